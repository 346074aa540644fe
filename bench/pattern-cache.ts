/**
 * Disk caches for the pattern benchmark and vocabulary training: painted photos (one 1024×768
 * photo takes ~0.3–0.5 s to paint) keyed by spec and the painter's source, and extracted features
 * keyed also by the pattern engine's source and vocabulary, so a change to either recomputes.
 * Lives under bench/.out (ignored by git). Timings are always measured on fresh extractions.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { renderPhoto } from '../seeds/photos/index';
import type { PhotoTruth } from '../seeds/photos/types';
import { deserializeFeatures, serializeFeatures } from '../server/pattern/serialize';
import { PATTERN_PARAMS, type FeatureSet } from '../server/pattern/types';
import { decodeJpeg } from '../server/images/codec';
import { reviewerCrop, type PlannedPhoto, type RenderedSetPhoto } from '../tests/pattern/photo-set';

const CACHE = new URL('./.out/pattern-photos/', import.meta.url);

const versions = new Map<string, string>();

/** Hash of some source files (relative to this file), computed once per list. */
function sourceVersion(files: readonly string[]): string {
  const name = files.join(',');
  let v = versions.get(name);
  if (v) return v;
  const h = createHash('sha256');
  for (const f of files) h.update(readFileSync(new URL(f, import.meta.url)));
  v = h.digest('hex').slice(0, 12);
  versions.set(name, v);
  return v;
}

function painterFiles(): string[] {
  const dir = new URL('../seeds/photos/', import.meta.url);
  return readdirSync(dir)
    .filter((f) => f.endsWith('.ts'))
    .sort()
    .map((f) => `../seeds/photos/${f}`);
}

/** What extraction depends on: its code, the vocabulary and the extraction constants. */
const EXTRACTION_FILES = [
  'features.ts',
  'opencv.ts',
  'hamming.ts',
  'vocabulary.ts',
  'vocabulary-v1.json',
  'serialize.ts',
].map((f) => `../server/pattern/${f}`);

function extractionVersion(): string {
  const p = PATTERN_PARAMS;
  const constants = [
    p.workingSize,
    p.orbFeatures,
    p.orbScaleFactor,
    p.orbLevels,
    p.orbEdge,
    p.claheClip,
    p.claheTiles,
  ];
  return sourceVersion(EXTRACTION_FILES) + JSON.stringify(constants);
}

function keyOf(plan: PlannedPhoto): string {
  return createHash('sha256')
    .update(sourceVersion(painterFiles()))
    .update(JSON.stringify(plan.spec))
    .digest('hex')
    .slice(0, 24);
}

/** Features of a planned photo, from the cache or by `extract` (then stored). */
export async function featuresCached(
  plan: PlannedPhoto,
  mirror: boolean,
  extract: (photo: RenderedSetPhoto) => Promise<FeatureSet>,
): Promise<FeatureSet> {
  const dir = join(CACHE.pathname, 'features');
  mkdirSync(dir, { recursive: true });
  const key = createHash('sha256')
    .update(keyOf(plan))
    .update(extractionVersion())
    .update(mirror ? 'mirror' : 'plain')
    .digest('hex')
    .slice(0, 24);
  const path = join(dir, `${key}.bin`);
  if (existsSync(path)) return deserializeFeatures(readFileSync(path));
  const features = await extract(await renderCached(plan));
  writeFileSync(path, serializeFeatures(features));
  return features;
}

/** Paints (or reads back) and decodes a planned photo. */
export async function renderCached(plan: PlannedPhoto): Promise<RenderedSetPhoto> {
  const dir = CACHE.pathname;
  mkdirSync(dir, { recursive: true });
  const key = keyOf(plan);
  const jpegPath = join(dir, `${key}.jpg`);
  const truthPath = join(dir, `${key}.json`);
  let jpeg: Buffer;
  let truth: PhotoTruth;
  if (existsSync(jpegPath) && existsSync(truthPath)) {
    jpeg = readFileSync(jpegPath);
    truth = JSON.parse(readFileSync(truthPath, 'utf8')) as PhotoTruth;
  } else {
    ({ jpeg, truth } = await renderPhoto(plan.spec));
    writeFileSync(jpegPath, jpeg);
    writeFileSync(truthPath, JSON.stringify(truth));
  }
  const pixels = await decodeJpeg(jpeg);
  return { plan, jpeg, pixels, crop: reviewerCrop(plan, truth), truth };
}

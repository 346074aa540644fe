/**
 * A synthetic trail-camera card for the ingest benchmark: one camera over several weeks, triggers
 * in bursts (wind-triggered blanks, leopards, other species, people, vehicles; infrared at night),
 * 3000×2000 JPEGs at quality 97 with real EXIF and an embedded thumbnail, so files weigh 2–2.5 MB
 * like a camera's. Painted by seeds/photos (all synthetic) and cached under bench/.out/.
 *
 * The first UNIQUE_PHOTOS files are painted one by one; beyond that (the 2,000-photo card) a file
 * reuses the pixels of file i mod UNIQUE_PHOTOS with its own EXIF time, so its bytes (and hash) are
 * its own while painting stays a one-off of minutes, not an hour.
 */
import { existsSync, mkdirSync, readFileSync, renameSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import exifr from 'exifr';
import { buildExif, exifTimeOfWallClock, insertExif } from '../seeds/photos/exif';
import { renderSet } from '../seeds/photos/index';
import { Rng } from '../seeds/photos/random';
import type { ExifFields, OtherSpecies, PhotoSpec, Subject } from '../seeds/photos/types';
import { randomVariation } from '../seeds/photos/variation';
import { OUT_DIR } from './report';

export const CARD_WIDTH = 3000;
export const CARD_HEIGHT = 2000;
const QUALITY = 97;
const UNIQUE_PHOTOS = 200;

/** Where the card's deployment is, and what its camera writes. */
export const CARD_SITE = {
  stationCode: 'BN01',
  lat: -1.2921,
  lon: 36.8219,
  serial: 'BENCH-0001',
  timezone: 'Africa/Nairobi',
  start: '2026-07-01T06:00:00Z',
  end: '2026-12-31T06:00:00Z',
} as const;

const LOCAL_OFFSET_MS = 3 * 3600_000; // Africa/Nairobi is UTC+3 all year.
const OTHERS: OtherSpecies[] = ['bushbuck', 'porcupine', 'honeyBadger', 'baboon', 'genet'];

/** One planned photo of the card. */
export interface CardPhoto {
  index: number;
  file: string;
  trueTime: string;
  spec: PhotoSpec;
}

function pickSubject(rng: Rng): Subject {
  const u = rng.next();
  if (u < 0.4) return { kind: 'blank' };
  if (u < 0.6)
    return {
      kind: 'target',
      individual: rng.pick(['P01', 'P02', 'P03', 'P04', 'P05']),
      flank: rng.pick(['left', 'right']),
    };
  if (u < 0.85) return { kind: 'animal', species: rng.pick(OTHERS) };
  if (u < 0.93) return { kind: 'human' };
  return { kind: 'vehicle' };
}

/**
 * Plans the first `count` photos of the card (a prefix of the same infinite plan, so a cache made
 * for 200 photos serves the first 200 of the 2,000-photo card). Triggers come about every 90
 * minutes on average, some within the 30-minute independence interval of the previous one.
 */
export function planCard(count: number): CardPhoto[] {
  const rng = new Rng(2026).fork('bench-card');
  const photos: CardPhoto[] = [];
  let t = Date.parse(CARD_SITE.start) + 3600_000;
  while (photos.length < count) {
    t += Math.round(-Math.log(1 - rng.next()) * 90 * 60_000) + 10_000;
    const subject = pickSubject(rng);
    const burst = subject.kind === 'blank' ? rng.int(1, 3) : 3;
    const seed = rng.int(0, 2 ** 30);
    const base = randomVariation(seed, 0.5, subject.kind);
    const localHour = new Date(t + LOCAL_OFFSET_MS).getUTCHours();
    for (let k = 0; k < burst && photos.length < count; k++) {
      const at = t + k * 1500;
      const index = photos.length;
      photos.push({
        index,
        file: `IMG_${String(index + 1).padStart(4, '0')}.JPG`,
        trueTime: new Date(at).toISOString(),
        spec: {
          width: CARD_WIDTH,
          height: CARD_HEIGHT,
          quality: QUALITY,
          seed: rng.int(0, 2 ** 30),
          station: CARD_SITE.stationCode,
          camera: 'A',
          lighting: localHour >= 18 || localHour < 6 ? 'infrared' : 'day',
          subject,
          variation: {
            ...base,
            position: (base.position ?? 0) + (k - (burst - 1) / 2) * 0.35,
            gait: ((base.gait ?? 0) + k * 0.3) % 1,
          },
          exif: exifFor(at),
        },
      });
    }
    t += burst * 1500;
  }
  return photos;
}

function exifFor(trueMs: number): ExifFields {
  return {
    dateTimeOriginal: exifTimeOfWallClock(new Date(trueMs + LOCAL_OFFSET_MS)),
    subSecTimeOriginal: String(trueMs % 1000).padStart(3, '0'),
    make: 'Synthetic Trailcam',
    model: 'ST-1',
    serial: CARD_SITE.serial,
    gps: { lat: CARD_SITE.lat, lon: CARD_SITE.lon },
  };
}

function cardDir(): string {
  return join(OUT_DIR, `card-${CARD_WIDTH}x${CARD_HEIGHT}-q${QUALITY}-u${UNIQUE_PHOTOS}`);
}

function writeOnce(path: string, bytes: Buffer): void {
  writeFileSync(`${path}.part`, bytes);
  renameSync(`${path}.part`, path);
}

async function paintMissing(plan: CardPhoto[], dir: string): Promise<number> {
  const missing = plan.filter((p) => p.index < UNIQUE_PHOTOS && !existsSync(join(dir, p.file)));
  if (missing.length === 0) return 0;
  const started = performance.now();
  const chunk = 16;
  for (let first = 0; first < missing.length; first += chunk) {
    const part = missing.slice(first, first + chunk);
    await renderSet(
      part.map((p) => p.spec),
      {
        concurrency: 2,
        onPhoto: (i, photo) => writeOnce(join(dir, part[i]!.file), photo.jpeg),
      },
    );
    const done = Math.min(missing.length, first + chunk);
    const eta = ((performance.now() - started) / done) * (missing.length - done);
    process.stdout.write(
      `\r  painting ${done}/${missing.length} photos (about ${Math.ceil(eta / 1000)} s left)  `,
    );
  }
  process.stdout.write('\n');
  return missing.length;
}

async function deriveMissing(plan: CardPhoto[], dir: string): Promise<number> {
  let made = 0;
  for (const p of plan) {
    if (p.index < UNIQUE_PHOTOS || existsSync(join(dir, p.file))) continue;
    const source = readFileSync(join(dir, plan[p.index % UNIQUE_PHOTOS]!.file));
    const thumb = await exifr.thumbnail(source);
    if (!thumb) throw new Error(`no EXIF thumbnail in ${plan[p.index % UNIQUE_PHOTOS]!.file}`);
    const exif = buildExif(p.spec.exif!, CARD_WIDTH, CARD_HEIGHT, Buffer.from(thumb));
    writeOnce(join(dir, p.file), insertExif(source, exif));
    made++;
  }
  return made;
}

/** The card's files on disk (painted or derived if not cached yet), in card order. */
export async function ensureCard(
  count: number,
): Promise<{ plan: CardPhoto[]; paths: string[]; bytes: number; painted: number }> {
  const plan = planCard(count);
  const dir = cardDir();
  mkdirSync(dir, { recursive: true });
  const painted = await paintMissing(plan, dir);
  const derived = await deriveMissing(plan, dir);
  if (derived) console.log(`  derived ${derived} more files with their own EXIF times`);
  const paths = plan.map((p) => join(dir, p.file));
  const bytes = paths.reduce((s, p) => s + statSync(p).size, 0);
  return { plan, paths, bytes, painted };
}

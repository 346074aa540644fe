/**
 * Coat-pattern features in the database and the pattern signal of the Identify ranking. Features
 * are computed by the job queue in the pattern worker pool (never on a request thread) for each
 * sighting's best photo inside its crop, and for reference photos inside the crop of the sighting
 * they came from. A sighting and a reference made from the same photo and crop share one row.
 */
import { readFile } from 'node:fs/promises';
import { sql } from 'kysely';
import type { PatternMatchesView, PatternStatus } from '../../shared/identify';
import type { Crop } from '../../shared/sort';
import type { Db } from '../db/database';
import type { PhotoStorage } from '../images/storage';
import type { JobHandler } from '../jobs/runner';
import { PatternCatalogue } from '../pattern/catalogue';
import { PatternError, type CatalogueSource, type PatternPool } from '../pattern/pool';
import { deserializeFeatures, serializeFeatures } from '../pattern/serialize';
import type { FeatureSet, RankedCandidate } from '../pattern/types';
import { defaultVocabulary } from '../pattern/vocabulary';
import { ApiError } from '../errors/api-error';
import { catalogueVersion } from './catalogue-cache';
import { enqueueJob } from './jobs.service';

/** What a pattern job computes: one photo inside one crop ('' = whole photo). */
export interface PatternJob {
  readonly photoId: string;
  readonly crop: string;
}

/**
 * Pattern jobs wait this long before they run: a reviewer drawing a crop box often adjusts it a
 * few times in a row, and photo previews (which reviewers wait for) go first.
 */
export const PATTERN_JOB_DELAY_MS = 5000;

/** The vocabulary features must use to count as ready. */
export function currentVocabulary(): string {
  return defaultVocabulary().id;
}

function jobOf(payload: unknown): PatternJob {
  const p = payload as { photoId?: unknown; crop?: unknown } | null;
  if (typeof p?.photoId !== 'string' || typeof p.crop !== 'string') {
    throw new Error('pattern job without a photo id and crop');
  }
  return { photoId: p.photoId, crop: p.crop };
}

/** The stored features of a photo and crop when they use the current vocabulary. */
export async function storedFeatures(
  db: Db,
  photoId: string,
  crop: string,
): Promise<{ features: FeatureSet; computedAt: string } | null> {
  const row = await db
    .selectFrom('pattern_features')
    .select(['features', 'computed_at'])
    .where('photo_id', '=', photoId)
    .where('crop', '=', crop)
    .where('vocabulary', '=', currentVocabulary())
    .executeTakeFirst();
  return row ? { features: deserializeFeatures(row.features), computedAt: row.computed_at } : null;
}

/**
 * Queues the features of a photo and crop unless they are stored or already queued. Pass a
 * transaction to queue together with the change that made them necessary.
 */
export async function queuePatternFeatures(db: Db, job: PatternJob): Promise<boolean> {
  const payload = JSON.stringify({ photoId: job.photoId, crop: job.crop });
  const pending = await db
    .selectFrom('jobs')
    .select('id')
    .where('kind', '=', 'pattern')
    .where('status', 'in', ['queued', 'running', 'failed'])
    .where('payload', '=', payload)
    .executeTakeFirst();
  // A job that failed for good (a crop too small, a photo that cannot be read) is not retried.
  if (pending) return false;
  const stored = await db
    .selectFrom('pattern_features')
    .select('photo_id')
    .where('photo_id', '=', job.photoId)
    .where('crop', '=', job.crop)
    .where('vocabulary', '=', currentVocabulary())
    .executeTakeFirst();
  if (stored) return false;
  const photo = await db
    .selectFrom('photos')
    .select('stored_path')
    .where('id', '=', job.photoId)
    .executeTakeFirst();
  if (!photo?.stored_path) return false;
  await enqueueJob(
    db,
    'pattern',
    { photoId: job.photoId, crop: job.crop },
    3,
    PATTERN_JOB_DELAY_MS,
  );
  return true;
}

/** The crop key of a sighting's crop column (stored JSON text, or null for the whole photo). */
export function cropKey(crop: string | null): string {
  return crop ?? '';
}

/**
 * Every photo and crop the pattern signal needs and lacks: sightings' best photos with their
 * crops, and reference photos with the crop of the latest sighting that chose them as best photo
 * (the whole photo when none did). Used at start-up and after seeding or an import.
 */
export async function missingPatternWork(db: Db, projectId?: string): Promise<PatternJob[]> {
  const vocabulary = currentVocabulary();
  const inProject = (column: string) =>
    projectId ? sql`and ${sql.ref(column)} = ${projectId}` : sql``;
  const rows = await sql<{ photo_id: string; crop: string }>`
    with wanted(photo_id, crop) as (
      select s.best_photo_id, coalesce(s.crop, '') from sightings s
      where s.state not in ('discarded') ${inProject('s.project_id')}
      union
      select r.photo_id, coalesce((
        select s.crop from sightings s where s.best_photo_id = r.photo_id
        order by s.updated_at desc limit 1), '')
      from reference_photos r join individuals i on i.id = r.individual_id
      where i.status in ('active', 'provisional') ${inProject('i.project_id')}
    )
    select w.photo_id, w.crop from wanted w
    join photos p on p.id = w.photo_id and p.stored_path is not null
    where not exists (select 1 from pattern_features f
      where f.photo_id = w.photo_id and f.crop = w.crop and f.vocabulary = ${vocabulary})`.execute(
    db,
  );
  return rows.rows.map((r) => ({ photoId: r.photo_id, crop: r.crop }));
}

/** Queues every missing photo and crop; returns how many jobs were added. */
export async function queueMissingPatternWork(db: Db, projectId?: string): Promise<number> {
  let queued = 0;
  const work = await missingPatternWork(db, projectId);
  // In transactions of 500 (one commit each, not one per job), giving the event loop back between
  // them: SQLite calls block it, and the server may already be answering.
  for (let i = 0; i < work.length; i += 500) {
    await db.transaction().execute(async (trx) => {
      for (const job of work.slice(i, i + 500)) if (await queuePatternFeatures(trx, job)) queued++;
    });
    await new Promise((resolve) => setImmediate(resolve));
  }
  return queued;
}

/**
 * Whether a photo and crop is still some sighting's best photo and crop, or a reference photo's
 * (a crop adjusted several times before its job ran leaves jobs nobody needs any more).
 */
async function stillWanted(db: Db, job: PatternJob): Promise<boolean> {
  const sighting = await db
    .selectFrom('sightings')
    .select('id')
    .where('best_photo_id', '=', job.photoId)
    .where(sql<string>`coalesce(crop, '')`, '=', job.crop)
    .executeTakeFirst();
  if (sighting) return true;
  const reference = await db
    .selectFrom('reference_photos')
    .select('photo_id')
    .where('photo_id', '=', job.photoId)
    .executeTakeFirst();
  if (!reference) return false;
  const latest = await db
    .selectFrom('sightings')
    .select('crop')
    .where('best_photo_id', '=', job.photoId)
    .orderBy('updated_at', 'desc')
    .executeTakeFirst();
  return (latest?.crop ?? '') === job.crop;
}

/** Computes and stores one photo's features in the pattern worker pool. */
export function patternFeaturesHandler(
  db: Db,
  pool: PatternPool,
  storage: PhotoStorage,
): JobHandler {
  return async (payload) => {
    const job = jobOf(payload);
    const photo = await db
      .selectFrom('photos')
      .select(['stored_path'])
      .where('id', '=', job.photoId)
      .executeTakeFirst();
    if (!photo?.stored_path || !(await stillWanted(db, job))) return;
    const bytes = await readFile(storage.absolute(photo.stored_path));
    const crop = job.crop ? (JSON.parse(job.crop) as Crop) : null;
    const features = await pool.extract(new Uint8Array(bytes), crop, { mirror: true });
    const row = {
      photo_id: job.photoId,
      crop: job.crop,
      vocabulary: features.vocabulary,
      keypoints: features.plain.words.length,
      features: serializeFeatures(features),
      computed_at: new Date().toISOString(),
    };
    await db
      .insertInto('pattern_features')
      .values(row)
      .onConflict((oc) => oc.columns(['photo_id', 'crop']).doUpdateSet(row))
      .execute();
  };
}

/** A project's reference photos indexed for the shortlist, with where their features live. */
interface ProjectCatalogue {
  /** Catalogue version, feature rows and latest computation: unchanged means nothing to rebuild. */
  readonly quick: string;
  readonly signature: string;
  readonly catalogue: PatternCatalogue;
  readonly cropOf: ReadonlyMap<string, string>;
}

const catalogues = new Map<string, ProjectCatalogue>();

/** Reference photos with ready features (no blobs), in a stable order. */
async function referenceRows(db: Db, projectId: string) {
  const rows = await sql<{
    individual_id: string;
    flank: string;
    photo_id: string;
    crop: string;
    computed_at: string;
  }>`
    select r.individual_id, r.flank, r.photo_id, f.crop, f.computed_at
    from reference_photos r
    join individuals i on i.id = r.individual_id
    join pattern_features f on f.photo_id = r.photo_id and f.vocabulary = ${currentVocabulary()}
      and f.crop = coalesce((select s.crop from sightings s where s.best_photo_id = r.photo_id
        order by s.updated_at desc limit 1), '')
    where i.project_id = ${projectId} and i.status in ('active', 'provisional')
    order by r.individual_id, r.flank, r.photo_id`.execute(db);
  return rows.rows;
}

/** The project's catalogue, rebuilt only when its references or their features changed. */
async function projectCatalogue(db: Db, projectId: string): Promise<ProjectCatalogue> {
  const stats = await db
    .selectFrom('pattern_features')
    .select((eb) => [eb.fn.countAll<number>().as('n'), eb.fn.max('computed_at').as('latest')])
    .executeTakeFirst();
  const quick = `${catalogueVersion(projectId)}|${stats?.n ?? 0}|${stats?.latest ?? ''}`;
  const known = catalogues.get(projectId);
  if (known && known.quick === quick) return known;
  const rows = await referenceRows(db, projectId);
  const signature = rows
    .map((r) => `${r.individual_id}/${r.flank}/${r.photo_id}/${r.computed_at}`)
    .join('|');
  if (known && known.signature === signature) {
    const same = { ...known, quick };
    catalogues.set(projectId, same);
    return same;
  }
  const catalogue = new PatternCatalogue();
  const cropOf = new Map<string, string>();
  for (const r of rows) {
    const stored = await storedFeatures(db, r.photo_id, r.crop);
    if (!stored) continue;
    catalogue.add(
      { individualId: r.individual_id, photoId: r.photo_id, flank: r.flank },
      stored.features,
    );
    cropOf.set(r.photo_id, r.crop);
  }
  const built = { quick, signature, catalogue, cropOf };
  catalogues.set(projectId, built);
  return built;
}

function sourceOf(db: Db, built: ProjectCatalogue): CatalogueSource {
  return {
    catalogue: built.catalogue,
    async features(photoIds) {
      const out = new Map<string, FeatureSet>();
      for (const id of photoIds) {
        const stored = await storedFeatures(db, id, built.cropOf.get(id) ?? '');
        if (stored) out.set(id, stored.features);
      }
      return out;
    },
  };
}

/** What the Identify ranking learns from the coat pattern. */
export interface PatternSignal {
  /** ready: scores below; pending: the sighting's features are still being computed. */
  readonly status: 'ready' | 'pending';
  /** Per individual: normalised score, verified points, and whether the flipped photo matched. */
  readonly scores: Map<string, { score: number; inliers: number; mirrored: boolean }>;
  /** References with features (the catalogue the pattern compared against). */
  readonly references: number;
}

const rankings = new Map<string, RankedCandidate[]>();
const MAX_CACHED_RANKINGS = 200;

/** The sighting's best photo and crop key. */
interface SightingPhoto {
  readonly id: string;
  readonly bestPhotoId: string;
  readonly crop: Crop | null;
  readonly flank: string;
}

async function sightingKey(db: Db, sighting: SightingPhoto): Promise<PatternJob> {
  const row = await db
    .selectFrom('sightings')
    .select(['best_photo_id', 'crop'])
    .where('id', '=', sighting.id)
    .executeTakeFirst();
  return { photoId: row?.best_photo_id ?? sighting.bestPhotoId, crop: cropKey(row?.crop ?? null) };
}

/**
 * The pattern signal of a sighting: its features ranked against the project's reference photos
 * of the same flank (the flipped photo against the other flank). Rankings are cached until the
 * sighting's features or the catalogue change.
 */
export async function patternSignal(
  db: Db,
  pool: PatternPool,
  projectId: string,
  sighting: SightingPhoto,
): Promise<PatternSignal> {
  const key = await sightingKey(db, sighting);
  const query = await storedFeatures(db, key.photoId, key.crop);
  const built = await projectCatalogue(db, projectId);
  if (!query) {
    await queuePatternFeatures(db, key);
    const failed = await db
      .selectFrom('jobs')
      .select('id')
      .where('kind', '=', 'pattern')
      .where('status', '=', 'failed')
      .where('payload', '=', JSON.stringify(key))
      .executeTakeFirst();
    // The job's own error may name server paths: the reviewer gets a plain reason.
    if (failed) throw new PatternError('the features of this photo could not be computed', 'input');
    return { status: 'pending', scores: new Map(), references: built.catalogue.size };
  }
  const cacheKey = `${sighting.id}|${key.photoId}|${key.crop}|${query.computedAt}|${sighting.flank}|${built.signature.length}:${hashOf(built.signature)}`;
  let ranked = rankings.get(cacheKey);
  if (!ranked) {
    const flank =
      sighting.flank === 'left' || sighting.flank === 'right' ? sighting.flank : undefined;
    ranked =
      built.catalogue.size === 0
        ? []
        : await pool.rank(query.features, sourceOf(db, built), { flank });
    rankings.set(cacheKey, ranked);
    if (rankings.size > MAX_CACHED_RANKINGS) rankings.delete(rankings.keys().next().value!);
  }
  const scores = new Map<string, { score: number; inliers: number; mirrored: boolean }>();
  for (const c of ranked) {
    if (c.inliers > 0)
      scores.set(c.individualId, { score: c.score, inliers: c.inliers, mirrored: c.mirrored });
  }
  return { status: 'ready', scores, references: built.catalogue.size };
}

function hashOf(text: string): number {
  let h = 2166136261;
  for (let i = 0; i < text.length; i++) h = Math.imul(h ^ text.charCodeAt(i), 16777619);
  return h >>> 0;
}

/** A point in fractions of a crop, as fractions of the whole photo. */
function toPhoto(f: FeatureSet, x: number, y: number): [number, number] {
  return [
    (f.crop.x + x * f.crop.width) / f.photoWidth,
    (f.crop.y + y * f.crop.height) / f.photoHeight,
  ];
}

/** Verifies a sighting against one of the project's reference photos and returns the pairs. */
export async function patternMatches(
  db: Db,
  pool: PatternPool,
  projectId: string,
  sighting: SightingPhoto,
  referencePhotoId: string,
): Promise<PatternMatchesView> {
  const reference = await db
    .selectFrom('reference_photos')
    .innerJoin('individuals', 'individuals.id', 'reference_photos.individual_id')
    .select(['reference_photos.individual_id', 'reference_photos.flank'])
    .where('reference_photos.photo_id', '=', referencePhotoId)
    .where('individuals.project_id', '=', projectId)
    .executeTakeFirst();
  if (!reference)
    throw new ApiError('not_found', 'This photo is not a reference photo of this project.');
  const key = await sightingKey(db, sighting);
  const query = await storedFeatures(db, key.photoId, key.crop);
  const built = await projectCatalogue(db, projectId);
  const refCrop = built.cropOf.get(referencePhotoId);
  const ref = refCrop === undefined ? null : await storedFeatures(db, referencePhotoId, refCrop);
  if (!query || !ref) {
    if (!query) await queuePatternFeatures(db, key);
    throw new ApiError(
      'conflict',
      'The coat-pattern features of these photos are still being computed; try again shortly.',
    );
  }
  const ranked = await pool.rank(query.features, [
    {
      individualId: reference.individual_id,
      photoId: referencePhotoId,
      flank: reference.flank,
      features: ref.features,
    },
  ]);
  const best = ranked[0];
  const q = query.features;
  const r = ref.features;
  return {
    referencePhotoId,
    inliers: best?.inliers ?? 0,
    score: best?.score ?? 0,
    mirrored: best?.mirrored ?? false,
    pairs: (best?.matches ?? []).map(([qx, qy, rx, ry]) => [
      ...toPhoto(q, qx, qy),
      ...toPhoto(r, rx, ry),
    ]),
    sightingPhoto: { width: q.photoWidth, height: q.photoHeight },
    referencePhoto: { width: r.photoWidth, height: r.photoHeight },
  };
}

/** What the reviewer is told about the pattern's part in the ranking. */
export function patternStatus(signal: PatternSignal | null, error?: string): PatternStatus {
  if (!signal) {
    return {
      state: 'unavailable',
      references: 0,
      text: `The coat pattern could not be compared (${error ?? 'unknown error'}): ranked without it.`,
    };
  }
  if (signal.status === 'pending') {
    return {
      state: 'pending',
      references: signal.references,
      text: 'The coat-pattern features of this photo are still being computed: ranked without the pattern for now.',
    };
  }
  return {
    state: 'ready',
    references: signal.references,
    text:
      signal.references === 0
        ? 'No reference photo has coat-pattern features yet: ranked without the pattern.'
        : `Coat pattern compared with ${signal.references} reference photos.`,
  };
}

/**
 * Measurements for the pattern benchmark: fresh extraction timings, query runs against a
 * catalogue, the brute-force baseline, and the memory check. All photos are synthetic.
 */
import { PatternCatalogue } from '../server/pattern/catalogue';
import { loadOpenCv } from '../server/pattern/opencv';
import type { CatalogueSource, PatternPool } from '../server/pattern/pool';
import { type ShortlistedReference, verifyPrematchedWith } from '../server/pattern/rank';
import { serializeFeatures } from '../server/pattern/serialize';
import type { ReferenceFeatures } from '../server/pattern/types';
import { outcomeOf, type QueryOutcome } from '../tests/pattern/evaluation';
import type { PlannedPhoto } from '../tests/pattern/photo-set';
import { median } from './estimate-timing';
import { renderCached } from './pattern-cache';
import type { LoadedQuery } from './pattern-sets';

/** Milliseconds of one call. */
async function timed<T>(fn: () => Promise<T> | T): Promise<[T, number]> {
  const t0 = performance.now();
  const value = await fn();
  return [value, performance.now() - t0];
}

/** Median extraction times from JPEG bytes (decode included), always freshly computed. */
export async function extractionTimes(pool: PatternPool, plans: readonly PlannedPhoto[]) {
  const photos = await Promise.all(plans.map((p) => renderCached(p)));
  await pool.extract(photos[0].jpeg, photos[0].crop);
  const both: number[] = [];
  const plain: number[] = [];
  const bytesBoth: number[] = [];
  const bytesPlain: number[] = [];
  for (const photo of photos) {
    const [f, ms] = await timed(() => pool.extract(photo.jpeg, photo.crop));
    both.push(ms);
    bytesBoth.push(serializeFeatures(f).length);
    const [g, ms2] = await timed(() => pool.extract(photo.jpeg, photo.crop, { mirror: false }));
    plain.push(ms2);
    bytesPlain.push(serializeFeatures(g).length);
  }
  return {
    photos: photos.length,
    bothMs: median(both),
    plainMs: median(plain),
    bytesBoth: median(bytesBoth),
    bytesPlain: median(bytesPlain),
  };
}

/** Results of running queries against a catalogue. */
export interface QueryRun {
  readonly outcomes: QueryOutcome[];
  readonly unknown: QueryOutcome[];
  readonly shortlistMs: number[];
  readonly rankMs: number[];
  /** CPU time of the whole process (main thread and worker) per ranking. */
  readonly rankCpuMs: number[];
}

/**
 * The flank a reviewer would record for a query photo: the one it shows (a mirrored photo of a
 * left flank looks like a right flank).
 */
export function recordedFlank(plan: LoadedQuery['plan']): 'left' | 'right' {
  if (plan.condition !== 'mirrored') return plan.flank;
  return plan.flank === 'left' ? 'right' : 'left';
}

/**
 * Ranks every query (and every unknown) against a catalogue through the pool; with `flankAware`
 * the recorded flank is passed as the app does (the photo as seen against that flank's
 * references, flipped against the other's), else both orientations meet every reference.
 */
export async function runQueries(
  pool: PatternPool,
  source: CatalogueSource,
  queries: readonly LoadedQuery[],
  unknown: readonly LoadedQuery[],
  flankAware = false,
): Promise<QueryRun> {
  const run: QueryRun = { outcomes: [], unknown: [], shortlistMs: [], rankMs: [], rankCpuMs: [] };
  for (const [list, out] of [
    [queries, run.outcomes],
    [unknown, run.unknown],
  ] as const) {
    for (const q of list) {
      const options = flankAware ? { flank: recordedFlank(q.plan) } : {};
      const [, slMs] = await timed(() => source.catalogue.shortlist(q.features, options));
      const cpu = process.cpuUsage();
      const [ranked, ms] = await timed(() => pool.rank(q.features, source, options));
      const used = process.cpuUsage(cpu);
      run.shortlistMs.push(slMs);
      run.rankMs.push(ms);
      run.rankCpuMs.push((used.user + used.system) / 1000);
      out.push(outcomeOf(q.plan, ranked));
    }
  }
  return run;
}

/**
 * The baseline: full OpenCV verification of the query, as seen and flipped, against every
 * reference, with no shortlist. Runs in this thread (a benchmark, not the server).
 */
export async function bruteForce(
  references: readonly ReferenceFeatures[],
  queries: readonly LoadedQuery[],
) {
  const cv = await loadOpenCv();
  const outcomes: QueryOutcome[] = [];
  let pairs = 0;
  let ms = 0;
  for (const q of queries) {
    const all = references.flatMap((r) =>
      [false, true].map((mirrored) => ({
        ref: { ...r, mirrored, votes: 0 } satisfies ShortlistedReference,
        prematchInliers: 0,
      })),
    );
    const [ranked, t] = await timed(() => verifyPrematchedWith(cv, q.features, all));
    // Several references per individual: keep each individual's best, as the engine does.
    const seen = new Set<string>();
    const best = ranked.filter((c) => !seen.has(c.individualId) && seen.add(c.individualId));
    outcomes.push(outcomeOf(q.plan, best));
    pairs += all.length;
    ms += t;
  }
  return { outcomes, msPerPair: ms / pairs, pairs };
}

/** Heap top of the worker after warm-up and after many extractions and rankings. */
export async function memoryCheck(
  pool: PatternPool,
  plan: PlannedPhoto,
  references: readonly ReferenceFeatures[],
  iterations: number,
) {
  const photo = await renderCached(plan);
  const catalogue = new PatternCatalogue();
  for (const r of references) catalogue.add(r, r.features);
  const byPhoto = new Map(references.map((r) => [r.photoId, r.features]));
  const source: CatalogueSource = { catalogue, features: () => byPhoto };
  for (let i = 0; i < 10; i++) await pool.rank(await pool.extract(photo.jpeg, photo.crop), source);
  const start = await pool.heapBytes();
  for (let i = 0; i < iterations; i++) await pool.extract(photo.jpeg, photo.crop);
  const afterExtract = await pool.heapBytes();
  const query = await pool.extract(photo.jpeg, photo.crop);
  for (let i = 0; i < iterations; i++) await pool.rank(query, source);
  const afterRank = await pool.heapBytes();
  return { start, afterExtract, afterRank };
}

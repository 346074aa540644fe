/**
 * The benchmark's photo sets (all synthetic): catalogue individuals with their held-out queries,
 * individuals never catalogued ("unknown"), painted distractor individuals, and catalogues grown
 * to a target size with mosaic stand-ins. Training individuals ("TRAIN-…") are used only with
 * --set train, which is how the parameters and the threshold were chosen.
 */
import type { CatalogueSource, PatternPool } from '../server/pattern/pool';
import { PatternCatalogue } from '../server/pattern/catalogue';
import type { FeatureSet, ReferenceFeatures } from '../server/pattern/types';
import {
  ids,
  planCatalogue,
  planQueries,
  QUERY_CONDITIONS,
  type PlannedPhoto,
  type SetShape,
} from '../tests/pattern/photo-set';
import { featuresCached } from './pattern-cache';
import { mosaicPlan, mosaicReference } from './pattern-mosaic';

/** Photo size and stations of every benchmark photo. */
export const BENCH_SHAPE: SetShape = { width: 1024, height: 768, stations: 12 };

/** Who is in each part of a set. */
export interface SetNames {
  readonly catalogue: readonly string[];
  readonly unknown: readonly string[];
  readonly distractors: readonly string[];
}

/** Names for the evaluation (held-out) or the training set. */
export function setNames(
  kind: 'eval' | 'train',
  sizes: { catalogue: number; unknown: number; distractors: number },
): SetNames {
  if (kind === 'train') {
    return {
      catalogue: ids('TRAIN', sizes.catalogue),
      unknown: ids('TRAIN', sizes.unknown, 200),
      distractors: ids('TRAIN', sizes.distractors, 300),
    };
  }
  return {
    catalogue: ids('EVAL', sizes.catalogue),
    unknown: ids('UNK', sizes.unknown),
    distractors: ids('DIST', sizes.distractors),
  };
}

/** A query photo and its features. */
export interface LoadedQuery {
  readonly plan: PlannedPhoto;
  readonly features: FeatureSet;
}

/** Every photo of a set, with features. */
export interface LoadedSets {
  readonly references: ReferenceFeatures[];
  readonly distractors: ReferenceFeatures[];
  readonly queries: LoadedQuery[];
  readonly unknown: LoadedQuery[];
}

async function featuresOf(pool: PatternPool, plan: PlannedPhoto, mirror: boolean) {
  return featuresCached(plan, mirror, (photo) =>
    pool.extract(photo.pixels, photo.crop, { mirror }),
  );
}

async function referencesOf(pool: PatternPool, plans: readonly PlannedPhoto[], tick: () => void) {
  const out: ReferenceFeatures[] = [];
  for (const p of plans) {
    const features = await featuresOf(pool, p, false);
    out.push({ individualId: p.individualId, photoId: p.photoId, flank: p.flank, features });
    tick();
  }
  return out;
}

async function queriesOf(pool: PatternPool, plans: readonly PlannedPhoto[], tick: () => void) {
  const out: LoadedQuery[] = [];
  for (const plan of plans) {
    out.push({ plan, features: await featuresOf(pool, plan, true) });
    tick();
  }
  return out;
}

/** Paints (or reads from the cache) and extracts every photo of a set. */
export async function loadSets(pool: PatternPool, names: SetNames): Promise<LoadedSets> {
  const plans = {
    references: planCatalogue(names.catalogue, BENCH_SHAPE),
    distractors: planCatalogue(names.distractors, BENCH_SHAPE),
    queries: planQueries(names.catalogue, BENCH_SHAPE),
    unknown: planQueries(names.unknown, BENCH_SHAPE, QUERY_CONDITIONS.slice(0, 3)),
  };
  const total = Object.values(plans).reduce((s, p) => s + p.length, 0);
  let done = 0;
  const started = performance.now();
  const tick = () => {
    if (++done % 100 === 0 || done === total) {
      const s = ((performance.now() - started) / 1000).toFixed(0);
      process.stdout.write(`  photos ready: ${done}/${total} (${s} s)\n`);
    }
  };
  return {
    references: await referencesOf(pool, plans.references, tick),
    distractors: await referencesOf(pool, plans.distractors, tick),
    queries: await queriesOf(pool, plans.queries, tick),
    unknown: await queriesOf(pool, plans.unknown, tick),
  };
}

/** A catalogue of `individuals` (real ones first, then mosaics) and its feature store. */
export interface BuiltCatalogue {
  readonly source: CatalogueSource;
  readonly references: number;
  readonly mosaics: number;
  readonly buildMs: number;
}

/** Builds the index; mosaic features are re-made on demand, as a database read would be. */
export function buildCatalogue(
  real: readonly ReferenceFeatures[],
  donors: readonly ReferenceFeatures[],
  individuals: number,
): BuiltCatalogue {
  const started = performance.now();
  const catalogue = new PatternCatalogue();
  const byPhoto = new Map<string, ReferenceFeatures>();
  for (const r of real) {
    catalogue.add(r, r.features);
    byPhoto.set(r.photoId, r);
  }
  const realIndividuals = new Set(real.map((r) => r.individualId)).size;
  const mosaics = mosaicPlan(Math.max(0, individuals - realIndividuals));
  const recipe = new Map<string, (typeof mosaics)[number]>();
  for (const m of mosaics) {
    const ref = mosaicReference(m.individualId, m.photoId, m.flank, donors);
    catalogue.add(ref, ref.features);
    recipe.set(m.photoId, m);
  }
  const buildMs = performance.now() - started;
  const features = (photoIds: readonly string[]) => {
    const out = new Map<string, FeatureSet>();
    for (const id of photoIds) {
      const r = byPhoto.get(id);
      const m = recipe.get(id);
      if (r) out.set(id, r.features);
      else if (m) out.set(id, mosaicReference(m.individualId, id, m.flank, donors).features);
    }
    return out;
  };
  return {
    source: { catalogue, features },
    references: catalogue.size,
    mosaics: mosaics.length,
    buildMs,
  };
}

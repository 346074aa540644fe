/**
 * The pattern engine behind a piscina worker pool: feature extraction and verification run in
 * worker threads (OpenCV never loads in the main thread); the shortlist, which needs the whole
 * catalogue's index, runs in the caller's thread in a few milliseconds.
 */
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import { PatternCatalogue, type ShortlistOptions } from './catalogue';
import { attachFeatures, shortlistReferences, type ShortlistedReference } from './rank';
import type { CropBox, FeatureSet, RankedCandidate, ReferenceFeatures, RgbaPixels } from './types';
import type { ExtractTask, FailureKind, Outcome, RankTask } from './worker-task';

/** A large catalogue: its index, and a way to fetch the shortlisted references' features. */
export interface CatalogueSource {
  readonly catalogue: PatternCatalogue;
  /** Features of the given reference photos (for example read from SQLite BLOBs). */
  features(
    photoIds: readonly string[],
  ): Promise<ReadonlyMap<string, FeatureSet>> | ReadonlyMap<string, FeatureSet>;
}

/** A failure reported by the pattern engine; `kind` says whether the input was at fault. */
export class PatternError extends Error {
  override readonly name = 'PatternError';

  constructor(
    message: string,
    readonly kind: FailureKind,
  ) {
    super(message);
  }
}

/** The pattern engine's API. */
export interface PatternPool {
  readonly threads: number;
  /** Features of a photo (JPEG bytes or RGBA pixels) inside the crop (whole photo when none). */
  extract(
    image: Uint8Array | RgbaPixels,
    crop?: CropBox | null,
    options?: { readonly mirror?: boolean },
  ): Promise<FeatureSet>;
  /** Individuals ranked by pattern similarity to the query, best first (one per individual). */
  rank(
    query: FeatureSet,
    references: readonly ReferenceFeatures[] | CatalogueSource,
    options?: ShortlistOptions,
  ): Promise<RankedCandidate[]>;
  /** Top of one worker's OpenCV heap in bytes: flat across calls unless memory leaks. */
  heapBytes(): Promise<number>;
  /** Makes a worker hit an OpenCV C++ exception, which retires that thread (recovery tests). */
  faultForTests(): Promise<void>;
  /** Stops the worker threads. */
  close(): Promise<void>;
}

function isSource(value: readonly ReferenceFeatures[] | CatalogueSource): value is CatalogueSource {
  return !Array.isArray(value);
}

/** Shortlists in this thread: from a plain list, or from a catalogue and its feature store. */
export async function shortlistFor(
  query: FeatureSet,
  references: readonly ReferenceFeatures[] | CatalogueSource,
  options: ShortlistOptions = {},
): Promise<ShortlistedReference[]> {
  if (!isSource(references)) return shortlistReferences(query, references, options);
  const entries = references.catalogue.shortlist(query, options);
  const features = await references.features(entries.map((e) => e.photoId));
  return attachFeatures(entries, (id) => features.get(id));
}

/** Starts the pool (threads start lazily; each loads OpenCV, ≈ 0.5 s and ~125 MB). */
export function createPatternPool(threads = 1): PatternPool {
  const size = Math.max(1, Math.floor(threads));
  const piscina = new Piscina({
    filename: fileURLToPath(new URL('./worker.mjs', import.meta.url)),
    minThreads: 0,
    maxThreads: size,
    idleTimeout: 60_000,
    resourceLimits: { maxOldGenerationSizeMb: 512 },
  });

  async function call<T>(name: string, task: unknown): Promise<T> {
    let outcome: Outcome<T>;
    try {
      outcome = (await piscina.run(task, { name })) as Outcome<T>;
    } catch (err) {
      // A thread that retired after an OpenCV fault may have taken this task with it: retry once.
      if (!(err instanceof Error && /worker exited/.test(err.message))) throw err;
      outcome = (await piscina.run(task, { name })) as Outcome<T>;
    }
    if (!outcome.ok) throw new PatternError(outcome.message, outcome.kind);
    return outcome.value;
  }

  return {
    threads: size,
    extract: (image, crop = null, options = {}) => {
      const task: ExtractTask = { image, crop, mirror: options.mirror ?? true };
      return call<FeatureSet>('extract', task);
    },
    rank: async (query, references, options = {}) => {
      const shortlisted = await shortlistFor(query, references, options);
      if (shortlisted.length === 0) return [];
      const task: RankTask = { query, shortlisted };
      return call<RankedCandidate[]>('rank', task);
    },
    heapBytes: () => call<number>('heap', {}),
    faultForTests: () => call<void>('fault', {}),
    close: () => piscina.destroy(),
  };
}

import { availableParallelism } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { DerivativesResult, DerivativesTask } from './derivatives-task';

/** Photo processing off the main thread, one worker per core by default. */
export interface ImagePool {
  readonly threads: number;
  makeDerivatives(task: DerivativesTask): Promise<DerivativesResult>;
  close(): Promise<void>;
}

/** Starts the worker pool (workers start lazily, on the first task). */
export function createImagePool(threads = availableParallelism()): ImagePool {
  const size = Math.max(1, threads);
  const piscina = new Piscina({
    filename: fileURLToPath(new URL('./worker.mjs', import.meta.url)),
    minThreads: 0,
    maxThreads: size,
    idleTimeout: 30_000,
    // Decoded 6-megapixel frames are 24 MB each; cap a worker's heap so a bad file cannot run away.
    resourceLimits: { maxOldGenerationSizeMb: 512 },
  });
  return {
    threads: size,
    makeDerivatives: (task) => piscina.run(task) as Promise<DerivativesResult>,
    close: () => piscina.destroy(),
  };
}

/**
 * The one worker pool for SECR fits: created on first use, one thread (a fit keeps a core busy for
 * seconds, and the machine is shared), so the HTTP server stays responsive while a fit runs.
 */
import { MessageChannel } from 'node:worker_threads';
import { Piscina } from 'piscina';
import type { SecrInput } from '../estimation';
import type { SecrTask, SecrTaskOutcome } from './secr-task';

/** Fits waiting for the thread beyond which new fits are refused (the server is busy). */
export const SECR_QUEUE_LIMIT = 8;
/** An idle thread exits after this long, so an unused server holds no worker. */
const IDLE_MS = 60_000;

let pool: Piscina<SecrTask, SecrTaskOutcome> | null = null;

function secrPool(): Piscina<SecrTask, SecrTaskOutcome> {
  pool ??= new Piscina<SecrTask, SecrTaskOutcome>({
    // A .mjs entry that registers tsx itself: worker threads do not always inherit the loader.
    filename: new URL('./secr-worker.mjs', import.meta.url).href,
    minThreads: 0,
    maxThreads: 1,
    idleTimeout: IDLE_MS,
    maxQueue: SECR_QUEUE_LIMIT,
  });
  return pool;
}

/** True when the pool's queue is full and a new fit would be refused. */
export function secrPoolIsFull(): boolean {
  return pool !== null && pool.queueSize >= SECR_QUEUE_LIMIT;
}

/** Runs one fit in the worker thread; progress arrives as the worker reports it. */
export async function runSecrInWorker(
  input: SecrInput,
  onProgress: (p: { stage: string; fraction: number }) => void,
  signal?: AbortSignal,
): Promise<SecrTaskOutcome> {
  const channel = new MessageChannel();
  channel.port1.on('message', (p: { stage: string; fraction: number }) => onProgress(p));
  try {
    return await secrPool().run(
      { input, progress: channel.port2 },
      { transferList: [channel.port2], signal },
    );
  } finally {
    channel.port1.close();
  }
}

/** Stops the worker thread (server shutdown, end of tests); a later fit starts a new pool. */
export async function closeSecrPool(): Promise<void> {
  const closing = pool;
  pool = null;
  await closing?.destroy();
}

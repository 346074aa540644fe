/** The SECR fit as a worker-thread task: progress goes back over a MessagePort. */
import type { MessagePort } from 'node:worker_threads';
import type { SecrResult } from '../../shared/estimate';
import { fitSecr, type SecrInput } from '../estimation';

/** What the pool sends to the worker. */
export interface SecrTask {
  input: SecrInput;
  /** Receives `{ stage, fraction }` messages while the fit runs. */
  progress?: MessagePort;
}

/** What the worker sends back: the fit, or a message about input the fit cannot use. */
export type SecrTaskOutcome = { ok: true; result: SecrResult } | { ok: false; message: string };

/** Runs one fit; RangeErrors (input a person can fix, such as an oversized mask) become messages. */
export default function runSecrTask({ input, progress }: SecrTask): SecrTaskOutcome {
  try {
    const result = fitSecr(input, (p) => progress?.postMessage(p));
    return { ok: true, result };
  } catch (err) {
    if (err instanceof RangeError) return { ok: false, message: err.message };
    throw err;
  } finally {
    progress?.close();
  }
}

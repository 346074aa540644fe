/** SECR fits off the main thread: memory guard, worker run, and the in-memory job list per user. */
import type { Logger } from 'pino';
import type { SecrRequest } from '../../shared/estimate';
import type { SecrJobView, SecrProgressView, SecrResponse } from '../../shared/estimate-api';
import { ApiError, notFound } from '../errors/api-error';
import { assertSecrFitsInMemory } from '../estimation';
import { runSecrInWorker, secrPoolIsFull } from '../workers/secr-pool';
import { toSecrResponse, withInputErrorsAs400 } from './estimates.service';
import { newId, nowIso } from './ids';

/** A finished job is forgotten this long after it finished. */
export const SECR_JOB_TTL_MS = 30 * 60 * 1000;
/** Fits one person may have running or waiting at once. */
export const SECR_JOBS_PER_USER = 2;

/** Refuses, before any work, a fit too large for memory (400) or one the busy worker cannot queue (429). */
export function assertSecrCanStart(input: SecrRequest): void {
  withInputErrorsAs400(() => assertSecrFitsInMemory(input));
  if (secrPoolIsFull()) {
    throw new ApiError(
      'rate_limited',
      'The server is busy with other density fits. Please try again in a minute.',
    );
  }
}

/**
 * Fits one SECR request in the worker thread. Refuses (400) a fit too large for memory before
 * it starts, and input the fit cannot use; 429 when the worker's queue is full.
 */
export async function fitSecrOffThread(
  input: SecrRequest,
  onProgress: (p: SecrProgressView) => void = () => undefined,
  signal?: AbortSignal,
): Promise<SecrResponse> {
  assertSecrCanStart(input);
  const outcome = await runSecrInWorker(input, onProgress, signal);
  if (!outcome.ok) throw new ApiError('validation_failed', outcome.message);
  return toSecrResponse(outcome.result);
}

interface SecrJob extends SecrJobView {
  userId: string;
  finishedMs?: number;
}

/** In-memory density-fit jobs, private to the person who started them. */
export class SecrJobs {
  private readonly jobs = new Map<string, SecrJob>();

  constructor(
    private readonly log: Logger,
    private readonly now: () => number = Date.now,
  ) {}

  /** Starts a fit and returns its id at once; the fit reports into the job as it runs. */
  start(userId: string, input: SecrRequest): { id: string } {
    this.prune();
    assertSecrCanStart(input);
    const active = [...this.jobs.values()].filter(
      (j) => j.userId === userId && j.status === 'running',
    );
    if (active.length >= SECR_JOBS_PER_USER) {
      throw new ApiError(
        'rate_limited',
        `You already have ${active.length} density fits running; wait for one to finish.`,
      );
    }
    const job: SecrJob = {
      id: newId(),
      userId,
      status: 'running',
      progress: { stage: 'queued; starts when the fitting worker is free', fraction: 0 },
      createdAt: nowIso(),
    };
    this.jobs.set(job.id, job);
    void this.run(job, input);
    return { id: job.id };
  }

  /** The job as its owner sees it; 404 for other people's jobs and forgotten ones. */
  view(userId: string, id: string): SecrJobView {
    this.prune();
    const job = this.jobs.get(id);
    if (!job || job.userId !== userId) throw notFound('This density fit');
    const { userId: _owner, finishedMs: _finished, ...view } = job;
    return view;
  }

  private async run(job: SecrJob, input: SecrRequest): Promise<void> {
    try {
      job.result = await fitSecrOffThread(input, (p) => {
        job.progress = p;
      });
      job.status = 'done';
      job.progress = { stage: 'done', fraction: 1 };
    } catch (err) {
      job.status = 'failed';
      if (err instanceof ApiError) job.error = { code: err.code, message: err.message };
      else {
        this.log.error({ err, job: job.id }, 'SECR fit failed');
        job.error = {
          code: 'internal',
          message: 'The fit failed on the server. Please try again.',
        };
      }
    } finally {
      job.finishedAt = nowIso();
      job.finishedMs = this.now();
    }
  }

  private prune(): void {
    const cutoff = this.now() - SECR_JOB_TTL_MS;
    for (const [id, job] of this.jobs) {
      if (job.finishedMs !== undefined && job.finishedMs < cutoff) this.jobs.delete(id);
    }
  }
}

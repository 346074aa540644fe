import type { Logger } from 'pino';
import type { Db } from '../db/database';
import type { JobsTable } from '../db/schema/ingest.table';
import { claimJobs, failJob, finishJob, requeueInterrupted } from '../services/jobs.service';

/** Does one kind of job; throwing means "failed this attempt". */
export type JobHandler = (payload: unknown, job: JobsTable) => Promise<void>;

/** What the runner does when a job fails for good (e.g. mark its photo failed). */
export type FinalFailureHandler = (
  payload: unknown,
  error: string,
  job: JobsTable,
) => Promise<void>;

/** Polls the durable queue and runs jobs with bounded concurrency. */
export class JobRunner {
  private running = 0;
  private timer: NodeJS.Timeout | null = null;
  private stopped = true;
  private pumping = false;
  private readonly idle = new Set<() => void>();

  constructor(
    private readonly db: Db,
    private readonly log: Logger,
    private readonly handlers: Record<
      string,
      { run: JobHandler; onFinalFailure?: FinalFailureHandler }
    >,
    private readonly concurrency: number,
    private readonly pollMs = 500,
    private readonly retryBaseMs = 1000,
  ) {}

  /** Puts interrupted jobs back in the queue and starts polling. */
  async start(): Promise<void> {
    const requeued = await requeueInterrupted(this.db);
    if (requeued) this.log.info({ requeued }, 'jobs interrupted by the last stop are queued again');
    this.stopped = false;
    this.schedule(0);
  }

  /** Wakes the runner now (after new jobs were queued). */
  kick(): void {
    if (!this.stopped) this.schedule(0);
  }

  /** Stops taking jobs and waits for the running ones to finish. */
  async stop(): Promise<void> {
    this.stopped = true;
    if (this.timer) clearTimeout(this.timer);
    this.timer = null;
    await this.whenIdle();
  }

  /** Resolves when no job is running. */
  whenIdle(): Promise<void> {
    if (this.running === 0) return Promise.resolve();
    return new Promise((resolve) => this.idle.add(resolve));
  }

  private schedule(ms: number): void {
    if (this.timer) clearTimeout(this.timer);
    this.timer = setTimeout(() => void this.pump(), ms);
    this.timer.unref();
  }

  private async pump(): Promise<void> {
    if (this.stopped || this.pumping) return;
    this.pumping = true;
    try {
      const free = this.concurrency * 2 - this.running;
      if (free > 0) {
        const jobs = await claimJobs(this.db, free);
        for (const job of jobs) void this.runOne(job);
        if (jobs.length === free) {
          this.pumping = false;
          return this.schedule(0);
        }
      }
    } catch (err) {
      this.log.error({ err }, 'job queue poll failed');
    }
    this.pumping = false;
    if (!this.stopped) this.schedule(this.pollMs);
  }

  private async runOne(job: JobsTable): Promise<void> {
    this.running++;
    const handler = this.handlers[job.kind];
    let payload: unknown = null;
    try {
      payload = JSON.parse(job.payload);
      if (!handler) throw new Error(`no handler for job kind ${job.kind}`);
      await handler.run(payload, job);
      await finishJob(this.db, job.id);
    } catch (err) {
      const message = err instanceof Error ? err.message : String(err);
      try {
        const outcome = await failJob(this.db, job, message, this.retryBaseMs);
        if (outcome === 'failed') await handler?.onFinalFailure?.(payload, message, job);
        this.log.warn(
          { job: job.id, kind: job.kind, attempt: job.attempts, outcome, err: message },
          'job failed',
        );
      } catch (inner) {
        this.log.error({ err: inner }, 'could not record a job failure');
      }
    } finally {
      this.running--;
      if (this.running === 0) {
        const waiting = [...this.idle];
        this.idle.clear();
        for (const resolve of waiting) resolve();
      }
      this.kick();
    }
  }
}

import type { Db } from '../db/database';
import type { JobsTable } from '../db/schema/ingest.table';
import { newId } from './ids';

/** Kinds of durable background work. */
export type JobKind = 'derivatives' | 'blur' | 'pattern';

/** Adds a job (inside the caller's transaction when one is passed), due now or after a delay. */
export async function enqueueJob(
  db: Db,
  kind: JobKind,
  payload: unknown,
  maxAttempts = 3,
  delayMs = 0,
): Promise<string> {
  const now = new Date().toISOString();
  const due = delayMs > 0 ? new Date(Date.now() + delayMs).toISOString() : now;
  const id = newId();
  await db
    .insertInto('jobs')
    .values({
      id,
      kind,
      payload: JSON.stringify(payload),
      status: 'queued',
      attempts: 0,
      max_attempts: maxAttempts,
      run_after: due,
      locked_at: null,
      error: null,
      created_at: now,
      updated_at: now,
    })
    .execute();
  return id;
}

/** Claims up to `limit` due jobs atomically (queued → running, attempts + 1). */
export async function claimJobs(db: Db, limit: number): Promise<JobsTable[]> {
  const now = new Date().toISOString();
  return db.transaction().execute(async (trx) => {
    const due = await trx
      .selectFrom('jobs')
      .select('id')
      .where('status', '=', 'queued')
      .where('run_after', '<=', now)
      .orderBy('run_after')
      .orderBy('id')
      .limit(limit)
      .execute();
    if (due.length === 0) return [];
    return trx
      .updateTable('jobs')
      .set((eb) => ({
        status: 'running',
        locked_at: now,
        updated_at: now,
        attempts: eb('attempts', '+', 1),
      }))
      .where(
        'id',
        'in',
        due.map((d) => d.id),
      )
      .where('status', '=', 'queued')
      .returningAll()
      .execute();
  });
}

/** Marks a job done. */
export async function finishJob(db: Db, id: string): Promise<void> {
  await db
    .updateTable('jobs')
    .set({ status: 'done', error: null, updated_at: new Date().toISOString() })
    .where('id', '=', id)
    .execute();
}

/** Records a failure: retried later with back-off, or failed for good after the last attempt. */
export async function failJob(
  db: Db,
  job: JobsTable,
  error: string,
  retryBaseMs = 1000,
): Promise<'retry' | 'failed'> {
  const finalFailure = job.attempts >= job.max_attempts;
  const retryAt = new Date(Date.now() + 2 ** job.attempts * retryBaseMs).toISOString();
  await db
    .updateTable('jobs')
    .set({
      status: finalFailure ? 'failed' : 'queued',
      error: error.slice(0, 1000),
      run_after: finalFailure ? job.run_after : retryAt,
      updated_at: new Date().toISOString(),
    })
    .where('id', '=', job.id)
    .execute();
  return finalFailure ? 'failed' : 'retry';
}

/** After a crash or restart, jobs that were running go back to the queue (their work is idempotent). */
export async function requeueInterrupted(db: Db): Promise<number> {
  const result = await db
    .updateTable('jobs')
    .set({ status: 'queued', locked_at: null, updated_at: new Date().toISOString() })
    .where('status', '=', 'running')
    .executeTakeFirst();
  return Number(result.numUpdatedRows);
}

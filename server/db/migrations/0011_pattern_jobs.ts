import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/**
 * Before a coat-pattern job is queued the queue is asked whether the same photo and crop is
 * already queued, running or failed for good; without an index that question read every such job,
 * and the start-up sweep over a large imported catalogue asked it tens of thousands of times.
 */
export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`create index jobs_kind_payload on jobs (kind, payload)`.execute(db);
}

/** Drops the index. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`drop index if exists jobs_kind_payload`.execute(db);
}

import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/**
 * The Sort queue in station order walks the project's stations by code and each station's
 * unsorted events by time: this index lets it stop after the first batch instead of sorting the
 * whole queue on every call.
 */
export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`create index events_station_queue on events (station_id, label, start, id)`.execute(db);
}

/** Drops the index. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`drop index if exists events_station_queue`.execute(db);
}

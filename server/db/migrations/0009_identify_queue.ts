import { sql, type Kysely } from 'kysely';

// Frozen in time: this migration never imports app types.

/**
 * The Identify queue hands out sightings oldest event first. Ordering by the event's start meant
 * sorting every open and proposed sighting of the project on each call (a temporary B-tree over
 * thousands of rows); a copy of the start on the sighting, kept right by triggers whatever code
 * inserts sightings or moves events (clock fixes, regrouping), lets the queue walk an index and
 * stop at the first sighting the reviewer may take.
 */
export async function up(db: Kysely<unknown>): Promise<void> {
  await sql`alter table sightings add column queue_start text`.execute(db);
  await sql`update sightings set queue_start = (select start from events where events.id = sightings.event_id)`.execute(
    db,
  );
  await sql`create trigger sightings_queue_start_insert after insert on sightings
    begin
      update sightings set queue_start = (select start from events where id = new.event_id)
      where id = new.id;
    end`.execute(db);
  await sql`create trigger sightings_queue_start_move after update of event_id on sightings
    begin
      update sightings set queue_start = (select start from events where id = new.event_id)
      where id = new.id;
    end`.execute(db);
  await sql`create trigger events_start_to_sightings after update of start on events
    begin
      update sightings set queue_start = new.start where event_id = new.id;
    end`.execute(db);
  await sql`create index sightings_queue on sightings (project_id, state, queue_start, id)`.execute(
    db,
  );
  await sql`create index sightings_lease_holder on sightings (lease_holder) where lease_holder is not null`.execute(
    db,
  );
}

/** Drops the triggers, indexes and column. */
export async function down(db: Kysely<unknown>): Promise<void> {
  await sql`drop index if exists sightings_lease_holder`.execute(db);
  await sql`drop index if exists sightings_queue`.execute(db);
  await sql`drop trigger if exists events_start_to_sightings`.execute(db);
  await sql`drop trigger if exists sightings_queue_start_move`.execute(db);
  await sql`drop trigger if exists sightings_queue_start_insert`.execute(db);
  await sql`alter table sightings drop column queue_start`.execute(db);
}

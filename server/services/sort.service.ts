import { sql } from 'kysely';
import type { ProjectRole } from '../../shared/roles';
import type { EventView, LabelBody, SortNextQuery } from '../../shared/sort';
import type { Db } from '../db/database';
import type { EventsTable } from '../db/schema/ingest.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { eventViews } from './event-views.service';
import { enqueueJob } from './jobs.service';
import { isKnownSpecies } from './species.service';

/** How long a reviewer holds the events the queue hands them. */
export const LEASE_MS = 5 * 60 * 1000;

/**
 * Hands the caller the next unsorted events and leases them for a few minutes, in one atomic
 * statement: two reviewers asking at once never get the same event. A stale lease expires.
 */
export async function leaseNext(
  db: Db,
  project: ProjectsTable,
  user: { id: string },
  role: ProjectRole | null,
  query: SortNextQuery,
): Promise<EventView[]> {
  const now = new Date();
  const until = new Date(now.getTime() + LEASE_MS).toISOString();
  const nowIso = now.toISOString();
  const filters = [
    sql`e.project_id = ${project.id}`,
    sql`e.label is null`,
    sql`(e.lease_holder is null or e.lease_until < ${nowIso} or e.lease_holder = ${user.id})`,
  ];
  if (query.stationId) filters.push(sql`e.station_id = ${query.stationId}`);
  if (query.from) filters.push(sql`e.start >= ${new Date(query.from).toISOString()}`);
  if (query.to) filters.push(sql`e.start < ${new Date(query.to).toISOString()}`);
  if (query.deploymentId) {
    filters.push(
      sql`exists (select 1 from photos ph where ph.event_id = e.id and ph.deployment_id = ${query.deploymentId})`,
    );
  }
  if (query.flag) {
    filters.push(
      sql`exists (select 1 from photos ph where ph.event_id = e.id and ph.flags like ${`%"${query.flag}"%`})`,
    );
  }
  // Station order walks stations by code (CROSS JOIN keeps that loop outermost) and each
  // station's unsorted events through events_station_queue, so no sort of the whole queue.
  const source =
    query.order === 'station'
      ? sql`stations s cross join events e on e.station_id = s.id and s.project_id = ${project.id}`
      : sql`events e join stations s on s.id = e.station_id`;
  const order = query.order === 'station' ? sql`s.code, e.start, e.id` : sql`e.start, e.id`;
  // (The Sort screen gives its leases back itself when the reviewer changes filters.)
  const leased = await sql<{ id: string }>`
    update events set lease_holder = ${user.id}, lease_until = ${until}
    where id in (
      select e.id from ${source}
      where ${sql.join(filters, sql` and `)}
      order by ${order}
      limit ${query.limit}
    )
    returning id`.execute(db);
  const ids = leased.rows.map((r) => r.id);
  if (ids.length === 0) return [];
  const ordered = await db
    .selectFrom('events')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .select('events.id')
    .where('events.id', 'in', ids)
    .$call((q) => (query.order === 'station' ? q.orderBy('stations.code') : q))
    .orderBy('events.start')
    .orderBy('events.id')
    .execute();
  return eventViews(
    db,
    ordered.map((r) => r.id),
    role,
  );
}

/** Gives back the caller's leases (leaving the Sort screen). */
export async function releaseLeases(db: Db, projectId: string, userId: string): Promise<void> {
  await db
    .updateTable('events')
    .set({ lease_holder: null, lease_until: null })
    .where('project_id', '=', projectId)
    .where('lease_holder', '=', userId)
    .execute();
}

async function loadEvent(db: Db, projectId: string, eventId: string): Promise<EventsTable> {
  const event = await db
    .selectFrom('events')
    .selectAll()
    .where('id', '=', eventId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!event)
    throw new ApiError('not_found', 'This event was not found (it may have been regrouped).');
  return event;
}

async function nameOf(db: Db, userId: string | null): Promise<string> {
  if (!userId) return 'someone';
  const row = await db
    .selectFrom('users')
    .select('name')
    .where('id', '=', userId)
    .executeTakeFirst();
  return row?.name ?? 'a former member';
}

/**
 * Labels an event. Never overwrites silently: a label on an event already sorted needs the version
 * the caller saw (`expectedVersion`); an event leased to someone else is refused while the lease runs.
 */
export async function labelEvent(
  db: Db,
  project: ProjectsTable,
  actor: { id: string },
  eventId: string,
  body: LabelBody,
): Promise<void> {
  const event = await loadEvent(db, project.id, eventId);
  const now = new Date().toISOString();
  if (
    event.lease_holder &&
    event.lease_holder !== actor.id &&
    event.lease_until &&
    event.lease_until > now
  ) {
    throw new ApiError(
      'conflict',
      `${await nameOf(db, event.lease_holder)} is sorting this event right now; it comes back to the queue if they leave it.`,
    );
  }
  if (event.label !== null && body.expectedVersion !== event.label_version) {
    throw new ApiError(
      'conflict',
      `${await nameOf(db, event.sorted_by)} already sorted this event as ${event.species ?? event.label}. Your label was not saved; reload the event to change it.`,
      { current: { label: event.label, species: event.species, version: event.label_version } },
    );
  }
  if (
    body.label === 'animal' &&
    body.species &&
    !(await isKnownSpecies(db, project, body.species))
  ) {
    throw new ApiError(
      'validation_failed',
      `species: "${body.species}" is not in the project's list or the species catalogue.`,
    );
  }
  const clearing = body.label === 'unclassified';
  const isTarget = body.label === 'animal' && body.species === project.target_species_scientific;
  const sightings = await db
    .selectFrom('sightings')
    .select(['id', 'state'])
    .where('event_id', '=', eventId)
    .execute();
  if (!isTarget && sightings.some((s) => s.state !== 'open')) {
    throw new ApiError(
      'conflict',
      'Sightings of this event are already being identified; a curator must remove them before the label can change.',
    );
  }
  const after = {
    label: clearing ? null : body.label,
    species: clearing ? null : (body.species ?? null),
    animal_count: clearing ? null : body.label === 'animal' ? (body.count ?? 1) : null,
    sorted_by: clearing ? null : actor.id,
    sorted_at: clearing ? null : now,
  };
  await db.transaction().execute(async (trx) => {
    const updated = await trx
      .updateTable('events')
      .set({
        ...after,
        label_version: event.label_version + 1,
        lease_holder: null,
        lease_until: null,
      })
      .where('id', '=', eventId)
      .where('label_version', '=', event.label_version)
      .executeTakeFirst();
    if (Number(updated.numUpdatedRows) !== 1) {
      throw new ApiError(
        'conflict',
        'Someone changed this event at the same moment; your label was not saved. Reload it.',
      );
    }
    if (!isTarget && sightings.length)
      await trx.deleteFrom('sightings').where('event_id', '=', eventId).execute();
    await recordAudit(trx, {
      userId: actor.id,
      projectId: project.id,
      action: clearing ? 'clear-label' : event.label ? 'relabel' : 'label',
      entity: 'event',
      entityId: eventId,
      before: {
        label: event.label,
        species: event.species,
        count: event.animal_count,
        version: event.label_version,
      },
      after: {
        label: after.label,
        species: after.species,
        count: after.animal_count,
        removedSightings: isTarget ? 0 : sightings.length,
      },
    });
    if (after.label === 'human') {
      const photos = await trx
        .selectFrom('photos')
        .select('id')
        .where('event_id', '=', eventId)
        .execute();
      for (const p of photos) await enqueueJob(trx, 'blur', { photoId: p.id });
    }
  });
}

/** Labels many unsorted events at once; each event gets its own outcome. */
export async function labelBatch(
  db: Db,
  project: ProjectsTable,
  actor: { id: string },
  eventIds: string[],
  body: Omit<LabelBody, 'expectedVersion'>,
): Promise<{ id: string; ok: boolean; message?: string }[]> {
  const results: { id: string; ok: boolean; message?: string }[] = [];
  for (const id of eventIds) {
    try {
      await labelEvent(db, project, actor, id, body);
      results.push({ id, ok: true });
    } catch (err) {
      if (!(err instanceof ApiError)) throw err;
      results.push({ id, ok: false, message: err.message });
    }
  }
  return results;
}

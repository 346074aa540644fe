import { sql } from 'kysely';
import type { Db } from '../db/database';
import type { EventsTable } from '../db/schema/ingest.table';
import type { PhotoFlag } from '../../shared/ingest';
import { newId, nowIso } from './ids';
import { KEEP_OUT_OF_EVENTS } from './photo-flags';

interface GroupPhoto {
  id: string;
  taken_at: string;
  event_id: string | null;
}

/**
 * Splits time-ordered photos into independent events: a photo more than `intervalMinutes` after the
 * previous photo starts a new event; a gap of exactly the interval stays in the same event.
 */
export function groupByInterval<T extends { taken_at: string }>(
  photos: T[],
  intervalMinutes: number,
): T[][] {
  const limit = intervalMinutes * 60_000;
  const groups: T[][] = [];
  let previous = -Infinity;
  for (const photo of photos) {
    const t = Date.parse(photo.taken_at);
    if (groups.length === 0 || t - previous > limit) groups.push([]);
    groups[groups.length - 1]!.push(photo);
    previous = t;
  }
  return groups;
}

export function eligible(flags: string): boolean {
  const list = JSON.parse(flags) as PhotoFlag[];
  return !list.some((f) => KEEP_OUT_OF_EVENTS.includes(f));
}

type EventRow = Pick<
  EventsTable,
  | 'id'
  | 'start'
  | 'end'
  | 'photo_count'
  | 'label'
  | 'species'
  | 'animal_count'
  | 'sorted_by'
  | 'sorted_at'
>;

/**
 * A new event made by regrouping takes the label of the old event most of its photos came from:
 * labels describe what the photos show, so they follow the photos.
 */
function inheritedLabel(source: EventRow | undefined) {
  return {
    label: source?.label ?? null,
    species: source?.species ?? null,
    animal_count: source?.animal_count ?? null,
    sorted_by: source?.sorted_by ?? null,
    sorted_at: source?.sorted_at ?? null,
    label_version: source?.label ? 1 : 0,
    lease_holder: null,
    lease_until: null,
  };
}

function mostCommon(counts: Map<string, number>): string | undefined {
  return [...counts.entries()].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))[0]?.[0];
}

/**
 * Regroups every photo of one station (both cameras of a pair) into events. Events keep their ids
 * (and labels) where most of their photos stay together; sightings follow their best photo.
 */
export async function regroupStation(
  db: Db,
  projectId: string,
  stationId: string,
  intervalMinutes: number,
): Promise<void> {
  await db.transaction().execute(async (trx) => {
    const rows = await trx
      .selectFrom('photos')
      .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
      .select(['photos.id', 'photos.taken_at', 'photos.event_id', 'photos.flags'])
      .where('deployments.station_id', '=', stationId)
      .orderBy('photos.taken_at')
      .orderBy('photos.id')
      .execute();
    const placed = rows.filter(
      (r): r is typeof r & { taken_at: string } => r.taken_at !== null && eligible(r.flags),
    );
    const groups = groupByInterval<GroupPhoto>(placed, intervalMinutes);
    const existing: EventRow[] = await trx
      .selectFrom('events')
      .select([
        'id',
        'start',
        'end',
        'photo_count',
        'label',
        'species',
        'animal_count',
        'sorted_by',
        'sorted_at',
      ])
      .where('station_id', '=', stationId)
      .execute();
    const before = new Map(existing.map((e) => [e.id, e]));
    const unclaimed = new Set(before.keys());

    const assignment = new Map<string, string | null>();
    for (const r of rows) assignment.set(r.id, null);
    for (const group of groups) {
      const origins = new Map<string, number>();
      const votes = new Map<string, number>();
      for (const p of group) {
        if (!p.event_id) continue;
        origins.set(p.event_id, (origins.get(p.event_id) ?? 0) + 1);
        if (unclaimed.has(p.event_id)) votes.set(p.event_id, (votes.get(p.event_id) ?? 0) + 1);
      }
      const reuse = mostCommon(votes);
      const eventId = reuse ?? newId();
      const start = group[0]!.taken_at;
      const end = group[group.length - 1]!.taken_at;
      for (const p of group) assignment.set(p.id, eventId);
      if (reuse) {
        unclaimed.delete(reuse);
        const old = before.get(reuse)!;
        if (old.start !== start || old.end !== end || old.photo_count !== group.length) {
          await trx
            .updateTable('events')
            .set({ start, end, photo_count: group.length })
            .where('id', '=', reuse)
            .execute();
        }
      } else {
        await trx
          .insertInto('events')
          .values({
            id: eventId,
            project_id: projectId,
            station_id: stationId,
            start,
            end,
            photo_count: group.length,
            created_at: nowIso(),
            ...inheritedLabel(before.get(mostCommon(origins) ?? '')),
          })
          .execute();
      }
    }

    const changes = new Map<string | null, string[]>();
    for (const r of rows) {
      const target = assignment.get(r.id) ?? null;
      if (target !== r.event_id) changes.set(target, [...(changes.get(target) ?? []), r.id]);
    }
    for (const [eventId, ids] of changes) {
      for (let i = 0; i < ids.length; i += 500) {
        await trx
          .updateTable('photos')
          .set({ event_id: eventId })
          .where('id', 'in', ids.slice(i, i + 500))
          .execute();
      }
    }
    if (changes.size) {
      // Sightings follow their best photo into its new event before emptied events are removed.
      await sql`update sightings
        set event_id = (select event_id from photos where photos.id = sightings.best_photo_id)
        where event_id in (select id from events where station_id = ${stationId})
          and (select event_id from photos where photos.id = sightings.best_photo_id) is not null`.execute(
        trx,
      );
    }
    if (unclaimed.size) {
      await trx
        .deleteFrom('events')
        .where('id', 'in', [...unclaimed])
        .execute();
    }
  });
}

/** Regroups every station of a project (after the independence interval changes). */
export async function regroupProject(
  db: Db,
  projectId: string,
  intervalMinutes: number,
): Promise<void> {
  const stations = await db
    .selectFrom('stations')
    .select('id')
    .where('project_id', '=', projectId)
    .execute();
  for (const s of stations) await regroupStation(db, projectId, s.id, intervalMinutes);
}

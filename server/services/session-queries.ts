/** The queries a session is built from: stations, deployments, confirmed sightings, flank coverage. */
import type { SessionDefaults, SessionParameters } from '../../shared/analyses';
import { utcToWall } from '../../shared/zoned-time';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { coverageOf } from './individuals.service';

const DAY_MS = 86_400_000;
const CHUNK = 500;

/** A confirmed sighting of a catalogued individual, where and when its event happened. */
export interface CandidateSighting {
  id: string;
  flank: string;
  quality: string;
  individualId: string;
  eventId: string;
  stationId: string;
  time: number;
  start: string;
}

/** The session's stations (all of the project's when `ids` is null), by code. */
export async function sessionStations(db: Db, projectId: string, ids: string[] | null) {
  const rows = await db
    .selectFrom('stations')
    .select(['id', 'code', 'lat', 'lon'])
    .where('project_id', '=', projectId)
    .orderBy('code')
    .execute();
  if (!ids) return rows;
  const known = new Set(rows.map((r) => r.id));
  const missing = ids.filter((id) => !known.has(id));
  if (missing.length > 0) {
    throw new ApiError(
      'validation_failed',
      `${missing.length} station(s) chosen for the session are not in this project (${missing.slice(0, 3).join(', ')}).`,
    );
  }
  const wanted = new Set(ids);
  return rows.filter((r) => wanted.has(r.id));
}

/** Deployments of the stations, by station. */
export async function deploymentsOf(db: Db, stationIds: string[]) {
  const out = new Map<string, { start: string; end: string; lastWorking: string | null }[]>();
  for (let i = 0; i < stationIds.length; i += CHUNK) {
    const rows = await db
      .selectFrom('deployments')
      .select(['station_id', 'start', 'end', 'last_working'])
      .where('station_id', 'in', stationIds.slice(i, i + CHUNK))
      .execute();
    for (const r of rows) {
      const list = out.get(r.station_id) ?? [];
      list.push({ start: r.start, end: r.end, lastWorking: r.last_working });
      out.set(r.station_id, list);
    }
  }
  return out;
}

/** Confirmed sightings of active individuals whose event starts within the session. */
export async function candidateSightings(
  db: Db,
  projectId: string,
  params: SessionParameters,
  stationIds: Set<string>,
): Promise<CandidateSighting[]> {
  const start = Date.parse(params.start);
  const end = Date.parse(params.end);
  // Stored times may carry milliseconds, so the SQL range is loose and the exact test is below.
  const rows = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('individuals', 'individuals.id', 'sightings.individual_id')
    .select([
      'sightings.id',
      'sightings.flank',
      'sightings.quality',
      'sightings.individual_id',
      'events.id as eventId',
      'events.station_id',
      'events.start',
    ])
    .where('sightings.project_id', '=', projectId)
    .where('sightings.state', '=', 'confirmed')
    .where('individuals.status', '=', 'active')
    .where('events.start', '>=', new Date(start - DAY_MS).toISOString())
    .where('events.start', '<', new Date(end + DAY_MS).toISOString())
    .execute();
  return rows
    .map((r) => ({
      id: r.id,
      flank: r.flank,
      quality: r.quality,
      individualId: r.individual_id ?? '',
      eventId: r.eventId,
      stationId: r.station_id,
      time: Date.parse(r.start),
      start: r.start,
    }))
    .filter((s) => s.time >= start && s.time < end && stationIds.has(s.stationId))
    .sort((a, b) => a.time - b.time || a.id.localeCompare(b.id));
}

/** Individuals known from both flanks: the same coverage the Catalogue shows. */
export async function bothFlankIndividuals(db: Db, projectId: string): Promise<Set<string>> {
  const seen = await db
    .selectFrom('sightings')
    .select(['individual_id', 'flank'])
    .where('project_id', '=', projectId)
    .where('state', '=', 'confirmed')
    .where('individual_id', 'is not', null)
    .groupBy(['individual_id', 'flank'])
    .execute();
  const refs = await db
    .selectFrom('reference_photos')
    .innerJoin('individuals', 'individuals.id', 'reference_photos.individual_id')
    .select(['reference_photos.individual_id', 'reference_photos.flank'])
    .where('individuals.project_id', '=', projectId)
    .groupBy(['reference_photos.individual_id', 'reference_photos.flank'])
    .execute();
  const flanks = new Map<string, string[]>();
  for (const r of [...seen, ...refs]) {
    if (!r.individual_id) continue;
    flanks.set(r.individual_id, [...(flanks.get(r.individual_id) ?? []), r.flank]);
  }
  const out = new Set<string>();
  for (const [individual, list] of flanks) {
    const c = coverageOf(list);
    if (c.left && c.right) out.add(individual);
  }
  return out;
}

/** The form's starting point: the deployments' span in local days, occasion length, stations. */
export async function sessionDefaults(db: Db, project: ProjectsTable): Promise<SessionDefaults> {
  const span = await db
    .selectFrom('deployments')
    .select((eb) => [eb.fn.min('start').as('first'), eb.fn.max('end').as('last')])
    .where('project_id', '=', project.id)
    .executeTakeFirst();
  const stations = await db
    .selectFrom('stations')
    .select(['id', 'code', 'name'])
    .where('project_id', '=', project.id)
    .orderBy('code')
    .execute();
  const day = (iso: string | null | undefined) =>
    iso ? utcToWall(iso, project.timezone).slice(0, 10) : null;
  return {
    timezone: project.timezone,
    occasionHours: project.occasion_hours,
    firstDay: day(span?.first),
    lastDay: day(span?.last),
    stations,
  };
}

/**
 * Builds a closed session from the project's own catalogue: which confirmed sightings count (flank
 * policy, photo quality, stations, dates), the effort grid from deployments, the capture histories
 * and the detection array, through the estimation library's buildSessionData.
 */
import {
  MAX_OCCASIONS,
  qualitiesAtLeast,
  type FlankPolicy,
  type SessionInputs,
  type SessionParameters,
  type SessionParamsInput,
  type SessionPreview,
  type SessionSummary,
} from '../../shared/analyses';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { buildSessionData, type SessionData } from '../estimation';
import { freezeHash } from './session-freeze';
import { localPlane } from './geo';
import { coverageOf } from './individuals.service';

/** Cells of the individual × occasion × station array the library may allocate at once. */
const MAX_DETECTION_CELLS = 5_000_000;
const DAY_MS = 86_400_000;
const CHUNK = 500;

/** A confirmed sighting of a catalogued individual, where and when its event happened. */
interface CandidateSighting {
  id: string;
  flank: string;
  quality: string;
  individualId: string;
  eventId: string;
  stationId: string;
  time: number;
  start: string;
}

/** Fills in defaults and normalises times to UTC (what an analysis stores and re-runs with). */
export function normaliseSession(
  project: ProjectsTable,
  input: SessionParamsInput,
): SessionParameters {
  const iso = (t: string) => new Date(Date.parse(t)).toISOString().replace('.000Z', 'Z');
  return {
    start: iso(input.start),
    end: iso(input.end),
    stationIds: input.stationIds ? [...new Set(input.stationIds)].sort() : null,
    occasionHours: input.occasionHours ?? project.occasion_hours,
    flankPolicy: input.flankPolicy ?? 'left',
    minQuality: input.minQuality ?? 'fair',
    closurePeriodDays: input.closurePeriodDays ?? 90,
  };
}

async function sessionStations(db: Db, projectId: string, ids: string[] | null) {
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

async function deploymentsOf(db: Db, stationIds: string[]) {
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
async function candidateSightings(
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
async function bothFlankIndividuals(db: Db, projectId: string): Promise<Set<string>> {
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

/** True when a sighting passes the flank policy. */
export function passesFlank(policy: FlankPolicy, flank: string, linked: boolean): boolean {
  if (policy === 'left') return flank === 'left' || flank === 'both';
  if (policy === 'right') return flank === 'right' || flank === 'both';
  if (policy === 'both-linked') return linked;
  return true;
}

/** The session's inputs, summary and warnings, and its freeze hash. */
export async function buildSession(
  db: Db,
  project: ProjectsTable,
  params: SessionParameters,
): Promise<SessionPreview> {
  const stations = await sessionStations(db, project.id, params.stationIds);
  if (stations.length === 0)
    throw new ApiError('validation_failed', 'This project has no stations to build a session on.');
  const stepMs = params.occasionHours * 3_600_000;
  const startMs = Date.parse(params.start);
  const T = Math.ceil((Date.parse(params.end) - startMs) / stepMs);
  if (T > MAX_OCCASIONS) {
    throw new ApiError(
      'validation_failed',
      `This session would have ${T} occasions; at most ${MAX_OCCASIONS} are allowed. Use longer occasions.`,
    );
  }
  const deployments = await deploymentsOf(
    db,
    stations.map((s) => s.id),
  );
  const candidates = await candidateSightings(
    db,
    project.id,
    params,
    new Set(stations.map((s) => s.id)),
  );
  const linked =
    params.flankPolicy === 'both-linked'
      ? await bothFlankIndividuals(db, project.id)
      : new Set<string>();
  const allowed = new Set<string>(qualitiesAtLeast(params.minQuality));
  const leftOut = { flank: 0, quality: 0, offEffort: 0 };
  const kept = candidates.filter((s) => {
    if (!passesFlank(params.flankPolicy, s.flank, linked.has(s.individualId))) leftOut.flank++;
    else if (!allowed.has(s.quality)) leftOut.quality++;
    else return true;
    return false;
  });
  const individualsSeen = new Set(kept.map((s) => s.individualId)).size;
  if (individualsSeen * T * stations.length > MAX_DETECTION_CELLS) {
    throw new ApiError(
      'validation_failed',
      `${individualsSeen} individuals × ${T} occasions × ${stations.length} stations is too large a detection array; use longer occasions or fewer stations.`,
    );
  }
  // One detection per individual and event: two sightings of one animal in one event are one record.
  const byEvent = new Map<string, CandidateSighting>();
  for (const s of kept) {
    const key = `${s.individualId}:${s.eventId}`;
    if (!byEvent.has(key)) byEvent.set(key, s);
  }
  const data = buildSessionData({
    sessionStart: params.start,
    sessionEnd: params.end,
    occasionHours: params.occasionHours,
    stations: stations.map((s) => ({ id: s.id, deployments: deployments.get(s.id) ?? [] })),
    detections: [...byEvent.values()].map((s) => ({
      individualId: s.individualId,
      stationId: s.stationId,
      time: s.start,
    })),
    closurePeriodDays: params.closurePeriodDays,
  });
  const stationIndex = new Map(stations.map((s, k) => [s.id, k]));
  const used = kept.filter((s) => {
    const k = stationIndex.get(s.stationId) ?? -1;
    const on = (data.effort[k]?.[Math.floor((s.time - startMs) / stepMs)] ?? 0) > 0;
    if (!on) leftOut.offEffort++;
    return on;
  });
  const inputs = await sessionInputs(db, params, stations, data, used);
  return {
    inputs,
    hash: freezeHash(inputs),
    summary: summarise(inputs, leftOut),
    warnings: sessionWarnings(data, inputs, params),
  };
}

async function sessionInputs(
  db: Db,
  params: SessionParameters,
  stations: { id: string; code: string; lat: number; lon: number }[],
  data: SessionData,
  used: CandidateSighting[],
): Promise<SessionInputs> {
  const plane = localPlane(stations);
  const codes = new Map<string, string>();
  for (let i = 0; i < data.individuals.length; i += CHUNK) {
    const rows = await db
      .selectFrom('individuals')
      .select(['id', 'code'])
      .where('id', 'in', data.individuals.slice(i, i + CHUNK))
      .execute();
    for (const r of rows) codes.set(r.id, r.code ?? r.id);
  }
  const detections: SessionInputs['detections'] = [];
  data.detections.forEach((byOccasion, i) =>
    byOccasion.forEach((row, s) =>
      row.forEach((count, k) => {
        if (count > 0) detections.push([i, s, k, count]);
      }),
    ),
  );
  const round = (v: number, digits: number) => Number(v.toFixed(digits));
  return {
    parameters: params,
    occasions: data.occasions.map((o) => ({
      start: o.start.replace('.000Z', 'Z'),
      end: o.end.replace('.000Z', 'Z'),
    })),
    stations: stations.map((s) => ({
      id: s.id,
      code: s.code,
      lat: s.lat,
      lon: s.lon,
      x: round(plane.get(s.id)?.x ?? 0, 2),
      y: round(plane.get(s.id)?.y ?? 0, 2),
    })),
    individuals: data.individuals.map((id) => ({ id, code: codes.get(id) ?? id })),
    // Six decimals of a day is under a tenth of a second: enough, and stable to re-serialise.
    effort: data.effort.map((row) => row.map((v) => round(v, 6))),
    histories: data.histories.map((row) => row.join('')),
    detections,
    sightingIds: used.map((s) => s.id).sort(),
  };
}

function summarise(inputs: SessionInputs, leftOut: SessionSummary['leftOut']): SessionSummary {
  const total = inputs.effort.reduce((a, row) => a + row.reduce((b, v) => b + v, 0), 0);
  return {
    occasions: inputs.occasions.length,
    stations: inputs.stations.length,
    activeStations: inputs.effort.filter((row) => row.some((v) => v > 0)).length,
    individuals: inputs.individuals.length,
    detections: inputs.detections.reduce((a, d) => a + d[3], 0),
    sightings: inputs.sightingIds.length,
    effortDays: Number(total.toFixed(3)),
    leftOut,
  };
}

function sessionWarnings(
  data: SessionData,
  inputs: SessionInputs,
  params: SessionParameters,
): string[] {
  const out = data.warnings.map((w) => {
    // The library names stations by id; people know them by code.
    let text = w;
    for (const s of inputs.stations) text = text.split(s.id).join(s.code);
    return text;
  });
  if (inputs.individuals.length === 0) {
    out.push(
      'No confirmed sighting passes the session’s dates, stations, flank policy and photo quality, so there is nothing to estimate.',
    );
  }
  if (params.flankPolicy === 'all') {
    out.push(
      'All confirmed sightings are used whatever flank they show: an animal catalogued twice (once per flank) counts as two and inflates the estimate.',
    );
  }
  return out;
}

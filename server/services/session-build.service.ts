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
import {
  bothFlankIndividuals,
  candidateSightings,
  deploymentsOf,
  sessionStations,
  type CandidateSighting,
} from './session-queries';

/** Cells of the individual × occasion × station array the library may allocate at once. */
const MAX_DETECTION_CELLS = 5_000_000;
const CHUNK = 500;

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
  // Individuals in display-code order, as people read the catalogue.
  const order = data.individuals
    .map((id, i) => ({ i, code: codes.get(id) ?? id }))
    .sort((a, b) => a.code.localeCompare(b.code, 'en', { numeric: true }) || a.i - b.i);
  const detections: SessionInputs['detections'] = [];
  order.forEach(({ i }, row) =>
    data.detections[i]?.forEach((cells, s) =>
      cells.forEach((count, k) => {
        if (count > 0) detections.push([row, s, k, count]);
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
    individuals: order.map(({ i, code }) => ({ id: data.individuals[i] ?? '', code })),
    // Six decimals of a day is under a tenth of a second: enough, and stable to re-serialise.
    effort: data.effort.map((row) => row.map((v) => round(v, 6))),
    histories: order.map(({ i }) => (data.histories[i] ?? []).join('')),
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

/**
 * Capture histories and effort from generic inputs (no database): the effort grid (station ×
 * occasion, days active; a station is active while at least one of its cameras works; 0 means
 * "not working", never "not seen"), the capture-history matrix, and the detection array.
 */

/** A camera deployment: working from `start` until `lastWorking` (if it failed early) or `end`. */
export interface DeploymentInput {
  start: string;
  end: string;
  lastWorking?: string | null;
}

/** Inputs of buildSessionData; times are ISO 8601 UTC strings. */
export interface SessionInput {
  sessionStart: string;
  sessionEnd: string;
  occasionHours: number;
  stations: { id: string; x?: number; y?: number; deployments: DeploymentInput[] }[];
  detections: { individualId: string; stationId: string; time: string }[];
  /** Longest session (days) over which the species can be treated as closed; warns when exceeded. */
  closurePeriodDays?: number;
}

/** Effort, histories and detections for one session. */
export interface SessionData {
  occasions: { start: string; end: string }[];
  stations: string[];
  individuals: string[];
  /** effort[k][s]: days station k was active during occasion s. */
  effort: number[][];
  /** histories[i][s]: 1 if individual i was detected anywhere during occasion s. */
  histories: number[][];
  /** detections[i][s][k]: number of detections of individual i at station k during occasion s. */
  detections: number[][][];
  warnings: string[];
}

const DAY_MS = 86_400_000;

function parseTime(value: string, what: string): number {
  const t = Date.parse(value);
  if (Number.isNaN(t)) throw new RangeError(`${what} (${value}) is not a valid ISO 8601 time.`);
  return t;
}

/** Merge working intervals so overlapping cameras at one station are not counted twice. */
function union(intervals: [number, number][]): [number, number][] {
  const sorted = intervals.filter(([a, b]) => b > a).sort((p, q) => p[0] - q[0]);
  const out: [number, number][] = [];
  for (const [a, b] of sorted) {
    const last = out[out.length - 1];
    if (last && a <= last[1]) last[1] = Math.max(last[1], b);
    else out.push([a, b]);
  }
  return out;
}

/** Build the effort grid, capture histories and detection array for a session. */
export function buildSessionData(input: SessionInput): SessionData {
  const start = parseTime(input.sessionStart, 'sessionStart');
  const end = parseTime(input.sessionEnd, 'sessionEnd');
  if (!(end > start)) throw new RangeError('The session must end after it starts.');
  if (!(input.occasionHours > 0)) throw new RangeError('occasionHours must be positive.');
  const step = input.occasionHours * 3_600_000;
  const T = Math.ceil((end - start) / step);
  const occ = Array.from({ length: T }, (_, s): [number, number] => [
    start + s * step,
    Math.min(end, start + (s + 1) * step),
  ]);
  const working = input.stations.map((st) =>
    union(
      st.deployments.map((d, i): [number, number] => {
        const a = parseTime(d.start, `Deployment ${i + 1} at ${st.id} start`);
        const b = parseTime(d.lastWorking ?? d.end, `Deployment ${i + 1} at ${st.id} end`);
        return [a, Math.min(b, parseTime(d.end, `Deployment ${i + 1} at ${st.id} end`))];
      }),
    ),
  );
  const effort = working.map((intervals) =>
    occ.map(
      ([a, b]) =>
        intervals.reduce((sum, [c, d]) => sum + Math.max(0, Math.min(b, d) - Math.max(a, c)), 0) /
        DAY_MS,
    ),
  );
  const stationIndex = new Map(input.stations.map((s, k) => [s.id, k]));
  const individuals = [...new Set(input.detections.map((d) => d.individualId))].sort();
  const indIndex = new Map(individuals.map((id, i) => [id, i]));
  const detections = individuals.map(() =>
    occ.map(() => new Array<number>(input.stations.length).fill(0)),
  );
  let outside = 0;
  let unknown = 0;
  let offEffort = 0;
  for (const d of input.detections) {
    const k = stationIndex.get(d.stationId);
    const t = parseTime(d.time, `Detection time of ${d.individualId}`);
    if (k === undefined) {
      unknown++;
      continue;
    }
    if (t < start || t >= end) {
      outside++;
      continue;
    }
    const s = Math.floor((t - start) / step);
    if (!(effort[k][s] > 0)) {
      offEffort++;
      continue;
    }
    detections[indIndex.get(d.individualId) ?? 0][s][k]++;
  }
  const warnings = sessionWarnings(
    input,
    { outside, unknown, offEffort },
    (end - start) / DAY_MS,
    effort,
  );
  const keep = individuals.map((_, i) => detections[i].some((row) => row.some((v) => v > 0)));
  return {
    occasions: occ.map(([a, b]) => ({
      start: new Date(a).toISOString(),
      end: new Date(b).toISOString(),
    })),
    stations: input.stations.map((s) => s.id),
    individuals: individuals.filter((_, i) => keep[i]),
    effort,
    histories: detections
      .filter((_, i) => keep[i])
      .map((rows) => rows.map((row) => (row.some((v) => v > 0) ? 1 : 0))),
    detections: detections.filter((_, i) => keep[i]),
    warnings,
  };
}

function sessionWarnings(
  input: SessionInput,
  counts: { outside: number; unknown: number; offEffort: number },
  days: number,
  effort: number[][],
): string[] {
  const out: string[] = [];
  if (counts.offEffort > 0) {
    out.push(
      `${counts.offEffort} detection(s) fell at a station and occasion with no working camera and were left out; check the deployment dates and clock fixes.`,
    );
  }
  if (counts.outside > 0)
    out.push(`${counts.outside} detection(s) fell outside the session and were left out.`);
  if (counts.unknown > 0)
    out.push(
      `${counts.unknown} detection(s) were at stations not in this session and were left out.`,
    );
  if (input.closurePeriodDays !== undefined && days > input.closurePeriodDays) {
    out.push(
      `The session lasts ${days.toFixed(0)} days, longer than the ${input.closurePeriodDays}-day period over which this species can be treated as closed; births, deaths and movement may bias the estimate.`,
    );
  }
  const idle = input.stations.filter((_, k) => effort[k].every((e) => e === 0)).map((s) => s.id);
  if (idle.length > 0)
    out.push(`Station(s) ${idle.join(', ')} had no working camera during the session.`);
  return out;
}

/** SECR input from session data: stations with coordinates become traps and effort becomes usage. */
export function secrInputFromSession(
  data: SessionData,
  stations: readonly { id: string; x?: number; y?: number }[],
  detector: 'proximity' | 'count',
): {
  traps: { id: string; x: number; y: number }[];
  occasions: number;
  detector: 'proximity' | 'count';
  captures: { animal: string; occasion: number; trap: string }[];
  usage: number[][];
} {
  const where = new Map(stations.map((s) => [s.id, s]));
  const traps = data.stations.map((id) => {
    const s = where.get(id);
    if (s?.x === undefined || s.y === undefined)
      throw new RangeError(`Station ${id} has no coordinates; SECR needs x and y in metres.`);
    return { id, x: s.x, y: s.y };
  });
  const captures: { animal: string; occasion: number; trap: string }[] = [];
  data.detections.forEach((byOccasion, i) =>
    byOccasion.forEach((row, s) =>
      row.forEach((count, k) => {
        for (let c = 0; c < count; c++)
          captures.push({ animal: data.individuals[i], occasion: s + 1, trap: traps[k].id });
      }),
    ),
  );
  return { traps, occasions: data.occasions.length, detector, captures, usage: data.effort };
}

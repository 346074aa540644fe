import Papa from 'papaparse';
import {
  createStationBodySchema,
  type CreateStationBody,
  type StationImportReport,
  type StationImportRowReport,
  type StationView,
} from '../../shared/stations';
import { roleAtLeast, type ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import type { StationsTable } from '../db/schema/ingest.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { cameraDays, roundDays, stationDays } from './effort';
import { distanceMetres, generalise } from './geo';
import { newId, nowIso } from './ids';
import { publicPrecisionOf } from './projects.service';

/** The precision a role may see coordinates at: exact for ecologists, else the project's public one. */
export function precisionFor(
  project: ProjectsTable,
  role: ProjectRole | null,
  viaAdmin = false,
): number | null | undefined {
  return viaAdmin || roleAtLeast(role, 'ecologist') ? undefined : publicPrecisionOf(project);
}

/** Stations with effort figures, coordinates as the caller's role may see them. */
export async function listStations(
  db: Db,
  project: ProjectsTable,
  precision: number | null | undefined,
): Promise<StationView[]> {
  const stations = await db
    .selectFrom('stations')
    .selectAll()
    .where('project_id', '=', project.id)
    .orderBy('code')
    .execute();
  const deployments = await db
    .selectFrom('deployments')
    .select(['station_id', 'start', 'end', 'last_working'])
    .where('project_id', '=', project.id)
    .execute();
  return stations.map((s) => {
    const own = deployments.filter((d) => d.station_id === s.id);
    const where = generalise(s.lat, s.lon, precision);
    return {
      id: s.id,
      code: s.code,
      name: s.name,
      lat: where.lat,
      lon: where.lon,
      coordinatePrecision: where.precision,
      coordinatesWithheld: where.withheld,
      notes: s.notes,
      deployments: own.length,
      cameraDays: roundDays(own.reduce((sum, d) => sum + cameraDays(d), 0)),
      stationDays: roundDays(stationDays(own)),
    };
  });
}

async function codeTaken(
  db: Db,
  projectId: string,
  code: string,
  exceptId?: string,
): Promise<boolean> {
  let q = db
    .selectFrom('stations')
    .select('id')
    .where('project_id', '=', projectId)
    .where('code', '=', code);
  if (exceptId) q = q.where('id', '!=', exceptId);
  return Boolean(await q.executeTakeFirst());
}

/** Creates a station; codes are unique within a project. */
export async function createStation(
  db: Db,
  projectId: string,
  body: CreateStationBody,
  actorId: string,
): Promise<StationsTable> {
  if (await codeTaken(db, projectId, body.code)) {
    throw new ApiError('conflict', `Station code ${body.code} is already used in this project.`);
  }
  const row: StationsTable = { id: newId(), project_id: projectId, ...body, created_at: nowIso() };
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('stations').values(row).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'create',
      entity: 'station',
      entityId: row.id,
      after: body,
    });
  });
  return row;
}

/** Changes a station's code, name, position or notes. */
export async function updateStation(
  db: Db,
  projectId: string,
  stationId: string,
  patch: Partial<CreateStationBody>,
  actorId: string,
): Promise<void> {
  const before = await db
    .selectFrom('stations')
    .selectAll()
    .where('id', '=', stationId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!before) throw new ApiError('not_found', 'This station was not found.');
  if (patch.code && (await codeTaken(db, projectId, patch.code, stationId))) {
    throw new ApiError('conflict', `Station code ${patch.code} is already used in this project.`);
  }
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('stations').set(patch).where('id', '=', stationId).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'update',
      entity: 'station',
      entityId: stationId,
      before,
      after: patch,
    });
  });
}

const HEADER_ALIASES: Record<string, keyof CreateStationBody> = {
  code: 'code',
  station: 'code',
  stationcode: 'code',
  locationid: 'code',
  name: 'name',
  locationname: 'name',
  lat: 'lat',
  latitude: 'lat',
  decimallatitude: 'lat',
  lon: 'lon',
  lng: 'lon',
  long: 'lon',
  longitude: 'lon',
  decimallongitude: 'lon',
  notes: 'notes',
  comments: 'notes',
};

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  return sorted[Math.floor(sorted.length / 2)] ?? 0;
}

/** True when swapping a row's latitude and longitude brings it close to the other stations. */
function looksSwapped(
  lat: number,
  lon: number,
  centre: { lat: number; lon: number } | null,
): boolean {
  if (Math.abs(lat) > 90 && Math.abs(lon) <= 90) return true;
  if (!centre) return false;
  const asGiven = distanceMetres(lat, lon, centre.lat, centre.lon);
  const swapped = distanceMetres(lon, lat, centre.lat, centre.lon);
  return asGiven > 50_000 && swapped < 50_000;
}

/**
 * Imports stations from CSV text. Every row is checked (missing code, bad or swapped coordinates,
 * duplicate codes in the file or the project); nothing is imported unless every row is clean.
 */
export async function importStationsCsv(
  db: Db,
  projectId: string,
  csv: string,
  actorId: string,
  dryRun: boolean,
): Promise<StationImportReport> {
  const parsed = Papa.parse<Record<string, string>>(csv.replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
    transformHeader: (h) =>
      HEADER_ALIASES[
        h
          .trim()
          .toLowerCase()
          .replace(/[\s_-]/g, '')
      ] ?? h.trim(),
  });
  const fields = parsed.meta.fields ?? [];
  for (const needed of ['code', 'lat', 'lon']) {
    if (!fields.includes(needed)) {
      throw new ApiError(
        'validation_failed',
        `The CSV needs a "${needed}" column (found: ${fields.join(', ') || 'none'}).`,
      );
    }
  }
  const existing = await db
    .selectFrom('stations')
    .select(['code', 'lat', 'lon'])
    .where('project_id', '=', projectId)
    .execute();
  const numeric = parsed.data
    .map((r) => ({ lat: Number(r['lat']), lon: Number(r['lon']) }))
    .filter((p) => Number.isFinite(p.lat) && Number.isFinite(p.lon) && Math.abs(p.lat) <= 90);
  const reference = [...existing, ...numeric];
  const centre =
    reference.length >= 3
      ? { lat: median(reference.map((p) => p.lat)), lon: median(reference.map((p) => p.lon)) }
      : null;
  const taken = new Set(existing.map((s) => s.code));
  const seen = new Map<string, number>();
  const problems: StationImportRowReport[] = [];
  const rows: CreateStationBody[] = [];

  parsed.data.forEach((raw, index) => {
    const rowNumber = index + 2;
    const rowProblems: string[] = [];
    const code = (raw['code'] ?? '').trim();
    const latText = (raw['lat'] ?? '').trim();
    const lonText = (raw['lon'] ?? '').trim();
    const lat = latText === '' ? NaN : Number(latText.replace(',', '.'));
    const lon = lonText === '' ? NaN : Number(lonText.replace(',', '.'));
    if (!code) rowProblems.push('The station code is missing.');
    if (!Number.isFinite(lat) || !Number.isFinite(lon)) {
      rowProblems.push(`The coordinates "${latText}", "${lonText}" are not decimal degrees.`);
    } else if (looksSwapped(lat, lon, centre)) {
      rowProblems.push(
        'Latitude and longitude look swapped (the point lands far from the other stations).',
      );
    } else {
      const result = createStationBodySchema.safeParse({
        code,
        name: raw['name'] ?? '',
        lat,
        lon,
        notes: raw['notes'] ?? '',
      });
      if (!result.success) rowProblems.push(...result.error.issues.map((i) => i.message));
      else rows.push(result.data);
    }
    if (code && taken.has(code))
      rowProblems.push(`Station ${code} already exists in this project.`);
    if (code && seen.has(code))
      rowProblems.push(`Code ${code} is also used on row ${seen.get(code)}.`);
    if (code && !seen.has(code)) seen.set(code, rowNumber);
    if (rowProblems.length)
      problems.push({ row: rowNumber, code: code || null, problems: rowProblems });
  });
  for (const err of parsed.errors) {
    problems.push({
      row: (err.row ?? 0) + 2,
      code: null,
      problems: [`CSV format: ${err.message}`],
    });
  }
  if (parsed.data.length === 0)
    problems.push({ row: 1, code: null, problems: ['The file has no station rows.'] });

  const report: StationImportReport = { imported: 0, rows: parsed.data.length, problems, dryRun };
  if (problems.length || dryRun) return report;
  await db.transaction().execute(async (trx) => {
    for (const body of rows) {
      await trx
        .insertInto('stations')
        .values({ id: newId(), project_id: projectId, ...body, created_at: nowIso() })
        .execute();
    }
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'import',
      entity: 'station',
      after: { count: rows.length },
    });
  });
  return { ...report, imported: rows.length };
}

import {
  PUBLIC_PRECISION,
  type Boundary,
  type CreateProjectBody,
  type ProjectDetail,
  type ProjectListItem,
  type SensitivityCategory,
  type UpdateProjectBody,
} from '../../shared/projects';
import { roleAtLeast, type ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { snapToGrid } from './geo';
import { newId, nowIso } from './ids';

/** Public coordinate precision of a project in degrees; null = withheld, undefined = exact. */
export function publicPrecisionOf(
  row: Pick<ProjectsTable, 'sensitivity'>,
): number | null | undefined {
  return PUBLIC_PRECISION[row.sensitivity as SensitivityCategory];
}

/**
 * The study-area boundary as a role may see it: exact, with every vertex snapped to the public
 * grid (repeated vertices dropped), or withheld.
 */
export function boundaryFor(
  geojson: string | null,
  precision: number | null | undefined,
): Boundary | null {
  if (!geojson || precision === null) return null;
  const boundary = JSON.parse(geojson) as Boundary;
  if (precision === undefined) return boundary;
  const ring = (positions: [number, number][]) => {
    const out: [number, number][] = [];
    for (const [lon, lat] of positions) {
      const p: [number, number] = [snapToGrid(lon, precision), snapToGrid(lat, precision)];
      const last = out.at(-1);
      if (!last || last[0] !== p[0] || last[1] !== p[1]) out.push(p);
    }
    // A ring that collapses to a point or a line is no shape at all: keep it closed and valid.
    while (out.length < 4) out.push(out[0]!);
    return out;
  };
  return boundary.type === 'Polygon'
    ? { type: 'Polygon', coordinates: boundary.coordinates.map(ring) }
    : { type: 'MultiPolygon', coordinates: boundary.coordinates.map((poly) => poly.map(ring)) };
}

/** The members' view of a project. */
export function toProjectDetail(row: ProjectsTable, role: ProjectRole | null): ProjectDetail {
  const precision = publicPrecisionOf(row);
  return {
    slug: row.slug,
    name: row.name,
    description: row.description,
    targetSpeciesScientific: row.target_species_scientific,
    targetSpeciesCommon: row.target_species_common,
    timezone: row.timezone,
    independenceMinutes: row.independence_minutes,
    occasionHours: row.occasion_hours,
    reviewersPerSighting: row.reviewers_per_sighting === 1 ? 1 : 2,
    sensitivity: row.sensitivity as SensitivityCategory,
    publicPrecision: precision === undefined ? null : precision,
    sensitivityReviewDate: row.sensitivity_review_date,
    codePrefix: row.code_prefix,
    boundary: boundaryFor(
      row.boundary_geojson,
      roleAtLeast(role, 'ecologist') ? undefined : precision,
    ),
    tileUrl: row.tile_url,
    gpsToleranceM: row.gps_tolerance_m,
    humanRetentionDays: row.human_retention_days,
    createdAt: row.created_at,
    role,
  };
}

/** Projects the user belongs to; admins see every project (with their role where they have one). */
export async function listProjectsFor(db: Db, user: Express.User): Promise<ProjectListItem[]> {
  const rows = await db
    .selectFrom('projects')
    .leftJoin('memberships', (join) =>
      join
        .onRef('memberships.project_id', '=', 'projects.id')
        .on('memberships.user_id', '=', user.id),
    )
    .select(['projects.slug', 'projects.name', 'memberships.role'])
    .orderBy('projects.name')
    .execute();
  return rows
    .filter((r) => r.role !== null || user.isAdmin)
    .map((r) => ({ slug: r.slug, name: r.name, role: (r.role as ProjectRole | null) ?? null }));
}

const COLUMN: Record<keyof UpdateProjectBody, keyof ProjectsTable> = {
  name: 'name',
  description: 'description',
  targetSpeciesScientific: 'target_species_scientific',
  targetSpeciesCommon: 'target_species_common',
  timezone: 'timezone',
  independenceMinutes: 'independence_minutes',
  occasionHours: 'occasion_hours',
  reviewersPerSighting: 'reviewers_per_sighting',
  sensitivity: 'sensitivity',
  sensitivityReviewDate: 'sensitivity_review_date',
  codePrefix: 'code_prefix',
  boundary: 'boundary_geojson',
  tileUrl: 'tile_url',
  gpsToleranceM: 'gps_tolerance_m',
  humanRetentionDays: 'human_retention_days',
};

/** Creates a project; the slug must be new. */
export async function createProject(
  db: Db,
  input: CreateProjectBody,
  actorId: string,
): Promise<ProjectsTable> {
  const taken = await db
    .selectFrom('projects')
    .select('id')
    .where('slug', '=', input.slug)
    .executeTakeFirst();
  if (taken)
    throw new ApiError('conflict', `The slug "${input.slug}" is already used by another project.`);
  const row: ProjectsTable = {
    id: newId(),
    slug: input.slug,
    name: input.name,
    description: input.description,
    target_species_scientific: input.targetSpeciesScientific,
    target_species_common: input.targetSpeciesCommon,
    timezone: input.timezone,
    independence_minutes: input.independenceMinutes,
    occasion_hours: input.occasionHours,
    reviewers_per_sighting: input.reviewersPerSighting,
    sensitivity: input.sensitivity,
    sensitivity_review_date: input.sensitivityReviewDate,
    code_prefix: input.codePrefix,
    code_next: 1,
    created_at: nowIso(),
    created_by: actorId,
    boundary_geojson: input.boundary ? JSON.stringify(input.boundary) : null,
    tile_url: input.tileUrl,
    gps_tolerance_m: input.gpsToleranceM,
    human_retention_days: input.humanRetentionDays,
    last_digest_at: null,
  };
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('projects').values(row).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId: row.id,
      action: 'create',
      entity: 'project',
      entityId: row.id,
      after: input,
    });
  });
  return row;
}

/** Changes project settings and records the before/after in the audit log. */
export async function updateProject(
  db: Db,
  project: ProjectsTable,
  patch: UpdateProjectBody,
  actorId: string,
): Promise<ProjectsTable> {
  const set: Partial<Record<keyof ProjectsTable, unknown>> = {};
  const before: Partial<Record<string, unknown>> = {};
  for (const [key, value] of Object.entries(patch) as [keyof UpdateProjectBody, unknown][]) {
    if (value === undefined) continue;
    set[COLUMN[key]] = key === 'boundary' && value !== null ? JSON.stringify(value) : value;
    before[key] = project[COLUMN[key]];
  }
  if (Object.keys(set).length === 0) return project;
  return db.transaction().execute(async (trx) => {
    await trx
      .updateTable('projects')
      .set(set as Partial<ProjectsTable>)
      .where('id', '=', project.id)
      .execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'update-settings',
      entity: 'project',
      entityId: project.id,
      before,
      after: patch,
    });
    return trx
      .selectFrom('projects')
      .selectAll()
      .where('id', '=', project.id)
      .executeTakeFirstOrThrow();
  });
}

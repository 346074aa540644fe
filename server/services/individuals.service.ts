import type { CatalogueEntry, FlankCoverage, ReferencePhotoView } from '../../shared/identify';
import type { Db } from '../db/database';
import type { IndividualsTable } from '../db/schema/identify.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { queueMissingPatternWork } from './pattern.service';
import { recordAudit } from './audit.service';
import { bumpCatalogue } from './catalogue-cache';
import { newId, nowIso } from './ids';

/** Description a reviewer gives a new individual. */
export interface IndividualDescription {
  nickname: string | null;
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
}

/** The reference flank a sighting's flank gives its best photo. */
export function referenceFlank(flank: string): 'left' | 'right' | 'other' {
  return flank === 'left' || flank === 'right' ? flank : 'other';
}

/** Next display code of a project ("KHL-014"); codes are never reused. */
async function takeCode(db: Db, projectId: string): Promise<string> {
  const project = await db
    .updateTable('projects')
    .set((eb) => ({ code_next: eb('code_next', '+', 1) }))
    .where('id', '=', projectId)
    .returning(['code_prefix', 'code_next'])
    .executeTakeFirstOrThrow();
  return `${project.code_prefix}-${String(project.code_next - 1).padStart(3, '0')}`;
}

/** Creates an individual: `active` (with a code) or `provisional` (a first reviewer's "new", blind to others). */
export async function createIndividual(
  db: Db,
  projectId: string,
  description: IndividualDescription,
  status: 'active' | 'provisional',
  actorId: string,
): Promise<IndividualsTable> {
  const now = nowIso();
  const row: IndividualsTable = {
    id: newId(),
    project_id: projectId,
    code: status === 'active' ? await takeCode(db, projectId) : null,
    nickname: description.nickname,
    sex: description.sex,
    notes: description.notes,
    tags: JSON.stringify(description.tags),
    status,
    merged_into: null,
    created_by: actorId,
    created_at: now,
    updated_at: now,
  };
  await db.insertInto('individuals').values(row).execute();
  await recordAudit(db, {
    userId: actorId,
    projectId,
    action: 'create',
    entity: 'individual',
    entityId: row.id,
    after: { ...description, status, code: row.code },
  });
  bumpCatalogue(projectId);
  return row;
}

/** Makes a provisional individual active: it gets its display code and joins the catalogue. */
export async function activateIndividual(
  db: Db,
  individualId: string,
  actorId: string,
): Promise<IndividualsTable> {
  const row = await db
    .selectFrom('individuals')
    .selectAll()
    .where('id', '=', individualId)
    .executeTakeFirstOrThrow();
  if (row.status === 'active') return row;
  const code = await takeCode(db, row.project_id);
  await db
    .updateTable('individuals')
    .set({ status: 'active', code, updated_at: nowIso() })
    .where('id', '=', individualId)
    .execute();
  await recordAudit(db, {
    userId: actorId,
    projectId: row.project_id,
    action: 'activate',
    entity: 'individual',
    entityId: individualId,
    after: { code },
  });
  bumpCatalogue(row.project_id);
  return { ...row, status: 'active', code };
}

/** Adds a photo as a reference of a flank when that flank has none yet. */
export async function addFirstReference(
  db: Db,
  individualId: string,
  flank: 'left' | 'right' | 'other',
  photoId: string,
  actorId: string,
): Promise<void> {
  const existing = await db
    .selectFrom('reference_photos')
    .select('photo_id')
    .where('individual_id', '=', individualId)
    .where('flank', '=', flank)
    .executeTakeFirst();
  if (existing) return;
  await db
    .insertInto('reference_photos')
    .values({
      individual_id: individualId,
      flank,
      photo_id: photoId,
      position: 0,
      chosen_by: actorId,
      created_at: nowIso(),
    })
    .onConflict((oc) => oc.doNothing())
    .execute();
}

/** Resolves an id or a display code (current or an alias) to the individual it names now. */
export async function resolveIndividual(
  db: Db,
  projectId: string,
  idOrCode: string,
): Promise<IndividualsTable> {
  let row = await db
    .selectFrom('individuals')
    .selectAll()
    .where('project_id', '=', projectId)
    .where((eb) => eb.or([eb('id', '=', idOrCode), eb('code', '=', idOrCode.toUpperCase())]))
    .executeTakeFirst();
  if (!row) {
    const alias = await db
      .selectFrom('aliases')
      .select('individual_id')
      .where('project_id', '=', projectId)
      .where('code', '=', idOrCode.toUpperCase())
      .executeTakeFirst();
    if (alias)
      row = await db
        .selectFrom('individuals')
        .selectAll()
        .where('id', '=', alias.individual_id)
        .executeTakeFirst();
  }
  for (let hops = 0; row && row.status === 'merged' && row.merged_into && hops < 50; hops++) {
    row = await db
      .selectFrom('individuals')
      .selectAll()
      .where('id', '=', row.merged_into)
      .executeTakeFirst();
  }
  if (!row || row.status === 'discarded')
    throw new ApiError('not_found', `There is no individual "${idOrCode}" in this project.`);
  return row;
}

/** Flank coverage from confirmed sightings: both flanks once linked, else a partial identity. */
export function coverageOf(flanks: Iterable<string>): FlankCoverage {
  const set = new Set(flanks);
  const left = set.has('left') || set.has('both');
  const right = set.has('right') || set.has('both');
  return { left, right, partial: left !== right };
}

/** Reference photo views of many individuals at once. */
export async function referencesOf(
  db: Db,
  individualIds: string[],
): Promise<Map<string, ReferencePhotoView[]>> {
  const out = new Map<string, ReferencePhotoView[]>();
  for (let i = 0; i < individualIds.length; i += 500) {
    const rows = await db
      .selectFrom('reference_photos')
      .selectAll()
      .where('individual_id', 'in', individualIds.slice(i, i + 500))
      .orderBy('flank')
      .orderBy('position')
      .execute();
    for (const r of rows) {
      const list = out.get(r.individual_id) ?? [];
      list.push({
        photoId: r.photo_id,
        flank: r.flank as ReferencePhotoView['flank'],
        thumbUrl: `/api/photos/${r.photo_id}/thumb`,
        previewUrl: `/api/photos/${r.photo_id}/preview`,
      });
      out.set(r.individual_id, list);
    }
  }
  return out;
}

/** Catalogue entries of a project (active by default), with coverage, references and detections. */
export async function catalogueEntries(
  db: Db,
  project: ProjectsTable,
  status: 'active' | 'merged' | 'all' = 'active',
): Promise<CatalogueEntry[]> {
  let q = db.selectFrom('individuals').selectAll().where('project_id', '=', project.id);
  q =
    status === 'all'
      ? q.where('status', 'in', ['active', 'merged'])
      : q.where('status', '=', status);
  const rows = await q.orderBy('code').execute();
  const seen = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .select([
      'sightings.individual_id',
      'sightings.flank',
      'events.start',
      'stations.code as stationCode',
    ])
    .where('sightings.project_id', '=', project.id)
    .where('sightings.state', '=', 'confirmed')
    .orderBy('events.start')
    .execute();
  const aliases = await db
    .selectFrom('aliases')
    .select(['code', 'individual_id'])
    .where('project_id', '=', project.id)
    .execute();
  const refs = await referencesOf(
    db,
    rows.map((r) => r.id),
  );
  const byIndividual = new Map<string, typeof seen>();
  for (const s of seen)
    if (s.individual_id)
      byIndividual.set(s.individual_id, [...(byIndividual.get(s.individual_id) ?? []), s]);
  return rows.map((r) => {
    const own = byIndividual.get(r.id) ?? [];
    return {
      id: r.id,
      code: r.code,
      nickname: r.nickname,
      sex: r.sex as CatalogueEntry['sex'],
      notes: r.notes,
      tags: JSON.parse(r.tags) as string[],
      status: r.status as CatalogueEntry['status'],
      mergedInto: r.merged_into,
      aliases: aliases.filter((a) => a.individual_id === r.id).map((a) => a.code),
      coverage: coverageOf([
        ...own.map((s) => s.flank),
        ...(refs.get(r.id) ?? []).map((p) => p.flank),
      ]),
      references: refs.get(r.id) ?? [],
      sightings: own.length,
      stations: [...new Set(own.map((s) => s.stationCode))].sort(),
      firstSeen: own[0]?.start ?? null,
      lastSeen: own.at(-1)?.start ?? null,
      lastStation: own.at(-1)?.stationCode ?? null,
    };
  });
}

/** Edits an individual's record (curators); every edit is in the audit log. */
export async function updateIndividual(
  db: Db,
  projectId: string,
  individualId: string,
  patch: Partial<IndividualDescription>,
  actorId: string,
): Promise<void> {
  const before = await db
    .selectFrom('individuals')
    .selectAll()
    .where('id', '=', individualId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!before || before.status !== 'active')
    throw new ApiError('not_found', 'This individual was not found (or was merged).');
  const set: Partial<IndividualsTable> = { updated_at: nowIso() };
  if (patch.nickname !== undefined) set.nickname = patch.nickname;
  if (patch.sex !== undefined) set.sex = patch.sex;
  if (patch.notes !== undefined) set.notes = patch.notes;
  if (patch.tags !== undefined) set.tags = JSON.stringify(patch.tags);
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('individuals').set(set).where('id', '=', individualId).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'update',
      entity: 'individual',
      entityId: individualId,
      before: {
        nickname: before.nickname,
        sex: before.sex,
        notes: before.notes,
        tags: JSON.parse(before.tags) as unknown,
      },
      after: patch,
    });
  });
  bumpCatalogue(projectId);
}

/** Sets the reference photos of one flank (curators): photos of the individual's confirmed sightings only. */
export async function setReferences(
  db: Db,
  projectId: string,
  individualId: string,
  flank: 'left' | 'right' | 'other',
  photoIds: string[],
  actorId: string,
): Promise<void> {
  const allowed = await db
    .selectFrom('photos')
    .innerJoin('sightings', 'sightings.event_id', 'photos.event_id')
    .select('photos.id')
    .where('sightings.individual_id', '=', individualId)
    .where('sightings.state', '=', 'confirmed')
    .where('photos.id', 'in', photoIds.length ? photoIds : [''])
    .execute();
  const ok = new Set(allowed.map((a) => a.id));
  const foreign = photoIds.filter((p) => !ok.has(p));
  if (foreign.length) {
    throw new ApiError(
      'validation_failed',
      'photoIds: reference photos must come from this individual’s confirmed sightings.',
      { photoIds: foreign },
    );
  }
  await db.transaction().execute(async (trx) => {
    const before = await trx
      .selectFrom('reference_photos')
      .select('photo_id')
      .where('individual_id', '=', individualId)
      .where('flank', '=', flank)
      .orderBy('position')
      .execute();
    await trx
      .deleteFrom('reference_photos')
      .where('individual_id', '=', individualId)
      .where('flank', '=', flank)
      .execute();
    for (const [position, photoId] of photoIds.entries()) {
      await trx
        .insertInto('reference_photos')
        .values({
          individual_id: individualId,
          flank,
          photo_id: photoId,
          position,
          chosen_by: actorId,
          created_at: nowIso(),
        })
        .execute();
    }
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'set-references',
      entity: 'individual',
      entityId: individualId,
      before: { flank, photoIds: before.map((b) => b.photo_id) },
      after: { flank, photoIds },
    });
  });
  // Newly chosen references get coat-pattern features (most share their sighting's already).
  await queueMissingPatternWork(db, projectId);
  bumpCatalogue(projectId);
}

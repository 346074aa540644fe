import type { CreateSightingBody, SightingView } from '../../shared/sort';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import type { SightingsTable } from '../db/schema/sort.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { toSightingView } from './event-views.service';
import { newId, nowIso } from './ids';
import { cropKey, queuePatternFeatures } from './pattern.service';

async function targetEvent(db: Db, project: ProjectsTable, eventId: string) {
  const event = await db
    .selectFrom('events')
    .selectAll()
    .where('id', '=', eventId)
    .where('project_id', '=', project.id)
    .executeTakeFirst();
  if (!event) throw new ApiError('not_found', 'This event was not found.');
  if (event.label !== 'animal' || event.species !== project.target_species_scientific) {
    throw new ApiError(
      'conflict',
      `Sightings are recorded only for events labelled ${project.target_species_common} (${project.target_species_scientific}).`,
    );
  }
  return event;
}

async function checkPhoto(db: Db, eventId: string, photoId: string): Promise<void> {
  const photo = await db
    .selectFrom('photos')
    .select('id')
    .where('id', '=', photoId)
    .where('event_id', '=', eventId)
    .executeTakeFirst();
  if (!photo)
    throw new ApiError(
      'validation_failed',
      'bestPhotoId: the best photo must be one of this event’s photos.',
    );
}

/** Records one animal of the target species in an event; it starts `open` for the Identify screen. */
export async function createSighting(
  db: Db,
  project: ProjectsTable,
  eventId: string,
  body: CreateSightingBody,
  actorId: string,
): Promise<SightingView> {
  const event = await targetEvent(db, project, eventId);
  await checkPhoto(db, eventId, body.bestPhotoId);
  const existing = await db
    .selectFrom('sightings')
    .select('id')
    .where('event_id', '=', eventId)
    .execute();
  if (existing.length >= (event.animal_count ?? 1)) {
    throw new ApiError(
      'conflict',
      `This event is labelled with ${event.animal_count ?? 1} animal(s), and each already has a sighting. Raise the count first.`,
    );
  }
  const now = nowIso();
  const row: SightingsTable = {
    id: newId(),
    project_id: project.id,
    event_id: eventId,
    flank: body.flank,
    quality: body.quality,
    best_photo_id: body.bestPhotoId,
    crop: body.crop ? JSON.stringify(body.crop) : null,
    sex: body.sex,
    age_class: body.ageClass,
    state: 'open',
    individual_id: null,
    created_by: actorId,
    created_at: now,
    updated_at: now,
    lease_holder: null,
    lease_until: null,
  };
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('sightings').values(row).execute();
    await queuePatternFeatures(trx, { photoId: row.best_photo_id, crop: cropKey(row.crop) });
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'create',
      entity: 'sighting',
      entityId: row.id,
      after: body,
    });
  });
  return toSightingView(row);
}

async function openSighting(
  db: Db,
  projectId: string,
  sightingId: string,
): Promise<SightingsTable> {
  const row = await db
    .selectFrom('sightings')
    .selectAll()
    .where('id', '=', sightingId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!row) throw new ApiError('not_found', 'This sighting was not found.');
  if (row.state !== 'open') {
    throw new ApiError(
      'conflict',
      'This sighting is already being identified; ask a curator to change it.',
    );
  }
  return row;
}

/** Changes an open sighting's flank, quality, best photo, crop, sex or age class. */
export async function updateSighting(
  db: Db,
  project: ProjectsTable,
  sightingId: string,
  patch: Partial<CreateSightingBody>,
  actorId: string,
): Promise<SightingView> {
  const before = await openSighting(db, project.id, sightingId);
  if (patch.bestPhotoId) await checkPhoto(db, before.event_id, patch.bestPhotoId);
  const set: Partial<SightingsTable> = { updated_at: nowIso() };
  if (patch.flank) set.flank = patch.flank;
  if (patch.quality) set.quality = patch.quality;
  if (patch.bestPhotoId) set.best_photo_id = patch.bestPhotoId;
  if (patch.crop !== undefined) set.crop = patch.crop ? JSON.stringify(patch.crop) : null;
  if (patch.sex !== undefined) set.sex = patch.sex;
  if (patch.ageClass !== undefined) set.age_class = patch.ageClass;
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('sightings').set(set).where('id', '=', sightingId).execute();
    // A new best photo or crop box means new coat-pattern features.
    const photoId = set.best_photo_id ?? before.best_photo_id;
    const crop = set.crop !== undefined ? set.crop : before.crop;
    if (photoId !== before.best_photo_id || crop !== before.crop) {
      await queuePatternFeatures(trx, { photoId, crop: cropKey(crop) });
    }
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'update',
      entity: 'sighting',
      entityId: sightingId,
      before,
      after: patch,
    });
  });
  const row = await db
    .selectFrom('sightings')
    .selectAll()
    .where('id', '=', sightingId)
    .executeTakeFirstOrThrow();
  return toSightingView(row);
}

/** Removes an open sighting (recorded by mistake). */
export async function deleteSighting(
  db: Db,
  project: ProjectsTable,
  sightingId: string,
  actorId: string,
): Promise<void> {
  const before = await openSighting(db, project.id, sightingId);
  await db.transaction().execute(async (trx) => {
    await trx.deleteFrom('sightings').where('id', '=', sightingId).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'delete',
      entity: 'sighting',
      entityId: sightingId,
      before,
    });
  });
}

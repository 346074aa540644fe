import { roleAtLeast, type ProjectRole } from '../../shared/roles';
import type { PhotoFlag } from '../../shared/ingest';
import type {
  AgeClass,
  Crop,
  EventView,
  Flank,
  Quality,
  Sex,
  SightingState,
  SightingView,
  SortLabel,
} from '../../shared/sort';
import type { Db } from '../db/database';
import type { SightingsTable } from '../db/schema/sort.table';

/** The API view of a sighting row. */
export function toSightingView(row: SightingsTable): SightingView {
  return {
    id: row.id,
    eventId: row.event_id,
    flank: row.flank as Flank,
    quality: row.quality as Quality,
    bestPhotoId: row.best_photo_id,
    crop: row.crop ? (JSON.parse(row.crop) as Crop) : null,
    sex: row.sex as Sex | null,
    ageClass: row.age_class as AgeClass | null,
    state: row.state as SightingState,
    individualId: row.individual_id,
    createdAt: row.created_at,
  };
}

/**
 * Events with their photos and sightings, in the order of `ids`. Photos of events labelled human
 * are marked blurred; only reviewers and above ever receive such events.
 */
export async function eventViews(
  db: Db,
  ids: string[],
  role: ProjectRole | null,
): Promise<EventView[]> {
  if (ids.length === 0) return [];
  const events = await db
    .selectFrom('events')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .leftJoin('users', 'users.id', 'events.sorted_by')
    .selectAll('events')
    .select(['stations.code as stationCode', 'users.name as sorterName'])
    .where('events.id', 'in', ids)
    .execute();
  const photos = await db
    .selectFrom('photos')
    .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
    .select([
      'photos.id',
      'photos.event_id',
      'photos.deployment_id',
      'photos.taken_at',
      'photos.flags',
      'deployments.camera_label',
    ])
    .where('photos.event_id', 'in', ids)
    .orderBy('photos.taken_at')
    .orderBy('photos.id')
    .execute();
  const sightings = await db
    .selectFrom('sightings')
    .selectAll()
    .where('event_id', 'in', ids)
    .orderBy('created_at')
    .execute();
  const byId = new Map(events.map((e) => [e.id, e]));
  return ids.flatMap((id) => {
    const e = byId.get(id);
    if (!e) return [];
    if (e.label === 'human' && !roleAtLeast(role, 'reviewer')) return [];
    const blurred = e.label === 'human';
    return [
      {
        id: e.id,
        stationId: e.station_id,
        stationCode: e.stationCode,
        start: e.start,
        end: e.end,
        photoCount: e.photo_count,
        photos: photos
          .filter((p) => p.event_id === id)
          .map((p) => ({
            id: p.id,
            thumbUrl: `/api/photos/${p.id}/thumb`,
            previewUrl: `/api/photos/${p.id}/preview`,
            deploymentId: p.deployment_id,
            cameraLabel: p.camera_label,
            takenAt: p.taken_at,
            flags: JSON.parse(p.flags) as PhotoFlag[],
            blurred,
          })),
        label: e.label as SortLabel | null,
        species: e.species,
        count: e.animal_count,
        sortedBy: e.sorted_by ? { id: e.sorted_by, name: e.sorterName ?? 'a former member' } : null,
        sortedAt: e.sorted_at,
        version: e.label_version,
        leaseUntil: e.lease_until,
        sightings: sightings.filter((s) => s.event_id === id).map(toSightingView),
      },
    ];
  });
}

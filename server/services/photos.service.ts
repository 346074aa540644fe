import type { PhotoFlag, PhotoStatus, PhotoView } from '../../shared/ingest';
import type { Db } from '../db/database';
import type { PhotosTable } from '../db/schema/ingest.table';
import { decodeCursor, encodeCursor } from './cursor';
import { generalise } from './geo';

/** The API view of a photo; GPS generalised like station coordinates for roles that need it. */
export function toPhotoView(row: PhotosTable, precision: number | null | undefined): PhotoView {
  const gps =
    row.gps_lat !== null && row.gps_lon !== null
      ? generalise(row.gps_lat, row.gps_lon, precision)
      : null;
  return {
    id: row.id,
    originalName: row.original_name,
    sha256: row.sha256,
    takenAtExif: row.taken_at_exif,
    takenAt: row.taken_at,
    lat: gps?.lat ?? null,
    lon: gps?.lon ?? null,
    width: row.width,
    height: row.height,
    status: row.status as PhotoStatus,
    flags: JSON.parse(row.flags) as PhotoFlag[],
    deploymentId: row.deployment_id,
    uploadId: row.upload_id,
    eventId: row.event_id,
    error: row.error,
    thumbUrl: `/api/photos/${row.id}/thumb`,
  };
}

/** Filters of the photo list. */
export interface PhotoFilter {
  uploadId?: string;
  deploymentId?: string;
  status?: PhotoStatus;
  flag?: PhotoFlag;
  uploaderId?: string | null;
  after?: string;
  limit: number;
}

/** One page of a project's photos in upload order (keyset on created_at, id). */
export async function listPhotos(
  db: Db,
  projectId: string,
  filter: PhotoFilter,
  precision: number | null | undefined,
): Promise<{ items: PhotoView[]; next: string | null }> {
  let q = db.selectFrom('photos').selectAll('photos').where('photos.project_id', '=', projectId);
  if (filter.uploadId) q = q.where('photos.upload_id', '=', filter.uploadId);
  if (filter.deploymentId) q = q.where('photos.deployment_id', '=', filter.deploymentId);
  if (filter.status) q = q.where('photos.status', '=', filter.status);
  if (filter.flag) q = q.where('photos.flags', 'like', `%"${filter.flag}"%`);
  if (filter.uploaderId) {
    q = q
      .innerJoin('card_uploads', 'card_uploads.id', 'photos.upload_id')
      .where('card_uploads.uploader_id', '=', filter.uploaderId);
  }
  if (filter.after) {
    const [at, id] = decodeCursor(filter.after, 2) as [string, string];
    q = q.where((eb) =>
      eb.or([
        eb('photos.created_at', '>', at),
        eb.and([eb('photos.created_at', '=', at), eb('photos.id', '>', id)]),
      ]),
    );
  }
  const rows = await q
    .orderBy('photos.created_at')
    .orderBy('photos.id')
    .limit(filter.limit + 1)
    .execute();
  const page = rows.slice(0, filter.limit);
  const last = rows.length > filter.limit ? page[page.length - 1] : undefined;
  return {
    items: page.map((r) => toPhotoView(r, precision)),
    next: last ? encodeCursor([last.created_at, last.id]) : null,
  };
}

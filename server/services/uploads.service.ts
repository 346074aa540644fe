import type {
  PhotoFlag,
  UploadFileView,
  UploadListItem,
  UploadProgress,
} from '../../shared/ingest';
import type { Db } from '../db/database';
import { ApiError } from '../errors/api-error';
import { newId, nowIso } from './ids';

/** Starts a card upload for a deployment. */
export async function createUpload(
  db: Db,
  projectId: string,
  deploymentId: string,
  uploaderId: string,
): Promise<string> {
  const id = newId();
  await db
    .insertInto('card_uploads')
    .values({
      id,
      project_id: projectId,
      deployment_id: deploymentId,
      uploader_id: uploaderId,
      accepted: 0,
      duplicate: 0,
      rejected: 0,
      created_at: nowIso(),
    })
    .execute();
  return id;
}

/** A card upload row of the project, or 404. */
export async function getUploadRow(db: Db, projectId: string, uploadId: string) {
  const row = await db
    .selectFrom('card_uploads')
    .selectAll()
    .where('id', '=', uploadId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!row) throw new ApiError('not_found', 'This card upload was not found.');
  return row;
}

async function progressOf(db: Db, uploadIds: string[]): Promise<Map<string, UploadProgress>> {
  const out = new Map<string, UploadProgress>();
  if (uploadIds.length === 0) return out;
  const uploads = await db
    .selectFrom('card_uploads')
    .innerJoin('deployments', 'deployments.id', 'card_uploads.deployment_id')
    .innerJoin('stations', 'stations.id', 'deployments.station_id')
    .leftJoin('users', 'users.id', 'card_uploads.uploader_id')
    .select([
      'card_uploads.id',
      'card_uploads.deployment_id',
      'card_uploads.accepted',
      'card_uploads.duplicate',
      'card_uploads.rejected',
      'card_uploads.created_at',
      'stations.code',
      'deployments.camera_label',
      'users.name',
    ])
    .where('card_uploads.id', 'in', uploadIds)
    .execute();
  const statuses = await db
    .selectFrom('photos')
    .select(['upload_id', 'status', (eb) => eb.fn.countAll<number>().as('n')])
    .where('upload_id', 'in', uploadIds)
    .groupBy(['upload_id', 'status'])
    .execute();
  const flagged = await db
    .selectFrom('photos')
    .select(['upload_id', 'flags'])
    .where('upload_id', 'in', uploadIds)
    .where('flags', '!=', '[]')
    .execute();
  for (const u of uploads) {
    const count = (status: string) =>
      Number(statuses.find((s) => s.upload_id === u.id && s.status === status)?.n ?? 0);
    const flags: Partial<Record<PhotoFlag, number>> = {};
    for (const row of flagged.filter((f) => f.upload_id === u.id)) {
      for (const flag of JSON.parse(row.flags) as PhotoFlag[]) flags[flag] = (flags[flag] ?? 0) + 1;
    }
    const counts = {
      accepted: u.accepted,
      duplicate: u.duplicate,
      rejected: u.rejected,
      queued: count('queued'),
      processing: count('processing'),
      ready: count('ready'),
      failed: count('failed'),
    };
    out.set(u.id, {
      id: u.id,
      deploymentId: u.deployment_id,
      stationCode: u.code,
      cameraLabel: u.camera_label,
      uploaderName: u.name ?? 'a former member',
      createdAt: u.created_at,
      counts,
      flagged: flags,
      done: counts.queued + counts.processing === 0,
    });
  }
  return out;
}

/** Counts and processing progress of one card upload. */
export async function uploadProgress(db: Db, uploadId: string): Promise<UploadProgress> {
  const progress = (await progressOf(db, [uploadId])).get(uploadId);
  if (!progress) throw new ApiError('not_found', 'This card upload was not found.');
  return progress;
}

/** Card uploads of a project, newest first; `uploaderId` limits them to one person's. */
export async function listUploads(
  db: Db,
  projectId: string,
  uploaderId: string | null,
): Promise<UploadListItem[]> {
  let q = db.selectFrom('card_uploads').select('id').where('project_id', '=', projectId);
  if (uploaderId) q = q.where('uploader_id', '=', uploaderId);
  const rows = await q.orderBy('created_at', 'desc').limit(500).execute();
  const progress = await progressOf(
    db,
    rows.map((r) => r.id),
  );
  return rows.flatMap((r) => {
    const p = progress.get(r.id);
    return p ? [{ ...p, files: p.counts.accepted + p.counts.duplicate + p.counts.rejected }] : [];
  });
}

/** The per-file verdicts of a card upload, in the order the files arrived. */
export async function uploadFiles(db: Db, uploadId: string): Promise<UploadFileView[]> {
  const rows = await db
    .selectFrom('upload_files')
    .selectAll()
    .where('upload_id', '=', uploadId)
    .orderBy('seq')
    .execute();
  return rows.map((r) => ({
    name: r.name,
    status: r.status as UploadFileView['status'],
    code: r.code as UploadFileView['code'],
    message: r.message,
    photoId: r.photo_id,
  }));
}

/** Puts an upload's failed photos back in the queue for another try. */
export async function retryFailed(db: Db, uploadId: string): Promise<number> {
  return db.transaction().execute(async (trx) => {
    const failed = await trx
      .selectFrom('photos')
      .select('id')
      .where('upload_id', '=', uploadId)
      .where('status', '=', 'failed')
      .execute();
    if (failed.length === 0) return 0;
    const ids = failed.map((f) => f.id);
    const now = new Date().toISOString();
    await trx
      .updateTable('photos')
      .set({ status: 'queued', error: null })
      .where('id', 'in', ids)
      .execute();
    for (const id of ids) {
      await trx
        .updateTable('jobs')
        .set({ status: 'queued', attempts: 0, error: null, run_after: now, updated_at: now })
        .where('kind', '=', 'derivatives')
        .where('status', '=', 'failed')
        .where('payload', '=', JSON.stringify({ photoId: id }))
        .execute();
    }
    return ids.length;
  });
}

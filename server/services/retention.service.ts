import { rm } from 'node:fs/promises';
import type { Db } from '../db/database';
import type { PhotoStorage } from '../images/storage';
import { recordAudit } from './audit.service';

/**
 * Deletes photos of people once a project's retention period has passed since they were labelled
 * human: the bytes and every derivative go, the row stays (status `purged`) so counts and the
 * audit trail stay whole. Bytes shared with a photo that is not purged are kept.
 */
export async function purgeExpiredHumanPhotos(
  db: Db,
  storage: PhotoStorage,
  now = new Date(),
): Promise<number> {
  const projects = await db
    .selectFrom('projects')
    .select(['id', 'human_retention_days'])
    .where('human_retention_days', 'is not', null)
    .execute();
  let purged = 0;
  for (const project of projects) {
    const cutoff = new Date(
      now.getTime() - project.human_retention_days! * 86_400_000,
    ).toISOString();
    const due = await db
      .selectFrom('photos')
      .innerJoin('events', 'events.id', 'photos.event_id')
      .select(['photos.id', 'photos.sha256', 'photos.stored_path'])
      .where('photos.project_id', '=', project.id)
      .where('events.label', '=', 'human')
      .where('events.sorted_at', '<', cutoff)
      .where('photos.status', '!=', 'purged')
      .execute();
    for (const photo of due) {
      await db.transaction().execute(async (trx) => {
        await trx
          .updateTable('photos')
          .set({ status: 'purged', stored_path: '', error: null })
          .where('id', '=', photo.id)
          .execute();
        await recordAudit(trx, {
          userId: null,
          projectId: project.id,
          action: 'purge-human-photo',
          entity: 'photo',
          entityId: photo.id,
        });
      });
      const stillUsed = await db
        .selectFrom('photos')
        .select('id')
        .where('sha256', '=', photo.sha256)
        .where('status', '!=', 'purged')
        .executeTakeFirst();
      if (!stillUsed) {
        await rm(storage.absolute(photo.stored_path), { force: true });
        await rm(storage.derivedPath(photo.sha256, 'thumb').replace(/\/thumb\.jpg$/, ''), {
          recursive: true,
          force: true,
        });
      }
      purged++;
    }
  }
  return purged;
}

import type { Db } from '../db/database';
import type { ImagePool } from '../images/pool';
import type { PhotoStorage } from '../images/storage';
import type { FinalFailureHandler, JobHandler } from './runner';

function photoIdOf(payload: unknown): string {
  const id = (payload as { photoId?: unknown } | null)?.photoId;
  if (typeof id !== 'string') throw new Error('derivatives job without a photo id');
  return id;
}

/** Makes a photo's preview and thumbnail in the worker pool, then marks it ready. */
export function derivativesHandler(db: Db, pool: ImagePool, storage: PhotoStorage): JobHandler {
  return async (payload) => {
    const photoId = photoIdOf(payload);
    const photo = await db
      .selectFrom('photos')
      .select(['id', 'sha256', 'stored_path', 'status'])
      .where('id', '=', photoId)
      .executeTakeFirst();
    if (!photo) return;
    await db
      .updateTable('photos')
      .set({ status: 'processing' })
      .where('id', '=', photoId)
      .execute();
    try {
      await pool.makeDerivatives({
        root: storage.root,
        storedPath: photo.stored_path,
        sha256: photo.sha256,
      });
    } catch (err) {
      await db.updateTable('photos').set({ status: 'queued' }).where('id', '=', photoId).execute();
      throw err;
    }
    await db
      .updateTable('photos')
      .set({ status: 'ready', error: null })
      .where('id', '=', photoId)
      .execute();
  };
}

/** After the last attempt: the photo is marked failed with a reason a person can read. */
export function derivativesFailed(db: Db): FinalFailureHandler {
  return async (payload, error) => {
    const photoId = photoIdOf(payload);
    const reason = /corrupt|invalid|unsupported|decode|JPEG/i.test(error)
      ? 'The photo could not be decoded; the file is probably damaged.'
      : `Processing failed: ${error.slice(0, 200)}`;
    await db
      .updateTable('photos')
      .set({ status: 'failed', error: reason })
      .where('id', '=', photoId)
      .execute();
  };
}

import { existsSync } from 'node:fs';
import { Router, type Response } from 'express';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { photoAccess, photoOf } from '../middleware/photo-access';

function send(res: Response, path: string, etag: string): void {
  res.set({ 'Cache-Control': 'private, max-age=3600', ETag: `"${etag}"` });
  res.type('image/jpeg').sendFile(path);
}

/** Photo files for members allowed to see them: thumbnail, preview and the original. */
export function photosRoutes({ db, ingest }: AppDeps): Router {
  const router = Router();
  const { storage } = ingest;

  router.get('/photos/:id/thumb', photoAccess(db), (req, res) => {
    const { row } = photoOf(req);
    const thumb = storage.derivedPath(row.sha256, 'thumb');
    if (existsSync(thumb)) return send(res, thumb, `${row.sha256}-t`);
    // Until the worker has made the thumbnail, the camera's own embedded one stands in.
    const embedded = storage.derivedPath(row.sha256, 'exif-thumb');
    if (existsSync(embedded)) return send(res, embedded, `${row.sha256}-e`);
    throw new ApiError('not_found', 'The thumbnail is not ready yet.');
  });

  router.get('/photos/:id/preview', photoAccess(db), (req, res) => {
    const { row } = photoOf(req);
    const preview = storage.derivedPath(row.sha256, 'preview');
    if (existsSync(preview)) return send(res, preview, `${row.sha256}-p`);
    send(res, storage.absolute(row.stored_path), row.sha256);
  });

  router.get('/photos/:id/original', photoAccess(db), (req, res) => {
    const { row } = photoOf(req);
    res.set(
      'Content-Disposition',
      `inline; filename="${row.original_name.replace(/[^\w.-]/g, '_')}"`,
    );
    send(res, storage.absolute(row.stored_path), row.sha256);
  });

  return router;
}

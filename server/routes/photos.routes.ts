import { existsSync } from 'node:fs';
import { readFile } from 'node:fs/promises';
import { Router, type Request, type Response } from 'express';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { photoAccess, photoOf } from '../middleware/photo-access';
import { recordAudit } from '../services/audit.service';
import type { DerivedKind } from '../images/storage';
import { stripJpegMetadata } from '../images/strip-metadata';
import { publicPrecisionOf } from '../services/projects.service';
import { roleAtLeast } from '../../shared/roles';

declare module 'express-session' {
  interface SessionData {
    /** Photos of people this session chose to see unblurred (each reveal is in the audit log). */
    revealed?: string[];
  }
}

const MAX_REVEALED = 200;

function send(res: Response, path: string, etag: string): void {
  res.set({ 'Cache-Control': 'private, max-age=3600', ETag: `"${etag}"` });
  res.type('image/jpeg').sendFile(path);
}

function revealed(req: Request, photoId: string): boolean {
  return req.session.revealed?.includes(photoId) ?? false;
}

/** Photo files for members allowed to see them: thumbnail, preview, original; people blurred. */
export function photosRoutes({ db, ingest }: AppDeps): Router {
  const router = Router();
  const { storage } = ingest;

  // Photos of people: the blurred copy, unless this session revealed the photo.
  const sendBlurred = (
    req: Request,
    res: Response,
    kind: DerivedKind & ('thumb-blur' | 'preview-blur'),
  ): boolean => {
    const { row, human } = photoOf(req);
    if (row.status === 'purged') {
      throw new ApiError('gone', 'This photo was deleted under the project’s retention rule.');
    }
    if (row.status === 'external') {
      throw new ApiError(
        'not_found',
        'This photo came in a Camtrap DP package without its file; only its record is here.',
      );
    }
    if (!human || revealed(req, row.id)) return false;
    const path = storage.derivedPath(row.sha256, kind);
    if (!existsSync(path))
      throw new ApiError('not_found', 'The blurred copy of this photo is still being made.');
    res.set('Cache-Control', 'no-store');
    res.type('image/jpeg').sendFile(path);
    return true;
  };

  // The camera wrote its GPS position into the original's EXIF: roles that see only generalised
  // locations get the file without its metadata segments.
  const sendOriginal = async (req: Request, res: Response) => {
    const { row, project, role } = photoOf(req);
    const path = storage.absolute(row.stored_path);
    if (roleAtLeast(role, 'ecologist') || publicPrecisionOf(project) === undefined) {
      return send(res, path, row.sha256);
    }
    const bytes = await readFile(path).catch(() => {
      throw new ApiError('not_found', 'The photo file is missing from the store.');
    });
    res.set({ 'Cache-Control': 'private, max-age=3600', ETag: `"${row.sha256}-s"` });
    res.type('image/jpeg').send(stripJpegMetadata(bytes));
  };

  router.get('/photos/:id/thumb', photoAccess(db), (req, res) => {
    if (sendBlurred(req, res, 'thumb-blur')) return;
    const { row } = photoOf(req);
    const thumb = storage.derivedPath(row.sha256, 'thumb');
    if (existsSync(thumb)) return send(res, thumb, `${row.sha256}-t`);
    // Until the worker has made the thumbnail, the camera's own embedded one stands in.
    const embedded = storage.derivedPath(row.sha256, 'exif-thumb');
    if (existsSync(embedded)) return send(res, embedded, `${row.sha256}-e`);
    throw new ApiError('not_found', 'The thumbnail is not ready yet.');
  });

  router.get('/photos/:id/preview', photoAccess(db), async (req, res) => {
    if (sendBlurred(req, res, 'preview-blur')) return;
    const { row } = photoOf(req);
    const preview = storage.derivedPath(row.sha256, 'preview');
    if (existsSync(preview)) return send(res, preview, `${row.sha256}-p`);
    await sendOriginal(req, res);
  });

  router.get('/photos/:id/original', photoAccess(db), async (req, res) => {
    if (sendBlurred(req, res, 'preview-blur')) return;
    const { row } = photoOf(req);
    if (!row.stored_path)
      throw new ApiError('gone', 'This photo was deleted under the project’s retention rule.');
    res.set(
      'Content-Disposition',
      `inline; filename="${row.original_name.replace(/[^\w.-]/g, '_')}"`,
    );
    await sendOriginal(req, res);
  });

  router.post('/photos/:id/reveal', photoAccess(db), async (req, res) => {
    const { row, project, human } = photoOf(req);
    if (!human) {
      res.json({ revealed: true });
      return;
    }
    await recordAudit(db, {
      userId: req.user!.id,
      projectId: project.id,
      action: 'reveal-human-photo',
      entity: 'photo',
      entityId: row.id,
    });
    const list = (req.session.revealed ?? []).filter((id) => id !== row.id);
    req.session.revealed = [...list.slice(-(MAX_REVEALED - 1)), row.id];
    res.json({ revealed: true });
  });

  return router;
}

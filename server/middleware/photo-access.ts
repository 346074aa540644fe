import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { idSchema } from '../../shared/ids';
import { roleAtLeast, type ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import type { PhotosTable } from '../db/schema/ingest.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { membershipRole, type Guard } from './access';

/** The photo a photo route serves, resolved and checked by its guard. */
export interface PhotoContext {
  row: PhotosTable;
  project: ProjectsTable;
  role: ProjectRole;
}

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      photo?: PhotoContext;
    }
  }
}

/**
 * Photo files: signed in, a member of the photo's project, and allowed to see that photo.
 * Volunteers see only the photos of their own card uploads.
 */
export function photoAccess(db: Db): Guard {
  const handler = async (req: Request, _res: Response, next: NextFunction) => {
    if (!req.user) throw new ApiError('unauthenticated', 'Please sign in first.');
    const id = idSchema.safeParse(req.params['id']);
    if (!id.success) throw new ApiError('bad_request', 'This photo address is not valid.');
    const row = await db
      .selectFrom('photos')
      .selectAll()
      .where('id', '=', id.data)
      .executeTakeFirst();
    if (!row) throw new ApiError('not_found', 'This photo was not found.');
    const project = await db
      .selectFrom('projects')
      .selectAll()
      .where('id', '=', row.project_id)
      .executeTakeFirstOrThrow();
    const role = await membershipRole(db, project.id, req.user.id);
    if (!role)
      throw new ApiError('forbidden', 'You are not a member of the project this photo belongs to.');
    if (!roleAtLeast(role, 'reviewer')) {
      const upload = await db
        .selectFrom('card_uploads')
        .select('uploader_id')
        .where('id', '=', row.upload_id)
        .executeTakeFirst();
      if (upload?.uploader_id !== req.user.id) {
        throw new ApiError(
          'forbidden',
          'Volunteers can see only the photos of their own card uploads.',
        );
      }
    }
    req.photo = { row, project, role };
    next();
  };
  return Object.assign(handler as RequestHandler, {
    access: { kind: 'photo', role: 'volunteer' } as const,
  });
}

/** The checked photo of a photo route. */
export function photoOf(req: Request): PhotoContext {
  if (!req.photo) throw new Error('photoOf() used on a route without the photo guard');
  return req.photo;
}

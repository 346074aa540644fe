import { Router, type NextFunction, type Request, type Response } from 'express';
import { z } from 'zod';
import { idSchema } from '../../shared/ids';
import { photoListQuerySchema, type UploadResponse } from '../../shared/ingest';
import { roleAtLeast } from '../../shared/roles';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { cardUploadMiddleware, receivedFiles } from '../middleware/upload-storage';
import { parseWith } from '../middleware/validate';
import { getDeployment } from '../services/deployments.service';
import { regroupStation } from '../services/events.service';
import { ingestFiles } from '../services/ingest.service';
import { listPhotos } from '../services/photos.service';
import { precisionFor } from '../services/stations.service';
import {
  createUpload,
  getUploadRow,
  listUploads,
  retryFailed,
  uploadFiles,
  uploadProgress,
} from '../services/uploads.service';

const uploadQuerySchema = z.object({ uploadId: idSchema.optional() }).strict();

/** Volunteers see their own uploads; reviewers and above see everyone's. */
function ownOnly(req: Request): string | null {
  return roleAtLeast(projectOf(req).role, 'reviewer') ? null : userOf(req).id;
}

async function ownedUpload(deps: AppDeps, req: Request) {
  const uploadId = parseWith(idSchema, req.params['uploadId'], 'uploadId');
  const upload = await getUploadRow(deps.db, projectOf(req).row.id, uploadId);
  const mine = ownOnly(req);
  if (mine && upload.uploader_id !== mine) {
    throw new ApiError('forbidden', 'Volunteers can see only their own card uploads.');
  }
  return upload;
}

/** Card uploads: files in, per-file verdicts out, live processing counts, the photo list. */
export function uploadsRoutes(deps: AppDeps): Router {
  const { db, ingest } = deps;
  const router = Router();
  const multipart = cardUploadMiddleware(ingest.storage, ingest.limits);

  // Checks the deployment (and an existing upload to continue) before any byte is written.
  const prepare = async (req: Request, res: Response, next: NextFunction) => {
    const deploymentId = parseWith(idSchema, req.params['deploymentId'], 'deploymentId');
    const query = parseWith(uploadQuerySchema, req.query, 'query');
    const { row } = projectOf(req);
    const { deployment } = await getDeployment(db, row.id, deploymentId);
    if (query.uploadId) {
      const upload = await ownedUpload(
        deps,
        Object.assign(req, { params: { ...req.params, uploadId: query.uploadId } }),
      );
      if (upload.deployment_id !== deployment.id) {
        throw new ApiError('conflict', 'This card upload belongs to another deployment.');
      }
    }
    if (!req.is('multipart/form-data')) {
      throw new ApiError(
        'bad_request',
        'Send the photos as multipart/form-data in the field "photos".',
      );
    }
    res.locals['deploymentId'] = deployment.id;
    next();
  };

  router.post(
    '/projects/:slug/deployments/:deploymentId/uploads',
    projectRole(db, 'volunteer'),
    prepare,
    multipart,
    async (req, res) => {
      const { row: project } = projectOf(req);
      const { deployment, station } = await getDeployment(
        db,
        project.id,
        String(res.locals['deploymentId']),
      );
      const query = parseWith(uploadQuerySchema, req.query, 'query');
      const uploadId =
        query.uploadId ?? (await createUpload(db, project.id, deployment.id, userOf(req).id));
      const files = await ingestFiles(
        {
          db,
          storage: ingest.storage,
          maxMegapixels: ingest.maxMegapixels,
          project,
          deployment,
          station,
          uploadId,
        },
        receivedFiles(req),
      );
      if (files.some((f) => f.status === 'accepted')) {
        await regroupStation(db, project.id, station.id, project.independence_minutes);
        ingest.runner.kick();
      }
      const body: UploadResponse = { upload: { id: uploadId }, files };
      res.status(201).json(body);
    },
  );

  router.get('/projects/:slug/uploads', projectRole(db, 'volunteer'), async (req, res) => {
    res.json(await listUploads(db, projectOf(req).row.id, ownOnly(req)));
  });

  router.get(
    '/projects/:slug/uploads/:uploadId',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const upload = await ownedUpload(deps, req);
      res.json(await uploadProgress(db, upload.id));
    },
  );

  router.get(
    '/projects/:slug/uploads/:uploadId/files',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const upload = await ownedUpload(deps, req);
      res.json(await uploadFiles(db, upload.id));
    },
  );

  router.post(
    '/projects/:slug/uploads/:uploadId/retry',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const upload = await ownedUpload(deps, req);
      const requeued = await retryFailed(db, upload.id);
      if (requeued) ingest.runner.kick();
      res.json({ requeued });
    },
  );

  router.get('/projects/:slug/photos', projectRole(db, 'volunteer'), async (req, res) => {
    const query = parseWith(photoListQuerySchema, req.query, 'query');
    const { row, role } = projectOf(req);
    const page = await listPhotos(
      db,
      row.id,
      { ...query, uploaderId: ownOnly(req) },
      precisionFor(row, role),
    );
    if (page.next) res.set('X-Next-Cursor', page.next);
    res.json(page.items);
  });

  return router;
}

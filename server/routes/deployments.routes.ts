import { Router } from 'express';
import { z } from 'zod';
import { idSchema } from '../../shared/ids';
import {
  clockFixBodySchema,
  createDeploymentBodySchema,
  updateDeploymentBodySchema,
} from '../../shared/stations';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import {
  applyClockFix,
  createDeployment,
  listDeployments,
  updateDeployment,
} from '../services/deployments.service';

const listQuerySchema = z.object({ stationId: idSchema.optional() }).strict();

async function viewOf(deps: AppDeps, projectId: string, deploymentId: string) {
  const view = (await listDeployments(deps.db, projectId)).find((d) => d.id === deploymentId);
  if (!view) throw new ApiError('not_found', 'This deployment was not found.');
  return view;
}

/** Deployments: which camera stood where and when, its clock and its effort. */
export function deploymentsRoutes(deps: AppDeps): Router {
  const { db } = deps;
  const router = Router();

  router.get('/projects/:slug/deployments', projectRole(db, 'volunteer'), async (req, res) => {
    const query = parseWith(listQuerySchema, req.query, 'query');
    res.json(await listDeployments(db, projectOf(req).row.id, query.stationId));
  });

  router.post('/projects/:slug/deployments', projectRole(db, 'volunteer'), async (req, res) => {
    const body = parseWith(createDeploymentBodySchema, req.body);
    const projectId = projectOf(req).row.id;
    const row = await createDeployment(db, projectId, body, userOf(req).id);
    res.status(201).json(await viewOf(deps, projectId, row.id));
  });

  router.get(
    '/projects/:slug/deployments/:deploymentId',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['deploymentId'], 'deploymentId');
      res.json(await viewOf(deps, projectOf(req).row.id, id));
    },
  );

  router.patch(
    '/projects/:slug/deployments/:deploymentId',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['deploymentId'], 'deploymentId');
      const body = parseWith(updateDeploymentBodySchema, req.body);
      const { row } = projectOf(req);
      await updateDeployment(db, row, id, body, userOf(req).id);
      res.json(await viewOf(deps, row.id, id));
    },
  );

  router.post(
    '/projects/:slug/deployments/:deploymentId/clock-fix',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['deploymentId'], 'deploymentId');
      const body = parseWith(clockFixBodySchema, req.body);
      const { row } = projectOf(req);
      const user = userOf(req);
      await applyClockFix(db, row, id, body, { id: user.id, name: user.name });
      res.json(await viewOf(deps, row.id, id));
    },
  );

  return router;
}

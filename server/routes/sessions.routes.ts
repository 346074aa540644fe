import { Router } from 'express';
import { z } from 'zod';
import { SESSION_TABLES, sessionParamsSchema, sessionRunSchema } from '../../shared/analyses';
import { idSchema } from '../../shared/ids';
import type { AppDeps } from '../app';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { SecrJobs } from '../services/secr-fits.service';
import { buildSession, normaliseSession } from '../services/session-build.service';
import { sessionDefaults } from '../services/session-queries';
import { csvFileName, sessionCsv } from '../services/session-csv';
import { estimateSession, secrBlocker, secrRequestOf } from '../services/session-models.service';
import { ApiError } from '../errors/api-error';

const tableSchema = z.enum(SESSION_TABLES, {
  message: `The table is one of ${SESSION_TABLES.join(', ')}.`,
});

/**
 * Sessions built from the project's catalogue, before anything is saved (ecologists only: the
 * inputs carry exact station coordinates, and a detection map is a home-range map): preview the
 * effort grid, histories and detections; download them as CSV; run the closed models and the
 * two-step comparison; start an SECR fit as a job and follow its progress.
 */
export function sessionsRoutes({ db, log }: AppDeps): Router {
  const router = Router();
  const jobs = new SecrJobs(log);

  router.get(
    '/projects/:slug/sessions/defaults',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      res.json(await sessionDefaults(db, projectOf(req).row));
    },
  );

  router.post(
    '/projects/:slug/sessions/preview',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const { row } = projectOf(req);
      const params = normaliseSession(row, parseWith(sessionParamsSchema, req.body));
      res.json(await buildSession(db, row, params));
    },
  );

  router.post(
    '/projects/:slug/sessions/csv/:table',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const table = parseWith(tableSchema, req.params['table'], 'table');
      const { row } = projectOf(req);
      const params = normaliseSession(row, parseWith(sessionParamsSchema, req.body));
      const session = await buildSession(db, row, params);
      res
        .type('text/csv; charset=utf-8')
        .attachment(csvFileName(`${row.slug}-session`, table))
        .send(sessionCsv(session.inputs, table));
    },
  );

  router.post(
    '/projects/:slug/sessions/estimate',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const { row } = projectOf(req);
      const body = parseWith(sessionRunSchema, req.body);
      const session = await buildSession(db, row, normaliseSession(row, body.session));
      res.json({ session, results: estimateSession(session, false) });
    },
  );

  router.post(
    '/projects/:slug/sessions/secr-jobs',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const { row } = projectOf(req);
      const body = parseWith(sessionRunSchema, req.body);
      const session = await buildSession(db, row, normaliseSession(row, body.session));
      const blocker = secrBlocker(session.inputs);
      if (blocker) throw new ApiError('validation_failed', blocker);
      const input = secrRequestOf(session.inputs, body.secr ?? { detector: 'proximity' });
      res.status(202).json(jobs.start(userOf(req).id, input));
    },
  );

  router.get(
    '/projects/:slug/sessions/secr-jobs/:jobId',
    projectRole(db, 'ecologist'),
    (req, res) => {
      const id = parseWith(idSchema, req.params['jobId'], 'jobId');
      res.json(jobs.view(userOf(req).id, id));
    },
  );

  return router;
}

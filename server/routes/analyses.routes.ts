import { Router } from 'express';
import { z } from 'zod';
import { createAnalysisSchema, SESSION_TABLES, type SessionInputs } from '../../shared/analyses';
import { idSchema, pageQuerySchema } from '../../shared/ids';
import type { AppDeps } from '../app';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import {
  createAnalysis,
  getAnalysis,
  listAnalyses,
  rerunAnalysis,
} from '../services/analyses.service';
import { AnalysisRuns } from '../services/analysis-runs';
import { csvFileName, sessionCsv } from '../services/session-csv';
import { notFound } from '../errors/api-error';

const tableSchema = z.enum(SESSION_TABLES, {
  message: `The table is one of ${SESSION_TABLES.join(', ')}.`,
});

/**
 * Saved analyses. Reading them is for ecologists too, not only writing: an analysis holds exact
 * station coordinates and each individual's detections (a home-range map), which roles below
 * ecologist only ever see generalised.
 */
export function analysesRoutes({ db, log }: AppDeps): Router {
  const router = Router();
  const runs = new AnalysisRuns(db, log);

  router.post('/projects/:slug/analyses', projectRole(db, 'ecologist'), async (req, res) => {
    const body = parseWith(createAnalysisSchema, req.body);
    const { row } = projectOf(req);
    const id = await createAnalysis(db, row, body, userOf(req).id, runs);
    res.status(201).json(await getAnalysis(db, row, id, runs));
  });

  router.get('/projects/:slug/analyses', projectRole(db, 'ecologist'), async (req, res) => {
    const page = parseWith(pageQuerySchema, req.query, 'query');
    res.json(await listAnalyses(db, projectOf(req).row.id, page));
  });

  router.get(
    '/projects/:slug/analyses/:analysisId',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['analysisId'], 'analysisId');
      res.json(await getAnalysis(db, projectOf(req).row, id, runs));
    },
  );

  router.get(
    '/projects/:slug/analyses/:analysisId/csv/:table',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['analysisId'], 'analysisId');
      const table = parseWith(tableSchema, req.params['table'], 'table');
      const { row } = projectOf(req);
      const saved = await db
        .selectFrom('analyses')
        .select(['inputs', 'name'])
        .where('id', '=', id)
        .where('project_id', '=', row.id)
        .executeTakeFirst();
      if (!saved) throw notFound('This analysis');
      res
        .type('text/csv; charset=utf-8')
        .attachment(csvFileName(`${row.slug}-${saved.name}`, table))
        .send(sessionCsv(JSON.parse(saved.inputs) as SessionInputs, table));
    },
  );

  router.post(
    '/projects/:slug/analyses/:analysisId/rerun',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['analysisId'], 'analysisId');
      // A caller who gives up frees the SECR worker: the fit is abandoned with the connection.
      const abandon = new AbortController();
      res.on('close', () => {
        if (!res.writableFinished) abandon.abort();
      });
      try {
        res.json(await rerunAnalysis(db, projectOf(req).row, id, abandon.signal));
      } catch (err) {
        if (abandon.signal.aborted) return;
        throw err;
      }
    },
  );

  return router;
}

import { Router } from 'express';
import { z } from 'zod';
import {
  closedRequestSchema,
  plotsRequestSchema,
  secrRequestSchema,
  twoSampleRequestSchema,
} from '../../shared/estimate';
import { idSchema } from '../../shared/ids';
import type { AppDeps } from '../app';
import { estimateClosed, estimatePlots, estimateTwoSample } from '../estimation';
import { signedIn, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { toClosedResponse, withInputErrorsAs400 } from '../services/estimates.service';
import { fitSecrOffThread, SecrJobs } from '../services/secr-fits.service';

const jobParamsSchema = z.object({ id: idSchema });

/**
 * Stateless estimation calculators for any signed-in user (no project data). An estimate that
 * does not exist is answered with 200, the estimate null and a plain-language `reason`; input the
 * estimators cannot use is a 400 (see shared/estimate-api.ts). SECR fits run in a worker thread.
 */
export function estimateRoutes({ log }: AppDeps): Router {
  const router = Router();
  const jobs = new SecrJobs(log);

  router.post('/estimate/two-sample', signedIn(), (req, res) => {
    const body = parseWith(twoSampleRequestSchema, req.body);
    res.json(withInputErrorsAs400(() => estimateTwoSample(body)));
  });

  router.post('/estimate/closed', signedIn(), (req, res) => {
    const { histories } = parseWith(closedRequestSchema, req.body);
    const result = withInputErrorsAs400(() => estimateClosed(histories));
    res.json(toClosedResponse(histories, result));
  });

  router.post('/estimate/plots', signedIn(), (req, res) => {
    const body = parseWith(plotsRequestSchema, req.body);
    res.json(withInputErrorsAs400(() => estimatePlots(body)));
  });

  router.post('/estimate/secr', signedIn(), async (req, res) => {
    const input = parseWith(secrRequestSchema, req.body);
    // A caller who gives up frees the worker: the fit is abandoned with the connection.
    const abandon = new AbortController();
    res.on('close', () => {
      if (!res.writableFinished) abandon.abort();
    });
    try {
      res.json(await fitSecrOffThread(input, undefined, abandon.signal));
    } catch (err) {
      if (abandon.signal.aborted) return; // nobody is left to answer
      throw err;
    }
  });

  router.post('/estimate/secr/jobs', signedIn(), (req, res) => {
    const input = parseWith(secrRequestSchema, req.body);
    res.status(202).json(jobs.start(userOf(req).id, input));
  });

  router.get('/estimate/secr/jobs/:id', signedIn(), (req, res) => {
    const { id } = parseWith(jobParamsSchema, req.params, 'params');
    res.json(jobs.view(userOf(req).id, id));
  });

  return router;
}

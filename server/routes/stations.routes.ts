import { Router } from 'express';
import { z } from 'zod';
import { idSchema } from '../../shared/ids';
import { createStationBodySchema, updateStationBodySchema } from '../../shared/stations';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { listDeployments } from '../services/deployments.service';
import {
  createStation,
  importStationsCsv,
  listStations,
  precisionFor,
  updateStation,
} from '../services/stations.service';

const importBodySchema = z
  .object({ csv: z.string().min(1, { message: 'The CSV file is empty.' }).max(900_000) })
  .strict();
const importQuerySchema = z
  .object({ dryRun: z.enum(['0', '1', 'true', 'false']).optional() })
  .strict();

/** Stations: list with effort, create and edit (ecologists), CSV import with a per-row report. */
export function stationsRoutes({ db }: AppDeps): Router {
  const router = Router();

  router.get(
    '/projects/:slug/stations',
    projectRole(db, 'volunteer', { allowAdmin: true }),
    async (req, res) => {
      const { row, role, viaAdmin } = projectOf(req);
      res.json(await listStations(db, row, precisionFor(row, role, viaAdmin)));
    },
  );

  router.post('/projects/:slug/stations', projectRole(db, 'ecologist'), async (req, res) => {
    const body = parseWith(createStationBodySchema, req.body);
    const { row } = projectOf(req);
    const station = await createStation(db, row.id, body, userOf(req).id);
    const view = (await listStations(db, row, undefined)).find((s) => s.id === station.id);
    res.status(201).json(view);
  });

  router.post('/projects/:slug/stations/import', projectRole(db, 'ecologist'), async (req, res) => {
    const query = parseWith(importQuerySchema, req.query, 'query');
    const body = parseWith(importBodySchema, req.body);
    const dryRun = query.dryRun === '1' || query.dryRun === 'true';
    const report = await importStationsCsv(
      db,
      projectOf(req).row.id,
      body.csv,
      userOf(req).id,
      dryRun,
    );
    if (report.problems.length) {
      const rows = report.problems.length;
      throw new ApiError(
        'validation_failed',
        `${rows} row${rows > 1 ? 's have' : ' has'} problems; nothing was imported. Fix the file and try again.`,
        { report },
      );
    }
    res.status(dryRun ? 200 : 201).json(report);
  });

  router.get(
    '/projects/:slug/stations/:stationId',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const stationId = parseWith(idSchema, req.params['stationId'], 'stationId');
      const { row, role } = projectOf(req);
      const station = (await listStations(db, row, precisionFor(row, role))).find(
        (s) => s.id === stationId,
      );
      if (!station) throw new ApiError('not_found', 'This station was not found.');
      res.json({ ...station, deploymentList: await listDeployments(db, row.id, stationId) });
    },
  );

  router.patch(
    '/projects/:slug/stations/:stationId',
    projectRole(db, 'ecologist'),
    async (req, res) => {
      const stationId = parseWith(idSchema, req.params['stationId'], 'stationId');
      const body = parseWith(updateStationBodySchema, req.body);
      const { row } = projectOf(req);
      await updateStation(db, row.id, stationId, body, userOf(req).id);
      res.json((await listStations(db, row, undefined)).find((s) => s.id === stationId));
    },
  );

  return router;
}

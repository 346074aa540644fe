import { Router } from 'express';
import { z } from 'zod';
import {
  dismissBodySchema,
  mergeBodySchema,
  resolveBodySchema,
  splitBodySchema,
} from '../../shared/curate';
import { idSchema } from '../../shared/ids';
import type { AppDeps } from '../app';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { changeViews } from '../services/change-views.service';
import { sendCurateDigest } from '../services/digest.service';
import { disputedSightings, resolveDispute } from '../services/disputes.service';
import { dismissDuplicate, suggestDuplicates } from '../services/duplicates.service';
import { mergeIndividuals, splitIndividual } from '../services/identity-changes.service';
import { undoChange } from '../services/undo.service';

const undoBodySchema = z.object({ reason: z.string().trim().max(1000).default('') }).strict();

/** Curate: disputes, suggested duplicates, merges, splits, the history of identity changes and undo. */
export function curateRoutes({ db, mailer, config }: AppDeps): Router {
  const router = Router();
  const one = async (projectId: string, id: string) => (await changeViews(db, projectId, [id]))[0];

  router.post(
    '/projects/:slug/individuals/:individualId/merge',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['individualId'], 'individualId');
      const body = parseWith(mergeBodySchema, req.body);
      const { row } = projectOf(req);
      const change = await mergeIndividuals(db, row, id, body, userOf(req).id);
      res.json({ change: await one(row.id, change.id) });
    },
  );

  router.post(
    '/projects/:slug/individuals/:individualId/split',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['individualId'], 'individualId');
      const body = parseWith(splitBodySchema, req.body);
      const { row } = projectOf(req);
      const change = await splitIndividual(db, row, id, body, userOf(req).id);
      res.json({ change: await one(row.id, change.id) });
    },
  );

  router.post(
    '/projects/:slug/identity-changes/:changeId/undo',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['changeId'], 'changeId');
      const body = parseWith(undoBodySchema, req.body ?? {});
      const { row } = projectOf(req);
      const undo = await undoChange(db, row, id, userOf(req).id, body.reason);
      res.json({ change: await one(row.id, undo.id) });
    },
  );

  router.get('/projects/:slug/identity-changes', projectRole(db, 'curator'), async (req, res) => {
    res.json(await changeViews(db, projectOf(req).row.id));
  });

  router.get('/projects/:slug/disputes', projectRole(db, 'curator'), async (req, res) => {
    res.json(await disputedSightings(db, projectOf(req).row.id));
  });

  router.post(
    '/projects/:slug/sightings/:sightingId/resolve',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      const body = parseWith(resolveBodySchema, req.body);
      const { row } = projectOf(req);
      const change = await resolveDispute(db, row, id, body, userOf(req).id);
      res.json({ change: await one(row.id, change.id) });
    },
  );

  router.get('/projects/:slug/duplicates', projectRole(db, 'curator'), async (req, res) => {
    res.json(await suggestDuplicates(db, projectOf(req).row.id));
  });

  router.post(
    '/projects/:slug/duplicates/dismiss',
    projectRole(db, 'curator'),
    async (req, res) => {
      const body = parseWith(dismissBodySchema, req.body);
      await dismissDuplicate(
        db,
        projectOf(req).row.id,
        body.first,
        body.second,
        userOf(req).id,
        body.reason ?? '',
      );
      res.status(204).end();
    },
  );

  router.post('/projects/:slug/curate/digest', projectRole(db, 'curator'), async (req, res) => {
    res.json(await sendCurateDigest(db, mailer, projectOf(req).row, config.publicUrl));
  });

  router.get('/projects/:slug/calls/mine', projectRole(db, 'reviewer'), async (req, res) => {
    const { row } = projectOf(req);
    const calls = await db
      .selectFrom('calls')
      .innerJoin('sightings', 'sightings.id', 'calls.sighting_id')
      .leftJoin('individuals as called', 'called.id', 'calls.individual_id')
      .leftJoin('individuals as final', 'final.id', 'sightings.individual_id')
      .select([
        'calls.id',
        'calls.sighting_id',
        'calls.verdict',
        'calls.created_at',
        'called.code as calledCode',
        'sightings.state',
        'final.code as finalCode',
      ])
      .where('calls.project_id', '=', row.id)
      .where('calls.reviewer_id', '=', userOf(req).id)
      .orderBy('calls.created_at', 'desc')
      .limit(200)
      .execute();
    res.json(
      calls.map((c) => ({
        callId: c.id,
        sightingId: c.sighting_id,
        verdict: c.verdict,
        calledCode: c.calledCode,
        at: c.created_at,
        outcome: c.state,
        finalCode: c.finalCode,
      })),
    );
  });

  return router;
}

import { Router } from 'express';
import { z } from 'zod';
import { idSchema } from '../../shared/ids';
import { roleAtLeast } from '../../shared/roles';
import {
  SORT_LABELS,
  batchLabelBodySchema,
  createSightingBodySchema,
  labelBodySchema,
  sortNextQuerySchema,
  speciesListBodySchema,
  updateSightingBodySchema,
} from '../../shared/sort';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { decodeCursor, encodeCursor } from '../services/cursor';
import { eventViews } from '../services/event-views.service';
import { projectProgress, relativeAbundance } from '../services/overview.service';
import { createSighting, deleteSighting, updateSighting } from '../services/sightings.service';
import { labelBatch, labelEvent, leaseNext, releaseLeases } from '../services/sort.service';
import { projectSpecies, setProjectSpecies } from '../services/species.service';

const eventListQuerySchema = z
  .object({
    label: z.enum([...SORT_LABELS, 'unclassified']).optional(),
    species: z.string().max(120).optional(),
    stationId: idSchema.optional(),
    deploymentId: idSchema.optional(),
    from: z.iso.datetime({ offset: true }).optional(),
    to: z.iso.datetime({ offset: true }).optional(),
    flag: z.string().max(40).optional(),
    after: z.string().max(200).optional(),
    limit: z.coerce.number().int().min(1).max(200).default(50),
  })
  .strict();

/** Sort: the leased queue, labels (single and batch), sightings, species list, progress and index. */
export function sortRoutes({ db, ingest }: AppDeps): Router {
  const router = Router();

  router.get('/projects/:slug/sort/next', projectRole(db, 'reviewer'), async (req, res) => {
    const query = parseWith(sortNextQuerySchema, req.query, 'query');
    const { row, role } = projectOf(req);
    res.json({ events: await leaseNext(db, row, userOf(req), role, query) });
  });

  router.post('/projects/:slug/sort/release', projectRole(db, 'reviewer'), async (req, res) => {
    await releaseLeases(db, projectOf(req).row.id, userOf(req).id);
    res.status(204).end();
  });

  router.get('/projects/:slug/events', projectRole(db, 'reviewer'), async (req, res) => {
    const query = parseWith(eventListQuerySchema, req.query, 'query');
    const { row, role } = projectOf(req);
    let q = db
      .selectFrom('events')
      .select(['events.id', 'events.start'])
      .where('events.project_id', '=', row.id);
    if (query.label === 'unclassified') q = q.where('events.label', 'is', null);
    else if (query.label) q = q.where('events.label', '=', query.label);
    if (query.species) q = q.where('events.species', '=', query.species);
    if (query.stationId) q = q.where('events.station_id', '=', query.stationId);
    if (query.from) q = q.where('events.start', '>=', new Date(query.from).toISOString());
    if (query.to) q = q.where('events.start', '<', new Date(query.to).toISOString());
    if (query.deploymentId || query.flag) {
      q = q.where((eb) =>
        eb.exists(
          eb
            .selectFrom('photos')
            .select('photos.id')
            .whereRef('photos.event_id', '=', 'events.id')
            .$if(Boolean(query.deploymentId), (w) =>
              w.where('photos.deployment_id', '=', query.deploymentId!),
            )
            .$if(Boolean(query.flag), (w) => w.where('photos.flags', 'like', `%"${query.flag}"%`)),
        ),
      );
    }
    if (query.after) {
      const [start, id] = decodeCursor(query.after, 2) as [string, string];
      q = q.where((eb) =>
        eb.or([
          eb('events.start', '>', start),
          eb.and([eb('events.start', '=', start), eb('events.id', '>', id)]),
        ]),
      );
    }
    const rows = await q
      .orderBy('events.start')
      .orderBy('events.id')
      .limit(query.limit + 1)
      .execute();
    const page = rows.slice(0, query.limit);
    const last = rows.length > query.limit ? page[page.length - 1] : undefined;
    res.json({
      items: await eventViews(
        db,
        page.map((r) => r.id),
        role,
      ),
      next: last ? encodeCursor([last.start, last.id]) : null,
    });
  });

  router.get('/projects/:slug/events/:eventId', projectRole(db, 'reviewer'), async (req, res) => {
    const eventId = parseWith(idSchema, req.params['eventId'], 'eventId');
    const { row, role } = projectOf(req);
    const [view] = await eventViews(db, [eventId], role);
    if (
      !view ||
      (
        await db
          .selectFrom('events')
          .select('project_id')
          .where('id', '=', eventId)
          .executeTakeFirst()
      )?.project_id !== row.id
    ) {
      throw new ApiError('not_found', 'This event was not found.');
    }
    const history = await db
      .selectFrom('audit_log')
      .leftJoin('users', 'users.id', 'audit_log.user_id')
      .select([
        'audit_log.action',
        'audit_log.at',
        'audit_log.before',
        'audit_log.after',
        'users.name',
      ])
      .where('audit_log.entity', '=', 'event')
      .where('audit_log.entity_id', '=', eventId)
      .orderBy('audit_log.at')
      .execute();
    res.json({
      ...view,
      history: history.map((h) => ({
        action: h.action,
        at: h.at,
        by: h.name ?? 'a former member',
        before: h.before ? (JSON.parse(h.before) as unknown) : null,
        after: h.after ? (JSON.parse(h.after) as unknown) : null,
      })),
    });
  });

  router.post(
    '/projects/:slug/events/:eventId/label',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const eventId = parseWith(idSchema, req.params['eventId'], 'eventId');
      const body = parseWith(labelBodySchema, req.body);
      const { row, role } = projectOf(req);
      await labelEvent(db, row, userOf(req), eventId, body);
      if (body.label === 'human') ingest.runner.kick();
      const [view] = await eventViews(db, [eventId], role);
      res.json(view);
    },
  );

  router.post(
    '/projects/:slug/events/label-batch',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const body = parseWith(batchLabelBodySchema, req.body);
      const { eventIds, ...label } = body;
      const results = await labelBatch(db, projectOf(req).row, userOf(req), eventIds, label);
      if (label.label === 'human') ingest.runner.kick();
      res.json({ results, labelled: results.filter((r) => r.ok).length });
    },
  );

  router.post(
    '/projects/:slug/events/:eventId/sightings',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const eventId = parseWith(idSchema, req.params['eventId'], 'eventId');
      const body = parseWith(createSightingBodySchema, req.body);
      res
        .status(201)
        .json(await createSighting(db, projectOf(req).row, eventId, body, userOf(req).id));
    },
  );

  router.patch(
    '/projects/:slug/sightings/:sightingId',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      const body = parseWith(updateSightingBodySchema, req.body);
      res.json(await updateSighting(db, projectOf(req).row, id, body, userOf(req).id));
    },
  );

  router.delete(
    '/projects/:slug/sightings/:sightingId',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      await deleteSighting(db, projectOf(req).row, id, userOf(req).id);
      res.status(204).end();
    },
  );

  router.get('/projects/:slug/species', projectRole(db, 'volunteer'), async (req, res) => {
    res.json(await projectSpecies(db, projectOf(req).row));
  });

  router.put('/projects/:slug/species', projectRole(db, 'ecologist'), async (req, res) => {
    const body = parseWith(speciesListBodySchema, req.body);
    const { row } = projectOf(req);
    await setProjectSpecies(db, row, body.species, userOf(req).id);
    res.json(await projectSpecies(db, row));
  });

  router.get('/projects/:slug/progress', projectRole(db, 'volunteer'), async (req, res) => {
    const { row, role } = projectOf(req);
    res.json(await projectProgress(db, row, !roleAtLeast(role, 'reviewer')));
  });

  router.get(
    '/projects/:slug/relative-abundance',
    projectRole(db, 'volunteer'),
    async (req, res) => {
      const { row, role } = projectOf(req);
      res.json(await relativeAbundance(db, row, roleAtLeast(role, 'reviewer')));
    },
  );

  return router;
}

import { Router } from 'express';
import { z } from 'zod';
import {
  callBodySchema,
  catalogueQuerySchema,
  referencesBodySchema,
  updateIndividualBodySchema,
  type CatalogueEntry,
} from '../../shared/identify';
import { idSchema } from '../../shared/ids';
import type { AppDeps } from '../app';
import { ApiError } from '../errors/api-error';
import { projectOf, projectRole, userOf } from '../middleware/access';
import { parseWith } from '../middleware/validate';
import { makeCall } from '../services/calls.service';
import { CATALOGUE_SEARCH, catalogueVersion, textScores } from '../services/catalogue-cache';
import { CatalogueSearch } from '../services/catalogue-search';
import {
  candidatesWithPattern,
  leaseNextSighting,
  releaseSighting,
  sightingToIdentify,
} from '../services/identify.service';
import { individualDetail } from '../services/individual-detail.service';
import { patternMatches } from '../services/pattern.service';
import {
  catalogueEntries,
  resolveIndividual,
  setReferences,
  updateIndividual,
} from '../services/individuals.service';

declare module 'express-session' {
  interface SessionData {
    /** Sightings this reviewer skipped on the Identify screen (not offered again this session). */
    skippedSightings?: string[];
  }
}

const candidatesQuerySchema = z.object({ q: z.string().max(300).optional() }).strict();
const skipBodySchema = z.object({ sightingId: idSchema }).strict();

const CATALOGUE_KEYS = {
  ...CATALOGUE_SEARCH,
  keys: [...CATALOGUE_SEARCH.keys, { name: 'aliases', weight: 3 }],
};
const catalogueSearchers = new Map<
  string,
  { version: number; count: number; search: CatalogueSearch<CatalogueEntry> }
>();

/** The catalogue's text index, kept until the catalogue changes (it is costly for thousands). */
function catalogueSearch(projectId: string, status: string, entries: CatalogueEntry[]) {
  const key = `${projectId}:${status}`;
  const version = catalogueVersion(projectId);
  const cached = catalogueSearchers.get(key);
  if (cached && cached.version === version && cached.count === entries.length) return cached.search;
  const search = new CatalogueSearch(entries, CATALOGUE_KEYS);
  catalogueSearchers.set(key, { version, count: entries.length, search });
  return search;
}

function filterCatalogue(
  projectId: string,
  entries: CatalogueEntry[],
  query: z.infer<typeof catalogueQuerySchema>,
  stationCodes: Set<string> | null,
) {
  let list = entries;
  if (query.sex) list = list.filter((e) => e.sex === query.sex);
  if (query.coverage === 'both') list = list.filter((e) => e.coverage.left && e.coverage.right);
  if (query.coverage === 'left') list = list.filter((e) => e.coverage.left && !e.coverage.right);
  if (query.coverage === 'right') list = list.filter((e) => e.coverage.right && !e.coverage.left);
  if (query.coverage === 'partial') list = list.filter((e) => e.coverage.partial);
  if (query.coverage === 'none') list = list.filter((e) => !e.coverage.left && !e.coverage.right);
  if (stationCodes) list = list.filter((e) => e.stations.some((s) => stationCodes.has(s)));
  if (query.seenAfter)
    list = list.filter((e) => e.lastSeen !== null && e.lastSeen >= query.seenAfter!);
  const text = query.query?.trim();
  const exact = text
    ? list.filter((e) => e.code === text.toUpperCase() || e.aliases.includes(text.toUpperCase()))
    : [];
  if (exact.length) return exact;
  if (text) {
    // Other filters may leave few of the best text matches: then every match is scored.
    const filtered = list.length < entries.length;
    const search = catalogueSearch(projectId, query.status, entries);
    const scores = textScores(search, text, filtered ? entries.length : query.limit);
    list = list
      .filter((e) => (scores.get(e.id) ?? 0) > 0)
      .sort((x, y) => (scores.get(y.id) ?? 0) - (scores.get(x.id) ?? 0));
  }
  return list.slice(0, query.limit);
}

/** Identify (the queue, candidates, calls) and the Catalogue of individuals. */
export function identifyRoutes({ db, ingest }: AppDeps): Router {
  const router = Router();

  router.get('/projects/:slug/identify/next', projectRole(db, 'reviewer'), async (req, res) => {
    const { row } = projectOf(req);
    const user = userOf(req);
    const id = await leaseNextSighting(db, row.id, user.id, req.session.skippedSightings ?? []);
    if (!id) {
      res.status(204).end();
      return;
    }
    const sighting = await sightingToIdentify(db, row.id, id);
    const ranked = await candidatesWithPattern(db, ingest.pattern, row, sighting);
    res.json({ sighting, ...ranked });
  });

  router.post('/projects/:slug/identify/skip', projectRole(db, 'reviewer'), async (req, res) => {
    const body = parseWith(skipBodySchema, req.body);
    await releaseSighting(db, body.sightingId, userOf(req).id);
    req.session.skippedSightings = [
      ...(req.session.skippedSightings ?? []).slice(-199),
      body.sightingId,
    ];
    res.status(204).end();
  });

  router.get(
    '/projects/:slug/sightings/:sightingId/candidates',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      const query = parseWith(candidatesQuerySchema, req.query, 'query');
      const { row } = projectOf(req);
      const sighting = await sightingToIdentify(db, row.id, id);
      res.json(
        (await candidatesWithPattern(db, ingest.pattern, row, sighting, query.q)).candidates,
      );
    },
  );

  router.get(
    '/projects/:slug/sightings/:sightingId/pattern-matches/:photoId',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      const photoId = parseWith(idSchema, req.params['photoId'], 'photoId');
      const { row } = projectOf(req);
      const sighting = await sightingToIdentify(db, row.id, id);
      const view = await patternMatches(
        db,
        ingest.pattern,
        row.id,
        {
          id: sighting.id,
          bestPhotoId: sighting.bestPhoto.id,
          crop: sighting.crop,
          flank: sighting.flank,
        },
        photoId,
      );
      res.json(view);
    },
  );

  router.post(
    '/projects/:slug/sightings/:sightingId/calls',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['sightingId'], 'sightingId');
      const body = parseWith(callBodySchema, req.body);
      res.json(await makeCall(db, projectOf(req).row, userOf(req), id, body));
    },
  );

  router.get('/projects/:slug/individuals', projectRole(db, 'reviewer'), async (req, res) => {
    const query = parseWith(catalogueQuerySchema, req.query, 'query');
    const { row } = projectOf(req);
    let stationCodes: Set<string> | null = null;
    if (query.stationId) {
      const station = await db
        .selectFrom('stations')
        .select('code')
        .where('id', '=', query.stationId)
        .where('project_id', '=', row.id)
        .executeTakeFirst();
      stationCodes = new Set(station ? [station.code] : []);
    }
    res.json(
      filterCatalogue(row.id, await catalogueEntries(db, row, query.status), query, stationCodes),
    );
  });

  router.get(
    '/projects/:slug/individuals/:idOrCode',
    projectRole(db, 'reviewer'),
    async (req, res) => {
      const key = String(req.params['idOrCode'] ?? '');
      if (!/^[A-Za-z0-9-]{1,40}$/.test(key))
        throw new ApiError('bad_request', 'This is not an individual id or code.');
      const { row, role } = projectOf(req);
      const individual = await resolveIndividual(db, row.id, key);
      res.json(await individualDetail(db, row, individual, role, key));
    },
  );

  router.patch(
    '/projects/:slug/individuals/:individualId',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['individualId'], 'individualId');
      const body = parseWith(updateIndividualBodySchema, req.body);
      const { row, role } = projectOf(req);
      await updateIndividual(db, row.id, id, body, userOf(req).id);
      res.json(await individualDetail(db, row, await resolveIndividual(db, row.id, id), role, id));
    },
  );

  router.put(
    '/projects/:slug/individuals/:individualId/references',
    projectRole(db, 'curator'),
    async (req, res) => {
      const id = parseWith(idSchema, req.params['individualId'], 'individualId');
      const body = parseWith(referencesBodySchema, req.body);
      const { row, role } = projectOf(req);
      await setReferences(db, row.id, id, body.flank, body.photoIds, userOf(req).id);
      res.json(await individualDetail(db, row, await resolveIndividual(db, row.id, id), role, id));
    },
  );

  return router;
}

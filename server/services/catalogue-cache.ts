import type { FuseResult } from 'fuse.js';
import type { ReferencePhotoView } from '../../shared/identify';
import type { Db } from '../db/database';
import { CatalogueSearch } from './catalogue-search';
import { referencesOf } from './individuals.service';

/** What candidate ranking needs to know about one active individual. */
export interface PoolEntry {
  id: string;
  code: string;
  nickname: string | null;
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
  references: ReferencePhotoView[];
  /** Confirmed detections, newest last (at most the last 30). */
  detections: { stationId: string; time: number }[];
  flanks: Set<string>;
}

/** The active catalogue of a project, with a search index, cached until the catalogue changes. */
export interface CandidatePool {
  version: number;
  entries: PoolEntry[];
  byId: Map<string, PoolEntry>;
  search: CatalogueSearch<PoolEntry>;
}

const versions = new Map<string, number>();
const pools = new Map<string, CandidatePool>();

/** How often a project's catalogue has changed since the server started (a cache key). */
export function catalogueVersion(projectId: string): number {
  return versions.get(projectId) ?? 0;
}

/** Marks a project's catalogue as changed (new individual, call, merge, edit). */
export function bumpCatalogue(projectId: string): void {
  versions.set(projectId, (versions.get(projectId) ?? 0) + 1);
}

/** The fuse.js options used everywhere the catalogue is searched by text. */
export const CATALOGUE_SEARCH = {
  keys: [
    { name: 'code', weight: 3 },
    { name: 'nickname', weight: 2 },
    { name: 'tags', weight: 2 },
    { name: 'notes', weight: 1 },
  ],
  threshold: 0.45,
  ignoreLocation: true,
  includeScore: true,
  useExtendedSearch: false,
};

/** The cached pool, rebuilt when the catalogue version moved on. */
export async function candidatePool(db: Db, projectId: string): Promise<CandidatePool> {
  const version = versions.get(projectId) ?? 0;
  const cached = pools.get(projectId);
  if (cached && cached.version === version) return cached;
  const rows = await db
    .selectFrom('individuals')
    .select(['id', 'code', 'nickname', 'sex', 'notes', 'tags'])
    .where('project_id', '=', projectId)
    .where('status', '=', 'active')
    .execute();
  const seen = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .select(['sightings.individual_id', 'sightings.flank', 'events.station_id', 'events.start'])
    .where('sightings.project_id', '=', projectId)
    .where('sightings.state', '=', 'confirmed')
    .orderBy('events.start')
    .execute();
  const refs = await referencesOf(
    db,
    rows.map((r) => r.id),
  );
  const detections = new Map<string, PoolEntry['detections']>();
  const flanks = new Map<string, Set<string>>();
  for (const s of seen) {
    if (!s.individual_id) continue;
    const list = detections.get(s.individual_id) ?? [];
    list.push({ stationId: s.station_id, time: Date.parse(s.start) });
    if (list.length > 30) list.shift();
    detections.set(s.individual_id, list);
    flanks.set(s.individual_id, (flanks.get(s.individual_id) ?? new Set()).add(s.flank));
  }
  const entries: PoolEntry[] = rows.map((r) => ({
    id: r.id,
    code: r.code ?? '',
    nickname: r.nickname,
    sex: r.sex as PoolEntry['sex'],
    notes: r.notes,
    tags: JSON.parse(r.tags) as string[],
    references: refs.get(r.id) ?? [],
    detections: detections.get(r.id) ?? [],
    flanks: flanks.get(r.id) ?? new Set(),
  }));
  const pool: CandidatePool = {
    version,
    entries,
    byId: new Map(entries.map((e) => [e.id, e])),
    search: new CatalogueSearch(entries, CATALOGUE_SEARCH),
  };
  pools.set(projectId, pool);
  return pool;
}

/**
 * Text relevance per entry, 0..1. A description such as "notched left ear, broken rosette on
 * shoulder" is split into phrases; each phrase is searched on its own and the scores averaged, so
 * an animal matching every phrase ranks above one matching a single phrase well.
 */
export function textScores<T extends { id: string }>(
  searcher: { search(phrase: string, options: { limit: number }): FuseResult<T>[] },
  query: string,
  limit = 500,
): Map<string, number> {
  const phrases = query
    .split(/[,;+]|\band\b/i)
    .map((p) => p.trim())
    .filter((p) => p.length > 1);
  const scores = new Map<string, number>();
  if (phrases.length === 0) return scores;
  for (const phrase of phrases) {
    for (const hit of searcher.search(phrase, { limit })) {
      const s = (1 - (hit.score ?? 1)) / phrases.length;
      scores.set(hit.item.id, (scores.get(hit.item.id) ?? 0) + s);
    }
  }
  return scores;
}

/**
 * Catalogue text search in this process, one thread, no database: fuse.js with the app's own
 * options (`CATALOGUE_SEARCH`) over synthetic individuals' codes, nicknames, marking notes and
 * tags, queried through `textScores` as candidate ranking does (a description split into phrases,
 * each phrase searched over every individual).
 */
import Fuse from 'fuse.js';
import { CATALOGUE_SEARCH, textScores } from '../server/services/catalogue-cache';
import { Rng } from '../seeds/photos/random';
import { searchQueries, syntheticDescription, type SearchQuery } from './identify-text';
import { percentile, round } from './report';
import { median } from './sort-diagnose';

/** Median, p95 and max of a set of times. */
export interface Spread {
  count: number;
  medianMs: number;
  p95Ms: number;
  maxMs: number;
}

/** The figures of the search phase. */
export interface SearchFigures {
  individuals: number;
  /** Queries drawn, and how many were timed before the time budget ran out (a random sample). */
  queries: number;
  timed: number;
  budgetSeconds: number;
  /** Building the fuse.js index over every individual (median of three builds, ms). */
  indexBuildMs: number;
  indexBuilds: number[];
  /** `textScores` per query, as ranking calls it, over all queries and by kind of query. */
  all: Spread & { meanHits: number };
  byKind: Record<string, Spread>;
  /** The slowest queries, for looking into. */
  slowest: { query: string; ms: number }[];
  examples: string[];
  meanNotesChars: number;
  meanTags: number;
}

function spread(ms: number[]): Spread {
  return {
    count: ms.length,
    medianMs: round(median(ms), 2),
    p95Ms: round(percentile(ms, 95), 2),
    maxMs: round(Math.max(...ms), 2),
  };
}

function catalogue(individuals: number, rng: Rng) {
  return Array.from({ length: individuals }, (_, i) => {
    const d = syntheticDescription(rng);
    return {
      id: `ind-${i}`,
      code: `BN-${String(i + 1).padStart(3, '0')}`,
      nickname: d.nickname,
      notes: d.notes,
      tags: d.tags,
    };
  });
}

/**
 * Times the index build and up to `queries` searches over `individuals` synthetic animals, for at
 * most `budgetSeconds` of searching (0: no limit); queries come in random order, so the ones timed
 * are a fair sample of the kinds.
 */
export function measureSearch(
  individuals: number,
  queries: number,
  budgetSeconds: number,
): SearchFigures {
  const rng = new Rng(2026).fork('bench-identify-search');
  const entries = catalogue(individuals, rng);
  const indexBuilds: number[] = [];
  let fuse = new Fuse(entries, CATALOGUE_SEARCH);
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    fuse = new Fuse(entries, CATALOGUE_SEARCH);
    indexBuilds.push(round(performance.now() - t0, 1));
  }
  const list: SearchQuery[] = searchQueries(
    rng.fork('queries'),
    queries,
    entries.map((e) => e.code),
  );
  // Warm the JIT on a small catalogue of its own before timing.
  const warm = new Fuse(catalogue(200, rng.fork('warm-up')), CATALOGUE_SEARCH);
  for (const q of searchQueries(rng.fork('warm-up'), 50, ['BN-001'])) textScores(warm, q.text);

  const times: number[] = [];
  const byKind = new Map<string, number[]>();
  const timed: { query: string; ms: number }[] = [];
  let hits = 0;
  const deadline = performance.now() + budgetSeconds * 1000;
  for (const query of list) {
    if (budgetSeconds > 0 && performance.now() > deadline) break;
    const t0 = performance.now();
    const scores = textScores(fuse, query.text);
    const ms = performance.now() - t0;
    times.push(ms);
    byKind.set(query.kind, [...(byKind.get(query.kind) ?? []), ms]);
    timed.push({ query: query.text, ms: round(ms, 1) });
    hits += scores.size;
  }
  return {
    individuals,
    queries: list.length,
    timed: times.length,
    budgetSeconds,
    indexBuildMs: round(median(indexBuilds), 1),
    indexBuilds,
    all: { ...spread(times), meanHits: round(hits / times.length, 1) },
    byKind: Object.fromEntries([...byKind].map(([kind, ms]) => [kind, spread(ms)])),
    slowest: timed.sort((a, b) => b.ms - a.ms).slice(0, 5),
    examples: list.slice(0, 8).map((q) => q.text),
    meanNotesChars: round(entries.reduce((s, e) => s + e.notes.length, 0) / entries.length, 0),
    meanTags: round(entries.reduce((s, e) => s + e.tags.length, 0) / entries.length, 1),
  };
}

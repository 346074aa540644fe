/**
 * Catalogue text search in this process, one thread, no database, over synthetic individuals'
 * codes, nicknames, marking notes and tags, queried through `textScores` as candidate ranking does
 * (a description split into phrases, each phrase searched on its own). Two searchers answer every
 * query in turn: the app's `CatalogueSearch` (word-index shortlist, then fuse.js) and, as the
 * baseline, fuse.js with the same options over every individual. Besides the times, the run
 * reports how often both find the same best score and how many of the top five scores agree.
 */
import Fuse from 'fuse.js';
import { CATALOGUE_SEARCH, textScores } from '../server/services/catalogue-cache';
import { CatalogueSearch, SHORTLIST_SIZE } from '../server/services/catalogue-search';
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
  /** Building the app's searcher over every individual (median of three builds, ms). */
  indexBuildMs: number;
  indexBuilds: number[];
  /** The baseline's index build (fuse.js over every individual), ms. */
  baselineIndexBuildMs: number;
  /** `textScores` per query with the app's searcher, over all queries and by kind of query. */
  all: Spread & { meanHits: number };
  byKind: Record<string, Spread>;
  /** The same queries through fuse.js over every individual. */
  baseline: Spread & { meanHits: number };
  /** Baseline median ÷ app median. */
  speedup: number;
  /** Share of queries where both find the same best score, and of top-five scores found. */
  sameBest: number;
  /** Share of queries whose best score is within 0.01 of the baseline's (no clearly better miss). */
  nearBest: number;
  topFiveOverlap: number;
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
function topIds(scores: Map<string, number>, n: number): string[] {
  return [...scores]
    .sort((a, b) => b[1] - a[1] || (a[0] < b[0] ? -1 : 1))
    .slice(0, n)
    .map(([id]) => id);
}

export function measureSearch(
  individuals: number,
  queries: number,
  budgetSeconds: number,
): SearchFigures {
  const rng = new Rng(2026).fork('bench-identify-search');
  const entries = catalogue(individuals, rng);
  const indexBuilds: number[] = [];
  let search = new CatalogueSearch(entries, CATALOGUE_SEARCH);
  for (let i = 0; i < 3; i++) {
    const t0 = performance.now();
    search = new CatalogueSearch(entries, CATALOGUE_SEARCH);
    search.prepare();
    indexBuilds.push(round(performance.now() - t0, 1));
  }
  const b0 = performance.now();
  const fuse = new Fuse(entries, CATALOGUE_SEARCH);
  const baselineIndexBuildMs = round(performance.now() - b0, 1);
  const list: SearchQuery[] = searchQueries(
    rng.fork('queries'),
    queries,
    entries.map((e) => e.code),
  );
  // Warm the JIT on a small catalogue of its own before timing.
  const warmEntries = catalogue(400, rng.fork('warm-up'));
  const warm = new CatalogueSearch(warmEntries, CATALOGUE_SEARCH);
  const warmFuse = new Fuse(warmEntries, CATALOGUE_SEARCH);
  for (const q of searchQueries(rng.fork('warm-up'), 50, ['BN-001'])) {
    textScores(warm, q.text, SHORTLIST_SIZE);
    textScores(warmFuse, q.text);
  }

  const times: number[] = [];
  const baseTimes: number[] = [];
  const byKind = new Map<string, number[]>();
  const timed: { query: string; ms: number }[] = [];
  let hits = 0;
  let baseHits = 0;
  let sameBest = 0;
  let nearBest = 0;
  let overlap = 0;
  const deadline = performance.now() + budgetSeconds * 1000;
  for (const query of list) {
    if (budgetSeconds > 0 && performance.now() > deadline) break;
    const t0 = performance.now();
    const scores = textScores(search, query.text, SHORTLIST_SIZE);
    const ms = performance.now() - t0;
    const t1 = performance.now();
    const base = textScores(fuse, query.text);
    baseTimes.push(performance.now() - t1);
    times.push(ms);
    byKind.set(query.kind, [...(byKind.get(query.kind) ?? []), ms]);
    timed.push({ query: query.text, ms: round(ms, 1) });
    hits += scores.size;
    baseHits += base.size;
    const ours = topIds(scores, 5);
    const theirs = topIds(base, 5);
    // Ties are common (many animals share a mark), so compare scores, not ids: the same best
    // score means no better match was missed; the overlap counts top-five scores found.
    const ourScores = ours.map((id) => scores.get(id)!);
    const theirScores = theirs.map((id) => base.get(id)!);
    if (theirScores.length === 0 || Math.abs((ourScores[0] ?? 0) - theirScores[0]!) < 1e-9)
      sameBest++;
    if (theirScores.length === 0 || (ourScores[0] ?? 0) >= theirScores[0]! - 0.01) nearBest++;
    if (theirScores.length)
      overlap +=
        theirScores.filter((v, k) => Math.abs((ourScores[k] ?? -1) - v) < 1e-9).length /
        theirScores.length;
  }
  const all = { ...spread(times), meanHits: round(hits / times.length, 1) };
  const baseline = { ...spread(baseTimes), meanHits: round(baseHits / baseTimes.length, 1) };
  return {
    individuals,
    queries: list.length,
    timed: times.length,
    budgetSeconds,
    indexBuildMs: round(median(indexBuilds), 1),
    indexBuilds,
    baselineIndexBuildMs,
    all,
    byKind: Object.fromEntries([...byKind].map(([kind, ms]) => [kind, spread(ms)])),
    baseline,
    speedup: round(baseline.medianMs / all.medianMs, 1),
    sameBest: round(sameBest / times.length, 3),
    nearBest: round(nearBest / times.length, 3),
    topFiveOverlap: round(overlap / times.length, 3),
    slowest: timed.sort((a, b) => b.ms - a.ms).slice(0, 5),
    examples: list.slice(0, 8).map((q) => q.text),
    meanNotesChars: round(entries.reduce((s, e) => s + e.notes.length, 0) / entries.length, 0),
    meanTags: round(entries.reduce((s, e) => s + e.tags.length, 0) / entries.length, 1),
  };
}

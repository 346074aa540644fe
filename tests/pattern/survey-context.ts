/**
 * A synthetic survey around the held-out photo set, for judging the Identify ranking's other
 * signals beside the coat pattern: stations on a 2 km grid, each catalogued individual with a
 * home station, earlier detections near it, a sex and marking notes drawn from a small shared
 * list (so several animals share each note). A query is seen at its individual's home station or
 * a neighbouring one, and the reviewer types one of its notes for some queries. Everything here is
 * invented (seeded random numbers), not field data; it only gives the text-and-space ranking a
 * realistic amount of ambiguity.
 */
import { hashString, Rng } from '../../seeds/photos/random';
import {
  CATALOGUE_SEARCH,
  type CandidatePool,
  type PoolEntry,
} from '../../server/services/catalogue-cache';
import type { RankingContext } from '../../server/services/candidates.service';
import { CatalogueSearch } from '../../server/services/catalogue-search';

const GRID = 3;
const SPACING_M = 2000;
const DAY_MS = 86_400_000;
/** When the queries were taken (synthetic). */
const QUERY_TIME = Date.UTC(2026, 6, 20, 3, 0, 0);
const MARKS = [
  'notched left ear',
  'torn right ear',
  'kinked tail tip',
  'scar on right shoulder',
  'scar on left flank',
  'broken rosette on hip',
];

/** The invented survey: stations, the catalogue pool, and each individual's home station. */
export interface SyntheticSurvey {
  readonly stations: RankingContext['stations'];
  readonly pool: CandidatePool;
  readonly home: ReadonlyMap<string, string>;
}

function stationId(i: number): string {
  return `ST${String(i).padStart(2, '0')}`;
}

function neighbours(i: number): number[] {
  const [r, c] = [Math.floor(i / GRID), i % GRID];
  return [
    [r - 1, c],
    [r + 1, c],
    [r, c - 1],
    [r, c + 1],
  ]
    .filter(([y, x]) => y >= 0 && x >= 0 && y < GRID && x < GRID)
    .map(([y, x]) => y * GRID + x);
}

/** Builds the survey for the catalogued individuals (deterministic per id). */
export function syntheticSurvey(individuals: readonly string[]): SyntheticSurvey {
  const stations: RankingContext['stations'] = new Map();
  for (let i = 0; i < GRID * GRID; i++) {
    stations.set(stationId(i), {
      x: (i % GRID) * SPACING_M,
      y: Math.floor(i / GRID) * SPACING_M,
      code: stationId(i),
    });
  }
  const home = new Map<string, string>();
  const entries: PoolEntry[] = individuals.map((id) => {
    const rng = new Rng(hashString(`${id}#survey`));
    const h = rng.int(0, GRID * GRID - 1);
    home.set(id, stationId(h));
    const near = [h, ...neighbours(h)];
    const detections = Array.from({ length: 3 }, () => ({
      stationId: stationId(rng.pick(near)),
      time: QUERY_TIME - rng.range(2, 60) * DAY_MS,
    })).sort((a, b) => a.time - b.time);
    const marks = [rng.pick(MARKS), rng.pick(MARKS)];
    return {
      id,
      code: id,
      nickname: null,
      sex: rng.pick(['female', 'male'] as const),
      notes: [...new Set(marks)].join(', '),
      tags: [],
      references: [],
      detections,
      flanks: new Set(['left', 'right']),
    };
  });
  return {
    stations,
    home,
    pool: {
      version: 0,
      entries,
      byId: new Map(entries.map((e) => [e.id, e])),
      search: new CatalogueSearch(entries, CATALOGUE_SEARCH),
    },
  };
}

/**
 * Where and when a query photo was taken and what the reviewer typed: the individual's home
 * station two times in three, else a neighbour; one of its notes for half the queries. An
 * individual not in the survey is placed at a station drawn from its id.
 */
export function queryContext(
  survey: SyntheticSurvey,
  photoId: string,
  individualId: string,
  flank: string,
): RankingContext {
  const rng = new Rng(hashString(`${photoId}#context`));
  const homeId = survey.home.get(individualId) ?? stationId(rng.int(0, GRID * GRID - 1));
  const h = Number(homeId.slice(2));
  const at = rng.next() < 2 / 3 ? h : rng.pick(neighbours(h));
  const entry = survey.pool.byId.get(individualId);
  const typed = entry && rng.next() < 0.5 ? rng.pick(entry.notes.split(', ')) : undefined;
  return {
    stationId: stationId(at),
    time: QUERY_TIME,
    flank,
    sex: null,
    stations: survey.stations,
    query: typed,
  };
}

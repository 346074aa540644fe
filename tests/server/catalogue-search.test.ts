import Fuse from 'fuse.js';
import { describe, expect, it } from 'vitest';
import { CATALOGUE_SEARCH, textScores } from '../../server/services/catalogue-cache';
import {
  CatalogueSearch,
  DIRECT_SEARCH_LIMIT,
  SHORTLIST_SIZE,
  trigramsOf,
} from '../../server/services/catalogue-search';
import { Rng } from '../../seeds/photos/random';
import { syntheticDescription } from '../../bench/identify-text';

// Synthetic catalogues (invented marking notes from the benchmark's generator). fuse.js itself is
// the reference: the searcher must give each individual exactly the score fuse.js gives it.

function catalogue(n: number, seed: string) {
  const rng = new Rng(7).fork(seed);
  return Array.from({ length: n }, (_, i) => {
    const d = syntheticDescription(rng);
    return {
      id: `ind-${i}`,
      code: `TS-${String(i + 1).padStart(4, '0')}`,
      nickname: d.nickname,
      notes: d.notes,
      tags: d.tags,
    };
  });
}

describe('trigramsOf', () => {
  it('should cut a padded, lower-cased text into its distinct three-letter pieces', () => {
    // " ab ab " → " ab", "ab ", "b a", " ab" (again), "ab " (again): three distinct pieces.
    expect([...trigramsOf('AB  ab')].sort()).toEqual([' ab', 'ab ', 'b a']);
    expect(trigramsOf('x').size).toBe(1);
  });
});

describe('CatalogueSearch', () => {
  it('should answer exactly as fuse.js does for a catalogue small enough to search whole', () => {
    const items = catalogue(DIRECT_SEARCH_LIMIT, 'small');
    const ours = new CatalogueSearch(items, CATALOGUE_SEARCH);
    const fuse = new Fuse(items, CATALOGUE_SEARCH);
    for (const q of ['broken rosette on left shoulder', 'notch', 'TS-0042', 'pale scra']) {
      const a = ours.search(q, { limit: 50 }).map((r) => [r.item.id, r.score]);
      const b = fuse.search(q, { limit: 50 }).map((r) => [r.item.id, r.score]);
      expect(a).toEqual(b);
    }
  });

  it('should give every individual it returns from a large catalogue the score fuse.js gives it', () => {
    const items = catalogue(2000, 'large');
    const ours = new CatalogueSearch(items, CATALOGUE_SEARCH);
    const byId = new Map(items.map((i) => [i.id, i]));
    for (const q of ['crescent rosette on right shoulder', 'two small notches in left ear']) {
      const hits = ours.search(q);
      expect(hits.length).toBeGreaterThan(0);
      expect(hits.length).toBeLessThanOrEqual(SHORTLIST_SIZE);
      for (const hit of hits) {
        // fuse.js scores each record on its own; alone in a collection it gets the same score.
        const alone = new Fuse([byId.get(hit.item.id)!], CATALOGUE_SEARCH).search(q)[0];
        expect(hit.score).toBeCloseTo(alone!.score!, 12);
      }
    }
  });

  it('should find the one animal with an unusual mark among 2,000, also with a typing error', () => {
    const items = catalogue(2000, 'needle');
    items[1234] = {
      ...items[1234]!,
      notes: `${items[1234]!.notes} Scar shaped like a fish hook under the chin.`,
    };
    const ours = new CatalogueSearch(items, CATALOGUE_SEARCH);
    expect(ours.search('fish hook under the chin')[0]!.item.id).toBe('ind-1234');
    expect(ours.search('fsh hook undr chin')[0]!.item.id).toBe('ind-1234');
    expect(ours.search('qqqzzz')).toEqual([]);
  });

  it('should find the best-scoring animal fuse.js finds when a mark is typed word for word', () => {
    const items = catalogue(1000, 'verbatim');
    const ours = new CatalogueSearch(items, CATALOGUE_SEARCH);
    const fuse = new Fuse(items, CATALOGUE_SEARCH);
    // Marks held word for word by fewer animals than the shortlist holds.
    const counts = new Map<string, number>();
    for (const i of items) for (const t of i.tags) counts.set(t, (counts.get(t) ?? 0) + 1);
    const rare = [...counts]
      .filter(([, n]) => n >= 2 && n <= 10)
      .map(([t]) => t)
      .slice(0, 8);
    expect(rare.length).toBeGreaterThan(5);
    for (const mark of rare) {
      const best = fuse.search(mark, { limit: 1 })[0]!.score!;
      const ourBest = ours.search(mark, { limit: 1 })[0]!.score!;
      expect(ourBest).toBeCloseTo(best, 12);
    }
  }, 60_000);

  it('should rank through textScores the same way for a several-mark description', () => {
    const items = catalogue(1500, 'phrases');
    const target = items[77]!;
    const query = target.tags.slice(0, 2).join(', ');
    const scores = textScores(new CatalogueSearch(items, CATALOGUE_SEARCH), query, SHORTLIST_SIZE);
    const best = Math.max(...scores.values());
    // The animal whose two marks were typed scores within 3 % of the best (others may hold both
    // marks too, in shorter notes, which fuse.js prefers).
    expect(scores.get(target.id)).toBeGreaterThanOrEqual(0.97 * best);
  });
});

import { describe, expect, it } from 'vitest';
import {
  quickScores,
  rankCandidates,
  type RankingContext,
} from '../../server/services/candidates.service';
import {
  CATALOGUE_SEARCH,
  textScores,
  type CandidatePool,
  type PoolEntry,
} from '../../server/services/catalogue-cache';
import { CatalogueSearch } from '../../server/services/catalogue-search';
import { demoSeason } from '../../seeds/demo-season';
import { describeIndividual, makeIndividual } from '../../seeds/photos/index';
import { demoStations } from '../../seeds/scenario';

// Ranking checked against the demo season's generated ground truth (synthetic): for every leopard
// pass after an animal's first detection, a reviewer who types what the generator says the animal
// looks like must find the right individual in the top five.

const stations = new Map(demoStations().map((s) => [s.code, { x: s.x, y: s.y, code: s.code }]));

function poolOf(entries: PoolEntry[]): CandidatePool {
  return {
    version: 0,
    entries,
    byId: new Map(entries.map((e) => [e.id, e])),
    search: new CatalogueSearch(entries, CATALOGUE_SEARCH),
  };
}

function entry(
  id: string,
  detections: { stationId: string; time: number }[],
  overrides: Partial<PoolEntry> = {},
): PoolEntry {
  const d = describeIndividual(makeIndividual(id));
  return {
    id,
    code: `KHL-${id.slice(1)}`,
    nickname: null,
    sex: d.sex,
    notes: d.note,
    tags: [...d.tags],
    references: [
      { photoId: 'p', flank: 'left', thumbUrl: '', previewUrl: '' },
      { photoId: 'q', flank: 'right', thumbUrl: '', previewUrl: '' },
    ],
    detections,
    flanks: new Set(['both']),
    ...overrides,
  };
}

describe('candidate ranking on the demo season (generated ground truth)', () => {
  it('should put the right leopard in the top five for every repeat pass when the notes are typed', () => {
    const passes = demoSeason({ width: 64, height: 48 })
      .filter((p) => p.spec.subject.kind === 'target' && p.cameraLabel === 'A')
      .map((p) => ({
        individual: (p.spec.subject as { individual: string }).individual,
        station: p.stationCode,
        time: Date.parse(p.trueTime),
      }))
      .filter((p, i, all) => i === 0 || all[i - 1]!.time + 10_000 < p.time);
    const history = new Map<string, { stationId: string; time: number }[]>();
    let trials = 0;
    let top1 = 0;
    let top5 = 0;
    for (const pass of passes) {
      const known = [...history.keys()];
      if (history.has(pass.individual) && known.length >= 5) {
        const pool = poolOf(known.map((id) => entry(id, history.get(id)!)));
        const d = describeIndividual(makeIndividual(pass.individual));
        const ranked = rankCandidates(pool, {
          stationId: pass.station,
          time: pass.time,
          flank: 'both',
          sex: d.sex,
          stations,
          query: d.note,
        });
        const rank = ranked.findIndex((c) => c.individualId === pass.individual);
        trials++;
        if (rank === 0) top1++;
        if (rank >= 0 && rank < 5) top5++;
      }
      history.set(pass.individual, [
        ...(history.get(pass.individual) ?? []),
        { stationId: pass.station, time: pass.time },
      ]);
    }
    expect(trials).toBeGreaterThan(20);
    expect(top5 / trials).toBe(1);
    expect(top1 / trials).toBeGreaterThan(0.5);
  });
});

describe('ranking signals', () => {
  const day = 86_400_000;
  const t0 = Date.UTC(2026, 6, 20);
  const ctx = { stationId: 'KH06', time: t0, flank: 'left', sex: null, stations };

  it('should rank an animal last seen here above one last seen across the grid', () => {
    const pool = poolOf([
      entry('P01', [{ stationId: 'KH20', time: t0 - 2 * day }]),
      entry('P02', [{ stationId: 'KH06', time: t0 - 2 * day }]),
    ]);
    const ranked = rankCandidates(pool, ctx);
    expect(ranked.map((c) => c.individualId)).toEqual(['P02', 'P01']);
    expect(ranked[0]!.reasons[0]!.text).toMatch(/at this station \(KH06\) 2 days before/);
  });

  it('should push down an animal whose last detection makes this one an impossible journey', () => {
    // KH01 to KH20 is 6 km × 8 km apart: 10 km in one hour is beyond 4 km/h.
    const pool = poolOf([
      entry('P01', [{ stationId: 'KH20', time: t0 - 3_600_000 }]),
      entry('P02', [{ stationId: 'KH17', time: t0 - 20 * day }]),
    ]);
    const ranked = rankCandidates(pool, { ...ctx, stationId: 'KH01' });
    const p1 = ranked.find((c) => c.individualId === 'P01')!;
    expect(p1.reasons.some((r) => /unlikely journey/.test(r.text))).toBe(true);
    expect(ranked[0]!.individualId).toBe('P02');
  });

  it('should push down an animal of the other sex and say so', () => {
    const pool = poolOf([
      entry('P01', [{ stationId: 'KH06', time: t0 - day }], { sex: 'male' }),
      entry('P02', [{ stationId: 'KH07', time: t0 - day }], { sex: 'female' }),
    ]);
    const ranked = rankCandidates(pool, { ...ctx, sex: 'female' });
    expect(ranked[0]!.individualId).toBe('P02');
    expect(ranked[1]!.reasons.some((r) => r.signal === 'sex' && r.weight < 0)).toBe(true);
  });

  it('should say when an animal is known from the other flank only', () => {
    const pool = poolOf([
      entry('P03', [], {
        references: [{ photoId: 'r', flank: 'right', thumbUrl: '', previewUrl: '' }],
        flanks: new Set(['right']),
      }),
    ]);
    expect(rankCandidates(pool, ctx)[0]!.reasons.map((r) => r.text)).toContain(
      'known from the other flank only: cannot be compared on this photo',
    );
  });

  it('should let typed marks outweigh distance', () => {
    const pool = poolOf([
      entry('P05', [{ stationId: 'KH20', time: t0 - 30 * day }]),
      entry('P02', [{ stationId: 'KH06', time: t0 - day }]),
    ]);
    const ranked = rankCandidates(pool, { ...ctx, query: 'kinked tail tip, notched right ear' });
    expect(ranked[0]!.individualId).toBe('P05');
    expect(ranked[0]!.reasons[0]!.signal).toBe('text');
  });

  it('should order animals by the same score it shows: the numeric pass agrees with the worded one', () => {
    // Sixty demo leopards with detections spread over the grid and the season, some of them
    // within an impossible journey, both sexes, left and right references (synthetic).
    const codes = [...stations.keys()];
    const entries = Array.from({ length: 60 }, (_, i) =>
      entry(
        `P${String(i + 10)}`,
        Array.from({ length: 1 + (i % 4) }, (_, k) => ({
          stationId: codes[(i * 7 + k * 3) % codes.length]!,
          time: t0 - ((i * 13 + k * 29) % 60) * 3_600_000 * (k + 1),
        })),
        {
          sex: i % 3 === 0 ? 'male' : i % 3 === 1 ? 'female' : 'unknown',
          references:
            i % 5 === 0 ? [{ photoId: 'r', flank: 'right', thumbUrl: '', previewUrl: '' }] : [],
          flanks: new Set(i % 5 === 0 ? ['right'] : i % 2 ? ['left'] : ['both']),
        },
      ),
    );
    const pool = poolOf(entries);
    const pattern = new Map(entries.map((e, i) => [e.id, { score: (i % 7) / 7, inliers: i }]));
    const contexts: RankingContext[] = [
      ctx,
      { ...ctx, flank: 'right', sex: 'male' },
      { ...ctx, flank: 'both', stationId: 'KH01', query: 'broken rosette on left shoulder' },
      { ...ctx, flank: 'unknown', sex: 'female', pattern },
    ];
    for (const c of contexts) {
      const shown = rankCandidates(pool, c, entries.length);
      expect(shown).toHaveLength(entries.length);
      const query = c.query?.trim();
      const quick = quickScores(
        pool,
        c,
        query ? textScores(pool.search, query, 40) : new Map(),
        !!query,
      );
      for (const candidate of shown) {
        const i = entries.findIndex((e) => e.id === candidate.individualId);
        expect(candidate.score).toBeCloseTo(quick[i]!, 3);
      }
      for (let k = 1; k < shown.length; k++)
        expect(shown[k - 1]!.score).toBeGreaterThanOrEqual(shown[k]!.score);
    }
  });
});

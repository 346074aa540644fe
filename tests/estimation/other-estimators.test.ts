import { describe, expect, it } from 'vitest';
import { estimatePlots, relativeAbundanceIndex } from '../../server/estimation/plots';
import {
  bufferedHullArea,
  densityPer100km2,
  twoStepDensity,
} from '../../server/estimation/secr/two-step';
import { buildSessionData, secrInputFromSession } from '../../server/estimation/session-data';

describe('plot counts (Cochran 1977)', () => {
  // Synthetic counts from 10 of 200 plots.
  const counts = [3, 0, 1, 5, 2, 0, 7, 1, 0, 4];

  it('should give N = N·ȳ with the finite-population variance and a t interval', () => {
    const r = estimatePlots({ counts, totalPlots: 200 });
    const s2 = 5.788888888888889; // sample variance of the counts, independent computation [D]
    expect(r.N).toBeCloseTo(460, 10);
    expect(r.se).toBeCloseTo(Math.sqrt((200 ** 2 * (1 - 10 / 200) * s2) / 10), 10);
    // t_{9}(0.975) = 2.262 (tables, from memory)
    expect(r.ci[1]).toBeCloseTo(460 + 2.262157 * r.se, 3);
    expect(r.varianceToMean).toBeCloseTo(2.5169082, 6); // [D]
  });

  it('should warn that clumped counts make the plot estimate unreliable', () => {
    expect(estimatePlots({ counts, totalPlots: 200 }).warnings.join(' ')).toMatch(/clumped/);
    const even = estimatePlots({ counts: [2, 3, 2, 2, 3, 2, 3, 2, 2, 3], totalPlots: 200 });
    expect(even.warnings.join(' ')).not.toMatch(/clumped/);
  });

  it('should reject negative counts and fewer total plots than counted', () => {
    expect(() => estimatePlots({ counts: [1, -1], totalPlots: 5 })).toThrow(/not negative/);
    expect(() => estimatePlots({ counts: [1, 2, 3], totalPlots: 2 })).toThrow(/totalPlots/);
  });
});

describe('relative abundance index', () => {
  it('should give events per 100 camera-days per station and overall, labelled an index', () => {
    const r = relativeAbundanceIndex([
      { id: 'S1', events: 6, cameraDays: 30 },
      { id: 'S2', events: 0, cameraDays: 0 },
      { id: 'S3', events: 3, cameraDays: 45 },
    ]);
    expect(r.stations[0].per100CameraDays).toBeCloseTo(20, 12);
    expect(r.stations[1].per100CameraDays).toBeNull();
    expect(r.overall).toBeCloseTo((100 * 9) / 75, 12);
    expect(r.label).toMatch(/not an estimate of abundance/);
  });
});

describe('two-step density', () => {
  it('should reproduce Panna 6.94 and Huai Kha Khaeng 3.98 tigers per 100 km² [P]', () => {
    expect(densityPer100km2(29, 418)).toBeCloseTo(6.94, 2); // Karanth et al. 2004 [P]
    expect(densityPer100km2(19, 477.2)).toBeCloseTo(3.98, 2); // Simcharoen et al. 2007 [P]
  });

  it('should compute the buffered hull area P + L·W + πW² exactly for a square', () => {
    const square = [
      { x: 0, y: 0 },
      { x: 1000, y: 0 },
      { x: 1000, y: 1000 },
      { x: 0, y: 1000 },
      { x: 500, y: 500 }, // interior point, not on the hull
    ];
    const r = bufferedHullArea(square, 100);
    expect(r.hullArea).toBeCloseTo(1e6, 8);
    expect(r.perimeter).toBeCloseTo(4000, 8);
    expect(r.area).toBeCloseTo(1e6 + 4000 * 100 + Math.PI * 1e4, 6);
  });

  it('should use ½MMDM or MMDM and always carry the published critique', () => {
    const traps = [
      { id: 'a', x: 0, y: 0 },
      { id: 'b', x: 2000, y: 0 },
      { id: 'c', x: 2000, y: 2000 },
      { id: 'd', x: 0, y: 2000 },
    ];
    const captures = [
      { animal: '1', trap: 'a' },
      { animal: '1', trap: 'b' },
      { animal: '2', trap: 'c' },
      { animal: '2', trap: 'a' },
    ];
    const half = twoStepDensity({ N: 10, traps, captures, width: 'half-mmdm' });
    const full = twoStepDensity({ N: 10, traps, captures, width: 'mmdm' });
    const mmdm = (2000 + 2000 * Math.SQRT2) / 2;
    expect(half.mmdm).toBeCloseTo(mmdm, 8);
    expect(half.W).toBeCloseTo(mmdm / 2, 8);
    expect(half.densityPer100km2 ?? 0).toBeGreaterThan(full.densityPer100km2 ?? Infinity);
    expect(half.critique).toMatch(/Sollmann et al\. 2011.*0\.62 vs 0\.29/);
  });
});

describe('buildSessionData', () => {
  const input = {
    sessionStart: '2026-01-01T00:00:00Z',
    sessionEnd: '2026-01-04T00:00:00Z',
    occasionHours: 24,
    closurePeriodDays: 2,
    stations: [
      {
        id: 'S1',
        x: 0,
        y: 0,
        // Two cameras overlapping on day 2: the station counts as active once, not twice.
        deployments: [
          { start: '2026-01-01T00:00:00Z', end: '2026-01-02T12:00:00Z' },
          {
            start: '2026-01-02T00:00:00Z',
            end: '2026-01-05T00:00:00Z',
            lastWorking: '2026-01-03T06:00:00Z',
          },
        ],
      },
      {
        id: 'S2',
        x: 500,
        y: 0,
        deployments: [{ start: '2026-01-02T00:00:00Z', end: '2026-01-04T00:00:00Z' }],
      },
    ],
    detections: [
      { individualId: 'B', stationId: 'S1', time: '2026-01-01T05:00:00Z' },
      { individualId: 'B', stationId: 'S2', time: '2026-01-02T05:00:00Z' },
      { individualId: 'A', stationId: 'S2', time: '2026-01-01T05:00:00Z' }, // S2 not yet deployed
      { individualId: 'A', stationId: 'S1', time: '2026-01-03T03:00:00Z' },
      { individualId: 'A', stationId: 'S1', time: '2026-01-03T04:00:00Z' },
    ],
  };

  it('should build the effort grid as days active, merging cameras at a station', () => {
    const r = buildSessionData(input);
    expect(r.occasions).toHaveLength(3);
    expect(r.effort[0]).toEqual([1, 1, 0.25]);
    expect(r.effort[1]).toEqual([0, 1, 1]);
  });

  it('should drop detections at stations and occasions without effort and say how many', () => {
    const r = buildSessionData(input);
    expect(r.individuals).toEqual(['A', 'B']);
    expect(r.histories).toEqual([
      [0, 0, 1],
      [1, 1, 0],
    ]);
    expect(r.detections[0][2]).toEqual([2, 0]);
    expect(r.warnings.join(' ')).toMatch(
      /1 detection\(s\) fell at a station and occasion with no working camera/,
    );
    expect(r.warnings.join(' ')).toMatch(/longer than the 2-day period/);
  });

  it('should turn session data into SECR input with effort as usage', () => {
    const r = buildSessionData(input);
    const secr = secrInputFromSession(r, input.stations, 'count');
    expect(secr.usage).toEqual(r.effort);
    expect(secr.captures.filter((c) => c.animal === 'A')).toHaveLength(2);
    expect(() => secrInputFromSession(r, [{ id: 'S1' }, { id: 'S2' }], 'count')).toThrow(
      /no coordinates/,
    );
  });
});

import { describe, expect, it } from 'vitest';
import { estimateClosed } from '../../server/estimation/closed';
import { fitHuggins } from '../../server/estimation/huggins';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { fitSecr } from '../../server/estimation/secr/fit';
import { simulateSecr, trapGrid } from '../../server/estimation/secr/simulate';
import { COTTONTAILS, historiesFromFrequencies } from './fixtures/published-data';

describe('Huggins conditional likelihood with an individual covariate', () => {
  it('should recover N when capture probability depends on a measured covariate (synthetic)', () => {
    const rng = new SeededRandom(77);
    const N = 400;
    const rows: Uint8Array[] = [];
    const covariates: number[][] = [];
    for (let i = 0; i < N; i++) {
      const z = rng.normal();
      const p = 1 / (1 + Math.exp(-(-1.6 + 1.2 * z)));
      const row = Uint8Array.from({ length: 5 }, () => rng.bernoulli(p));
      if (row.includes(1)) {
        rows.push(row);
        covariates.push([z]);
      }
    }
    const withCov = fitHuggins({ rows, form: 'M0', covariates });
    const without = fitHuggins({ rows, form: 'M0' });
    // Within two standard errors of the truth; the slope near the simulated 1.2.
    expect(Math.abs((withCov.N ?? 0) - N)).toBeLessThan(2 * (withCov.se ?? 0));
    expect(Math.abs(Number((withCov.params?.beta as number[])[1]) - 1.2)).toBeLessThan(0.3);
    // Ignoring the covariate leaves heterogeneity unmodelled and the estimate falls well short.
    expect(without.N ?? Infinity).toBeLessThan(0.8 * (withCov.N ?? 0));
    // The conditional AIC favours the covariate model that generated the data.
    expect(withCov.aicc ?? Infinity).toBeLessThan(without.aicc ?? -Infinity);
  });
});

describe('two-class mixture (Pledger 2000)', () => {
  it('should place the estimate inside its profile interval, above S, and report a wide upper tail', () => {
    const r = estimateClosed(historiesFromFrequencies(COTTONTAILS.f, COTTONTAILS.t), {
      bootstrap: 20,
    });
    const mix = r.models.find((m) => m.model === 'Mh-mixture');
    expect(mix?.N).toBeGreaterThan(76);
    const [lo, hi] = mix?.ci ?? [NaN, null];
    expect(lo).toBeGreaterThanOrEqual(76);
    expect(lo).toBeLessThan(mix?.N ?? 0);
    // With t = 18 and most animals caught once the upper limit is far above the estimate (Link 2003).
    expect(hi === null || hi > 5 * (mix?.N ?? 0)).toBe(true);
    expect(r.aiccTable.rows.some((row) => row.model === 'Mh-mixture')).toBe(true);
  });
});

describe('SECR with count detectors (synthetic, 8 replicates)', () => {
  it('should estimate density and λ0 near the truth on average and report progress', () => {
    const sigma = 40;
    const traps = trapGrid(6, 6, 2 * sigma);
    const rng = new SeededRandom(5);
    const stages: string[] = [];
    let sumD = 0;
    let sumL = 0;
    for (let r = 0; r < 8; r++) {
      const sim = simulateSecr(
        {
          traps,
          occasions: 4,
          detector: 'count',
          density: 2,
          g0OrLambda0: 0.15,
          sigma,
          buffer: 4 * sigma,
        },
        rng,
      );
      const fit = fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 4 * sigma } }, (p) =>
        stages.push(p.stage),
      );
      sumD += fit.D ?? NaN;
      sumL += fit.lambda0 ?? NaN;
      expect(fit.densityPer100km2?.D).toBeCloseTo((fit.D ?? 0) * 1e4, 6);
      expect(fit.densityPerKm2?.D).toBeCloseTo((fit.D ?? 0) * 100, 8);
    }
    expect(Math.abs(sumD / 8 / 2 - 1)).toBeLessThan(0.15);
    expect(Math.abs(sumL / 8 / 0.15 - 1)).toBeLessThan(0.2);
    expect(stages).toContain('buffer check');
    expect(stages[stages.length - 1]).toBe('done');
  });
});

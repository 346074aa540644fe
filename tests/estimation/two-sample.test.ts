import { describe, expect, it } from 'vitest';
import { lchoose } from '../../server/estimation/numeric/special';
import {
  chapman,
  estimateTwoSample,
  twoSampleProfileLogLik,
} from '../../server/estimation/two-sample';

describe('two-sample estimators', () => {
  it('should give Chapman 281.8182 and Seber variance 4285.124 for M=50, C=60, R=10 [D]', () => {
    const r = estimateTwoSample({ M: 50, C: 60, R: 10 });
    expect(r.chapman.N).toBeCloseTo(281.8182, 4); // [D]
    expect((r.chapman.se ?? 0) ** 2).toBeCloseTo(4285.124, 3); // [D]
    expect(r.lincolnPetersen.N).toBe(300);
    // Seber 1982 (from memory): var = M²C(C−R)/R³
    expect(r.lincolnPetersen.se).toBeCloseTo(Math.sqrt((2500 * 60 * 50) / 1000), 10);
  });

  it('should be exactly unbiased when M + C ≥ N: E[N_C] = 30, E[Seber var] = Var(N_C) = 31 (N=30, M=C=15) [D]', () => {
    const N = 30;
    const M = 15;
    const C = 15;
    let mean = 0;
    let second = 0;
    let meanVar = 0;
    let totalProb = 0;
    for (let R = 0; R <= C; R++) {
      // Hypergeometric Pr(R) by enumeration.
      const prob = Math.exp(lchoose(M, R) + lchoose(N - M, C - R) - lchoose(N, C));
      const est = chapman({ M, C, R });
      totalProb += prob;
      mean += prob * est.N;
      second += prob * est.N ** 2;
      meanVar += prob * est.variance;
    }
    expect(totalProb).toBeCloseTo(1, 12);
    expect(mean).toBeCloseTo(30, 9); // [D]
    // [D] gives 31 to six figures (exactly 31 − 16/9694845); E[Seber var] equals Var exactly.
    expect(second - mean ** 2).toBeCloseTo(31, 5); // [D]
    expect(meanVar).toBeCloseTo(31, 5); // [D]
    expect(meanVar).toBeCloseTo(second - mean ** 2, 9);
  });

  it('should keep the log-normal lower limit at or above the animals caught', () => {
    const r = estimateTwoSample({ M: 20, C: 20, R: 18 });
    const S = 22;
    expect(r.chapman.ci?.[0]).toBeGreaterThanOrEqual(S);
    expect(r.chapman.intervals.normal?.[0]).toBeGreaterThanOrEqual(S);
  });

  it('should report R = 0 as not estimable with a reason, not a number', () => {
    const r = estimateTwoSample({ M: 30, C: 25, R: 0 });
    expect(r.lincolnPetersen.N).toBeNull();
    expect(r.chapman.N).toBeNull();
    expect(r.reason).toMatch(/R = 0/);
  });

  it('should warn when R < 7 and when MC/N < 4', () => {
    const r = estimateTwoSample({ M: 10, C: 12, R: 2 });
    expect(r.warnings.some((w) => /fewer than 7/.test(w))).toBe(true);
    expect(r.warnings.some((w) => /below 4/.test(w))).toBe(true);
    const ok = estimateTwoSample({ M: 200, C: 200, R: 80 });
    expect(ok.warnings).toEqual([]);
  });

  it('should reject R > C as invalid input', () => {
    expect(() => estimateTwoSample({ M: 10, C: 5, R: 6 })).toThrow(/R cannot exceed/);
    expect(() => estimateTwoSample({ M: -1, C: 5, R: 0 })).toThrow(/non-negative/);
  });

  it('should offer the exact Poisson interval only when R/C < 0.1 and bracket the estimate', () => {
    const sparse = estimateTwoSample({ M: 100, C: 90, R: 5 });
    const [lo, hi] = sparse.chapman.intervals.exactPoisson ?? [NaN, NaN];
    expect(lo).toBeLessThan(sparse.chapman.N ?? 0);
    expect(hi).toBeGreaterThan(sparse.chapman.N ?? 0);
    expect(estimateTwoSample({ M: 50, C: 60, R: 10 }).chapman.intervals.exactPoisson).toBeNull();
  });

  it('should make the exact binomial interval the image of the Clopper–Pearson limits', () => {
    const r = estimateTwoSample({ M: 50, C: 60, R: 10 });
    const [lo, hi] = r.chapman.intervals.exactBinomial ?? [NaN, NaN];
    // N = M/p: at the limits p = 10/60 lies inside, so N = 300 lies inside too.
    expect(lo).toBeLessThan(300);
    expect(hi).toBeGreaterThan(300);
  });

  it('should bound the profile interval by the χ²₁ cut-off 1.9207 around the integer maximum', () => {
    const input = { M: 50, C: 60, R: 10 };
    const r = estimateTwoSample(input);
    const [lo, hi] = r.chapman.intervals.profileLikelihood ?? [NaN, null];
    expect(hi).not.toBeNull();
    const ll = (n: number): number => twoSampleProfileLogLik(n, input);
    let best = -Infinity;
    for (let n = 100; n < 2000; n++) best = Math.max(best, ll(n));
    // inside at the limits, outside one step beyond (χ²₁(0.95)/2 = 1.9207, exact)
    expect(best - ll(lo)).toBeLessThanOrEqual(1.9207);
    expect(best - ll(lo - 1)).toBeGreaterThan(1.9207);
    expect(best - ll(hi ?? 0)).toBeLessThanOrEqual(1.9207);
    expect(best - ll((hi ?? 0) + 1)).toBeGreaterThan(1.9207);
  });
});

import { describe, expect, it } from 'vitest';
import {
  betaQuantile,
  chiSquareCdf,
  chiSquareQuantile,
  normalCdf,
  normalQuantile,
  tCdf,
  tQuantile,
} from '../../server/estimation/numeric/distributions';
import {
  binomialExactLimits,
  poissonExactLimits,
} from '../../server/estimation/numeric/exact-limits';
import { invertMatrix } from '../../server/estimation/numeric/linear-algebra';
import { bfgs, numericalHessian } from '../../server/estimation/numeric/optimise';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { brentMinimise, brentRoot } from '../../server/estimation/numeric/roots';
import {
  betaInc,
  digamma,
  ein,
  EULER_GAMMA,
  expint1,
  lgamma,
} from '../../server/estimation/numeric/special';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('special functions', () => {
  it('should reproduce log-factorials exactly (identity Γ(n) = (n−1)!)', () => {
    let logFact = 0;
    for (let n = 1; n <= 30; n++) {
      expect(rel(lgamma(n + 1), logFact) < 1e-13 || logFact === 0).toBe(true);
      if (logFact === 0) expect(Math.abs(lgamma(n + 1))).toBeLessThan(1e-14);
      logFact += Math.log(n + 1);
    }
  });

  it('should give Γ(½) = √π and satisfy the reflection formula (exact identities)', () => {
    expect(lgamma(0.5)).toBeCloseTo(0.5 * Math.log(Math.PI), 14);
    const x = 0.3;
    // Γ(x)Γ(1−x) = π / sin(πx)
    expect(lgamma(x) + lgamma(1 - x)).toBeCloseTo(Math.log(Math.PI / Math.sin(Math.PI * x)), 13);
  });

  it('should satisfy ψ(x+1) = ψ(x) + 1/x and ψ(1) = −γ (exact identities)', () => {
    expect(digamma(1)).toBeCloseTo(-EULER_GAMMA, 13);
    for (const x of [0.2, 1.7, 9.5, 40]) expect(digamma(x + 1) - digamma(x)).toBeCloseTo(1 / x, 12);
  });

  it('should match E1 and Ein values and the identity Ein = E1 + ln x + γ', () => {
    // SciPy 1.17 special.exp1, independent computation [D]
    expect(rel(expint1(0.5), 0.5597735947761608)).toBeLessThan(1e-12);
    expect(rel(expint1(2), 0.048900510708061125)).toBeLessThan(1e-12);
    expect(rel(expint1(10), 4.156968929685325e-6)).toBeLessThan(1e-11);
    for (const x of [0.3, 1, 1.0001, 3, 25]) {
      expect(ein(x)).toBeCloseTo(expint1(x) + Math.log(x) + EULER_GAMMA, 12);
    }
  });

  it('should give I_x(a, 1) = x^a and symmetry I_x(a,b) = 1 − I_{1−x}(b,a) (exact identities)', () => {
    expect(betaInc(0.3, 2.5, 1)).toBeCloseTo(Math.pow(0.3, 2.5), 14);
    expect(betaInc(0.4, 2.5, 3.5) + betaInc(0.6, 3.5, 2.5)).toBeCloseTo(1, 14);
  });
});

describe('distribution functions', () => {
  it('should give the normal quantile 1.959964 at 0.975 (textbook value)', () => {
    expect(normalQuantile(0.975)).toBeCloseTo(1.959964, 6);
    expect(normalQuantile(0.5)).toBe(0);
  });

  it('should invert the normal cdf across the range, tails included', () => {
    for (const p of [1e-12, 1e-6, 0.01, 0.3, 0.7, 0.99, 1 - 1e-9]) {
      const x = normalQuantile(p);
      const back = p < 0.5 ? normalCdf(x) : 1 - normalCdf(x);
      expect(rel(back, p < 0.5 ? p : 1 - p)).toBeLessThan(1e-8);
    }
    // Φ(1.5) = 0.9331928 (textbook tables, from memory)
    expect(normalCdf(1.5)).toBeCloseTo(0.9331928, 7);
  });

  it('should match textbook Student t quantiles (tables, from memory)', () => {
    expect(tQuantile(0.975, 4)).toBeCloseTo(2.776, 3);
    expect(tQuantile(0.975, 10)).toBeCloseTo(2.228, 3);
    expect(tQuantile(0.975, 30)).toBeCloseTo(2.042, 3);
    expect(tQuantile(0.025, 10)).toBeCloseTo(-2.228, 3);
  });

  it('should match closed-form t quantiles for 1 and 2 df (exact identities)', () => {
    for (const p of [0.6, 0.9, 0.975, 0.999]) {
      expect(rel(tQuantile(p, 1), Math.tan(Math.PI * (p - 0.5)))).toBeLessThan(1e-10);
      const q2 = (2 * p - 1) / Math.sqrt(2 * p * (1 - p));
      expect(rel(tQuantile(p, 2), q2)).toBeLessThan(1e-10);
      expect(tCdf(tQuantile(p, 7.5), 7.5)).toBeCloseTo(p, 12);
    }
  });

  it('should match textbook chi-square quantiles (tables, from memory)', () => {
    expect(chiSquareQuantile(0.95, 1)).toBeCloseTo(3.841, 3);
    expect(chiSquareQuantile(0.95, 5)).toBeCloseTo(11.07, 3);
    expect(chiSquareQuantile(0.95, 10)).toBeCloseTo(18.307, 3);
    expect(chiSquareQuantile(0.05, 10)).toBeCloseTo(3.94, 3);
  });

  it('should satisfy the chi-square closed forms for 1 and 2 df (exact identities)', () => {
    for (const p of [0.05, 0.5, 0.95, 0.9999]) {
      expect(rel(chiSquareQuantile(p, 2), -2 * Math.log(1 - p))).toBeLessThan(1e-10);
      const z = normalQuantile(0.5 + p / 2);
      expect(rel(chiSquareQuantile(p, 1), z * z)).toBeLessThan(1e-9);
    }
    expect(chiSquareCdf(3.841458820694124, 1)).toBeCloseTo(0.95, 12);
  });

  it('should give beta quantiles satisfying Beta(a,1): q = p^{1/a} (exact identity)', () => {
    expect(betaQuantile(0.3, 2, 1)).toBeCloseTo(Math.sqrt(0.3), 12);
  });
});

describe('exact limits', () => {
  it('should give the Poisson upper limit −ln(0.025) for a zero count (exact identity)', () => {
    const [lo, hi] = poissonExactLimits(0);
    expect(lo).toBe(0);
    expect(hi).toBeCloseTo(-Math.log(0.025), 10);
  });

  it('should match Garwood limits for a count of 5 (SciPy 1.17 chi2.ppf [D])', () => {
    const [lo, hi] = poissonExactLimits(5);
    expect(lo).toBeCloseTo(1.6234863901184207, 9);
    expect(hi).toBeCloseTo(11.66833207932267, 9);
  });

  it('should give Clopper–Pearson limits with the closed form at x = 0 and SciPy values at 3/10', () => {
    const [, hi0] = binomialExactLimits(0, 20);
    expect(hi0).toBeCloseTo(1 - Math.pow(0.025, 1 / 20), 12);
    // SciPy 1.17 beta.ppf, independent computation [D]
    const [lo, hi] = binomialExactLimits(3, 10);
    expect(lo).toBeCloseTo(0.06673951117773447, 10);
    expect(hi).toBeCloseTo(0.6524528500599973, 10);
  });
});

describe('root finding and optimisation', () => {
  it('should find the fixed point of cos x (0.7390851332151607, known constant)', () => {
    expect(brentRoot((x) => Math.cos(x) - x, 0, 1, 1e-15)).toBeCloseTo(0.7390851332151607, 14);
  });

  it('should minimise a parabola and the Rosenbrock function', () => {
    expect(brentMinimise((x) => (x - 2.5) ** 2 + 1, -10, 10).x).toBeCloseTo(2.5, 7);
    const rosen = {
      value: (p: readonly number[]) => 100 * (p[1] - p[0] ** 2) ** 2 + (1 - p[0]) ** 2,
    };
    const r = bfgs(rosen, [-1.2, 1], { maxIterations: 500, gradientTolerance: 1e-9 });
    expect(r.x[0]).toBeCloseTo(1, 4);
    expect(r.x[1]).toBeCloseTo(1, 4);
  });

  it('should use an analytic gradient and recover the exact Hessian of a quadratic', () => {
    const A = [
      [4, 1, 0],
      [1, 3, -1],
      [0, -1, 2],
    ];
    const b = [1, -2, 0.5];
    const value = (x: readonly number[]): number =>
      0.5 * x.reduce((s, xi, i) => s + xi * A[i].reduce((t, a, j) => t + a * x[j], 0), 0) -
      x.reduce((s, xi, i) => s + xi * b[i], 0);
    const gradient = (x: readonly number[]): number[] =>
      A.map((row, i) => row.reduce((t, a, j) => t + a * x[j], 0) - b[i]);
    const r = bfgs({ value, gradient }, [0, 0, 0]);
    const inv = invertMatrix(A);
    expect(inv).not.toBeNull();
    const exact = (inv ?? []).map((row) => row.reduce((t, a, j) => t + a * b[j], 0));
    r.x.forEach((xi, i) => expect(xi).toBeCloseTo(exact[i], 6));
    const H = numericalHessian({ value }, r.x);
    H.forEach((row, i) => row.forEach((h, j) => expect(h).toBeCloseTo(A[i][j], 4)));
  });
});

describe('seeded random numbers', () => {
  it('should repeat the same sequence for the same seed', () => {
    const a = new SeededRandom(42);
    const b = new SeededRandom(42);
    const c = new SeededRandom(43);
    const seqA = Array.from({ length: 5 }, () => a.uniform());
    expect(Array.from({ length: 5 }, () => b.uniform())).toEqual(seqA);
    expect(Array.from({ length: 5 }, () => c.uniform())).not.toEqual(seqA);
  });

  it('should draw normal, binomial and Poisson variates with the right mean and variance', () => {
    const rng = new SeededRandom(7);
    const n = 20000;
    const moments = (draw: () => number): [number, number] => {
      let s = 0;
      let s2 = 0;
      for (let i = 0; i < n; i++) {
        const v = draw();
        s += v;
        s2 += v * v;
      }
      return [s / n, s2 / n - (s / n) ** 2];
    };
    const [mz, vz] = moments(() => rng.normal());
    expect(Math.abs(mz)).toBeLessThan(0.03);
    expect(Math.abs(vz - 1)).toBeLessThan(0.04);
    const [mb, vb] = moments(() => rng.binomial(12, 0.3));
    expect(Math.abs(mb - 3.6)).toBeLessThan(0.05);
    expect(Math.abs(vb - 2.52)).toBeLessThan(0.1);
    for (const lambda of [0.7, 4, 25]) {
      const [mp, vp] = moments(() => rng.poisson(lambda));
      expect(Math.abs(mp - lambda)).toBeLessThan(4 * Math.sqrt(lambda / n));
      expect(Math.abs(vp / lambda - 1)).toBeLessThan(0.06);
    }
  });
});

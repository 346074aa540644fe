import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { numericalGradient } from '../../server/estimation/numeric/optimise';
import { ein, lchoose } from '../../server/estimation/numeric/special';
import { naiveSecrLogLik } from '../../server/estimation/secr/baseline';
import { prepareSecr, type SecrInput } from '../../server/estimation/secr/data';
import { effectiveArea } from '../../server/estimation/secr/esa';
import { fitSecr } from '../../server/estimation/secr/fit';
import { SecrLikelihood } from '../../server/estimation/secr/likelihood';
import { buildMask, defaultSpacing } from '../../server/estimation/secr/mask';
import { simulateSecr, trapGrid } from '../../server/estimation/secr/simulate';

const rel = (a: number, b: number): number => Math.abs(a - b) / Math.abs(b);

describe('effective sampling area of one detector', () => {
  const oneTrap = [{ id: 'A', x: 0, y: 0 }];
  const proximityFormula = (sigma: number, g0: number, S: number): number => {
    let sum = 0;
    for (let k = 1; k <= S; k++) sum += (Math.exp(lchoose(S, k)) * (-1) ** (k + 1) * g0 ** k) / k;
    return 2 * Math.PI * sigma * sigma * sum;
  };
  const cases = [
    { detector: 'proximity', sigma: 1, g: 0.2, S: 1, expected: 1.256637 }, // [D]
    { detector: 'proximity', sigma: 2, g: 0.1, S: 10, expected: 20.363066 }, // [D]
    { detector: 'proximity', sigma: 1.5, g: 0.05, S: 30, expected: 15.411748 }, // [D]
    { detector: 'count', sigma: 1, g: 1, S: 1, expected: 5.005183 }, // [D]
    { detector: 'count', sigma: 2, g: 0.05, S: 20, expected: 20.020732 }, // [D]
  ] as const;

  for (const c of cases) {
    it(`should reproduce a = ${c.expected} for ${c.detector} σ=${c.sigma}, ${c.detector === 'count' ? 'λ0' : 'g0'}=${c.g}, S=${c.S} with b = 6σ, h = σ/4 [D]`, () => {
      const mask = buildMask(oneTrap, c.sigma / 4, 6 * c.sigma);
      const a = effectiveArea(
        { traps: oneTrap, occasions: c.S, detector: c.detector },
        c.g,
        c.sigma,
        mask,
      );
      const formula =
        c.detector === 'proximity'
          ? proximityFormula(c.sigma, c.g, c.S)
          : 2 * Math.PI * c.sigma ** 2 * ein(c.S * c.g);
      expect(rel(formula, c.expected)).toBeLessThan(5e-7); // the formula itself against [D]
      expect(rel(a, formula)).toBeLessThanOrEqual(1e-6); // mask integration against the formula
    });
  }
});

describe('SECR likelihood', () => {
  const makeData = (detector: 'proximity' | 'count'): SecrInput => {
    const traps = trapGrid(4, 4, 40);
    // Synthetic: varied usage, one trap off on one occasion, one fractional usage.
    const usage = traps.map((_, k) => [1, 1, k % 5 === 0 ? 0 : 1, 2.5]);
    return simulateSecr(
      {
        traps,
        occasions: 4,
        detector,
        density: 2,
        g0OrLambda0: 0.3,
        sigma: 25,
        buffer: 100,
        usage,
      },
      new SeededRandom(3),
    );
  };

  for (const detector of ['proximity', 'count'] as const) {
    it(`should equal the naive term-by-term likelihood for ${detector} detectors`, () => {
      const input = makeData(detector);
      const mask = buildMask(input.traps, 10, 100);
      const lik = new SecrLikelihood(prepareSecr(input), mask, input.traps);
      for (const beta of [
        [Math.log(1.5), detector === 'proximity' ? -1 : Math.log(0.2), Math.log(30)],
        [Math.log(0.5), detector === 'proximity' ? 0.5 : Math.log(1.2), Math.log(15)],
      ]) {
        const fast = lik.evaluate(beta).logLik;
        expect(rel(fast, naiveSecrLogLik(input, mask, beta))).toBeLessThan(1e-12);
      }
    });

    it(`should return the analytic gradient of the log-likelihood for ${detector} detectors`, () => {
      const input = makeData(detector);
      const lik = new SecrLikelihood(
        prepareSecr(input),
        buildMask(input.traps, 10, 100),
        input.traps,
      );
      const beta = [Math.log(1.2), detector === 'proximity' ? -0.7 : Math.log(0.4), Math.log(28)];
      const analytic = lik.evaluate(beta).gradient;
      const numeric = numericalGradient((b) => lik.evaluate(b).logLik, beta);
      analytic.forEach((g, i) =>
        expect(Math.abs(g - numeric[i])).toBeLessThan(1e-6 * Math.max(1, Math.abs(g))),
      );
    });
  }
});

describe('habitat mask', () => {
  it('should keep only cells within the buffer of the nearest trap and aim for about 4,000 points', () => {
    const traps = trapGrid(5, 5, 100);
    const mask = buildMask(traps, defaultSpacing(traps, 200), 200);
    expect(Math.abs(mask.points - 4000)).toBeLessThan(150);
    for (let m = 0; m < mask.points; m += 97) {
      const d = Math.min(...traps.map((t) => Math.hypot(mask.x[m] - t.x, mask.y[m] - t.y)));
      expect(d).toBeLessThanOrEqual(200);
    }
  });

  it('should refuse a mask above the point cap with an explanation', () => {
    expect(() => buildMask(trapGrid(5, 5, 100), 0.5, 400)).toThrow(/larger spacing/);
  });
});

describe('fitSecr guards', () => {
  const traps = trapGrid(3, 3, 50);

  it('should report σ not identifiable when no animal is detected at two traps', () => {
    const r = fitSecr({
      traps,
      occasions: 3,
      detector: 'proximity',
      captures: [
        { animal: 'a', occasion: 1, trap: 'T1' },
        { animal: 'a', occasion: 2, trap: 'T1' },
        { animal: 'b', occasion: 1, trap: 'T5' },
      ],
    });
    expect(r.D).toBeNull();
    expect(r.reason).toMatch(/σ cannot be estimated/);
  });

  it('should warn about idle traps, dropped detections and few animals', () => {
    const usage = traps.map((_, k) => (k === 8 ? [0, 0, 0] : [1, 1, k === 0 ? 0 : 1]));
    const captures = [
      { animal: 'a', occasion: 1, trap: 'T1' },
      { animal: 'a', occasion: 2, trap: 'T2' },
      { animal: 'a', occasion: 3, trap: 'T1' }, // trap T1 was off on occasion 3
      { animal: 'b', occasion: 1, trap: 'T5' },
      { animal: 'b', occasion: 2, trap: 'T6' },
      { animal: 'c', occasion: 3, trap: 'T4' },
    ];
    const r = fitSecr({ traps, occasions: 3, detector: 'proximity', captures, usage });
    const text = r.warnings.join(' ');
    expect(text).toMatch(/never working \(T9\)/);
    expect(text).toMatch(/1 detection\(s\) fell on a trap and occasion marked as not working/);
    expect(text).toMatch(/relative standard error of about/);
  });
});

describe('SECR simulation, 6×6 grid at 2σ spacing (synthetic, 30 replicates, fixed seed)', () => {
  // Fewer replicates than the closed-model checks keep the suite short; the band is widened to match.
  const sigma = 50;
  const traps = trapGrid(6, 6, 2 * sigma);
  const truth = 1.2; // animals per hectare (about 40 animals detected per survey)
  const rng = new SeededRandom(2024);
  const sims = Array.from({ length: 30 }, () =>
    simulateSecr(
      {
        traps,
        occasions: 5,
        detector: 'proximity',
        density: truth,
        g0OrLambda0: 0.2,
        sigma,
        buffer: 4 * sigma,
      },
      rng,
    ),
  );

  it('should estimate density with small relative bias and near-nominal coverage', () => {
    let sum = 0;
    let covered = 0;
    let fitted = 0;
    for (const sim of sims) {
      const r = fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 4 * sigma } });
      if (r.D === null || !r.ci) continue;
      fitted++;
      sum += r.D;
      if (r.ci[0] <= truth && (r.ci[1] ?? Infinity) >= truth) covered++;
    }
    expect(fitted).toBe(30);
    expect(Math.abs(sum / fitted / truth - 1)).toBeLessThan(0.1);
    expect(covered / fitted).toBeGreaterThanOrEqual(0.8);
  });

  it('should estimate a higher density with a 2σ buffer than with 4σ (mask too small)', () => {
    let narrow = 0;
    let wide = 0;
    for (const sim of sims.slice(0, 5)) {
      narrow += fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 2 * sigma } }).D ?? NaN;
      wide += fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 4 * sigma } }).D ?? NaN;
    }
    expect(narrow).toBeGreaterThan(wide * 1.02);
  });
});

describe('fitSecr fit guards (synthetic)', () => {
  it('should warn when widening a narrow buffer moves the density by more than 1 %', () => {
    const sigma = 50;
    const traps = trapGrid(6, 6, 2 * sigma);
    const sim = simulateSecr(
      {
        traps,
        occasions: 5,
        detector: 'proximity',
        density: 1.2,
        g0OrLambda0: 0.2,
        sigma,
        buffer: 4 * sigma,
      },
      new SeededRandom(31),
    );
    const narrow = fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 1.5 * sigma } });
    expect(Math.abs(narrow.bufferCheck?.relativeChange ?? 0)).toBeGreaterThan(0.01);
    expect(narrow.warnings.join(' ')).toMatch(/buffer is too narrow/);
    const wide = fitSecr({ ...sim, mask: { spacing: sigma / 2, buffer: 5 * sigma } });
    expect(Math.abs(wide.bufferCheck?.relativeChange ?? 1)).toBeLessThan(0.01);
    expect(wide.warnings.join(' ')).not.toMatch(/buffer is too narrow/);
  });

  it('should warn when σ̂ exceeds half the extent of a small array', () => {
    const traps = trapGrid(3, 3, 20);
    const sim = simulateSecr(
      {
        traps,
        occasions: 10,
        detector: 'proximity',
        density: 0.3,
        g0OrLambda0: 0.3,
        sigma: 120,
        buffer: 500,
      },
      new SeededRandom(8),
    );
    const r = fitSecr({ ...sim, mask: { spacing: 30, buffer: 600 } });
    expect(r.sigma).toBeGreaterThan(28);
    expect(r.warnings.join(' ')).toMatch(/more than half the extent of the trap array/);
  });
});

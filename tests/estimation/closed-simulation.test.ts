/**
 * Short seeded simulations (synthetic data, 200 replicates, fixed seed). The acceptable band for
 * coverage is widened from 0.95 ± 2·sqrt(0.0475/R) to ± 3·sqrt(0.0475/R) ≈ ± 0.046.
 */
import { describe, expect, it } from 'vitest';
import { chaoMh } from '../../server/estimation/chao';
import { jackknifeMh } from '../../server/estimation/jackknife';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { modelM0, modelMb, modelMt } from '../../server/estimation/otis-models';
import {
  addMissedMatches,
  simulateClosed,
  type ClosedScenario,
} from '../../server/estimation/simulate-closed';
import { summarise } from '../../server/estimation/summary';
import type { ModelEstimate } from '../../shared/estimate';

const R = 200;
const BAND = 3 * Math.sqrt(0.0475 / R);

type Estimator = (rows: Uint8Array[]) => ModelEstimate;
const m0: Estimator = (rows) => modelM0(summarise(rows), 0);
const mt: Estimator = (rows) => modelMt(summarise(rows), 0);
const mb: Estimator = (rows) => modelMb(summarise(rows), 0);
const chaoT: Estimator = (rows) => chaoMh(summarise(rows), 't-adjusted');
const chao: Estimator = (rows) => chaoMh(summarise(rows), 'classic');
const jack: Estimator = (rows) => {
  const s = summarise(rows);
  return jackknifeMh(s.f, s.t);
};

/** Relative bias and coverage of each estimator over R seeded replicates. */
function study(
  scenario: ClosedScenario,
  estimators: Record<string, Estimator>,
  seed: number,
  transform?: (rows: Uint8Array[], rng: SeededRandom) => Uint8Array[],
): Record<string, { bias: number; coverage: number; failed: number }> {
  const rng = new SeededRandom(seed);
  const acc = Object.fromEntries(
    Object.keys(estimators).map((k) => [k, { sum: 0, covered: 0, ok: 0, failed: 0 }]),
  );
  for (let r = 0; r < R; r++) {
    let rows = simulateClosed(scenario, rng);
    if (transform) rows = transform(rows, rng);
    for (const [name, est] of Object.entries(estimators)) {
      const e = est(rows);
      const a = acc[name];
      if (e.N === null || !e.ci) {
        a.failed++;
        continue;
      }
      a.ok++;
      a.sum += e.N;
      if (e.ci[0] <= scenario.N && (e.ci[1] ?? Infinity) >= scenario.N) a.covered++;
    }
  }
  return Object.fromEntries(
    Object.entries(acc).map(([k, a]) => [
      k,
      { bias: a.sum / a.ok / scenario.N - 1, coverage: a.covered / a.ok, failed: a.failed },
    ]),
  );
}

describe('closed-population estimators under simulation', () => {
  it('should be near-unbiased with nominal coverage without heterogeneity (M0, Mt, Chao (t−1)/t)', () => {
    const r = study({ N: 100, t: 6, p: 0.25 }, { m0, mt, chaoT }, 11);
    expect(Math.abs(r.m0.bias)).toBeLessThan(0.02);
    expect(Math.abs(r.mt.bias)).toBeLessThan(0.02);
    expect(Math.abs(r.chaoT.bias)).toBeLessThan(0.05);
    expect(Math.abs(r.m0.coverage - 0.95)).toBeLessThan(BAND);
    expect(Math.abs(r.mt.coverage - 0.95)).toBeLessThan(BAND);
  });

  it('should show M0 biased low under logit-normal heterogeneity and Chao and jackknife much less so', () => {
    const r = study({ N: 100, t: 6, p: 0.2, logitSd: 1 }, { m0, chao, jack }, 12);
    expect(r.m0.bias).toBeLessThan(-0.08);
    expect(Math.abs(r.chao.bias)).toBeLessThan(Math.abs(r.m0.bias) / 2);
    expect(Math.abs(r.jack.bias)).toBeLessThan(Math.abs(r.m0.bias) / 2);
  });

  it('should recover N with Mb under a trap-happy response while M0 is biased low', () => {
    const r = study({ N: 100, t: 8, p: 0.25, c: 0.6 }, { m0, mb }, 13);
    expect(Math.abs(r.mb.bias)).toBeLessThan(0.05);
    expect(r.m0.bias).toBeLessThan(-0.08);
  });

  it('should move estimates up when 5 % of recaptured animals are split by missed matches', () => {
    const scenario = { N: 100, t: 6, p: 0.25 };
    const clean = study(scenario, { m0 }, 14);
    const ghosts = study(scenario, { m0 }, 14, (rows, rng) => addMissedMatches(rows, 0.05, rng));
    expect(ghosts.m0.bias).toBeGreaterThan(clean.m0.bias + 0.02);
  });
});

/** Burnham & Overton (1978, 1979) jackknife estimators for model Mh, orders 1–5, with order selection. */
import type { ModelEstimate } from '../../shared/estimate';
import { normalCdf, Z95 } from './numeric/distributions';
import { logNormalInterval } from './intervals';

/** Jackknife coefficients a_ik (i = 1..k; a_i = 1 for i > k) for order k and t occasions. */
export function jackknifeCoefficients(k: number, t: number): number[] {
  const t1 = t * (t - 1);
  const t2 = t1 * (t - 2);
  const t3 = t2 * (t - 3);
  const t4 = t3 * (t - 4);
  const increments: Record<number, number[]> = {
    1: [(t - 1) / t],
    2: [(2 * t - 3) / t, -((t - 2) ** 2) / t1],
    3: [(3 * t - 6) / t, -(3 * t * t - 15 * t + 19) / t1, (t - 3) ** 3 / t2],
    4: [
      (4 * t - 10) / t,
      -(6 * t * t - 36 * t + 55) / t1,
      (4 * t ** 3 - 42 * t * t + 148 * t - 175) / t2,
      -((t - 4) ** 4) / t3,
    ],
    5: [
      (5 * t - 15) / t,
      -(10 * t * t - 70 * t + 125) / t1,
      (10 * t ** 3 - 120 * t * t + 485 * t - 660) / t2,
      -((t - 4) ** 5 - (t - 5) ** 5) / t3,
      (t - 5) ** 5 / t4,
    ],
  };
  return increments[k].map((inc) => 1 + inc);
}

/** Jackknife of order k: N = Σ a_ik f_i and var = Σ a_ik² f_i − N. */
export function jackknifeOrder(
  f: readonly number[],
  t: number,
  k: number,
): { N: number; variance: number } {
  const a = jackknifeCoefficients(k, t);
  let N = 0;
  let sq = 0;
  for (let i = 1; i < f.length; i++) {
    const ai = i <= k ? a[i - 1] : 1;
    N += ai * f[i];
    sq += ai * ai * f[i];
  }
  return { N, variance: sq - N };
}

/** Test of order k against k + 1 (Burnham & Overton 1978, from memory); returns the z statistic. */
export function jackknifeOrderTest(f: readonly number[], t: number, k: number): number {
  const a = jackknifeCoefficients(k, t);
  const b = jackknifeCoefficients(k + 1, t);
  const S = f.reduce((s, x) => s + x, 0);
  let D = 0;
  let sb2 = 0;
  for (let i = 1; i < f.length; i++) {
    const bi = (i <= k + 1 ? b[i - 1] : 1) - (i <= k ? a[i - 1] : 1);
    D += bi * f[i];
    sb2 += bi * bi * f[i];
  }
  const v = (S / (S - 1)) * (sb2 - (D * D) / S);
  return v > 0 ? D / Math.sqrt(v) : D === 0 ? 0 : Infinity;
}

/** Mh jackknife: the full order sequence, the order tests, and the selected estimate. */
export function jackknifeMh(f: readonly number[], t: number): ModelEstimate {
  const S = f.reduce((s, x) => s + x, 0);
  const maxOrder = Math.min(5, t - 1);
  const warnings: string[] = [];
  if (maxOrder < 1) {
    const reason = 'The jackknife needs at least two occasions.';
    return { model: 'Mh-jackknife', N: null, se: null, ci: null, reason, warnings: [reason] };
  }
  const sequence = Array.from({ length: maxOrder }, (_, i) => jackknifeOrder(f, t, i + 1));
  const tests: number[] = [];
  let order = maxOrder;
  for (let k = 1; k < maxOrder; k++) {
    const z = jackknifeOrderTest(f, t, k);
    tests.push(z);
    if (Math.abs(z) < Z95 && order === maxOrder) order = k;
  }
  // When every difference is significant the highest order computed is used.
  const chosen = sequence[order - 1];
  const N = Math.max(chosen.N, S);
  const variance = Math.max(chosen.variance, 0);
  if (chosen.N < S)
    warnings.push(
      `The order-${order} jackknife fell below the ${S} animals caught and was raised to ${S}.`,
    );
  if (f[1] === 0)
    warnings.push('No animal was caught exactly once, so the jackknife adds no unseen animals.');
  return {
    model: 'Mh-jackknife',
    N,
    se: Math.sqrt(variance),
    ci: logNormalInterval(N, variance, S),
    params: {
      order,
      sequence: sequence.map((s) => s.N),
      standardErrors: sequence.map((s) => Math.sqrt(Math.max(s.variance, 0))),
      orderTests: tests,
      orderTestP: tests.map((z) => 2 * (1 - normalCdf(Math.abs(z)))),
    },
    warnings,
  };
}

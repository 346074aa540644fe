/**
 * Closure test after Otis et al. (1978). Under closure, an animal caught r ≥ 2 times has its capture
 * occasions spread at random over the t occasions, so the span between its first and last capture
 * has a known mean and variance; births, deaths or movement shorten spans. z sums the standardised
 * spans and P = Φ(z) is one-sided (Simcharoen et al. 2007 report z = 0.39, P = 0.65). We built the
 * statistic from this logic; it has not been checked term by term against the monograph.
 */
import type { ClosureTest } from '../../shared/estimate';
import { normalCdf } from './numeric/distributions';
import type { CaptureSummary } from './summary';

/** One-sided P value of the closure test for a given z. */
export function closureP(z: number): number {
  return normalCdf(z);
}

/** Closure test from capture summaries; null when fewer than two animals were caught twice. */
export function closureTest(s: CaptureSummary): ClosureTest | null {
  const t = s.t;
  let observed = 0;
  let expected = 0;
  let variance = 0;
  let used = 0;
  for (let i = 0; i < s.S; i++) {
    const r = s.captures[i];
    if (r < 2 || r === t) continue;
    // Range of a random r-subset of {1..t}: mean (t+1)(r−1)/(r+1), variance 2(r−1)(t+1)(t−r)/((r+1)²(r+2)).
    observed += s.last[i] - s.first[i];
    expected += ((t + 1) * (r - 1)) / (r + 1);
    variance += (2 * (r - 1) * (t + 1) * (t - r)) / ((r + 1) ** 2 * (r + 2));
    used++;
  }
  if (used < 2 || variance <= 0) return null;
  const z = (observed - expected) / Math.sqrt(variance);
  const p = closureP(z);
  const interpretation =
    p < 0.05
      ? `The closure test suggests the population was not closed (z = ${z.toFixed(2)}, P = ${p.toFixed(3)}): animals may have entered or left during the session. Consider a shorter session.`
      : `The closure test finds no evidence against closure (z = ${z.toFixed(2)}, P = ${p.toFixed(2)}); the test has little power against some kinds of violation.`;
  return { z, p, animalsUsed: used, interpretation };
}

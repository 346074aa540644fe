/** Two-sample estimators: Lincoln–Petersen and Chapman (1951) with Seber's variance. */
import type { Interval, TwoSampleResult } from '../../shared/estimate';
import { Z95 } from './numeric/distributions';
import { binomialExactLimits, poissonExactLimits } from './numeric/exact-limits';
import { lgamma } from './numeric/special';
import { logNormalInterval, normalInterval } from './intervals';

/** Inputs of the two-sample method. */
export interface TwoSampleInput {
  M: number;
  C: number;
  R: number;
}

/** χ²₁(0.95)/2, the log-likelihood drop that bounds a 95 % profile interval. */
const PROFILE_CUTOFF = 1.920729410347062;
/** Upper bound (as a multiple of S) searched by the profile interval before calling it infinite. */
const PROFILE_SEARCH_FACTOR = 1000;

/** Lincoln–Petersen N = MC/R and var = M²C(C−R)/R³ (Seber 1982); null at R = 0. */
export function lincolnPetersen({ M, C, R }: TwoSampleInput): {
  N: number | null;
  se: number | null;
} {
  if (R === 0) return { N: null, se: null };
  return { N: (M * C) / R, se: Math.sqrt((M * M * C * (C - R)) / R ** 3) };
}

/** Chapman (1951) N = (M+1)(C+1)/(R+1) − 1 with Seber's variance. */
export function chapman({ M, C, R }: TwoSampleInput): { N: number; variance: number } {
  const N = ((M + 1) * (C + 1)) / (R + 1) - 1;
  const variance = ((M + 1) * (C + 1) * (M - R) * (C - R)) / ((R + 1) ** 2 * (R + 2));
  return { N, variance };
}

/** Profile log-likelihood of N for two samples (model Mt with t = 2, capture probabilities profiled). */
export function twoSampleProfileLogLik(N: number, { M, C, R }: TwoSampleInput): number {
  const S = M + C - R;
  const part = (k: number): number =>
    (k > 0 ? k * Math.log(k / N) : 0) + (N - k > 0 ? (N - k) * Math.log(1 - k / N) : 0);
  return lgamma(N + 1) - lgamma(N - S + 1) + part(M) + part(C);
}

/** Profile-likelihood interval over integer N ≥ S; an upper limit of null means it never closes. */
export function twoSampleProfileInterval(input: TwoSampleInput): Interval {
  const S = input.M + input.C - input.R;
  const ll = (N: number): number => twoSampleProfileLogLik(N, input);
  const bound = Math.max(PROFILE_SEARCH_FACTOR * S, 1000);
  let best = S;
  let bestLl = ll(S);
  // The profile is unimodal in N: walk up by doubling, then scan locally for the integer maximum.
  let step = 1;
  while (best + step <= bound && ll(best + step) > bestLl) {
    best += step;
    bestLl = ll(best);
    step *= 2;
  }
  const lo0 = Math.max(S, best - step);
  const hi0 = Math.min(bound, best + step);
  const peak = integerArgMax(ll, lo0, hi0);
  const target = ll(peak) - PROFILE_CUTOFF;
  const lower = ll(S) >= target ? S : firstIntegerAbove(ll, target, S, peak, 'rising');
  if (ll(bound) >= target) return [lower, null];
  const upper = firstIntegerAbove(ll, target, peak, bound, 'falling');
  return [lower, upper];
}

function integerArgMax(f: (n: number) => number, lo: number, hi: number): number {
  // Ternary search is valid because the profile is unimodal in N.
  while (hi - lo > 2) {
    const third = Math.floor((hi - lo) / 3);
    const m1 = lo + third;
    const m2 = hi - third;
    if (f(m1) < f(m2)) lo = m1 + 1;
    else hi = m2 - 1;
  }
  let best = lo;
  for (let n = lo + 1; n <= hi; n++) if (f(n) > f(best)) best = n;
  return best;
}

/** Bisection for the outermost integer whose value is still at least `target`. */
function firstIntegerAbove(
  f: (n: number) => number,
  target: number,
  a: number,
  b: number,
  side: 'rising' | 'falling',
): number {
  // rising: f(a) < target ≤ f(b); falling: f(a) ≥ target > f(b).
  let lo = a;
  let hi = b;
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    const inside = f(mid) >= target;
    if (side === 'rising' ? inside : !inside) hi = mid;
    else lo = mid;
  }
  return side === 'rising' ? hi : lo;
}

/** Exact binomial interval: Clopper–Pearson on p = R/C, then N = M/p. */
function exactBinomialInterval({ M, C, R }: TwoSampleInput): Interval {
  const [pLo, pHi] = binomialExactLimits(R, C);
  const S = M + C - R;
  return [Math.max(S, M / pHi), pLo > 0 ? M / pLo : null];
}

/** Exact Poisson interval on R (Krebs 1999, ch. 2, from memory), substituted into Chapman's formula. */
function exactPoissonInterval({ M, C, R }: TwoSampleInput): Interval {
  const [rLo, rHi] = poissonExactLimits(R);
  const S = M + C - R;
  const n = (r: number): number => ((M + 1) * (C + 1)) / (r + 1) - 1;
  return [Math.max(S, n(rHi)), n(rLo)];
}

/** Two-sample estimate with every interval the method offers and plain-language warnings. */
export function estimateTwoSample(input: TwoSampleInput): TwoSampleResult {
  const { M, C, R } = input;
  for (const [name, v] of Object.entries(input)) {
    if (!Number.isInteger(v) || v < 0)
      throw new RangeError(`${name} must be a non-negative whole number.`);
  }
  if (R > C || R > M)
    throw new RangeError('R cannot exceed C or M: recaptures are part of both samples.');
  const S = M + C - R;
  const warnings: string[] = [];
  const noIntervals = {
    logNormal: null,
    normal: null,
    exactBinomial: null,
    exactPoisson: null,
    profileLikelihood: null,
  };
  if (M === 0 || C === 0 || R === 0) {
    const reason =
      R === 0
        ? 'No marked animal was recaptured (R = 0), so the population size cannot be estimated: the data fit an arbitrarily large population. Sample more intensively.'
        : 'Both samples must contain animals before a population size can be estimated.';
    return {
      lincolnPetersen: { N: null, se: null },
      chapman: { N: null, se: null, ci: null, intervals: noIntervals },
      reason,
      warnings: [reason],
    };
  }
  const lp = lincolnPetersen(input);
  const ch = chapman(input);
  const se = Math.sqrt(ch.variance);
  if (R < 7) {
    warnings.push(
      `Only ${R} marked animals were recaptured; with fewer than 7 recaptures the estimate is biased and its interval unreliable (Seber 1982; Krebs 1999).`,
    );
  }
  if ((M * C) / ch.N < 4) {
    warnings.push(
      `M·C/N is ${((M * C) / ch.N).toFixed(2)}, below 4: the samples are too small relative to the population for a reliable estimate (Robson & Regier 1964).`,
    );
  }
  const exactPoisson = R / C < 0.1 ? exactPoissonInterval(input) : null;
  const intervals = {
    logNormal: logNormalInterval(ch.N, ch.variance, S, Z95),
    normal: normalInterval(ch.N, se, S, Z95),
    exactBinomial: exactBinomialInterval(input),
    exactPoisson,
    profileLikelihood: twoSampleProfileInterval(input),
  };
  if (intervals.profileLikelihood[1] === null) {
    warnings.push(
      'The profile-likelihood interval has no finite upper limit: the data cannot rule out a very large population.',
    );
  }
  return {
    lincolnPetersen: lp,
    chapman: { N: ch.N, se, ci: intervals.logNormal, intervals },
    warnings,
  };
}

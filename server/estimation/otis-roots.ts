/**
 * Point estimates of the Otis et al. (1978) models M0, Mt and Mb.
 *
 * Convention: the reported N̂ is the root in N > S of the model's estimating equation
 *   M0: 1 − S/N = (1 − n./(tN))^t,  Mt: 1 − S/N = Π_j (1 − n_j/N),  Mb: 1 − S/N = (1 − S/(tN − M.))^t,
 * which is exactly the Huggins (1989) conditional-likelihood estimate in these models (the score
 * equations reduce to these identities). The full-likelihood maximum over continuous N (via lgamma)
 * is computed separately for logLik and AICc and differs slightly.
 */
import { rootInBracket } from './numeric/roots';
import type { CaptureSummary } from './summary';

/** A root, or the reason no finite root exists. */
export type RootOutcome = { N: number } | { N: null; reason: string; atBound?: boolean };

/** Search bound for N̂ as a multiple of S. */
export const SEARCH_FACTOR = 1e4;

function solve(g: (N: number) => number, S: number, lowerN: number, model: string): RootOutcome {
  const hi = Math.max(SEARCH_FACTOR * S, 1e6);
  // Tiny offset: the equations are singular at N = S exactly when some capture probability is 1.
  const lo = Math.max(S, lowerN) * (1 + 1e-12) + 1e-12;
  if (g(lo) >= 0) return { N: Math.max(S, lowerN) };
  const r = rootInBracket(g, lo, hi, 1e-10 * S);
  if ('root' in r) return { N: r.root };
  return {
    N: null,
    atBound: true,
    reason: `The ${model} estimate runs past the search bound (${hi.toExponential(1)} animals): the data hold too few recaptures to bound the population.`,
  };
}

/** M0 estimating-equation root. */
export function rootM0(s: CaptureSummary): RootOutcome {
  if (s.nDot <= s.S) return noRecaptures('M0');
  const g = (N: number): number => 1 - s.S / N - Math.pow(1 - s.nDot / (s.t * N), s.t);
  return solve(g, s.S, s.nDot / s.t, 'M0');
}

/** Mt (Darroch 1958) estimating-equation root. */
export function rootMt(s: CaptureSummary): RootOutcome {
  if (s.nDot <= s.S) return noRecaptures('Mt');
  const maxN = Math.max(...s.n);
  const g = (N: number): number => {
    let logProd = 0;
    for (const nj of s.n) logProd += Math.log1p(-nj / N);
    return 1 - s.S / N - Math.exp(logProd);
  };
  return solve(g, s.S, maxN, 'Mt');
}

/** Σ_j (t + 1 − 2j) u_j: Mb has a finite estimate only when this is positive (Otis et al. 1978, from memory). */
export function mbCriterion(s: CaptureSummary): number {
  let sum = 0;
  for (let j = 0; j < s.t; j++) sum += (s.t + 1 - 2 * (j + 1)) * s.u[j];
  return sum;
}

/** Mb (removal model for first captures) estimating-equation root. */
export function rootMb(s: CaptureSummary): RootOutcome {
  if (mbCriterion(s) <= 0) {
    return {
      N: null,
      reason:
        'Model Mb cannot be estimated: first captures do not decline over the occasions, so the removal part of the model has no finite maximum.',
    };
  }
  const g = (N: number): number => 1 - s.S / N - Math.pow(1 - s.S / (s.t * N - s.markedDot), s.t);
  return solve(g, s.S, (s.S + s.markedDot) / s.t, 'Mb');
}

function noRecaptures(model: string): RootOutcome {
  return {
    N: null,
    reason: `No animal was caught more than once, so ${model} cannot estimate how many were missed.`,
  };
}

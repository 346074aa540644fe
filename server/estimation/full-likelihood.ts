/** Full-likelihood (Otis et al. 1978) maxima of M0, Mt and Mb over continuous N, for logLik and AICc. */
import { digamma, lgamma } from './numeric/special';
import { rootInBracket } from './numeric/roots';
import type { CaptureSummary } from './summary';
import { SEARCH_FACTOR } from './otis-roots';

/** Maximum of a full likelihood: N̂ (continuous), log-likelihood, parameter count (N included). */
export interface FullLikelihoodFit {
  N: number;
  logLik: number;
  k: number;
  atBound: boolean;
  params: Record<string, number | number[]>;
}

const xlogy = (x: number, y: number): number => (x === 0 ? 0 : x * Math.log(y));

/** Pieces that define one model's profile likelihood in N. */
interface ProfileModel {
  k: number;
  /** Log-likelihood of the capture process at N with the other parameters at their conditional MLE. */
  captureLogLik(N: number): number;
  /** ∂/∂N of captureLogLik with parameters held fixed (envelope theorem). */
  slope(N: number): number;
  params(N: number): Record<string, number | number[]>;
  minN: number;
}

function fitProfile(
  s: CaptureSummary,
  model: ProfileModel,
  logMultinomial: number,
): FullLikelihoodFit {
  const S = s.S;
  const ll = (N: number): number =>
    lgamma(N + 1) - lgamma(N - S + 1) - logMultinomial + model.captureLogLik(N);
  const score = (N: number): number => digamma(N + 1) - digamma(N - S + 1) + model.slope(N);
  const lo = Math.max(S, model.minN) * (1 + 1e-12) + 1e-9;
  const hi = Math.max(SEARCH_FACTOR * S, 1e6);
  let N: number;
  let atBound = false;
  if (!(score(lo) > 0)) N = Math.max(S, model.minN);
  else {
    const r = rootInBracket(score, lo, hi, 1e-10 * S);
    if ('root' in r) N = r.root;
    else {
      N = hi;
      atBound = true;
    }
  }
  return { N, logLik: ll(N), k: model.k, atBound, params: model.params(N) };
}

/** Full-likelihood maximum of M0 (continuous N). */
export function fitFullM0(s: CaptureSummary, logMultinomial: number): FullLikelihoodFit {
  const p = (N: number): number => s.nDot / (s.t * N);
  return fitProfile(
    s,
    {
      k: 2,
      minN: s.nDot / s.t,
      captureLogLik: (N) => xlogy(s.nDot, p(N)) + xlogy(s.t * N - s.nDot, 1 - p(N)),
      slope: (N) => s.t * Math.log1p(-p(N)),
      params: (N) => ({ p: p(N) }),
    },
    logMultinomial,
  );
}

/** Full-likelihood maximum of Mt (continuous N). */
export function fitFullMt(s: CaptureSummary, logMultinomial: number): FullLikelihoodFit {
  return fitProfile(
    s,
    {
      k: s.t + 1,
      minN: Math.max(...s.n),
      captureLogLik: (N) =>
        s.n.reduce((a, nj) => a + xlogy(nj, nj / N) + xlogy(N - nj, 1 - nj / N), 0),
      slope: (N) => s.n.reduce((a, nj) => a + Math.log1p(-nj / N), 0),
      params: (N) => ({ p: s.n.map((nj) => nj / N) }),
    },
    logMultinomial,
  );
}

/** Full-likelihood maximum of Mb (continuous N); p first-capture, c recapture probability. */
export function fitFullMb(s: CaptureSummary, logMultinomial: number): FullLikelihoodFit {
  const p = (N: number): number => s.S / (s.t * N - s.markedDot);
  const c = s.markedDot > 0 ? s.mDot / s.markedDot : 0;
  const recapture = xlogy(s.mDot, c) + xlogy(s.markedDot - s.mDot, 1 - c);
  return fitProfile(
    s,
    {
      k: 3,
      minN: (s.S + s.markedDot) / s.t,
      captureLogLik: (N) =>
        xlogy(s.S, p(N)) + xlogy(s.t * N - s.markedDot - s.S, 1 - p(N)) + recapture,
      slope: (N) => s.t * Math.log1p(-p(N)),
      params: (N) => ({ p: p(N), c }),
    },
    logMultinomial,
  );
}

/** Σ log(x_ω!) over distinct histories: the multinomial constant shared by all full likelihoods. */
export function logMultinomialConstant(multiplicities: readonly number[]): number {
  return multiplicities.reduce((a, x) => a + lgamma(x + 1), 0);
}

/** AICc = −2 lnL + 2K + 2K(K+1)/(n − K − 1); null when n ≤ K + 1. */
export function aicc(logLik: number, k: number, n: number): number | null {
  if (n - k - 1 <= 0) return null;
  return -2 * logLik + 2 * k + (2 * k * (k + 1)) / (n - k - 1);
}

/** M0, Mt and Mb results: estimating-equation point estimate, Huggins SE, full-likelihood logLik/AICc. */
import type { ModelEstimate } from '../../shared/estimate';
import { logNormalInterval } from './intervals';
import { aicc, fitFullM0, fitFullMb, fitFullMt, type FullLikelihoodFit } from './full-likelihood';
import { mbCriterion, rootM0, rootMb, rootMt, type RootOutcome } from './otis-roots';
import type { CaptureSummary } from './summary';

const logit = (p: number): number => Math.log(p / (1 - p));
const sigmoid = (x: number): number => 1 / (1 + Math.exp(-x));

/**
 * Huggins (1989) variance for a constant-p conditional likelihood ℓ(θ) = a·log p + b·log q − S·log(1 − q^t):
 * var N̂ = S(1−p*)/p*² + (∂N/∂θ)²/I(θ), N = S/p*.
 */
function oneParameterVariance(S: number, t: number, a: number, b: number, p: number): number {
  const ll = (theta: number): number => {
    const pp = sigmoid(theta);
    return a * Math.log(pp) + b * Math.log1p(-pp) - S * Math.log(-Math.expm1(t * Math.log1p(-pp)));
  };
  const th = logit(p);
  const h = 1e-4;
  const info = -(ll(th + h) - 2 * ll(th) + ll(th - h)) / (h * h);
  const q = 1 - p;
  const qt = Math.pow(q, t);
  const pStar = 1 - qt;
  const dN = (-S / (pStar * pStar)) * t * p * qt;
  return (S * (1 - pStar)) / (pStar * pStar) + (dN * dN) / info;
}

/** Huggins variance for Mt: the information is diagonal minus rank one (Sherman–Morrison). */
function mtVariance(S: number, p: readonly number[]): number {
  let logP0 = 0;
  for (const pj of p) logP0 += Math.log1p(-pj);
  const P0 = Math.exp(logP0);
  const pStar = 1 - P0;
  const c = (S * P0) / (pStar * pStar);
  let dx = 0;
  let vx = 0;
  let vy = 0;
  for (const pj of p) {
    const a = (S * pj * (1 - pj)) / pStar;
    const d = (-S / (pStar * pStar)) * pj * P0;
    dx += (d * d) / a;
    vx += (pj * d) / a;
    vy += (pj * pj) / a;
  }
  const quad = dx + (c * vx * vx) / (1 - c * vy);
  return (S * (1 - pStar)) / (pStar * pStar) + quad;
}

function assemble(
  model: 'M0' | 'Mt' | 'Mb',
  s: CaptureSummary,
  root: RootOutcome,
  full: FullLikelihoodFit,
  variance: (N: number) => number,
  params: (N: number) => Record<string, number | number[]>,
): ModelEstimate {
  const base = { logLik: full.logLik, k: full.k, aicc: aicc(full.logLik, full.k, s.S) };
  if (root.N === null) {
    return {
      model,
      N: null,
      se: null,
      ci: null,
      reason: root.reason,
      ...base,
      warnings: [root.reason],
    };
  }
  const N = root.N;
  const v = N > s.S ? variance(N) : 0;
  const warnings: string[] = [];
  if (full.atBound)
    warnings.push(
      `The ${model} full-likelihood maximum reached the search bound; its AICc is unreliable.`,
    );
  if (base.aicc === null)
    warnings.push(`${model} has too many parameters (${full.k}) for AICc with ${s.S} animals.`);
  return {
    model,
    N,
    se: Number.isFinite(v) && v >= 0 ? Math.sqrt(v) : null,
    ci: Number.isFinite(v) && v >= 0 ? logNormalInterval(N, v, s.S) : null,
    ...base,
    params: { ...params(N), fullLikelihoodN: full.N },
    warnings,
  };
}

/** M0: constant capture probability. */
export function modelM0(s: CaptureSummary, logMultinomial: number): ModelEstimate {
  const p = (N: number): number => s.nDot / (s.t * N);
  return assemble(
    'M0',
    s,
    rootM0(s),
    fitFullM0(s, logMultinomial),
    (N) => oneParameterVariance(s.S, s.t, s.nDot, s.t * s.S - s.nDot, p(N)),
    (N) => ({ p: p(N) }),
  );
}

/** Mt: capture probability varies by occasion (Darroch 1958). */
export function modelMt(s: CaptureSummary, logMultinomial: number): ModelEstimate {
  const p = (N: number): number[] => s.n.map((nj) => nj / N);
  return assemble(
    'Mt',
    s,
    rootMt(s),
    fitFullMt(s, logMultinomial),
    (N) => mtVariance(s.S, p(N)),
    (N) => ({
      p: p(N),
    }),
  );
}

/** Mb: first-capture probability p, recapture probability c (behavioural response). */
export function modelMb(s: CaptureSummary, logMultinomial: number): ModelEstimate {
  const p = (N: number): number => s.S / (s.t * N - s.markedDot);
  const c = s.markedDot > 0 ? s.mDot / s.markedDot : 0;
  // Σ_i (first_i − 1): occasions each animal spent at risk of first capture before being caught.
  const missedBeforeFirst = s.u.reduce((a, uj, j) => a + j * uj, 0);
  const result = assemble(
    'Mb',
    s,
    rootMb(s),
    fitFullMb(s, logMultinomial),
    (N) => oneParameterVariance(s.S, s.t, s.S, missedBeforeFirst, p(N)),
    (N) => ({ p: p(N), c }),
  );
  result.params = { ...(result.params ?? {}), criterion: mbCriterion(s) };
  return result;
}

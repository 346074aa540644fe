/**
 * Two-class finite-mixture Mh (Pledger 2000), full likelihood with continuous N. Its profile upper
 * limit can be infinite (Link 2003), which is reported rather than hidden.
 */
import type { Interval, ModelEstimate } from '../../shared/estimate';
import { invertMatrix } from './numeric/linear-algebra';
import { bfgs, numericalHessian } from './numeric/optimise';
import { brentRoot } from './numeric/roots';
import { digamma, lgamma } from './numeric/special';
import { aicc } from './full-likelihood';
import type { CaptureSummary } from './summary';

const PROFILE_CUTOFF = 1.920729410347062;
const sigmoid = (x: number): number => 1 / (1 + Math.exp(-x));

/** log Q(k) for a history with k captures and its gradient in θ = (logit p1, logit p2, logit π). */
function logQ(k: number, t: number, theta: readonly number[]): { value: number; grad: number[] } {
  const [l1, l2, lw] = theta;
  const term = (l: number): number =>
    -k * Math.log1p(Math.exp(-l)) - (t - k) * Math.log1p(Math.exp(l));
  const a = -Math.log1p(Math.exp(-lw)) + term(l1);
  const b = -Math.log1p(Math.exp(lw)) + term(l2);
  const m = Math.max(a, b);
  const value = m + Math.log(Math.exp(a - m) + Math.exp(b - m));
  const r1 = Math.exp(a - value);
  const r2 = 1 - r1;
  const w = sigmoid(lw);
  return {
    value,
    grad: [r1 * (k - t * sigmoid(l1)), r2 * (k - t * sigmoid(l2)), (1 - w) * r1 - w * r2],
  };
}

/** Log-likelihood at N and θ, with the gradient in θ and the derivative in N. */
function captureLogLik(
  N: number,
  s: CaptureSummary,
  theta: readonly number[],
  logMultinomial: number,
): { value: number; grad: number[]; dN: number } {
  const q0 = logQ(0, s.t, theta);
  const unseen = N - s.S;
  let value = lgamma(N + 1) - lgamma(unseen + 1) - logMultinomial + unseen * q0.value;
  const grad = q0.grad.map((g) => unseen * g);
  for (let k = 1; k < s.f.length; k++) {
    if (s.f[k] === 0) continue;
    const q = logQ(k, s.t, theta);
    value += s.f[k] * q.value;
    for (let i = 0; i < 3; i++) grad[i] += s.f[k] * q.grad[i];
  }
  return { value, grad, dN: digamma(N + 1) - digamma(unseen + 1) + q0.value };
}

/** Maximise over the mixture parameters at fixed N (several starts guard against the label switch). */
function profileAt(
  N: number,
  s: CaptureSummary,
  logMultinomial: number,
  start?: number[],
): { ll: number; theta: number[] } {
  const starts = start
    ? [start]
    : [
        [-2, 0.5, 0],
        [-1, 1.5, 1],
        [-3, -0.5, -1],
      ];
  let best = { ll: -Infinity, theta: starts[0] };
  for (const s0 of starts) {
    const objective = {
      value: (th: readonly number[]) => -captureLogLik(N, s, th, logMultinomial).value,
      gradient: (th: readonly number[]) =>
        captureLogLik(N, s, th, logMultinomial).grad.map((g) => -g),
    };
    const r = bfgs(objective, s0, { maxIterations: 150 });
    if (-r.value > best.ll) best = { ll: -r.value, theta: r.x };
  }
  return best;
}

/** Fit the 2-class mixture; the interval comes from the profile likelihood and may be unbounded. */
export function fitMixtureMh(s: CaptureSummary, logMultinomial: number): ModelEstimate {
  const S = s.S;
  // x = (log(N − S), θ): N stays above S without a constraint.
  const full = {
    value: (x: readonly number[]) =>
      -captureLogLik(S + Math.exp(x[0]), s, x.slice(1), logMultinomial).value,
    gradient: (x: readonly number[]) => {
      const r = captureLogLik(S + Math.exp(x[0]), s, x.slice(1), logMultinomial);
      return [-r.dN * Math.exp(x[0]), ...r.grad.map((g) => -g)];
    },
  };
  const starts = [Math.log(Math.max(1, 0.2 * S)), Math.log(Math.max(1, S))].flatMap((l) => [
    [l, -2, 0.5, 0],
    [l, -1, 1.5, 1],
  ]);
  let best = bfgs(full, starts[0]);
  for (const x0 of starts.slice(1)) {
    const r = bfgs(full, x0);
    if (r.value < best.value) best = r;
  }
  const warnings: string[] = [];
  const bound = Math.log(1e4 * S);
  if (best.x[0] > bound) {
    const reason =
      'The two-class mixture estimate runs off to an unbounded population: the data cannot separate a small, hard-to-catch class from no class at all.';
    return { model: 'Mh-mixture', N: null, se: null, ci: null, reason, warnings: [reason] };
  }
  const N = S + Math.exp(best.x[0]);
  const logLik = -best.value;
  const theta = best.x.slice(1);
  const ci = profileInterval(s, logMultinomial, N, logLik, theta);
  if (ci[1] === null) {
    warnings.push(
      'The profile-likelihood upper limit of the mixture model is infinite (Link 2003): the data are consistent with any larger population.',
    );
  }
  const [p1, p2, w] = [sigmoid(theta[0]), sigmoid(theta[1]), sigmoid(theta[2])];
  // Delta method on x = log(N − S): var N = (N − S)² var x.
  const cov = invertMatrix(numericalHessian(full, best.x));
  const varX = cov ? cov[0][0] : NaN;
  const se = varX > 0 ? (N - S) * Math.sqrt(varX) : null;
  if (se === null)
    warnings.push(
      "The mixture model's information matrix is singular; no standard error is given.",
    );
  return {
    model: 'Mh-mixture',
    N,
    se,
    ci,
    logLik,
    k: 4,
    aicc: aicc(logLik, 4, S),
    params: { p1, p2, weight1: w, intervalMethod: 'profile likelihood' },
    warnings,
  };
}

function profileInterval(
  s: CaptureSummary,
  logMult: number,
  N: number,
  maxLl: number,
  theta: number[],
): Interval {
  const S = s.S;
  const target = maxLl - PROFILE_CUTOFF;
  // Work in x = log(N − S) so both limits are found on a well-scaled axis.
  const g = (x: number): number => profileAt(S + Math.exp(x), s, logMult, theta).ll - target;
  const x0 = Math.log(N - S);
  let lower: number = S;
  const xMin = Math.log(1e-6);
  if (g(xMin) < 0) lower = S + Math.exp(brentRoot(g, xMin, x0, 1e-6));
  const xMax = Math.log(1e4 * Math.max(S, 10));
  if (g(xMax) >= 0) return [lower, null];
  return [lower, S + Math.exp(brentRoot(g, x0, xMax, 1e-6))];
}

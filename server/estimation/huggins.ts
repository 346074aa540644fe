/**
 * Huggins (1989) conditional likelihood for closed populations: L_c = Π_i Pr(ω_i)/p*_i and
 * N̂ = Σ_i 1/p*_i, for the M0, Mt and Mb forms with optional individual covariates.
 * Its AIC is not comparable with full-likelihood AIC.
 */
import type { ModelEstimate } from '../../shared/estimate';
import { invertMatrix, quadraticForm } from './numeric/linear-algebra';
import { bfgs, numericalHessian } from './numeric/optimise';
import { logNormalInterval } from './intervals';
import { aicc } from './full-likelihood';

/** The capture-probability structure of a Huggins model. */
export type HugginsForm = 'M0' | 'Mt' | 'Mb';

/** Inputs of a Huggins fit: 0/1 rows and optional covariates (one row of numbers per animal). */
export interface HugginsInput {
  rows: readonly Uint8Array[];
  form: HugginsForm;
  covariates?: readonly (readonly number[])[];
}

interface Design {
  t: number;
  nBeta: number;
  timeOffset: number;
  hasTime: boolean;
  behaviourIndex: number;
  covOffset: number;
  nCov: number;
}

function makeDesign(input: HugginsInput): Design {
  const t = input.rows[0].length;
  const nCov = input.covariates?.[0]?.length ?? 0;
  const nTime = input.form === 'Mt' ? t - 1 : 0;
  const behaviour = input.form === 'Mb' ? 1 : 0;
  return {
    t,
    nCov,
    timeOffset: 1,
    hasTime: nTime > 0,
    behaviourIndex: behaviour ? 1 + nTime : -1,
    covOffset: 1 + nTime + behaviour,
    nBeta: 1 + nTime + behaviour + nCov,
  };
}

const sigmoid = (x: number): number => 1 / (1 + Math.exp(-x));

/** Linear predictor for first capture on occasion j of animal i (without the behaviour offset). */
function eta(
  beta: readonly number[],
  d: Design,
  z: readonly number[] | undefined,
  j: number,
): number {
  let v = beta[0];
  if (d.hasTime && j > 0) v += beta[d.timeOffset + j - 1];
  for (let c = 0; c < d.nCov; c++) v += beta[d.covOffset + c] * (z?.[c] ?? 0);
  return v;
}

/** Negative conditional log-likelihood, its gradient, and per-animal p*. */
function evaluate(
  beta: readonly number[],
  input: HugginsInput,
  d: Design,
  wantGradient: boolean,
): { nll: number; grad: number[]; pStar: Float64Array; dPStar: number[][] } {
  const grad = new Array<number>(d.nBeta).fill(0);
  const pStar = new Float64Array(input.rows.length);
  const dPStar: number[][] = [];
  let nll = 0;
  const addGrad = (
    j: number,
    zi: readonly number[] | undefined,
    w: number,
    behaviour: boolean,
  ): void => {
    grad[0] += w;
    if (d.hasTime && j > 0) grad[d.timeOffset + j - 1] += w;
    if (behaviour) grad[d.behaviourIndex] += w;
    for (let c = 0; c < d.nCov; c++) grad[d.covOffset + c] += w * (zi?.[c] ?? 0);
  };
  input.rows.forEach((row, i) => {
    const zi = input.covariates?.[i];
    const b = d.behaviourIndex >= 0 ? beta[d.behaviourIndex] : 0;
    let logMiss = 0;
    let caught = false;
    const pj = new Float64Array(d.t);
    for (let j = 0; j < d.t; j++) {
      const e = eta(beta, d, zi, j);
      const p = sigmoid(e);
      pj[j] = p;
      logMiss += Math.log1p(-p);
      const prob = caught ? sigmoid(e + b) : p;
      const y = row[j];
      nll -= y ? Math.log(prob) : Math.log1p(-prob);
      if (wantGradient) addGrad(j, zi, -(y - prob), caught);
      if (y) caught = true;
    }
    const ps = -Math.expm1(logMiss);
    pStar[i] = ps;
    nll += Math.log(ps);
    if (wantGradient) {
      // ∂ log p*/∂η_j = (1 − p*) p_j / p*
      const dp = new Array<number>(d.nBeta).fill(0);
      const saved = grad.slice();
      grad.fill(0);
      for (let j = 0; j < d.t; j++) addGrad(j, zi, (1 - ps) * pj[j], false);
      for (let k = 0; k < d.nBeta; k++) {
        dp[k] = grad[k];
        grad[k] = saved[k] + grad[k] / ps;
      }
      dPStar.push(dp);
    }
  });
  return { nll, grad, pStar, dPStar };
}

/** Fit a Huggins model; N̂ = Σ 1/p*, var by Huggins (1989): Σ(1−p*)/p*² + dᵀ I⁻¹ d. */
export function fitHuggins(input: HugginsInput): ModelEstimate {
  const d = makeDesign(input);
  const S = input.rows.length;
  const model = `Huggins-${input.form}` as const;
  const objective = {
    value: (b: readonly number[]) => evaluate(b, input, d, false).nll,
    gradient: (b: readonly number[]) => evaluate(b, input, d, true).grad,
  };
  const fit = bfgs(objective, new Array<number>(d.nBeta).fill(-1), { gradientTolerance: 1e-9 });
  const at = evaluate(fit.x, input, d, true);
  let N = 0;
  let varN = 0;
  const dN = new Array<number>(d.nBeta).fill(0);
  at.pStar.forEach((ps, i) => {
    N += 1 / ps;
    varN += (1 - ps) / (ps * ps);
    for (let k = 0; k < d.nBeta; k++) dN[k] -= at.dPStar[i][k] / (ps * ps);
  });
  const warnings: string[] = [];
  const info = invertMatrix(numericalHessian(objective, fit.x));
  if (info) varN += quadraticForm(info, dN);
  else
    warnings.push(
      `${model}: the information matrix is singular, so the standard error is missing.`,
    );
  const boundary = fit.x.some((b) => Math.abs(b) > 15);
  if (boundary) {
    warnings.push(
      `${model}: a capture probability went to 0 or 1; the estimate sits on a boundary and may not be reliable.`,
    );
  }
  if (!fit.converged) warnings.push(`${model}: the optimiser did not fully converge.`);
  const logLik = -fit.value;
  const se = info ? Math.sqrt(varN) : null;
  return {
    model,
    N,
    se,
    ci: se !== null ? logNormalInterval(N, varN, S) : null,
    logLik,
    k: d.nBeta,
    aicc: aicc(logLik, d.nBeta, S),
    params: { beta: fit.x, covariates: d.nCov },
    warnings,
  };
}

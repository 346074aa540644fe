/** fitSecr: maximum-likelihood SECR density with guards, interval and buffer-sensitivity refit. */
import type { DensityEstimate, SecrResult } from '../../../shared/estimate';
import { Z95 } from '../numeric/distributions';
import { invertMatrix } from '../numeric/linear-algebra';
import { bfgs, numericalHessian, type Objective } from '../numeric/optimise';
import { prepareSecr, type PreparedSecr, type SecrInput } from './data';
import { SecrLikelihood, type SecrEvaluation } from './likelihood';
import { buildMask, defaultSpacing, type HabitatMask } from './mask';
import { inputWarnings, SECR_ASSUMPTIONS } from './guards';

/** Progress report during a fit (stage name and overall fraction done). */
export type SecrProgress = (p: { stage: string; fraction: number }) => void;

/** Relative change in D̂ between the mask buffer b and 1.5·b above which we warn. */
const BUFFER_TOLERANCE = 0.01;

/** Negated log-likelihood objective that evaluates value and gradient together once per point. */
function cachedObjective(f: (x: readonly number[]) => SecrEvaluation): Objective {
  let lastX: number[] = [];
  let last: SecrEvaluation | null = null;
  const at = (x: readonly number[]): SecrEvaluation => {
    if (!last || x.length !== lastX.length || x.some((v, i) => v !== lastX[i])) {
      last = f(x);
      lastX = [...x];
    }
    return last;
  };
  return { value: (x) => -at(x).logLik, gradient: (x) => at(x).gradient.map((g) => -g) };
}

interface Optimum {
  theta: number[];
  logLik: number;
  converged: boolean;
  inverseHessian: number[][];
}

function optimise(
  lik: SecrLikelihood,
  starts: number[][],
  inverseHessian?: number[][],
  onStartDone?: (done: number, of: number) => void,
): Optimum {
  const objective = cachedObjective((th) => lik.concentrated(th));
  let best: Optimum = { theta: starts[0], logLik: -Infinity, converged: false, inverseHessian: [] };
  for (const [i, s] of starts.entries()) {
    const r = bfgs(objective, s, {
      maxIterations: 150,
      gradientTolerance: 1e-8,
      maxStep: 2,
      initialInverseHessian: inverseHessian,
    });
    if (-r.value > best.logLik) {
      best = {
        theta: r.x,
        logLik: -r.value,
        converged: r.converged,
        inverseHessian: r.inverseHessian,
      };
    }
    onStartDone?.(i + 1, starts.length);
  }
  return best;
}

/**
 * Several starts explored on a mask of twice the spacing (a quarter of the points), then the best
 * is polished on the full mask starting from the coarse curvature estimate.
 */
function multiStart(
  input: SecrInput,
  data: PreparedSecr,
  mask: HabitatMask,
  lik: SecrLikelihood,
  sigma0: number,
  report: SecrProgress,
): Optimum {
  const starts = startValues(input.detector, sigma0);
  const coarseSpacing = 2 * mask.spacing;
  // Starts take most of the fitting time, so progress moves once per start (0.05 → 0.6).
  const perStart = (share: number) => (done: number, of: number) =>
    report({ stage: `fitting (start ${done} of ${of})`, fraction: 0.05 + (share * done) / of });
  // Cells up to about σ across still place the optimum well enough to choose among starts.
  if (coarseSpacing > 0.8 * sigma0) return optimise(lik, starts, undefined, perStart(0.55));
  const coarse = new SecrLikelihood(
    data,
    buildMask(input.traps, coarseSpacing, mask.buffer),
    input.traps,
  );
  const rough = optimise(coarse, starts, undefined, perStart(0.35));
  report({ stage: 'refining on the full mask', fraction: 0.4 });
  return optimise(lik, [rough.theta], rough.inverseHessian);
}

function startValues(detector: SecrInput['detector'], sigma0: number): number[][] {
  const link = (v: number): number =>
    detector === 'proximity' ? Math.log(v / (1 - v)) : Math.log(v);
  return [
    [link(0.1), Math.log(sigma0)],
    [link(0.3), Math.log(0.6 * sigma0)],
    [link(0.03), Math.log(1.6 * sigma0)],
  ];
}

function scaled(D: number, se: number, ci: [number, number], factor: number): DensityEstimate {
  return { D: D * factor, se: se * factor, ci: [ci[0] * factor, ci[1] * factor] };
}

/** Fit SECR by maximum likelihood; D is per hectare with coordinates in metres. */
export function fitSecr(input: SecrInput, onProgress?: SecrProgress): SecrResult {
  const report = onProgress ?? (() => undefined);
  const data = prepareSecr(input);
  const warnings = inputWarnings(input, data);
  const n = data.animals.length;
  const sigma0 = data.rpsv;
  const empty = (reason: string, mask: HabitatMask | null): SecrResult => ({
    detector: input.detector,
    D: null,
    se: null,
    ci: null,
    densityPerKm2: null,
    densityPer100km2: null,
    sigma: null,
    logLik: null,
    esa: null,
    n,
    detections: data.detections,
    reason,
    bufferCheck: null,
    warnings: [reason, ...warnings],
    mask: { spacing: mask?.spacing ?? 0, buffer: mask?.buffer ?? 0, points: mask?.points ?? 0 },
    assumptions: SECR_ASSUMPTIONS,
  });
  if (n === 0) return empty('No animal was detected, so density cannot be estimated.', null);
  if (sigma0 === null) {
    return empty(
      'No animal was detected at two or more traps, so the movement scale σ cannot be estimated and density is not identifiable. Traps closer together or a longer session would help.',
      null,
    );
  }
  const buffer = input.mask?.buffer ?? 4 * sigma0;
  report({ stage: 'building mask', fraction: 0.02 });
  const spacing = input.mask?.spacing ?? defaultSpacing(input.traps, buffer);
  const mask = buildMask(input.traps, spacing, buffer);
  const lik = new SecrLikelihood(data, mask, input.traps);
  report({ stage: 'fitting', fraction: 0.05 });
  const best = multiStart(input, data, mask, lik, sigma0, report);
  report({ stage: 'standard errors', fraction: 0.7 });
  const result = summariseFit(input, data, lik, mask, best, warnings);
  report({ stage: 'buffer check', fraction: 0.8 });
  if (result.D !== null)
    result.bufferCheck = bufferCheck(input, data, mask, best, result.D, result.warnings);
  report({ stage: 'done', fraction: 1 });
  return result;
}

function summariseFit(
  input: SecrInput,
  data: PreparedSecr,
  lik: SecrLikelihood,
  mask: HabitatMask,
  best: Optimum,
  warnings: string[],
): SecrResult {
  const n = data.animals.length;
  const esa = lik.concentrated(best.theta).esa;
  const D = n / esa;
  const beta = [Math.log(D), ...best.theta];
  const full = cachedObjective((b) => lik.evaluate(b));
  const cov = invertMatrix(numericalHessian(full, beta));
  const varLogD = cov ? cov[0][0] : NaN;
  const se = varLogD > 0 ? D * Math.sqrt(varLogD) : null;
  const C = se !== null ? Math.exp(Z95 * Math.sqrt(Math.log(1 + (se / D) ** 2))) : NaN;
  const ci: [number, number] | null = se !== null ? [D / C, D * C] : null;
  const sigma = Math.exp(best.theta[1]);
  const scale =
    input.detector === 'proximity' ? 1 / (1 + Math.exp(-best.theta[0])) : Math.exp(best.theta[0]);
  const all = [
    ...warnings,
    ...fitWarnings(input, best, sigma, cov === null),
    ...maskWarnings(mask, sigma),
  ];
  return {
    detector: input.detector,
    D,
    se,
    ci,
    densityPerKm2: se !== null && ci ? scaled(D, se, ci, 100) : null,
    densityPer100km2: se !== null && ci ? scaled(D, se, ci, 1e4) : null,
    ...(input.detector === 'proximity' ? { g0: scale } : { lambda0: scale }),
    sigma,
    logLik: best.logLik,
    esa,
    n,
    detections: data.detections,
    bufferCheck: null,
    warnings: all,
    mask: { spacing: mask.spacing, buffer: mask.buffer, points: mask.points },
    assumptions: SECR_ASSUMPTIONS,
  };
}

function fitWarnings(input: SecrInput, best: Optimum, sigma: number, singular: boolean): string[] {
  const out: string[] = [];
  const eta = best.theta[0];
  if (input.detector === 'proximity' && (eta > 8 || eta < -10)) {
    out.push(
      'The detection probability at the home-range centre (g0) went to a bound; the fit is unreliable. Check for misidentified animals or too few detections.',
    );
  }
  if (!best.converged)
    out.push('The optimiser did not fully converge; treat the estimate with caution.');
  if (singular)
    out.push('The information matrix is singular, so no standard error or interval is given.');
  let extent = 0;
  for (const a of input.traps)
    for (const b of input.traps) extent = Math.max(extent, Math.hypot(a.x - b.x, a.y - b.y));
  if (sigma > extent / 2) {
    out.push(
      `The movement scale σ̂ (${sigma.toFixed(0)} m) is more than half the extent of the trap array (${extent.toFixed(0)} m): the array is too small for these animals, and density is poorly determined.`,
    );
  }
  return out;
}

/** Mask cells coarser than σ̂/2 depart from common practice (the buffer is checked by refitting). */
function maskWarnings(mask: HabitatMask, sigma: number): string[] {
  const out: string[] = [];
  if (mask.spacing > sigma / 2) {
    out.push(
      `The mask spacing (${mask.spacing.toFixed(0)} m) is coarser than half the movement scale σ̂ (${(sigma / 2).toFixed(0)} m); a finer mask would integrate more accurately.`,
    );
  }
  return out;
}

function bufferCheck(
  input: SecrInput,
  data: PreparedSecr,
  mask: HabitatMask,
  best: Optimum,
  D: number,
  warnings: string[],
): { buffer: number; D: number; relativeChange: number } | null {
  let wider: HabitatMask;
  try {
    wider = buildMask(input.traps, mask.spacing, 1.5 * mask.buffer);
  } catch (err) {
    if (!(err instanceof RangeError)) throw err;
    // A fine mask can fit under the point cap while its 1.5 × wider twin does not: say so, fit on.
    warnings.push(
      `The buffer-sensitivity check was skipped: a mask with a ${(1.5 * mask.buffer).toFixed(0)} m buffer at ${mask.spacing.toFixed(0)} m spacing would be too large. Refit with a coarser spacing to check the buffer.`,
    );
    return null;
  }
  const lik = new SecrLikelihood(data, wider, input.traps);
  const refit = optimise(lik, [best.theta], best.inverseHessian);
  const D2 = data.animals.length / lik.concentrated(refit.theta).esa;
  const relativeChange = (D2 - D) / D;
  if (Math.abs(relativeChange) > BUFFER_TOLERANCE) {
    warnings.push(
      `Widening the mask buffer from ${mask.buffer.toFixed(0)} m to ${wider.buffer.toFixed(0)} m changes the density by ${(100 * relativeChange).toFixed(1)} %: the buffer is too narrow; increase it.`,
    );
  }
  return { buffer: wider.buffer, D: D2, relativeChange };
}

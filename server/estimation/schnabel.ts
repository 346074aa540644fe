/** Multiple-census estimators: Schnabel (1938) and Schumacher & Eschmeyer (1943). */
import type { ModelEstimate } from '../../shared/estimate';
import { tQuantile, Z95 } from './numeric/distributions';
import { poissonExactLimits } from './numeric/exact-limits';
import { invertReciprocalInterval } from './intervals';
import type { CaptureSummary } from './summary';

/** Shown whenever a census estimate falls below the number of animals actually caught. */
export function belowSWarning(N: number, S: number): string {
  return `The estimate (${N.toFixed(1)}) is below the ${S} animals actually caught, so it cannot be right; this happens when animals become trap-happy or differ in catchability. Use a model that allows for behaviour (Mb) or heterogeneity (Mh).`;
}

/** Schnabel N = Σ C_t M_t / Σ R_t, with exact Poisson limits on Σ R_t (≤ 50) or normal on 1/N. */
export function schnabel(s: CaptureSummary): ModelEstimate {
  let sumCM = 0;
  let sumR = 0;
  for (let j = 0; j < s.t; j++) {
    sumCM += s.n[j] * s.marked[j];
    sumR += s.m[j];
  }
  if (sumR === 0) {
    const reason = 'No animal was recaptured, so the Schnabel estimate does not exist.';
    return { model: 'Schnabel', N: null, se: null, ci: null, reason, warnings: [reason] };
  }
  const N = sumCM / sumR;
  const varInv = sumR / (sumCM * sumCM);
  const se = N * N * Math.sqrt(varInv);
  let ci;
  let method: string;
  if (sumR <= 50) {
    const [rLo, rHi] = poissonExactLimits(sumR);
    ci = invertReciprocalInterval(rLo / sumCM, rHi / sumCM);
    method = 'exact Poisson limits on the total recaptures';
  } else {
    const half = Z95 * Math.sqrt(varInv);
    ci = invertReciprocalInterval(1 / N - half, 1 / N + half);
    method = 'normal interval on 1/N, inverted';
  }
  const warnings = N < s.S ? [belowSWarning(N, s.S)] : [];
  return {
    model: 'Schnabel',
    N,
    se,
    ci,
    params: { chapmanForm: sumCM / (sumR + 1), totalRecaptures: sumR, intervalMethod: method },
    warnings,
  };
}

/** Schumacher–Eschmeyer N = Σ C_t M_t² / Σ R_t M_t with a Student t interval on 1/N. */
export function schumacherEschmeyer(s: CaptureSummary): ModelEstimate {
  let sumCM2 = 0;
  let sumRM = 0;
  let sumR2C = 0;
  for (let j = 0; j < s.t; j++) {
    sumCM2 += s.n[j] * s.marked[j] ** 2;
    sumRM += s.m[j] * s.marked[j];
    if (s.n[j] > 0) sumR2C += s.m[j] ** 2 / s.n[j];
  }
  const df = s.t - 2;
  if (sumRM === 0 || df < 1) {
    const reason =
      df < 1
        ? 'The Schumacher–Eschmeyer method needs at least three occasions.'
        : 'No animal was recaptured, so the Schumacher–Eschmeyer estimate does not exist.';
    return {
      model: 'Schumacher-Eschmeyer',
      N: null,
      se: null,
      ci: null,
      reason,
      warnings: [reason],
    };
  }
  const N = sumCM2 / sumRM;
  const mse = (sumR2C - sumRM ** 2 / sumCM2) / df;
  const varInv = Math.max(mse, 0) / sumCM2;
  const half = tQuantile(0.975, df) * Math.sqrt(varInv);
  const ci = invertReciprocalInterval(1 / N - half, 1 / N + half);
  const warnings = N < s.S ? [belowSWarning(N, s.S)] : [];
  if (ci[1] === null) {
    warnings.push('The Schumacher–Eschmeyer interval has no finite upper limit.');
  }
  return {
    model: 'Schumacher-Eschmeyer',
    N,
    se: N * N * Math.sqrt(varInv),
    ci,
    params: { meanSquareError: mse, df },
    warnings,
  };
}

/** Chao (1987) Mh estimator in its three forms and the Chao, Lee & Jeng (1992) Mth estimator. */
import type { ModelEstimate } from '../../shared/estimate';
import { SeededRandom } from './numeric/random';
import { logNormalInterval } from './intervals';
import type { CaptureSummary } from './summary';

/** Which form of the Chao Mh estimator to report. */
export type ChaoForm = 'classic' | 't-adjusted' | 'bias-corrected';

/** Chao Mh estimate and variance for a given form (f1, f2: animals caught once and twice). */
export function chaoEstimate(
  f1: number,
  f2: number,
  S: number,
  t: number,
  form: ChaoForm,
): { N: number; variance: number } {
  const k = form === 'classic' ? 1 : (t - 1) / t;
  if (form === 'bias-corrected') {
    // Chao (2005), from memory: N = S + k f1(f1−1)/(2(f2+1)), valid when f2 = 0.
    const a = f2 + 1;
    const N = S + (k * f1 * (f1 - 1)) / (2 * a);
    const variance =
      (k * f1 * (f1 - 1)) / (2 * a) +
      (k * k * f1 * (2 * f1 - 1) ** 2) / (4 * a * a) +
      (k * k * f1 * f1 * (f1 - 1) ** 2 * f2) / (4 * a ** 4);
    return { N, variance };
  }
  const r = f1 / f2;
  // Chao (1987): var = f2[k²r⁴/4 + k²r³ + k r²/2] with r = f1/f2 (k = 1 in the classic form).
  return {
    N: S + (k * f1 * f1) / (2 * f2),
    variance: f2 * ((k * k * r ** 4) / 4 + k * k * r ** 3 + (k * r * r) / 2),
  };
}

/** Chao Mh with a log-normal interval; switches to the bias-corrected form when f2 = 0 and says so. */
export function chaoMh(s: CaptureSummary, form: ChaoForm = 'classic'): ModelEstimate {
  const f1 = s.f[1] ?? 0;
  const f2 = s.f[2] ?? 0;
  const warnings: string[] = [];
  let used = form;
  if (f2 === 0 && form !== 'bias-corrected') {
    used = 'bias-corrected';
    warnings.push(
      'No animal was caught exactly twice (f2 = 0), so the usual Chao estimator is undefined; the bias-corrected form S + ((t−1)/t)·f1(f1−1)/(2(f2+1)) is reported instead.',
    );
  }
  if (f1 === 0)
    warnings.push('No animal was caught only once, so the Chao estimate equals the number caught.');
  const { N, variance } = chaoEstimate(f1, f2, s.S, s.t, used);
  const others = (['classic', 't-adjusted', 'bias-corrected'] as const).filter(
    (x) => f2 > 0 || x === 'bias-corrected',
  );
  const params: Record<string, number | string> = { form: used, f1, f2 };
  for (const o of others) params[o] = chaoEstimate(f1, f2, s.S, s.t, o).N;
  return {
    model: 'Mh-chao',
    N,
    se: Math.sqrt(variance),
    ci: logNormalInterval(N, variance, s.S),
    params,
    warnings,
  };
}

/** Chao, Lee & Jeng (1992) N̂1 from counts: D/Ĉ + (f1/Ĉ)γ̂², Ĉ = 1 − f1/n. (from the paper, from memory). */
export function mthFromCounts(
  S: number,
  f1: number,
  sumKK1: number,
  nDot: number,
  sumNj2: number,
): { N: number; coverage: number; gamma2: number } | null {
  const coverage = 1 - f1 / nDot;
  const pairs = nDot * nDot - sumNj2; // 2 Σ_{j<k} n_j n_k
  if (!(coverage > 0) || !(pairs > 0)) return null;
  const n0 = S / coverage;
  const gamma2 = Math.max((n0 * sumKK1) / pairs - 1, 0);
  return { N: n0 + (f1 / coverage) * gamma2, coverage, gamma2 };
}

/** Mth sample-coverage estimate with a seeded bootstrap SE (B resamples of the imputed population). */
export function chaoMth(
  rows: readonly Uint8Array[],
  s: CaptureSummary,
  options: { bootstrap?: number; seed?: number } = {},
): ModelEstimate {
  const sumKK1 = s.f.reduce((a, fk, k) => a + k * (k - 1) * fk, 0);
  const sumNj2 = s.n.reduce((a, nj) => a + nj * nj, 0);
  const point = mthFromCounts(s.S, s.f[1] ?? 0, sumKK1, s.nDot, sumNj2);
  if (!point) {
    const reason =
      'Every animal was caught only once, so sample coverage is zero and Mth cannot be estimated.';
    return { model: 'Mth-chao', N: null, se: null, ci: null, reason, warnings: [reason] };
  }
  const B = options.bootstrap ?? 200;
  const boot = bootstrapMth(rows, s, point.N, B, options.seed ?? 20240601);
  const warnings: string[] = [];
  if (boot.failed > 0)
    warnings.push(
      `${boot.failed} of ${B} bootstrap resamples had no recaptures and were left out of the SE.`,
    );
  const variance = boot.variance;
  return {
    model: 'Mth-chao',
    N: point.N,
    se: Math.sqrt(variance),
    ci: logNormalInterval(point.N, variance, s.S),
    params: { coverage: point.coverage, cv2: point.gamma2, bootstrapReplicates: B },
    warnings,
  };
}

function bootstrapMth(
  rows: readonly Uint8Array[],
  s: CaptureSummary,
  N: number,
  B: number,
  seed: number,
): { variance: number; failed: number } {
  const rng = new SeededRandom(seed);
  const total = Math.max(Math.round(N), s.S);
  // Sparse rows: the occasions each animal was caught.
  const caughtOn = rows.map((r) => {
    const out: number[] = [];
    for (let j = 0; j < r.length; j++) if (r[j]) out.push(j);
    return out;
  });
  const nj = new Float64Array(s.t);
  const values: number[] = [];
  let failed = 0;
  for (let b = 0; b < B; b++) {
    nj.fill(0);
    let D = 0;
    let f1 = 0;
    let nDot = 0;
    let sumKK1 = 0;
    for (let i = 0; i < total; i++) {
      const idx = rng.integer(total);
      if (idx >= s.S) continue; // an imputed animal that was never caught
      const occ = caughtOn[idx];
      const k = occ.length;
      D++;
      nDot += k;
      if (k === 1) f1++;
      sumKK1 += k * (k - 1);
      for (const j of occ) nj[j]++;
    }
    let sumNj2 = 0;
    for (let j = 0; j < s.t; j++) sumNj2 += nj[j] * nj[j];
    const est = mthFromCounts(D, f1, sumKK1, nDot, sumNj2);
    if (est) values.push(est.N);
    else failed++;
  }
  const mean = values.reduce((a, v) => a + v, 0) / values.length;
  const variance = values.reduce((a, v) => a + (v - mean) ** 2, 0) / Math.max(values.length - 1, 1);
  return { variance, failed };
}

/**
 * Factorised SECR log-likelihood with analytic gradient (Borchers & Efford 2008), half-normal
 * detection. The non-detection part Σ_k,s log(1 − p_ks(X)) is shared by all animals and computed
 * once per mask point; each animal then multiplies in terms only for its (trap, usage) detection
 * groups, and animals with identical detection patterns share one integral.
 * Link scale: β = (log D [animals/ha], logit g0 | log λ0, log σ [m]).
 */
import type { PreparedSecr } from './data';
import {
  createWorkspace,
  fillCount,
  fillProximity,
  fillSeparable,
  type SecrWorkspace,
} from './detection-terms';
import type { HabitatMask, TrapXY } from './mask';

/** Log-likelihood value and gradient on the link scale. */
export interface SecrEvaluation {
  logLik: number;
  gradient: number[];
  /** Effective sampling area a(θ) in hectares. */
  esa: number;
}

/** Points whose log-integrand lies this far below the maximum weigh under e^−40 and are skipped. */
const LOG_SKIP = 40;

interface Pattern {
  group: Int32Array;
  count: Float64Array;
  animals: number;
}

/** The SECR likelihood for one data set and one mask. */
export class SecrLikelihood {
  private readonly ws: SecrWorkspace;
  private readonly cellHa: number;
  private readonly e: Float64Array;
  private readonly w: Float64Array;
  private readonly patterns: Pattern[];
  /** Number of likelihood evaluations so far (each includes the gradient). */
  evaluations = 0;

  constructor(
    private readonly data: PreparedSecr,
    mask: HabitatMask,
    traps: readonly TrapXY[],
  ) {
    this.ws = createWorkspace(data, mask, traps);
    this.cellHa = (mask.spacing * mask.spacing) / 1e4;
    this.e = new Float64Array(mask.points);
    this.w = new Float64Array(mask.points);
    this.patterns = detectionPatterns(data);
  }

  /** Full log-likelihood n·log D − D·a(θ) + Σ_i log ∫ Pr(ω_i|X) dX (+ constant) and its gradient. */
  evaluate(beta: readonly number[]): SecrEvaluation {
    const D = Math.exp(beta[0]);
    const r = this.core(beta[1], beta[2]);
    const n = this.data.animals.length;
    return {
      logLik: n * beta[0] - D * r.a + r.sumLi + this.data.constant,
      gradient: [n - D * r.a, -D * r.da1 + r.dL1, -D * r.da2 + r.dL2],
      esa: r.a,
    };
  }

  /** Log-likelihood with D at its conditional maximum n/a(θ); gradient in (η1, η2). */
  concentrated(theta: readonly number[]): SecrEvaluation {
    const r = this.core(theta[0], theta[1]);
    const n = this.data.animals.length;
    return {
      logLik: n * Math.log(n / r.a) - n + r.sumLi + this.data.constant,
      gradient: [(-n / r.a) * r.da1 + r.dL1, (-n / r.a) * r.da2 + r.dL2],
      esa: r.a,
    };
  }

  private core(eta1: number, eta2: number) {
    this.evaluations++;
    const ws = this.ws;
    const c = 1 / (2 * Math.exp(2 * eta2));
    fillSeparable(ws, c);
    if (this.data.detector === 'proximity') fillProximity(ws, 1 / (1 + Math.exp(-eta1)), c);
    else fillCount(ws, Math.exp(eta1), c);
    let maxBase = -Infinity;
    for (let m = 0; m < ws.M; m++) if (ws.base[m] > maxBase) maxBase = ws.base[m];
    let a = 0;
    let da1 = 0;
    let da2 = 0;
    for (let m = 0; m < ws.M; m++) {
      const miss = Math.exp(ws.base[m]);
      this.e[m] = Math.exp(ws.base[m] - maxBase);
      a -= Math.expm1(ws.base[m]);
      da1 -= miss * ws.base1[m];
      da2 -= miss * ws.base2[m];
    }
    const animals = this.animalTerms(maxBase);
    return { a: a * this.cellHa, da1: da1 * this.cellHa, da2: da2 * this.cellHa, ...animals };
  }

  private animalTerms(maxBase: number): { sumLi: number; dL1: number; dL2: number } {
    const { M, base1, base2, col1, col2 } = this.ws;
    const w = this.w;
    const logCell = Math.log(this.cellHa);
    let sumLi = 0;
    let dL1 = 0;
    let dL2 = 0;
    for (const p of this.patterns) {
      let sum = this.linearWeights(p);
      let logNorm = 0;
      for (let q = 0; q < p.group.length; q++) logNorm += p.count[q] * this.ws.logNorm[p.group[q]];
      let logScale = maxBase + logNorm;
      if (!(sum > 1e-250)) {
        // Products underflowed (detections far apart): redo this pattern on the log scale.
        const r = this.logWeights(p);
        sum = r.sum;
        logScale = r.max;
      }
      let s1 = dot(w, base1, 0, M);
      let s2 = dot(w, base2, 0, M);
      for (let q = 0; q < p.group.length; q++) {
        const off = p.group[q] * M;
        s1 += p.count[q] * dot(w, col1, off, M);
        s2 += p.count[q] * dot(w, col2, off, M);
      }
      sumLi += p.animals * (Math.log(sum) + logScale + logCell);
      dL1 += (p.animals * s1) / sum;
      dL2 += (p.animals * s2) / sum;
    }
    return { sumLi, dL1, dL2 };
  }

  /** w(m) = exp(base − max) · Π_q ratio_q^c_q: products only, no exponentials. */
  private linearWeights(p: Pattern): number {
    const { M, ratio } = this.ws;
    const w = this.w;
    w.set(this.e);
    for (let q = 0; q < p.group.length; q++) {
      const off = p.group[q] * M;
      const cnt = p.count[q];
      if (cnt === 1) for (let m = 0; m < M; m++) w[m] *= ratio[off + m];
      else if (cnt <= 8) {
        // Repeated products: far cheaper than Math.pow for the small counts typical here.
        for (let m = 0; m < M; m++) {
          const r = ratio[off + m];
          let t = r;
          for (let i = 1; i < cnt; i++) t *= r;
          w[m] *= t;
        }
      } else for (let m = 0; m < M; m++) w[m] *= Math.pow(ratio[off + m], cnt);
    }
    let sum = 0;
    for (let m = 0; m < M; m++) sum += w[m];
    return sum;
  }

  private logWeights(p: Pattern): { sum: number; max: number } {
    const { M, base, col } = this.ws;
    const w = this.w;
    for (let m = 0; m < M; m++) {
      let v = base[m];
      for (let q = 0; q < p.group.length; q++) v += p.count[q] * col[p.group[q] * M + m];
      w[m] = v;
    }
    let max = -Infinity;
    for (let m = 0; m < M; m++) if (w[m] > max) max = w[m];
    let sum = 0;
    for (let m = 0; m < M; m++) {
      w[m] = w[m] < max - LOG_SKIP ? 0 : Math.exp(w[m] - max);
      sum += w[m];
    }
    return { sum, max };
  }
}

/** Σ_m a[m]·b[offset + m]. */
function dot(a: Float64Array, b: Float64Array, offset: number, length: number): number {
  let s = 0;
  for (let m = 0; m < length; m++) s += a[m] * b[offset + m];
  return s;
}

/** Animals with identical detection groups and counts share one integral. */
function detectionPatterns(data: PreparedSecr): Pattern[] {
  const byKey = new Map<string, Pattern>();
  for (const a of data.animals) {
    const order = [...a.group.keys()].sort((i, j) => a.group[i] - a.group[j]);
    const key = order.map((i) => `${a.group[i]}x${a.count[i]}`).join(',');
    const found = byKey.get(key);
    if (found) found.animals++;
    else {
      byKey.set(key, {
        group: Int32Array.from(order.map((i) => a.group[i])),
        count: Float64Array.from(order.map((i) => a.count[i])),
        animals: 1,
      });
    }
  }
  return [...byKey.values()];
}

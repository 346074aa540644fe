/**
 * Per-evaluation detection terms on the mask for the SECR likelihood: the shared non-detection
 * sum base(m) = Σ_k U_k log(1 − g_mk) (or −Σ_k U_k λ_mk for counts) with its derivatives, and one
 * column per (trap, usage) detection group holding log[p/(1−p)] (or log λ), its derivatives, and
 * the same term on the linear scale divided by its largest possible value (`ratio` ≤ 1).
 */
import type { PreparedSecr } from './data';
import type { HabitatMask, TrapXY } from './mask';

/** Buffers reused across evaluations of one data set on one mask. */
export interface SecrWorkspace {
  M: number;
  K: number;
  nx: number;
  ny: number;
  ix: Int32Array;
  iy: Int32Array;
  dx2: Float64Array;
  dy2: Float64Array;
  ex: Float64Array;
  ey: Float64Array;
  base: Float64Array;
  base1: Float64Array;
  base2: Float64Array;
  gkm: Float64Array;
  lkm: Float64Array;
  col: Float64Array;
  col1: Float64Array;
  col2: Float64Array;
  ratio: Float64Array;
  /** log of the value each column's ratio was divided by. */
  logNorm: Float64Array;
  unitGroup: Int32Array;
  activeTraps: number[];
  data: PreparedSecr;
}

/** Allocate the buffers and the separable squared distances (x and y parts per trap). */
export function createWorkspace(
  data: PreparedSecr,
  mask: HabitatMask,
  traps: readonly TrapXY[],
): SecrWorkspace {
  const M = mask.points;
  const K = traps.length;
  const nx = mask.columns.length;
  const ny = mask.rows.length;
  const dx2 = new Float64Array(K * nx);
  const dy2 = new Float64Array(K * ny);
  traps.forEach((t, k) => {
    for (let i = 0; i < nx; i++) dx2[k * nx + i] = (mask.columns[i] - t.x) ** 2;
    for (let j = 0; j < ny; j++) dy2[k * ny + j] = (mask.rows[j] - t.y) ** 2;
  });
  const G = data.groups.length;
  const unitGroup = new Int32Array(K).fill(-1);
  if (data.detector === 'proximity') {
    data.groups.forEach((g, gi) => {
      if (g.usage === 1) unitGroup[g.trap] = gi;
    });
  }
  const used = new Set(data.groups.map((g) => g.trap));
  const activeTraps: number[] = [];
  for (let k = 0; k < K; k++) if (data.totalUsage[k] > 0 || used.has(k)) activeTraps.push(k);
  return {
    M,
    K,
    nx,
    ny,
    ix: mask.ix,
    iy: mask.iy,
    dx2,
    dy2,
    ex: new Float64Array(K * nx),
    ey: new Float64Array(K * ny),
    base: new Float64Array(M),
    base1: new Float64Array(M),
    base2: new Float64Array(M),
    gkm: new Float64Array(K * M),
    lkm: new Float64Array(K * M),
    col: new Float64Array(G * M),
    col1: new Float64Array(G * M),
    col2: new Float64Array(G * M),
    ratio: new Float64Array(G * M),
    logNorm: new Float64Array(G),
    unitGroup,
    activeTraps,
    data,
  };
}

/** exp(−d²/(2σ²)) factorises into x and y parts on a grid: K·(nx + ny) exponentials, not K·M. */
export function fillSeparable(ws: SecrWorkspace, c: number): void {
  for (let i = 0; i < ws.dx2.length; i++) ws.ex[i] = Math.exp(-ws.dx2[i] * c);
  for (let j = 0; j < ws.dy2.length; j++) ws.ey[j] = Math.exp(-ws.dy2[j] * c);
}

/** log(1 − g), by series where g is small (error below g⁶/6) and log1p elsewhere. */
function log1mg(g: number): number {
  return g < 1e-3 ? -g * (1 + g * (0.5 + g * (1 / 3 + g * (0.25 + g * 0.2)))) : Math.log1p(-g);
}

/** Proximity detectors: base terms and all detection-group columns for g0 and c = 1/(2σ²). */
export function fillProximity(ws: SecrWorkspace, g0: number, c: number): void {
  const { M, nx, ny, ix, iy, base, base1, base2, gkm, lkm, col, col1, col2, ratio } = ws;
  const logG0 = Math.log(g0);
  const logOdds0 = Math.log(g0 / (1 - g0));
  base.fill(0);
  base1.fill(0);
  base2.fill(0);
  for (const k of ws.activeTraps) {
    const U = ws.data.totalUsage[k];
    const off = k * M;
    const gi = ws.unitGroup[k];
    const co = gi * M;
    if (gi >= 0) ws.logNorm[gi] = logOdds0;
    for (let m = 0; m < M; m++) {
      const h = ws.ex[k * nx + ix[m]] * ws.ey[k * ny + iy[m]];
      const g = g0 * h;
      const L = log1mg(g);
      gkm[off + m] = g;
      lkm[off + m] = L;
      const twoE = 2 * c * (ws.dx2[k * nx + ix[m]] + ws.dy2[k * ny + iy[m]]);
      const inv = 1 / (1 - g);
      if (U > 0) {
        const w = U * g * inv;
        base[m] += U * L;
        base1[m] -= w * (1 - g0);
        base2[m] -= w * twoE;
      }
      if (gi >= 0) {
        // A usage-1 group: log p − log(1 − p) with p = g, exact even where g underflows.
        col[co + m] = logG0 - 0.5 * twoE - L;
        col1[co + m] = (1 - g0) * inv;
        col2[co + m] = twoE * inv;
        ratio[co + m] = h * (1 - g0) * inv;
      }
    }
  }
  ws.data.groups.forEach((grp, gi) => {
    if (grp.usage !== 1) proximityColumn(ws, grp.trap, grp.usage, gi, g0, c);
  });
}

/** A group with usage u ≠ 1: p = 1 − (1 − g)^u, column log p − u·log(1 − g). */
function proximityColumn(
  ws: SecrWorkspace,
  k: number,
  u: number,
  gi: number,
  g0: number,
  c: number,
): void {
  const { M, nx, ny, ix, iy, gkm, lkm, col, col1, col2, ratio } = ws;
  const logG0 = Math.log(g0);
  const L0 = Math.log1p(-g0);
  const logNorm = Math.log(-Math.expm1(u * L0)) - u * L0;
  ws.logNorm[gi] = logNorm;
  const off = gi * M;
  for (let m = 0; m < M; m++) {
    const e = c * (ws.dx2[k * nx + ix[m]] + ws.dy2[k * ny + iy[m]]);
    const g = gkm[k * M + m];
    const L = lkm[k * M + m];
    const P = -Math.expm1(u * L);
    if (P > 0) {
      const dcol = (u * Math.exp((u - 1) * L)) / P + u / (1 - g);
      col[off + m] = Math.log(P) - u * L;
      col1[off + m] = dcol * g * (1 - g0);
      col2[off + m] = dcol * g * 2 * e;
    } else {
      // g underflowed: p ≈ u·g.
      col[off + m] = Math.log(u) + logG0 - e;
      col1[off + m] = 1 - g0;
      col2[off + m] = 2 * e;
    }
    ratio[off + m] = Math.exp(col[off + m] - logNorm);
  }
}

/** Count (Poisson) detectors: base = −Σ U_k λ_mk and columns log λ_mk. */
export function fillCount(ws: SecrWorkspace, lambda0: number, c: number): void {
  const { M, nx, ny, ix, iy, base, base1, base2, col, col1, col2, ratio } = ws;
  base.fill(0);
  base1.fill(0);
  base2.fill(0);
  for (const k of ws.activeTraps) {
    const U = ws.data.totalUsage[k];
    if (U === 0) continue;
    for (let m = 0; m < M; m++) {
      const h = ws.ex[k * nx + ix[m]] * ws.ey[k * ny + iy[m]];
      const lam = U * lambda0 * h;
      base[m] -= lam;
      base1[m] -= lam;
      base2[m] -= lam * 2 * c * (ws.dx2[k * nx + ix[m]] + ws.dy2[k * ny + iy[m]]);
    }
  }
  const logL0 = Math.log(lambda0);
  ws.data.groups.forEach((grp, gi) => {
    const k = grp.trap;
    const off = gi * M;
    ws.logNorm[gi] = logL0;
    for (let m = 0; m < M; m++) {
      const e = c * (ws.dx2[k * nx + ix[m]] + ws.dy2[k * ny + iy[m]]);
      col[off + m] = logL0 - e;
      col1[off + m] = 1;
      col2[off + m] = 2 * e;
      ratio[off + m] = ws.ex[k * nx + ix[m]] * ws.ey[k * ny + iy[m]];
    }
  });
}

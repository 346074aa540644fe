/**
 * Memory a fit will need, estimated before anything large is built, so that a request that would
 * exhaust the server's memory is refused with advice instead of crashing the worker.
 */
import { prepareSecr, type SecrInput } from './data';
import { DEFAULT_MASK_POINTS, MASK_POINT_CAP, type TrapXY } from './mask';
import { bufferedHullArea } from './two-step';

/** Working memory a single fit may use (likelihood buffers for the mask and the buffer check). */
export const SECR_MEMORY_LIMIT_BYTES = 1024 ** 3;

/**
 * Bytes held by one likelihood on a mask of M points with K traps and G detection groups;
 * `gridLines` is the mask grid's columns plus rows (per-trap separable distance terms).
 */
export function likelihoodBytes(M: number, K: number, G: number, gridLines = 0): number {
  // Workspace: gkm and lkm (K·M), four group columns (G·M), three base terms (M); likelihood e
  // and w (2·M); mask x, y (Float64) and ix, iy (Int32) — 3·M in 8-byte units; dx2, dy2, ex, ey.
  return 8 * M * (2 * K + 4 * G + 3 + 2 + 3) + 16 * K * gridLines;
}

/** Columns plus rows of the grid a mask of this spacing and buffer is cut from. */
function gridLines(traps: readonly TrapXY[], spacing: number, buffer: number): number {
  const span = (v: number[]) => Math.max(...v) - Math.min(...v) + 2 * buffer;
  return (
    Math.ceil(span(traps.map((t) => t.x)) / spacing) +
    Math.ceil(span(traps.map((t) => t.y)) / spacing)
  );
}

/**
 * Mask points for a buffer and spacing: cells inside the convex hull of the traps buffered by b.
 * The kept region (within b of some trap) lies inside that hull, so this errs on the high side.
 */
export function maskPointsUpperEstimate(
  traps: readonly TrapXY[],
  spacing: number,
  buffer: number,
): number {
  return Math.ceil(bufferedHullArea(traps, buffer).area / (spacing * spacing));
}

/** What a fit of this input would build and use at its peak. */
export interface SecrMemoryEstimate {
  maskPoints: number;
  /** Points of the 1.5 × buffer mask of the buffer-sensitivity refit. */
  widerMaskPoints: number;
  peakBytes: number;
}

/** Estimate mask sizes and peak memory; null when σ cannot be estimated (no fit will run). */
export function estimateSecrMemory(input: SecrInput): SecrMemoryEstimate | null {
  const data = prepareSecr(input);
  const K = input.traps.length;
  const G = data.groups.length;
  let maskPoints: number;
  let widerMaskPoints: number;
  let lines: [number, number];
  if (input.mask) {
    const { spacing, buffer } = input.mask;
    maskPoints = maskPointsUpperEstimate(input.traps, spacing, buffer);
    widerMaskPoints = maskPointsUpperEstimate(input.traps, spacing, 1.5 * buffer);
    lines = [
      gridLines(input.traps, spacing, buffer),
      gridLines(input.traps, spacing, 1.5 * buffer),
    ];
  } else {
    if (data.rpsv === null) return null;
    // The default spacing aims at a fixed number of points for the default buffer of 4σ.
    const buffer = 4 * data.rpsv;
    const ratio =
      bufferedHullArea(input.traps, 1.5 * buffer).area / bufferedHullArea(input.traps, buffer).area;
    maskPoints = DEFAULT_MASK_POINTS;
    widerMaskPoints = Math.ceil(DEFAULT_MASK_POINTS * ratio);
    const side = Math.sqrt(maskPoints);
    lines = [2 * side, 2 * side * Math.sqrt(ratio)].map(Math.ceil) as [number, number];
  }
  // The fitted likelihood stays alive while the wider one is built for the buffer check (which
  // fitSecr skips when the wider mask would exceed the point cap).
  const wider =
    widerMaskPoints <= MASK_POINT_CAP ? likelihoodBytes(widerMaskPoints, K, G, lines[1]) : 0;
  const peakBytes = likelihoodBytes(maskPoints, K, G, lines[0]) + wider;
  return { maskPoints, widerMaskPoints, peakBytes };
}

/** Throws a RangeError a person can act on when the fit would exceed the point cap or memory. */
export function assertSecrFitsInMemory(input: SecrInput): void {
  const estimate = estimateSecrMemory(input);
  if (!estimate) return;
  const where = input.mask
    ? `a mask with spacing ${input.mask.spacing} m and buffer ${input.mask.buffer} m`
    : 'the default mask';
  if (estimate.maskPoints > MASK_POINT_CAP) {
    throw new RangeError(
      `The habitat mask is too large: ${where} would have about ${estimate.maskPoints.toLocaleString('en')} points, more than the limit of ${MASK_POINT_CAP.toLocaleString('en')}. Use a larger spacing (cells of up to half the movement scale σ are usually fine) or a smaller buffer.`,
    );
  }
  if (estimate.peakBytes > SECR_MEMORY_LIMIT_BYTES) {
    const mb = (b: number) => `${Math.round(b / 1024 ** 2).toLocaleString('en')} MB`;
    throw new RangeError(
      `This fit is too large for the server's memory: ${where} with ${input.traps.length} traps would need about ${mb(estimate.peakBytes)}, more than the ${mb(SECR_MEMORY_LIMIT_BYTES)} allowed. Use a larger mask spacing, a smaller buffer, or fewer traps.`,
    );
  }
}

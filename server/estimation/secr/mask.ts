/** Habitat mask: square cells of side h whose centres lie within buffer b of the nearest trap. */

/** A regular-grid mask; points are cell centres in metres, stored with their grid indices. */
export interface HabitatMask {
  spacing: number;
  buffer: number;
  points: number;
  x: Float64Array;
  y: Float64Array;
  /** Grid column / row of each point, for separable distance terms. */
  ix: Int32Array;
  iy: Int32Array;
  /** Distinct x (per column) and y (per row) of the grid. */
  columns: Float64Array;
  rows: Float64Array;
}

/** Largest mask we build; a finer spacing is refused with an explanation. */
export const MASK_POINT_CAP = 60_000;
/** Points the default spacing aims for. */
export const DEFAULT_MASK_POINTS = 4000;

/** Trap location in metres. */
export interface TrapXY {
  x: number;
  y: number;
}

/** Build the mask; throws a RangeError a person can act on if it would exceed the point cap. */
export function buildMask(traps: readonly TrapXY[], spacing: number, buffer: number): HabitatMask {
  if (!(spacing > 0) || !(buffer > 0))
    throw new RangeError('Mask spacing and buffer must be positive distances in metres.');
  const xs = traps.map((t) => t.x);
  const ys = traps.map((t) => t.y);
  const x0 = Math.min(...xs) - buffer;
  const y0 = Math.min(...ys) - buffer;
  const nx = Math.ceil((Math.max(...xs) + buffer - x0) / spacing);
  const ny = Math.ceil((Math.max(...ys) + buffer - y0) / spacing);
  const boxCells = nx * ny;
  if (boxCells > 50 * MASK_POINT_CAP) throw capError(boxCells, spacing, buffer);
  const columns = Float64Array.from({ length: nx }, (_, i) => x0 + (i + 0.5) * spacing);
  const rows = Float64Array.from({ length: ny }, (_, j) => y0 + (j + 0.5) * spacing);
  const b2 = buffer * buffer;
  const keepX: number[] = [];
  const keepY: number[] = [];
  const keepIx: number[] = [];
  const keepIy: number[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const px = columns[i];
      const py = rows[j];
      let near = false;
      for (const t of traps) {
        const dx = px - t.x;
        const dy = py - t.y;
        if (dx * dx + dy * dy <= b2) {
          near = true;
          break;
        }
      }
      if (!near) continue;
      keepX.push(px);
      keepY.push(py);
      keepIx.push(i);
      keepIy.push(j);
    }
  }
  if (keepX.length > MASK_POINT_CAP) throw capError(keepX.length, spacing, buffer);
  return {
    spacing,
    buffer,
    points: keepX.length,
    x: Float64Array.from(keepX),
    y: Float64Array.from(keepY),
    ix: Int32Array.from(keepIx),
    iy: Int32Array.from(keepIy),
    columns,
    rows,
  };
}

function capError(points: number, spacing: number, buffer: number): RangeError {
  return new RangeError(
    `A mask with spacing ${spacing} m and buffer ${buffer} m would have about ${points} points, more than the limit of ${MASK_POINT_CAP}. Use a larger spacing (cells of up to half the movement scale σ are usually fine).`,
  );
}

/** Spacing that gives about `target` points for a buffer (area estimated from a coarse trial mask). */
export function defaultSpacing(
  traps: readonly TrapXY[],
  buffer: number,
  target = DEFAULT_MASK_POINTS,
): number {
  const trial = buffer / 8;
  const coarse = buildMask(traps, trial, buffer);
  let spacing = Math.sqrt((coarse.points * trial * trial) / target);
  // One correction step: the boundary cells make the first guess slightly off.
  const check = buildMask(traps, spacing, buffer);
  spacing *= Math.sqrt(check.points / target);
  return spacing;
}

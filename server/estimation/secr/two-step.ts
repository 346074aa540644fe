/**
 * The older two-step density, for comparison only: D = N̂ / A(W) with W = ½MMDM (Wilson & Anderson
 * 1985; Karanth & Nichols 1998) or MMDM (Parmenter et al. 2003), and A = P + L·W + πW² for the
 * convex hull of the traps (area P, perimeter L) buffered by W.
 */
import type { TrapXY } from './mask';

/** The published critique shown beside every two-step density. */
export const TWO_STEP_CRITIQUE =
  'Two-step densities depend on an ad hoc buffer and are not comparable with SECR: ½MMDM inflates density relative to SECR (Sollmann et al. 2011, jaguars: 0.62 vs 0.29 per 100 km²), and Foster & Harmsen (2012) recommend SECR instead.';

/** Density per 100 km² from an abundance and an area in km². */
export function densityPer100km2(N: number, areaKm2: number): number {
  return (100 * N) / areaKm2;
}

/** Convex hull (Andrew's monotone chain), counter-clockwise. */
export function convexHull(points: readonly TrapXY[]): TrapXY[] {
  const pts = [...points].sort((a, b) => a.x - b.x || a.y - b.y);
  if (pts.length <= 2) return pts;
  const cross = (o: TrapXY, a: TrapXY, b: TrapXY): number =>
    (a.x - o.x) * (b.y - o.y) - (a.y - o.y) * (b.x - o.x);
  const lower: TrapXY[] = [];
  for (const p of pts) {
    while (lower.length >= 2 && cross(lower[lower.length - 2], lower[lower.length - 1], p) <= 0)
      lower.pop();
    lower.push(p);
  }
  const upper: TrapXY[] = [];
  for (const p of [...pts].reverse()) {
    while (upper.length >= 2 && cross(upper[upper.length - 2], upper[upper.length - 1], p) <= 0)
      upper.pop();
    upper.push(p);
  }
  return [...lower.slice(0, -1), ...upper.slice(0, -1)];
}

/** Area P + L·W + πW² of a convex polygon buffered by W (exact for convex shapes). */
export function bufferedHullArea(
  traps: readonly TrapXY[],
  W: number,
): { hullArea: number; perimeter: number; area: number } {
  const hull = convexHull(traps);
  let area = 0;
  let perimeter = 0;
  for (let i = 0; i < hull.length; i++) {
    const a = hull[i];
    const b = hull[(i + 1) % hull.length];
    area += a.x * b.y - b.x * a.y;
    perimeter += hull.length > 1 ? Math.hypot(b.x - a.x, b.y - a.y) : 0;
  }
  // A two-point "hull" is a segment traversed twice: its perimeter counts both directions, as it should.
  const hullArea = Math.abs(area) / 2;
  return { hullArea, perimeter, area: hullArea + perimeter * W + Math.PI * W * W };
}

/** Two-step density from N̂ (and SE), trap coordinates in metres and each animal's capture traps. */
export function twoStepDensity(input: {
  N: number;
  seN?: number;
  traps: readonly (TrapXY & { id: string })[];
  captures: readonly { animal: string; trap: string }[];
  width: 'half-mmdm' | 'mmdm';
}): {
  mmdm: number | null;
  W: number | null;
  areaKm2: number | null;
  densityPer100km2: number | null;
  se: number | null;
  critique: string;
  reason?: string;
} {
  const where = new Map(input.traps.map((t) => [t.id, t]));
  const byAnimal = new Map<string, TrapXY[]>();
  for (const c of input.captures) {
    const t = where.get(c.trap);
    if (t) byAnimal.set(c.animal, [...(byAnimal.get(c.animal) ?? []), t]);
  }
  const maxima: number[] = [];
  for (const locs of byAnimal.values()) {
    let max = 0;
    for (const a of locs)
      for (const b of locs) max = Math.max(max, Math.hypot(a.x - b.x, a.y - b.y));
    if (max > 0) maxima.push(max);
  }
  if (maxima.length === 0) {
    const reason = 'No animal was detected at two different traps, so MMDM does not exist.';
    return {
      mmdm: null,
      W: null,
      areaKm2: null,
      densityPer100km2: null,
      se: null,
      critique: TWO_STEP_CRITIQUE,
      reason,
    };
  }
  const m = maxima.length;
  const mmdm = maxima.reduce((a, v) => a + v, 0) / m;
  const varMmdm = m > 1 ? maxima.reduce((a, v) => a + (v - mmdm) ** 2, 0) / (m - 1) / m : 0;
  const factor = input.width === 'half-mmdm' ? 0.5 : 1;
  const W = factor * mmdm;
  const { perimeter, area } = bufferedHullArea(input.traps, W);
  const areaKm2 = area / 1e6;
  const D = densityPer100km2(input.N, areaKm2);
  // Delta method: var(A) = (L + 2πW)² var(W).
  const varA = (perimeter + 2 * Math.PI * W) ** 2 * factor * factor * varMmdm;
  const cv2 = ((input.seN ?? 0) / input.N) ** 2 + varA / (area * area);
  return {
    mmdm,
    W,
    areaKm2,
    densityPer100km2: D,
    se: D * Math.sqrt(cv2),
    critique: TWO_STEP_CRITIQUE,
  };
}

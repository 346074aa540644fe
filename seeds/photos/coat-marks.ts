import type { Rng } from './random';

/** Mark kinds: solid spot, rosette (broken ring round a tinted centre), pale scar line, tail ring. */
export type MarkKind = 'spot' | 'rosette' | 'scar' | 'ring';

/** One coat mark in a body-part coordinate frame (units of body length). */
export interface Mark {
  readonly kind: MarkKind;
  readonly x: number;
  readonly y: number;
  /** Mean radius (spots, rosettes), half-width (rings, scars). */
  readonly r: number;
  /** Cosine and sine of the mark's orientation. */
  readonly ca: number;
  readonly sa: number;
  /** Aspect: radius along the orientation over radius across it is elong². */
  readonly elong: number;
  /** Radius wobble: amplitude and phase for harmonics 1–3. */
  readonly wobble: readonly number[];
  /** Rosette ring: [start angle, span] pairs in radians (start in [0, 2π)). */
  readonly segs: readonly number[];
  /** Rosette ring half-thickness relative to the radius. */
  readonly ring: number;
  /** Scar polyline (x, y pairs), empty otherwise. */
  readonly path: readonly number[];
}

/** Ink of the coat at a point: black mark coverage, rosette-centre tint and scar coverage, 0–1. */
export interface Ink {
  black: number;
  centre: number;
  scar: number;
}

const TAU = Math.PI * 2;

/** A solid spot with an irregular edge. */
export function makeSpot(rng: Rng, x: number, y: number, r: number, lumpy = 0.12): Mark {
  const a = rng.range(0, Math.PI);
  return {
    kind: 'spot',
    x,
    y,
    r,
    ca: Math.cos(a),
    sa: Math.sin(a),
    elong: rng.range(0.85, 1.25),
    wobble: wobbleTerms(rng, lumpy),
    segs: [],
    ring: 0,
    path: [],
  };
}

/** A rosette: 2–6 blunt crescents on a wobbly ring; gaps differ in width, as on real coats. */
export function makeRosette(rng: Rng, x: number, y: number, r: number, ringWidth: number): Mark {
  const a = rng.range(0, Math.PI);
  const pieces = rng.int(3, 6);
  // Gaps take 12–35 % of the ring, split unevenly; an occasional wide gap leaves an open "C".
  const gapWeights: number[] = [];
  for (let i = 0; i < pieces; i++) gapWeights.push(rng.range(0.4, 1) * (rng.chance(0.15) ? 3 : 1));
  const arcWeights: number[] = [];
  for (let i = 0; i < pieces; i++) arcWeights.push(rng.range(0.5, 1.5));
  const gapTotal = TAU * rng.range(0.12, 0.35);
  const gapScale = gapTotal / gapWeights.reduce((s, g) => s + g, 0);
  const arcScale = (TAU - gapTotal) / arcWeights.reduce((s, v) => s + v, 0);
  const gaps = gapWeights.map((g) => g * gapScale);
  const arcs = arcWeights.map((a) => a * arcScale);
  const segs: number[] = [];
  let angle = rng.range(0, TAU);
  for (let i = 0; i < pieces; i++) {
    const span = arcs[i];
    segs.push(angle % TAU, span);
    angle += span + gaps[i];
  }
  return {
    kind: 'rosette',
    x,
    y,
    r,
    ca: Math.cos(a),
    sa: Math.sin(a),
    elong: rng.range(0.85, 1.2),
    wobble: wobbleTerms(rng, 0.1),
    segs,
    ring: ringWidth * rng.range(0.8, 1.25),
    path: [],
  };
}

/** A pale healed scar along a slightly bent line. */
export function makeScar(rng: Rng, x: number, y: number, length: number, angle: number): Mark {
  const path: number[] = [];
  const bend = rng.range(-0.25, 0.25);
  for (let i = 0; i <= 3; i++) {
    const t = i / 3 - 0.5;
    const a = angle + bend * t * 2;
    path.push(x + Math.cos(a) * t * length, y + Math.sin(a) * t * length);
  }
  return {
    kind: 'scar',
    x,
    y,
    r: 0.0045,
    ca: 1,
    sa: 0,
    elong: 1,
    wobble: [],
    segs: [],
    ring: 0,
    path,
  };
}

/** A dark band across a tail at position x (tail coordinates: x along, y across). */
export function makeRing(rng: Rng, x: number, halfWidth: number): Mark {
  return {
    kind: 'ring',
    x,
    y: 0,
    r: halfWidth,
    ca: 1,
    sa: 0,
    elong: 1,
    wobble: wobbleTerms(rng, 0.3),
    segs: [],
    ring: 0,
    path: [],
  };
}

function wobbleTerms(rng: Rng, amount: number): number[] {
  const w: number[] = [];
  for (let k = 1; k <= 3; k++) w.push(rng.range(0, amount / k), rng.range(0, TAU));
  return w;
}

/** Reach of a mark from its centre, for spatial indexing. */
export function markReach(m: Mark): number {
  if (m.kind === 'scar') {
    let reach = 0;
    for (let i = 0; i < m.path.length; i += 2) {
      reach = Math.max(reach, Math.hypot(m.path[i] - m.x, m.path[i + 1] - m.y));
    }
    return reach + m.r * 2;
  }
  // Rings span the whole tail width, whatever their half-width along it.
  if (m.kind === 'ring') return Math.max(m.r * 1.6, 0.07);
  return m.r * Math.max(m.elong, 1 / m.elong) * 1.5;
}

function wobble(w: readonly number[], theta: number): number {
  return (
    1 +
    w[0] * Math.sin(theta + w[1]) +
    w[2] * Math.sin(2 * theta + w[3]) +
    w[4] * Math.sin(3 * theta + w[5])
  );
}

function cover(dist: number, px: number): number {
  const a = 0.5 - dist * px;
  return a <= 0 ? 0 : a >= 1 ? 1 : a;
}

/** Distance from a point to a polyline. */
function polylineDistance(path: readonly number[], x: number, y: number): number {
  let best = Infinity;
  for (let i = 0; i + 3 < path.length; i += 2) {
    const ax = path[i];
    const ay = path[i + 1];
    const ex = path[i + 2] - ax;
    const ey = path[i + 3] - ay;
    let t = ((x - ax) * ex + (y - ay) * ey) / (ex * ex + ey * ey);
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    best = Math.min(best, Math.hypot(x - ax - ex * t, y - ay - ey * t));
  }
  return best;
}

/**
 * Adds one mark's ink at (x, y) into ink (max-combined). px is pixels per unit, for anti-aliasing;
 * pass a large value for hard edges.
 */
export function inkOf(m: Mark, x: number, y: number, px: number, ink: Ink): void {
  if (m.kind === 'scar') {
    ink.scar = Math.max(ink.scar, cover(polylineDistance(m.path, x, y) - m.r, px));
    return;
  }
  const dx = x - m.x;
  const dy = y - m.y;
  if (m.kind === 'ring') {
    const along = Math.abs(dx) - m.r * wobble(m.wobble, y * 40);
    ink.black = Math.max(ink.black, cover(along, px));
    return;
  }
  // Cheap rejection before any square root: the mark reaches at most 1.6 r·max(elong, 1/elong).
  const reach = m.r * 1.6 * (m.elong > 1 ? m.elong : 1 / m.elong);
  if (dx * dx + dy * dy > reach * reach) return;
  const u = (dx * m.ca + dy * m.sa) / m.elong;
  const v = (-dx * m.sa + dy * m.ca) * m.elong;
  const rho = Math.sqrt(u * u + v * v) / m.r;
  if (rho > 1.6) return;
  let theta = Math.atan2(v, u);
  const rad = wobble(m.wobble, theta);
  if (m.kind === 'spot') {
    ink.black = Math.max(ink.black, cover((rho - rad) * m.r, px));
    return;
  }
  ink.centre = Math.max(ink.centre, cover((rho - rad + m.ring * 1.1) * m.r, px));
  if (theta < 0) theta += TAU;
  for (let i = 0; i < m.segs.length; i += 2) {
    let t = theta - m.segs[i];
    if (t < 0) t += TAU;
    if (t > m.segs[i + 1]) continue;
    const f = Math.pow(Math.sin((Math.PI * t) / m.segs[i + 1]), 0.35);
    const dist = (Math.abs(rho - rad) - m.ring * f) * m.r;
    ink.black = Math.max(ink.black, cover(dist, px));
    break;
  }
}

/** A uniform grid over a rectangle holding, per cell, the marks that can reach it. */
export class MarkGrid {
  private readonly cells: Mark[][];
  private readonly nx: number;
  private readonly ny: number;

  constructor(
    readonly marks: readonly Mark[],
    private readonly x0: number,
    private readonly y0: number,
    x1: number,
    y1: number,
    private readonly cell: number,
  ) {
    this.nx = Math.max(1, Math.ceil((x1 - x0) / cell));
    this.ny = Math.max(1, Math.ceil((y1 - y0) / cell));
    this.cells = Array.from({ length: this.nx * this.ny }, () => []);
    for (const m of marks) {
      const reach = markReach(m);
      const cx0 = Math.max(0, Math.floor((m.x - reach - x0) / cell));
      const cx1 = Math.min(this.nx - 1, Math.floor((m.x + reach - x0) / cell));
      const cy0 = Math.max(0, Math.floor((m.y - reach - y0) / cell));
      const cy1 = Math.min(this.ny - 1, Math.floor((m.y + reach - y0) / cell));
      for (let cy = cy0; cy <= cy1; cy++) {
        for (let cx = cx0; cx <= cx1; cx++) this.cells[cy * this.nx + cx].push(m);
      }
    }
  }

  /** Ink at a point (reset first). */
  inkAt(x: number, y: number, px: number, ink: Ink): Ink {
    ink.black = 0;
    ink.centre = 0;
    ink.scar = 0;
    const cx = Math.floor((x - this.x0) / this.cell);
    const cy = Math.floor((y - this.y0) / this.cell);
    if (cx < 0 || cy < 0 || cx >= this.nx || cy >= this.ny) return ink;
    for (const m of this.cells[cy * this.nx + cx]) inkOf(m, x, y, px, ink);
    return ink;
  }

  /** Marks whose reach includes the point (for placement checks). */
  near(x: number, y: number): readonly Mark[] {
    const cx = Math.floor((x - this.x0) / this.cell);
    const cy = Math.floor((y - this.y0) / this.cell);
    if (cx < 0 || cy < 0 || cx >= this.nx || cy >= this.ny) return [];
    return this.cells[cy * this.nx + cx];
  }
}

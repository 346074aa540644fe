/**
 * Figures (animals, people, vehicles) as signed-distance shapes in a side-view template:
 * metres, x forward, y up, feet on y = 0. Parts blend smoothly into one silhouette; the part a
 * point belongs to decides its colour and its coat coordinates.
 */

/** Part shapes. */
export type PartShape =
  | { kind: 'capsule'; ax: number; ay: number; bx: number; by: number; ra: number; rb: number }
  | {
      kind: 'ellipse';
      cx: number;
      cy: number;
      rx: number;
      ry: number;
      angle: number;
      cos: number;
      sin: number;
    }
  | {
      kind: 'box';
      cx: number;
      cy: number;
      hw: number;
      hh: number;
      angle: number;
      round: number;
      cos: number;
      sin: number;
    };

/** One part of a figure. */
export interface Part {
  readonly shape: PartShape;
  /** 0 = far side (drawn behind and shaded darker), 1 = near side. */
  readonly layer: 0 | 1;
  /** Free label the figure's shader switches on ('torso', 'leg', ...). */
  readonly name: string;
  /** Smooth-union radius with the parts before it in the same layer, metres. */
  readonly blend: number;
  /** Optional circle cut out of this part alone (an ear notch), metres. */
  readonly cut?: { cx: number; cy: number; r: number };
  /** Optional frame for the part's surface coordinates (legs and tail carry their own coat). */
  readonly frame?: { ox: number; oy: number; ux: number; uy: number; s0: number; key: string };
}

/** Shading context handed to a figure's colour function (one object, reused per pixel). */
export interface ShadeInput {
  part: Part;
  x: number;
  y: number;
  /** Depth inside the silhouette, metres (0 at the edge). */
  inside: number;
  /** Pixels per template metre, for anti-aliasing marks. */
  px: number;
}

/** A figure ready to render. */
export interface Figure {
  readonly parts: readonly Part[];
  /** Colour (0–255 sRGB) of a covered point, written to out[0..2]. */
  shade(input: ShadeInput, out: Float32Array): void;
  /** Template x the figure turns about (roughly the middle of the body). */
  readonly pivotX: number;
  /** Physical length used for motion blur and sizing, metres. */
  readonly lengthM: number;
}

/** Template-space box of a part, grown by its blend radius. */
export interface PartBox {
  x0: number;
  y0: number;
  x1: number;
  y1: number;
}

/** Bounding box of a part in template metres. */
export function partBox(p: Part): PartBox {
  const s = p.shape;
  const g = p.blend + 0.002;
  if (s.kind === 'capsule') {
    const r = Math.max(s.ra, s.rb) + g;
    return {
      x0: Math.min(s.ax, s.bx) - r,
      x1: Math.max(s.ax, s.bx) + r,
      y0: Math.min(s.ay, s.by) - r,
      y1: Math.max(s.ay, s.by) + r,
    };
  }
  const r = s.kind === 'ellipse' ? Math.max(s.rx, s.ry) : Math.hypot(s.hw, s.hh);
  return { x0: s.cx - r - g, x1: s.cx + r + g, y0: s.cy - r - g, y1: s.cy + r + g };
}

/** Signed distance from a point to one part, metres (negative inside). */
export function partDistance(p: Part, x: number, y: number): number {
  const s = p.shape;
  let d: number;
  if (s.kind === 'capsule') {
    const ex = s.bx - s.ax;
    const ey = s.by - s.ay;
    const px = x - s.ax;
    const py = y - s.ay;
    let t = (px * ex + py * ey) / (ex * ex + ey * ey);
    t = t < 0 ? 0 : t > 1 ? 1 : t;
    const qx = px - ex * t;
    const qy = py - ey * t;
    d = Math.sqrt(qx * qx + qy * qy) - (s.ra + (s.rb - s.ra) * t);
  } else if (s.kind === 'ellipse') {
    const dx = x - s.cx;
    const dy = y - s.cy;
    const u = (dx * s.cos + dy * s.sin) / s.rx;
    const v = (-dx * s.sin + dy * s.cos) / s.ry;
    const k0 = Math.sqrt(u * u + v * v);
    const u1 = u / s.rx;
    const v1 = v / s.ry;
    const k1 = Math.sqrt(u1 * u1 + v1 * v1);
    d = k1 < 1e-12 ? -Math.min(s.rx, s.ry) : (k0 * (k0 - 1)) / k1;
  } else {
    const dx = x - s.cx;
    const dy = y - s.cy;
    const qx = Math.abs(dx * s.cos + dy * s.sin) - s.hw + s.round;
    const qy = Math.abs(-dx * s.sin + dy * s.cos) - s.hh + s.round;
    const mx = qx > 0 ? qx : 0;
    const my = qy > 0 ? qy : 0;
    d = Math.sqrt(mx * mx + my * my) + Math.min(Math.max(qx, qy), 0) - s.round;
  }
  if (p.cut) {
    const cx = x - p.cut.cx;
    const cy = y - p.cut.cy;
    d = Math.max(d, p.cut.r - Math.sqrt(cx * cx + cy * cy));
  }
  return d;
}

/** Polynomial smooth minimum: joins shapes with a fillet of radius k. */
export function smoothMin(a: number, b: number, k: number): number {
  if (k <= 0) return Math.min(a, b);
  const h = Math.max(k - Math.abs(a - b), 0) / k;
  return Math.min(a, b) - h * h * k * 0.25;
}

/** Box around the whole figure, template metres. */
export function figureBox(fig: Figure): PartBox {
  const box: PartBox = { x0: Infinity, y0: Infinity, x1: -Infinity, y1: -Infinity };
  for (const p of fig.parts) {
    const b = partBox(p);
    box.x0 = Math.min(box.x0, b.x0);
    box.y0 = Math.min(box.y0, b.y0);
    box.x1 = Math.max(box.x1, b.x1);
    box.y1 = Math.max(box.y1, b.y1);
  }
  return box;
}

/** Position along a part's own frame (s), or x for parts without a frame. */
export function frameS(p: Part, x: number, y: number): number {
  const f = p.frame;
  return f ? f.s0 + (x - f.ox) * f.ux + (y - f.oy) * f.uy : x;
}

/** Position across a part's own frame (t), or y for parts without a frame. */
export function frameT(p: Part, x: number, y: number): number {
  const f = p.frame;
  return f ? -(x - f.ox) * f.uy + (y - f.oy) * f.ux : y;
}

/** Shorthand constructors keep the figure files readable. */
export function capsule(
  name: string,
  a: readonly [number, number],
  b: readonly [number, number],
  ra: number,
  rb: number,
  opts: { layer?: 0 | 1; blend?: number; frame?: Part['frame'] } = {},
): Part {
  return {
    shape: { kind: 'capsule', ax: a[0], ay: a[1], bx: b[0], by: b[1], ra, rb },
    layer: opts.layer ?? 1,
    name,
    blend: opts.blend ?? 0,
    frame: opts.frame,
  };
}

/** An ellipse part. */
export function ellipse(
  name: string,
  c: readonly [number, number],
  rx: number,
  ry: number,
  angle = 0,
  opts: { layer?: 0 | 1; blend?: number; cut?: Part['cut'] } = {},
): Part {
  return {
    shape: {
      kind: 'ellipse',
      cx: c[0],
      cy: c[1],
      rx,
      ry,
      angle,
      cos: Math.cos(angle),
      sin: Math.sin(angle),
    },
    layer: opts.layer ?? 1,
    name,
    blend: opts.blend ?? 0,
    cut: opts.cut,
  };
}

/** A rounded-box part. */
export function box(
  name: string,
  c: readonly [number, number],
  hw: number,
  hh: number,
  round: number,
  angle = 0,
  opts: { layer?: 0 | 1; blend?: number } = {},
): Part {
  return {
    shape: {
      kind: 'box',
      cx: c[0],
      cy: c[1],
      hw,
      hh,
      angle,
      round,
      cos: Math.cos(angle),
      sin: Math.sin(angle),
    },
    layer: opts.layer ?? 1,
    name,
    blend: opts.blend ?? 0,
  };
}

/** A limb or tail segment from a to b, with a frame so its coat rides along when it moves. */
export function segment(
  name: string,
  key: string,
  a: readonly [number, number],
  b: readonly [number, number],
  ra: number,
  rb: number,
  opts: { layer?: 0 | 1; blend?: number; s0?: number } = {},
): Part {
  const len = Math.hypot(b[0] - a[0], b[1] - a[1]) || 1e-9;
  return capsule(name, a, b, ra, rb, {
    layer: opts.layer,
    blend: opts.blend,
    frame: {
      ox: a[0],
      oy: a[1],
      ux: (b[0] - a[0]) / len,
      uy: (b[1] - a[1]) / len,
      s0: opts.s0 ?? 0,
      key,
    },
  });
}

/**
 * Foreground vegetation placed in front of the subject to hide a requested fraction of it: a
 * clump of tall grass rising from below, or a leafy branch hanging across. Its strength is tuned
 * by bisection until the measured hidden fraction is close to the request.
 */
import type { SceneLight } from './background';
import type { FigureLayer } from './figure-render';
import { layerBox } from './figure-render';
import { createRaster, fillEllipse, fillStroke, type Raster, type Rgb } from './raster';
import { Rng } from './random';
import type { StationLook } from './station';

type Prim =
  | {
      kind: 'stroke';
      x0: number;
      y0: number;
      x1: number;
      y1: number;
      r0: number;
      r1: number;
      c: Rgb;
    }
  | { kind: 'leaf'; x: number; y: number; rx: number; ry: number; a: number; c: Rgb };

/** Distance at which the occluder stands (it is lit by the flash like anything that close). */
const OCCLUDER_Z = 1.4;

function grassPrims(seed: number, box: Box, strength: number, look: StationLook): Prim[] {
  const rng = new Rng(seed);
  const centre = box.x + box.width * rng.range(0.3, 0.7);
  const band = box.width * Math.min(1.6, 0.15 + strength);
  const n = Math.round(4 + strength * 70);
  const w = Math.max(1.2, box.height * 0.02);
  const prims: Prim[] = [];
  for (let i = 0; i < n; i++) {
    const bx = centre + (rng.next() - 0.5) * band;
    const by = box.y + box.height * rng.range(1.05, 1.4);
    const len = box.height * rng.range(0.7, 1.35);
    let a = rng.range(-0.35, 0.35);
    const curl = rng.range(-0.4, 0.4);
    const c = mix(look.palette.grass, look.palette.grassDry, rng.next());
    let x = bx;
    let y = by;
    for (let s = 0; s < 3; s++) {
      a += curl / 3;
      const nx = x + Math.sin(a) * (len / 3);
      const ny = y - Math.cos(a) * (len / 3);
      prims.push({
        kind: 'stroke',
        x0: x,
        y0: y,
        x1: nx,
        y1: ny,
        r0: w * (1 - s * 0.3),
        r1: w * (0.7 - s * 0.3),
        c,
      });
      x = nx;
      y = ny;
    }
  }
  return prims;
}

function branchPrims(seed: number, box: Box, strength: number, look: StationLook): Prim[] {
  const rng = new Rng(seed);
  const fromLeft = rng.chance(0.5);
  const x0 = fromLeft ? box.x - box.width * 0.2 : box.x + box.width * 1.2;
  const y0 = box.y - box.height * rng.range(0.2, 0.5);
  const x1 = box.x + box.width * rng.range(0.35, 0.65);
  const y1 = box.y + box.height * rng.range(0.5, 1.0);
  const stem = box.height * 0.025;
  const prims: Prim[] = [
    { kind: 'stroke', x0, y0, x1, y1, r0: stem, r1: stem * 0.4, c: look.palette.bark },
  ];
  // Side twigs along the stem, each ending in a cluster of leaves; more twigs hide more.
  const twigs = Math.round(2 + strength * 30);
  const leaf = box.height * 0.075;
  for (let i = 0; i < twigs; i++) {
    const t = rng.range(0.15, 1);
    const sx = x0 + (x1 - x0) * t;
    const sy = y0 + (y1 - y0) * t;
    const a = rng.range(0, Math.PI * 2);
    const len = box.height * rng.range(0.12, 0.3);
    const ex = sx + Math.cos(a) * len;
    const ey = sy + Math.sin(a) * len;
    prims.push({
      kind: 'stroke',
      x0: sx,
      y0: sy,
      x1: ex,
      y1: ey,
      r0: stem * 0.45,
      r1: stem * 0.2,
      c: look.palette.bark,
    });
    const leaves = rng.int(6, 11);
    for (let k = 0; k < leaves; k++) {
      const f = rng.range(0.3, 1.1);
      prims.push({
        kind: 'leaf',
        x: sx + (ex - sx) * f + rng.normal(leaf * 0.6),
        y: sy + (ey - sy) * f + rng.normal(leaf * 0.6),
        rx: leaf * rng.range(0.7, 1.3),
        ry: leaf * rng.range(0.35, 0.6),
        a: a + rng.range(-1, 1),
        c: mix(look.palette.foliageDark, look.palette.foliage, rng.next()),
      });
    }
  }
  return prims;
}

interface Box {
  x: number;
  y: number;
  width: number;
  height: number;
}

function mix(a: Rgb, b: Rgb, t: number): Rgb {
  return [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t];
}

function paint(
  img: Raster,
  prims: readonly Prim[],
  dx: number,
  dy: number,
  gain: number,
  mask: boolean,
): void {
  for (const p of prims) {
    const c: Rgb = mask ? [255, 255, 255] : [p.c[0] * gain, p.c[1] * gain, p.c[2] * gain];
    if (p.kind === 'stroke')
      fillStroke(img, p.x0 - dx, p.y0 - dy, p.x1 - dx, p.y1 - dy, p.r0, p.r1, c);
    else fillEllipse(img, p.x - dx, p.y - dy, p.rx, p.ry, p.a, c);
  }
}

/** Fraction of the subject's coverage that the primitives hide. */
function hidden(layer: FigureLayer, prims: readonly Prim[]): number {
  const mask = createRaster(layer.w, layer.h);
  paint(mask, prims, layer.x0, layer.y0, 1, true);
  let total = 0;
  let covered = 0;
  for (let i = 0; i < layer.alpha.length; i++) {
    const a = layer.alpha[i];
    total += a;
    covered += a * (mask.data[i * 4] / 255);
  }
  return total > 0 ? covered / total : 0;
}

/** Paints an occluder hiding about `target` of the subject; returns the measured fraction. */
export function paintOccluder(
  img: Raster,
  layer: FigureLayer,
  target: number,
  seed: number,
  look: StationLook,
  light: SceneLight,
): number {
  const box = layerBox(layer, 0.25);
  if (!box || target <= 0) return 0;
  const make = new Rng(seed).chance(0.6) ? grassPrims : branchPrims;
  let lo = 0;
  let hi = 3;
  let best = { prims: make(seed, box, 0, look), fraction: 0 };
  for (let k = 0; k < 8; k++) {
    const mid = (lo + hi) / 2;
    const prims = make(seed, box, mid, look);
    const fraction = hidden(layer, prims);
    if (Math.abs(fraction - target) < Math.abs(best.fraction - target)) best = { prims, fraction };
    if (fraction < target) lo = mid;
    else hi = mid;
  }
  paint(img, best.prims, 0, 0, light.gain(OCCLUDER_Z), false);
  return best.fraction;
}

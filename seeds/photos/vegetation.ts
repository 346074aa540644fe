/**
 * Objects standing on the ground (trunks, bushes, rocks, grass tufts), drawn back to front so
 * that a subject can be slotted in at its own distance. Positions come from the camera's look
 * (the same every photo); leaves and blades sway with each photo's wind.
 */
import type { SceneLight } from './background';
import { project, type Camera } from './camera';
import { fillEllipse, fillStroke, type Raster, type Rgb } from './raster';
import { Rng } from './random';
import type { SceneObject, StationLook } from './station';

/** Something drawn at a distance z. */
export interface Drawable {
  readonly z: number;
  draw(img: Raster): void;
}

function shade(c: Rgb, k: number): Rgb {
  return [c[0] * k, c[1] * k, c[2] * k];
}

function mixRgb(a: Rgb, b: Rgb, t: number): Rgb {
  return [a[0] + (b[0] - a[0]) * t, a[1] + (b[1] - a[1]) * t, a[2] + (b[2] - a[2]) * t];
}

/** All still objects and grass of a camera's view, for one photo's wind. */
export function sceneDrawables(
  look: StationLook,
  cam: Camera,
  light: SceneLight,
  windPhase: number,
  wind: number,
): Drawable[] {
  const out: Drawable[] = [];
  for (const o of look.objects) {
    const draw =
      o.kind === 'trunk'
        ? (img: Raster) => drawTrunk(img, cam, look, o, light)
        : o.kind === 'bush'
          ? (img: Raster) => drawBush(img, cam, look, o, light, windPhase, wind)
          : (img: Raster) => drawRock(img, cam, look, o, light);
    out.push({ z: o.z, draw });
  }
  out.push(...grassTufts(look, cam, light, windPhase, wind));
  return out.sort((a, b) => b.z - a.z);
}

function drawTrunk(
  img: Raster,
  cam: Camera,
  look: StationLook,
  o: SceneObject,
  light: SceneLight,
): void {
  const base = project(cam, o.x, -cam.heightM, o.z);
  if (!base) return;
  const ppm = cam.f / o.z;
  const r = o.size * ppm;
  const rng = new Rng(o.seed);
  const topX = base[0] + o.lean * base[1];
  const bark = shade(look.palette.bark, light.gain(o.z));
  // Furrowed bark: a few vertical strips of varying brightness, lit from the left.
  const strips = Math.max(3, Math.min(9, Math.round(r / 3)));
  for (let s = 0; s < strips; s++) {
    const f = (s + 0.5) / strips - 0.5;
    const k = 1.15 - 0.5 * (f + 0.5) + rng.range(-0.12, 0.12);
    const w = (r / strips) * 1.3;
    fillStroke(
      img,
      base[0] + f * 2 * r,
      base[1],
      topX + f * 1.6 * r,
      -20,
      w,
      w * 0.8,
      shade(bark, k),
    );
  }
  fillEllipse(img, base[0], base[1], r * 1.5, r * 0.35, 0, shade(bark, 0.8));
  const branches = rng.int(1, 3);
  for (let b = 0; b < branches; b++) {
    const t = rng.range(0.2, 0.7);
    const sx = base[0] + (topX - base[0]) * (1 - t) + rng.range(-0.3, 0.3) * r;
    const sy = base[1] * t;
    const dir = rng.chance(0.5) ? 1 : -1;
    const len = r * rng.range(3, 8);
    fillStroke(
      img,
      sx,
      sy,
      sx + dir * len,
      sy - len * rng.range(0.4, 1.2),
      r * 0.35,
      r * 0.12,
      shade(bark, 0.9),
    );
  }
}

function drawBush(
  img: Raster,
  cam: Camera,
  look: StationLook,
  o: SceneObject,
  light: SceneLight,
  windPhase: number,
  wind: number,
): void {
  const base = project(cam, o.x, -cam.heightM, o.z);
  if (!base) return;
  const ppm = cam.f / o.z;
  const rng = new Rng(o.seed);
  const halfW = o.size * ppm;
  const h = o.size * rng.range(0.8, 1.4) * ppm;
  const g = light.gain(o.z);
  const { foliage, foliageDark } = look.palette;
  fillEllipse(
    img,
    base[0],
    base[1],
    halfW * 1.1,
    halfW * 0.18,
    0,
    shade(foliageDark, g * 0.5),
    0.6,
  );
  const leaves = Math.round(80 + o.size * 160);
  const leafR = Math.max(1.2, 0.038 * ppm * rng.range(0.8, 1.3));
  for (let i = 0; i < leaves; i++) {
    // Leaves fill a dome; upper leaves catch more light.
    const a = rng.range(0, Math.PI);
    const rr = Math.sqrt(rng.next());
    const lx = Math.cos(a) * rr * halfW;
    const ly = Math.sin(a) * rr * h;
    const sway = wind * leafR * 0.8 * Math.sin(windPhase * 6.3 + i * 1.7) * (ly / h);
    const t = Math.min(1, ly / h + rng.range(-0.25, 0.25));
    const c = shade(mixRgb(foliageDark, foliage, Math.max(0, t)), g * rng.range(0.8, 1.15));
    fillEllipse(
      img,
      base[0] + lx + sway,
      base[1] - ly,
      leafR * rng.range(0.7, 1.4),
      leafR * rng.range(0.5, 0.9),
      rng.range(0, Math.PI),
      c,
    );
  }
}

function drawRock(
  img: Raster,
  cam: Camera,
  look: StationLook,
  o: SceneObject,
  light: SceneLight,
): void {
  const base = project(cam, o.x, -cam.heightM, o.z);
  if (!base) return;
  const ppm = cam.f / o.z;
  const rng = new Rng(o.seed);
  const rx = o.size * ppm * rng.range(1, 1.6);
  const ry = o.size * ppm * rng.range(0.6, 1);
  const c = shade(look.palette.rock, light.gain(o.z));
  fillEllipse(img, base[0], base[1], rx * 1.05, ry * 0.25, 0, shade(c, 0.45), 0.7);
  fillEllipse(
    img,
    base[0],
    base[1] - ry * 0.55,
    rx,
    ry * 0.75,
    rng.range(-0.1, 0.1),
    shade(c, 0.75),
  );
  fillEllipse(img, base[0] - rx * 0.15, base[1] - ry * 0.75, rx * 0.75, ry * 0.5, 0, shade(c, 1.0));
  fillEllipse(
    img,
    base[0] - rx * 0.25,
    base[1] - ry * 0.9,
    rx * 0.4,
    ry * 0.25,
    0,
    shade(c, 1.12),
    0.8,
  );
  const crack = rng.range(-0.5, 0.5) * rx;
  fillStroke(
    img,
    base[0] + crack,
    base[1] - ry * 1.1,
    base[0] + crack * 0.6,
    base[1] - ry * 0.3,
    0.6,
    0.4,
    shade(c, 0.5),
  );
}

/** Grass tufts over the visible ground, thinning with distance; stable positions per camera. */
function grassTufts(
  look: StationLook,
  cam: Camera,
  light: SceneLight,
  windPhase: number,
  wind: number,
): Drawable[] {
  const rng = new Rng(look.seed ^ 0x6a55);
  const half = cam.width / 2 / cam.f;
  const count = Math.round(140 * look.grassDensity);
  const out: Drawable[] = [];
  for (let i = 0; i < count; i++) {
    // Uniform in 1/z so the tufts spread evenly over the image rows.
    const z = 1 / rng.range(1 / 16, 1 / 1.6);
    const x = rng.range(-1.1, 1.1) * z * half;
    const seed = rng.int(0, 2 ** 31);
    const onTrail = Math.abs(z - (look.trailZ + look.trailSlope * x)) < look.trailWidth / 2 - 0.1;
    if (onTrail && rng.chance(0.85)) continue;
    out.push({ z, draw: (img) => drawTuft(img, cam, look, x, z, seed, light, windPhase, wind) });
  }
  return out;
}

function drawTuft(
  img: Raster,
  cam: Camera,
  look: StationLook,
  x: number,
  z: number,
  seed: number,
  light: SceneLight,
  windPhase: number,
  wind: number,
): void {
  const base = project(cam, x, -cam.heightM, z);
  if (!base) return;
  const ppm = cam.f / z;
  const rng = new Rng(seed);
  const blades = rng.int(6, 13);
  const tall = look.habitat === 'grassland' ? 0.55 : 0.35;
  const g = light.gain(z);
  const { grass, grassDry } = look.palette;
  for (let b = 0; b < blades; b++) {
    const len = rng.range(0.4, 1) * tall * ppm;
    const lean =
      rng.range(-0.45, 0.45) + wind * 0.35 * Math.sin(windPhase * 6.3 + seed * 0.001 + b * 0.4);
    const curl = rng.range(-0.5, 0.5);
    const bx = base[0] + rng.range(-0.05, 0.05) * ppm;
    const w = Math.max(0.35, 0.004 * ppm);
    const c = shade(mixRgb(grass, grassDry, rng.next()), g * rng.range(0.75, 1.15));
    let px = bx;
    let py = base[1];
    for (let s = 1; s <= 3; s++) {
      const a = lean + curl * (s / 3) * (s / 3);
      const nx = px + Math.sin(a) * (len / 3);
      const ny = py - Math.cos(a) * (len / 3);
      fillStroke(img, px, py, nx, ny, w * (1.1 - (s - 1) * 0.3), w * (1.1 - s * 0.3), c);
      px = nx;
      py = ny;
    }
  }
}

/**
 * The still part of a camera's view: sky, distant hills, the tree line and the textured ground
 * with the trail. It depends only on the camera's look, the frame size and the lighting, so it is
 * painted once and cached.
 */
import { horizonY, type Camera } from './camera';
import { fbm, noise1, valueNoise } from './noise';
import { cloneRaster, createRaster, upscale, type Raster, type Rgb } from './raster';
import { hashNoise } from './random';
import { Skyline, type SkylineColumn } from './skyline';
import type { StationLook } from './station';
import type { Lighting } from './types';

/** How brightly a point at distance z is lit: sunlight is even, the infrared flash falls off. */
export interface SceneLight {
  readonly infrared: boolean;
  gain(z: number): number;
}

/** Light model for a lighting mode. */
export function sceneLight(lighting: Lighting): SceneLight {
  if (lighting === 'day') return { infrared: false, gain: () => 1 };
  return {
    infrared: true,
    // Flash fall-off (roughly inverse square, flattened by the camera's exposure control).
    gain: (z: number) => Math.max(0.04, Math.min(1.15, Math.pow(3.2 / Math.max(z, 0.5), 1.35))),
  };
}

function smoothstep(a: number, b: number, x: number): number {
  const t = Math.min(1, Math.max(0, (x - a) / (b - a)));
  return t * t * (3 - 2 * t);
}

const cache = new Map<string, Raster>();
const CACHE_BYTES = 160 * 1024 * 1024;

/** A fresh copy of the camera's still background (painted on first use, then cached). */
export function background(look: StationLook, cam: Camera, lighting: Lighting): Raster {
  const key = `${look.key}|${cam.width}x${cam.height}|${cam.f.toFixed(2)}|${lighting}`;
  let img = cache.get(key);
  if (img) {
    cache.delete(key);
  } else {
    // The background is painted at half size (at most 1536 px wide) and enlarged: it is smooth
    // and distant, and many trail cameras interpolate their sensor up anyway. Fine ground grain
    // is added at full size; objects, grass and the subject are drawn sharp on top.
    const s = Math.min(0.5, 1536 / cam.width);
    const small = {
      ...cam,
      width: Math.max(2, Math.round(cam.width * s)),
      height: Math.max(2, Math.round(cam.height * s)),
    };
    const scaled = { ...small, f: cam.f * s, cx: cam.cx * s, cy: cam.cy * s };
    const light = sceneLight(lighting);
    img = upscale(paintBackground(look, scaled, light), cam.width, cam.height);
    addGroundGrain(img, look, cam, light);
  }
  cache.set(key, img);
  let bytes = 0;
  for (const r of cache.values()) bytes += r.data.length;
  while (bytes > CACHE_BYTES && cache.size > 1) {
    const oldest = cache.keys().next().value ?? '';
    bytes -= cache.get(oldest)?.data.length ?? 0;
    cache.delete(oldest);
  }
  return cloneRaster(img);
}

function paintBackground(look: StationLook, cam: Camera, light: SceneLight): Raster {
  const { width, height } = cam;
  const img = createRaster(width, height);
  const p = look.palette;
  const hy = horizonY(cam);
  const zT = look.treeLineZ;
  const treeBase = hy + (cam.f * cam.heightM) / zT;
  const sky = light.infrared ? 0.05 : 1;
  const farGain = light.gain(zT);
  const haze = light.infrared ? 0 : 0.3;
  const skyline = new Skyline(
    look.seed,
    (width / 2 / cam.f) * zT,
    look.habitat === 'grassland' ? 0.6 : 1.2,
  );
  const col: SkylineColumn = { understory: 0, spans: [], trunk: false };
  const c = new Float32Array(3);
  // Textures are laid out on a 1024-wide grid so every frame size shows the same scene.
  const u = 1024 / width;
  for (let x = 0; x < width; x++) {
    const ang = (x - cam.cx) / cam.f;
    skyline.column(ang * zT, col);
    const trunkTop = col.trunk ? skyline.trunkTop(ang * zT) : 0;
    const hillTop = look.hills
      ? hy -
        cam.f *
          (0.03 + 0.1 * noise1(ang * 2.2, look.seed + 2) + 0.02 * noise1(ang * 9, look.seed + 3))
      : Infinity;
    const top = Math.min(height, Math.ceil(treeBase));
    for (let y = 0; y < top; y++) {
      const hM = ((treeBase - y) * zT) / cam.f;
      let inCrown = false;
      for (let k = 0; k < col.spans.length; k += 2) {
        if (hM >= col.spans[k] && hM <= col.spans[k + 1]) inCrown = true;
      }
      let gain: number;
      if (inCrown || hM <= col.understory) {
        const leaf = fbm(x * u * 0.09, y * u * 0.09, look.seed + 5, 3);
        mixTo(c, p.foliageDark, p.treeLine, Math.max(0, leaf * 1.3 - 0.15 - (inCrown ? 0 : 0.25)));
        towards(c, p.skyLow, haze);
        gain = farGain;
      } else if (col.trunk && hM < trunkTop) {
        mixTo(c, p.bark, p.skyLow, haze + 0.1);
        gain = farGain * 0.8;
      } else if (y >= hillTop) {
        mixTo(c, p.hills, p.skyLow, 0.35 + 0.2 * fbm(x * u * 0.02, y * u * 0.02, look.seed + 6, 2));
        gain = light.infrared ? 0.02 : 1;
      } else {
        mixTo(
          c,
          p.skyLow,
          p.skyHigh,
          Math.sqrt(Math.max(0, Math.min(1, (hy - y) / (cam.height * 0.9)))),
        );
        const cloud = fbm(x * u * 0.004, y * u * 0.012, look.seed + 7, 3);
        towards(c, CLOUD, smoothstep(0.5, 0.8, cloud) * 0.7);
        gain = sky;
      }
      const i = (y * width + x) * 4;
      img.data[i] = c[0] * gain;
      img.data[i + 1] = c[1] * gain;
      img.data[i + 2] = c[2] * gain;
    }
  }
  paintGround(img, look, cam, light, Math.max(0, Math.floor(treeBase)));
  return img;
}

const CLOUD: Rgb = [246, 246, 244];

function towards(out: Float32Array, b: Rgb, t: number): void {
  out[0] += (b[0] - out[0]) * t;
  out[1] += (b[1] - out[1]) * t;
  out[2] += (b[2] - out[2]) * t;
}

/** Ground colour at a world position (soil, grass patches, the trail and its ruts) into out. */
export function groundColour(look: StationLook, gx: number, gz: number, out: Float32Array): void {
  const p = look.palette;
  const s = look.seed;
  const n1 = fbm(gx * 1.3, gz * 1.3, s + 11, 3);
  mixTo(out, p.soilDark, p.soil, n1);
  const patch = fbm(gx * 0.35 + 11, gz * 0.35, s + 12, 2);
  const grassAmt = smoothstep(0.55 - 0.15 * look.grassDensity, 0.75, patch);
  if (grassAmt > 0) {
    const g0 = p.grass[0] + (p.grassDry[0] - p.grass[0]) * n1;
    const g1 = p.grass[1] + (p.grassDry[1] - p.grass[1]) * n1;
    const g2 = p.grass[2] + (p.grassDry[2] - p.grass[2]) * n1;
    out[0] += (g0 - out[0]) * grassAmt;
    out[1] += (g1 - out[1]) * grassAmt;
    out[2] += (g2 - out[2]) * grassAmt;
  }
  const dz = gz - (look.trailZ + look.trailSlope * gx);
  const adz = Math.abs(dz);
  if (adz > look.trailWidth / 2 + 0.45) return;
  const edge = look.trailWidth / 2 + (valueNoise(gx * 1.7, 3.3, s + 13) - 0.5) * 0.5;
  if (adz >= edge + 0.15) return;
  const k = 0.3 * (1 - n1);
  let t0 = p.trail[0] + (p.soil[0] - p.trail[0]) * k;
  let t1 = p.trail[1] + (p.soil[1] - p.trail[1]) * k;
  let t2 = p.trail[2] + (p.soil[2] - p.trail[2]) * k;
  if (look.trailWidth > 2 && Math.abs(adz - 0.75) < 0.22) {
    t0 += (p.soilDark[0] - t0) * 0.35;
    t1 += (p.soilDark[1] - t1) * 0.35;
    t2 += (p.soilDark[2] - t2) * 0.35;
  }
  const a = smoothstep(edge + 0.15, edge - 0.15, adz);
  out[0] += (t0 - out[0]) * a;
  out[1] += (t1 - out[1]) * a;
  out[2] += (t2 - out[2]) * a;
}

function mixTo(out: Float32Array, a: Rgb, b: Rgb, t: number): void {
  out[0] = a[0] + (b[0] - a[0]) * t;
  out[1] = a[1] + (b[1] - a[1]) * t;
  out[2] = a[2] + (b[2] - a[2]) * t;
}

function paintGround(
  img: Raster,
  look: StationLook,
  cam: Camera,
  light: SceneLight,
  y0: number,
): void {
  const haze = look.palette.skyLow;
  const c = new Float32Array(3);
  const cp = Math.cos(cam.pitch);
  const sp = Math.sin(cam.pitch);
  const d = img.data;
  for (let y = y0; y < cam.height; y++) {
    // Where this row's rays meet the ground plane (camera tilted down by pitch, at heightM):
    // depth is the same all along a row.
    const yn = -(y - cam.cy) / cam.f;
    const yw = yn * cp - sp;
    if (yw >= -1e-6) continue;
    const t = -cam.heightM / yw;
    const gz = t * (yn * sp + cp);
    const h = light.infrared ? 0 : Math.min(0.5, gz / 90);
    const k = light.gain(gz);
    let i = y * cam.width * 4;
    for (let x = 0; x < cam.width; x++, i += 4) {
      const gx = (t * (x - cam.cx)) / cam.f;
      groundColour(look, gx, gz, c);
      d[i] = (c[0] + (haze[0] - c[0]) * h) * k;
      d[i + 1] = (c[1] + (haze[1] - c[1]) * h) * k;
      d[i + 2] = (c[2] + (haze[2] - c[2]) * h) * k;
    }
  }
}

/** Fine grit on the ground, at full resolution, fading with distance. */
function addGroundGrain(img: Raster, look: StationLook, cam: Camera, light: SceneLight): void {
  const cp = Math.cos(cam.pitch);
  const sp = Math.sin(cam.pitch);
  const d = img.data;
  for (let y = Math.max(0, Math.ceil(horizonY(cam))); y < cam.height; y++) {
    const yn = -(y - cam.cy) / cam.f;
    const yw = yn * cp - sp;
    if (yw >= -1e-6) continue;
    const gz = (-cam.heightM / yw) * (yn * sp + cp);
    if (gz > look.treeLineZ) continue;
    const amp = 18 * Math.min(1, 4 / gz) * light.gain(gz);
    let i = y * cam.width * 4;
    for (let x = 0; x < cam.width; x++, i += 4) {
      const g = (hashNoise(x, y, look.seed) - 0.5) * amp;
      d[i] += g;
      d[i + 1] += g;
      d[i + 2] += g;
    }
  }
}

import { hashNoise } from './random';

/** Smooth 2D value noise in [0, 1): lattice values from a hash, blended with a smoothstep. */
export function valueNoise(x: number, y: number, seed: number): number {
  const xi = Math.floor(x);
  const yi = Math.floor(y);
  const fx = x - xi;
  const fy = y - yi;
  const sx = fx * fx * (3 - 2 * fx);
  const sy = fy * fy * (3 - 2 * fy);
  const a = hashNoise(xi, yi, seed);
  const b = hashNoise(xi + 1, yi, seed);
  const c = hashNoise(xi, yi + 1, seed);
  const d = hashNoise(xi + 1, yi + 1, seed);
  const top = a + (b - a) * sx;
  const bottom = c + (d - c) * sx;
  return top + (bottom - top) * sy;
}

/** Fractal sum of value noise (octaves halve in amplitude and double in frequency), in [0, 1). */
export function fbm(x: number, y: number, seed: number, octaves: number): number {
  let sum = 0;
  let amp = 0.5;
  let norm = 0;
  let fx = x;
  let fy = y;
  for (let o = 0; o < octaves; o++) {
    sum += amp * valueNoise(fx, fy, seed + o * 1013);
    norm += amp;
    amp *= 0.5;
    fx *= 2.03;
    fy *= 2.03;
  }
  return sum / norm;
}

/** 1D value noise in [0, 1), for ridge lines and tree-line profiles. */
export function noise1(x: number, seed: number): number {
  const xi = Math.floor(x);
  const f = x - xi;
  const s = f * f * (3 - 2 * f);
  const a = hashNoise(xi, 0, seed);
  const b = hashNoise(xi + 1, 0, seed);
  return a + (b - a) * s;
}

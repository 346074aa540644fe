/** Helpers shared by the simple figures (other species, people): legs that walk, eyes, shading. */
import { capsule, type Part, type ShadeInput } from './figure';
import { valueNoise } from './noise';
import type { Rgb } from './raster';

/** Writes a colour into a shading buffer. */
export function put(out: Float32Array, c: Rgb): void {
  out[0] = c[0];
  out[1] = c[1];
  out[2] = c[2];
}

/** Blends a colour into a shading buffer. */
export function blend(out: Float32Array, c: Rgb, a: number): void {
  if (a <= 0) return;
  const t = a > 1 ? 1 : a;
  out[0] += (c[0] - out[0]) * t;
  out[1] += (c[1] - out[1]) * t;
  out[2] += (c[2] - out[2]) * t;
}

/**
 * Rounds the body with edge darkening, darkens the far side and adds fur or cloth grain.
 * `round` is the depth (metres) over which the edge darkening fades.
 */
export function finish(out: Float32Array, input: ShadeInput, round: number, grain: number): void {
  const depth = Math.min(1, Math.max(0, input.inside / round));
  let k = 0.68 + 0.32 * Math.sqrt(depth);
  if (input.part.layer === 0) k *= 0.7;
  if (grain > 0) {
    const f = Math.min(input.px * 0.5, 900);
    k *= 1 - grain + 2 * grain * valueNoise(input.x * f, input.y * f, 91);
  }
  out[0] *= k;
  out[1] *= k;
  out[2] *= k;
}

/** Paints an eye (a dark disc, or a bright eyeshine under infrared) if the point is on it. */
export function eye(
  out: Float32Array,
  input: ShadeInput,
  cx: number,
  cy: number,
  r: number,
  infrared: boolean,
): void {
  const dx = input.x - cx;
  const dy = input.y - cy;
  const d = Math.sqrt(dx * dx + dy * dy);
  if (d > r * 1.3) return;
  blend(out, infrared ? [255, 255, 255] : [18, 14, 12], Math.min(1, (r * 1.3 - d) * input.px));
}

/** One leg as a chain of segments swinging about its root for a walking phase. */
export function walkingLeg(
  name: string,
  root: readonly [number, number],
  lengths: readonly number[],
  angles: readonly number[],
  radii: readonly number[],
  phase: number,
  opts: { layer: 0 | 1; swing?: number; fold?: number; blend?: number },
): Part[] {
  const swing = Math.sin(phase * Math.PI * 2) * (opts.swing ?? 0.3);
  const lifting = phase > 0.5 ? Math.sin(((phase - 0.5) / 0.5) * Math.PI) : 0;
  let [x, y] = root;
  const parts: Part[] = [];
  for (let i = 0; i < lengths.length; i++) {
    const a = angles[i] + swing + (i > 0 ? (opts.fold ?? 0.6) * lifting * (i % 2 ? 1 : -1) : 0);
    const nx = x + Math.cos(a) * lengths[i];
    const ny = y + Math.sin(a) * lengths[i];
    parts.push(
      capsule(name, [x, y], [nx, ny], radii[i], radii[i + 1], {
        layer: opts.layer,
        blend: i === 0 ? (opts.blend ?? 0.03) : 0.005,
      }),
    );
    x = nx;
    y = ny;
  }
  return parts;
}

/** Near and far pairs of fore and hind legs for a walking phase (lateral-sequence walk). */
export function fourLegs(
  fore: { root: readonly [number, number]; lengths: number[]; angles: number[]; radii: number[] },
  hind: { root: readonly [number, number]; lengths: number[]; angles: number[]; radii: number[] },
  gait: number,
  farShift: number,
  opts: { swing?: number; fold?: number; blend?: number } = {},
): Part[] {
  const parts: Part[] = [];
  const legs = [
    { spec: hind, phase: 0, layer: 1 as const, shift: 0 },
    { spec: fore, phase: 0.25, layer: 1 as const, shift: 0 },
    { spec: hind, phase: 0.5, layer: 0 as const, shift: farShift },
    { spec: fore, phase: 0.75, layer: 0 as const, shift: farShift },
  ];
  for (const l of legs) {
    const root: [number, number] = [l.spec.root[0] + l.shift, l.spec.root[1]];
    const phase = (gait + l.phase) % 1;
    parts.push(
      ...walkingLeg('leg', root, l.spec.lengths, l.spec.angles, l.spec.radii, phase, {
        ...opts,
        layer: l.layer,
      }),
    );
  }
  return parts;
}

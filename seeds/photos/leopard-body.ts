/**
 * The big-cat side-view skeleton in body-length units (nose to rump ≈ 1): x forward (the head is
 * at +x), y up, paws on y = 0. The trunk (body, neck, head) is rigid; legs and tail are chains
 * whose segments carry their own coat frames so the pattern rides with them when they move.
 */
import { capsule, ellipse, type Part } from './figure';

type Pt = readonly [number, number];

/** Torso, neck and head parts (near side). The ears are added by the figure (notches). */
export function trunkParts(): Part[] {
  const blend = { blend: 0.06 };
  return [
    ellipse('trunk', [0.17, 0.37], 0.155, 0.135, 0.1, blend),
    capsule('trunk', [0.2, 0.38], [0.62, 0.385], 0.112, 0.122, blend),
    ellipse('trunk', [0.65, 0.36], 0.135, 0.14, 0.25, blend),
    ellipse('trunk', [0.6, 0.44], 0.11, 0.07, 0.05, blend),
    capsule('trunk', [0.7, 0.42], [0.85, 0.475], 0.085, 0.062, blend),
    ellipse('head', [0.905, 0.49], 0.09, 0.077, 0, { blend: 0.03 }),
    ellipse('muzzle', [0.975, 0.457], 0.056, 0.043, -0.25, { blend: 0.025 }),
    ellipse('chin', [0.945, 0.428], 0.05, 0.027, 0.1, { blend: 0.025 }),
  ];
}

/** Ear centre, radii and tilt in units; the far ear sits a little further forward. */
export const EAR = {
  near: { c: [0.866, 0.575] as Pt, rx: 0.028, ry: 0.038, angle: 0.35 },
  far: { c: [0.896, 0.582] as Pt, rx: 0.026, ry: 0.035, angle: 0.2 },
  /** Notch cut-out relative to the ear centre (up and back along the rim). */
  notch: { dx: -0.006, dy: 0.037, r: 0.013 },
};

/** Eye, nose and mouth positions in units (drawn by the shader, not as parts). */
export const FACE = {
  eye: [0.95, 0.51] as Pt,
  eyeRx: 0.014,
  eyeRy: 0.009,
  nose: [1.022, 0.474] as Pt,
  mouth: [0.99, 0.434] as Pt,
};

/** One jointed limb: the proximal joint, then segment lengths, rest angles and radii. */
export interface LimbSpec {
  readonly key: string;
  readonly root: Pt;
  readonly lengths: readonly number[];
  /** Absolute rest angle of each segment, radians from +x (down is -π/2). */
  readonly angles: readonly number[];
  /** Radius at the start of each segment, then at the very end. */
  readonly radii: readonly number[];
}

/** Fore and hind limbs of the near side; the far side uses the same geometry, shifted. */
export const LIMBS: readonly LimbSpec[] = [
  {
    key: 'fore',
    root: [0.655, 0.37],
    lengths: [0.17, 0.165, 0.05],
    angles: [-1.62, -1.5, -0.15],
    radii: [0.062, 0.04, 0.031, 0.026],
  },
  {
    key: 'hind',
    root: [0.15, 0.36],
    lengths: [0.19, 0.15, 0.065, 0.05],
    angles: [-1.1, -2.45, -1.45, -0.12],
    radii: [0.09, 0.048, 0.03, 0.028, 0.025],
  },
];

/** Tail root and segment count; length is per individual. */
export const TAIL = { root: [0.03, 0.43] as Pt, segments: 12, radius0: 0.03, radius1: 0.02 };

/** Points of a jointed chain from a root, given absolute segment angles. */
export function chainPoints(root: Pt, lengths: readonly number[], angles: readonly number[]): Pt[] {
  const pts: Pt[] = [root];
  let [x, y] = root;
  for (let i = 0; i < lengths.length; i++) {
    x += Math.cos(angles[i]) * lengths[i];
    y += Math.sin(angles[i]) * lengths[i];
    pts.push([x, y]);
  }
  return pts;
}

const REST_TRUNK = trunkParts();

/** Rest-pose distance test for the trunk (used to keep coat marks on the body). */
export function insideTrunk(x: number, y: number, margin: number): boolean {
  for (const p of REST_TRUNK) {
    const s = p.shape;
    if (s.kind === 'ellipse') {
      const u = ((x - s.cx) * s.cos + (y - s.cy) * s.sin) / (s.rx + margin);
      const v = (-(x - s.cx) * s.sin + (y - s.cy) * s.cos) / (s.ry + margin);
      if (u * u + v * v <= 1) return true;
    } else if (s.kind === 'capsule') {
      const ex = s.bx - s.ax;
      const ey = s.by - s.ay;
      let t = ((x - s.ax) * ex + (y - s.ay) * ey) / (ex * ex + ey * ey);
      t = Math.min(1, Math.max(0, t));
      const r = s.ra + (s.rb - s.ra) * t + margin;
      const dx = x - s.ax - ex * t;
      const dy = y - s.ay - ey * t;
      if (dx * dx + dy * dy <= r * r) return true;
    }
  }
  return false;
}

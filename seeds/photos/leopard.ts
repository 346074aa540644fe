/**
 * The target species as a figure: the individual's skeleton in a walking pose, with the flank's
 * coat looked up in body coordinates, so the same coat point lands on the same place of the body
 * in every photo (up to the placement homography).
 */
import type { Ink } from './coat-marks';
import { flankCoat, type Flank, type Individual } from './coat';
import {
  capsule,
  ellipse,
  frameS,
  frameT,
  segment,
  type Figure,
  type Part,
  type ShadeInput,
} from './figure';
import { chainPoints, EAR, FACE, LIMBS, TAIL, trunkParts, type LimbSpec } from './leopard-body';
import { valueNoise } from './noise';
import type { Rgb } from './raster';

/** Pose of one photo: gait phase and tail carriage. */
export interface CatPose {
  /** Walking phase, 0–1. */
  readonly gait: number;
  /** Tail lift in radians (positive raises it) and curl factor (1 = usual). */
  readonly tailLift: number;
  readonly tailCurl: number;
}

const BLACK: Rgb = [30, 24, 20];
const SCAR: Rgb = [222, 200, 178];
const WHITE: Rgb = [238, 232, 218];

/** Builds the figure of one individual showing one flank; template metres, head toward +x. */
export function leopardFigure(
  ind: Individual,
  flank: Flank,
  pose: CatPose,
  infrared: boolean,
): Figure {
  const L = ind.lengthM;
  const parts: Part[] = [];
  for (const p of trunkParts()) parts.push(scalePart(p, L));
  parts.push(earPart(L, 'near', ind.traits.earNotch === flank));
  parts.push(earPart(L, 'far', ind.traits.earNotch !== null && ind.traits.earNotch !== flank));
  const offsets: Record<string, number> = {
    'near-hind': 0,
    'near-fore': 0.25,
    'far-hind': 0.5,
    'far-fore': 0.75,
  };
  for (const side of ['near', 'far'] as const) {
    for (const limb of LIMBS) {
      const phase = (pose.gait + offsets[`${side}-${limb.key}`]) % 1;
      parts.push(...limbParts(limb, side, phase, L));
    }
  }
  parts.push(...tailParts(ind, pose, L));
  const coat = flankCoat(ind, flank);
  const ink: Ink = { black: 0, centre: 0, scar: 0 };
  const col = new Float32Array(3);
  return {
    parts,
    pivotX: 0.45 * L,
    lengthM: L,
    shade(input: ShadeInput, out: Float32Array): void {
      const p = input.part;
      const pxu = input.px * L;
      const u = frameS(p, input.x, input.y) / L;
      const v = frameT(p, input.x, input.y) / L;
      const key = p.frame ? p.frame.key : 'trunk';
      baseColour(ind, p, input.x / L, input.y / L, v, col);
      // Lips and chin are unmarked; the ear's outer side is dark rather than spotted.
      const plain = p.name === 'chin' || p.name === 'ear' || (p.name === 'muzzle' && v < 0.455);
      const face = p.name === 'muzzle' || p.name === 'chin';
      const grid = coat.parts.get(key);
      if (p.name === 'ear' && input.inside < 0.003 * L) mixInto(col, BLACK, 0.6);
      if (grid && !plain) {
        grid.inkAt(u, v, pxu, ink);
        mixInto(col, ind.centre, ink.centre * 0.75);
        mixInto(col, BLACK, ink.black * 0.95);
        mixInto(col, SCAR, ink.scar);
      }
      if (p.name === 'head' || face) faceFeatures(input.x / L, input.y / L, pxu, infrared, col);
      // Rounded body: darker towards the silhouette, fine fur grain in body coordinates.
      const depth = Math.min(1, Math.max(0, input.inside / (0.05 * L)));
      let light = 0.7 + 0.3 * Math.sqrt(depth);
      if (p.layer === 0) light *= 0.72;
      const f = Math.min(pxu * 0.5, 600);
      light *= 0.92 + 0.16 * valueNoise(u * f, v * f, 77);
      out[0] = col[0] * light;
      out[1] = col[1] * light;
      out[2] = col[2] * light;
    },
  };
}

function mixInto(c: Float32Array, to: Rgb, a: number): void {
  if (a <= 0) return;
  c[0] += (to[0] - c[0]) * a;
  c[1] += (to[1] - c[1]) * a;
  c[2] += (to[2] - c[2]) * a;
}

function setRgb(c: Float32Array, rgb: Rgb): void {
  c[0] = rgb[0];
  c[1] = rgb[1];
  c[2] = rgb[2];
}

/** Ground colour by body zone: pale belly, throat, lips and chin; tawny flanks; deeper spine. */
function baseColour(
  ind: Individual,
  p: Part,
  x: number,
  y: number,
  across: number,
  c: Float32Array,
): void {
  setRgb(c, ind.ground);
  switch (p.name) {
    case 'chin':
      setRgb(c, WHITE);
      return;
    case 'muzzle':
      mixInto(c, ind.belly, 0.35);
      if (y < FACE.mouth[1] + 0.014)
        mixInto(c, WHITE, Math.min(1, (FACE.mouth[1] + 0.014 - y) / 0.006));
      return;
    case 'ear':
      c[0] = ind.back[0] * 0.55;
      c[1] = ind.back[1] * 0.5;
      c[2] = ind.back[2] * 0.5;
      return;
    case 'tail':
      if (across < 0) mixInto(c, ind.belly, Math.min(1, -across / 0.03) * 0.5);
      return;
    case 'leg':
      mixInto(c, ind.belly, Math.max(0, Math.min(0.5, (0.3 - y) * 1.6)));
      return;
  }
  const v = (y - 0.25) / 0.27;
  if (v < 0.22) mixInto(c, ind.belly, Math.min(1, (0.22 - v) / 0.15));
  if (v > 0.75) mixInto(c, ind.back, Math.min(1, (v - 0.75) / 0.25));
  if (x > 0.72 && y < 0.42 && p.name === 'trunk') {
    mixInto(c, ind.belly, Math.min(1, (x - 0.72) / 0.08) * Math.min(1, (0.42 - y) / 0.06) * 0.7);
  }
  if (p.name === 'head') {
    // Pale fur below the eye.
    const dx = x - FACE.eye[0];
    const dy = y - FACE.eye[1] + 0.018;
    if (dx * dx + dy * dy < 0.00025) mixInto(c, ind.belly, 0.45);
  }
}

/** Eye (with eyeshine under infrared), nose and mouth line. */
function faceFeatures(x: number, y: number, pxu: number, infrared: boolean, c: Float32Array): void {
  const ex = (x - FACE.eye[0]) / FACE.eyeRx;
  const ey = (y - FACE.eye[1]) / FACE.eyeRy;
  const e = Math.sqrt(ex * ex + ey * ey);
  if (e < 1.35) {
    const rim = Math.min(1, Math.max(0, (1.35 - e) * FACE.eyeRx * pxu));
    mixInto(c, [20, 16, 12], rim);
    if (e < 1) {
      const iris: Rgb = infrared ? [255, 255, 255] : [196, 160, 70];
      mixInto(c, iris, Math.min(1, (1 - e) * FACE.eyeRx * pxu + 0.3));
      const pupil = Math.abs(ex) < 0.28 && !infrared;
      if (pupil) mixInto(c, [10, 8, 6], 0.9);
    }
  }
  const nx = (x - FACE.nose[0]) / 0.016;
  const ny = (y - FACE.nose[1]) / 0.011;
  if (nx * nx + ny * ny < 1) mixInto(c, [150, 96, 88], 0.9);
  const mouth = Math.abs(y - FACE.mouth[1] - (x - FACE.mouth[0]) * 0.2);
  if (x > 0.945 && x < 1.01 && mouth < 0.0035) mixInto(c, [40, 30, 26], 0.8);
}

function scalePart(p: Part, L: number): Part {
  const s = p.shape;
  const blend = p.blend * L;
  if (s.kind === 'ellipse') {
    return ellipse(p.name, [s.cx * L, s.cy * L], s.rx * L, s.ry * L, s.angle, { blend });
  }
  if (s.kind === 'capsule') {
    const a = [s.ax * L, s.ay * L] as const;
    return capsule(p.name, a, [s.bx * L, s.by * L], s.ra * L, s.rb * L, { blend });
  }
  return p;
}

function earPart(L: number, which: 'near' | 'far', notched: boolean): Part {
  const e = EAR[which];
  const ca = Math.cos(e.angle);
  const sa = Math.sin(e.angle);
  const { dx, dy, r } = EAR.notch;
  // The notch sits on the rim near the tip, rotated with the ear's backward lean.
  const cut = notched
    ? { cx: (e.c[0] + dx * ca - dy * sa) * L, cy: (e.c[1] + dx * sa + dy * ca) * L, r: r * L }
    : undefined;
  return ellipse('ear', [e.c[0] * L, e.c[1] * L], e.rx * L, e.ry * L, e.angle, {
    layer: which === 'near' ? 1 : 0,
    blend: 0.012 * L,
    cut,
  });
}

/** Limb segments for a gait phase: the leg swings about its root and folds while it swings. */
function limbParts(limb: LimbSpec, side: 'near' | 'far', phase: number, L: number): Part[] {
  const swing = Math.sin(phase * Math.PI * 2) * (limb.key === 'hind' ? 0.3 : 0.26);
  const lifting = phase > 0.5 ? Math.sin(((phase - 0.5) / 0.5) * Math.PI) : 0;
  const angles = limb.angles.map((a, i) => {
    if (i === 0) return a + swing;
    const fold =
      limb.key === 'fore'
        ? -0.9 * lifting * (i === 1 ? 1 : 0.6)
        : 0.5 * lifting * (i === 1 ? 1 : -0.8);
    return a + swing + fold;
  });
  const shift = side === 'far' ? 0.035 : 0;
  const root: readonly [number, number] = [limb.root[0] + shift, limb.root[1]];
  const pts = chainPoints(root, limb.lengths, angles);
  const layer = side === 'near' ? 1 : 0;
  return limb.lengths.map((_, i) =>
    segment(
      'leg',
      `${side}-${limb.key}-${i}`,
      [pts[i][0] * L, pts[i][1] * L],
      [pts[i + 1][0] * L, pts[i + 1][1] * L],
      limb.radii[i] * L,
      limb.radii[i + 1] * L,
      { layer, blend: (i === 0 ? 0.05 : 0.015) * L },
    ),
  );
}

/** Tail segments: hanging low and curving up at the end; a kinked tail bends sharply near the tip. */
function tailParts(ind: Individual, pose: CatPose, L: number): Part[] {
  const n = TAIL.segments;
  const len = ind.tailLength / n;
  const bends = [0.1, 0.08, 0.06, 0.02, 0, -0.06, -0.12, -0.16, -0.2, -0.22, -0.22, -0.2];
  let lift = pose.tailLift;
  let pts: (readonly [number, number])[] = [];
  for (let tries = 0; tries < 8; tries++) {
    const angles: number[] = [];
    let a = 3.75 - lift;
    for (let i = 0; i < n; i++) {
      a += bends[i] * pose.tailCurl;
      if (ind.traits.tailKink && i === n - 2) a += 1.3;
      angles.push(a);
    }
    pts = chainPoints(TAIL.root, new Array<number>(n).fill(len), angles);
    if (Math.min(...pts.map((p) => p[1])) > 0.05) break;
    lift += 0.12;
  }
  return pts.slice(0, n).map((p, i) => {
    const r0 = TAIL.radius0 + ((TAIL.radius1 - TAIL.radius0) * i) / n;
    const r1 = TAIL.radius0 + ((TAIL.radius1 - TAIL.radius0) * (i + 1)) / n;
    return segment(
      'tail',
      'tail',
      [p[0] * L, p[1] * L],
      [pts[i + 1][0] * L, pts[i + 1][1] * L],
      r0 * L,
      r1 * L,
      {
        blend: (i === 0 ? 0.03 : 0.004) * L,
        s0: i * len * L,
      },
    );
  });
}

/**
 * A pinhole trail camera over a flat ground plane. World axes: X to the right, Y up, Z away from
 * the camera, metres; the camera stands at X = Z = 0, heightM above the ground, tilted down.
 */

/** 3×3 matrix, row-major. */
export type Mat3 = Float64Array;

/** Intrinsics and mounting of the camera that took one photo. */
export interface Camera {
  readonly width: number;
  readonly height: number;
  /** Focal length in pixels. */
  readonly f: number;
  readonly cx: number;
  readonly cy: number;
  readonly heightM: number;
  /** Downward tilt in radians. */
  readonly pitch: number;
}

/** Typical trail-camera mounting (field-practice §1.2: 0.5–1 m high, angled slightly down). */
export function makeCamera(width: number, height: number, hfovDeg = 52, heightM = 0.75): Camera {
  const f = width / 2 / Math.tan((hfovDeg * Math.PI) / 360);
  return { width, height, f, cx: width / 2, cy: height / 2, heightM, pitch: (5 * Math.PI) / 180 };
}

/** Image row of the horizon (may be above the frame). */
export function horizonY(cam: Camera): number {
  return cam.cy - cam.f * Math.tan(cam.pitch);
}

/** Pixel position of a world point, or null when it is behind the camera. */
export function project(cam: Camera, x: number, y: number, z: number): [number, number] | null {
  const cp = Math.cos(cam.pitch);
  const sp = Math.sin(cam.pitch);
  const yc = y * cp + z * sp;
  const zc = -y * sp + z * cp;
  if (zc <= 1e-6) return null;
  return [cam.cx + (cam.f * x) / zc, cam.cy - (cam.f * yc) / zc];
}

/** Where an upright figure stands and how it is turned. */
export interface Placement {
  /** Lateral position of the pivot on the ground, metres. */
  readonly x: number;
  /** Distance from the camera, metres. */
  readonly z: number;
  /** Turn of the figure's side plane about the vertical, radians (0 = side-on). */
  readonly yaw: number;
  /** In-plane tilt (walking on a slope), radians. */
  readonly roll: number;
  /** +1: the figure's template front (+x) points to image right; -1: to image left. */
  readonly dir: 1 | -1;
  /** Template x (metres) about which the figure is turned and placed. */
  readonly pivotX: number;
}

/** Multiplies two 3×3 matrices. */
export function mul3(a: Mat3, b: Mat3): Mat3 {
  const o = new Float64Array(9);
  for (let r = 0; r < 3; r++) {
    for (let c = 0; c < 3; c++) {
      o[r * 3 + c] = a[r * 3] * b[c] + a[r * 3 + 1] * b[3 + c] + a[r * 3 + 2] * b[6 + c];
    }
  }
  return o;
}

/** Inverse of a 3×3 matrix (throws on a singular one). */
export function invert3(m: Mat3): Mat3 {
  const [a, b, c, d, e, f, g, h, i] = m;
  const A = e * i - f * h;
  const B = -(d * i - f * g);
  const C = d * h - e * g;
  const det = a * A + b * B + c * C;
  if (Math.abs(det) < 1e-15) throw new Error('singular homography');
  const s = 1 / det;
  return Float64Array.from([
    A * s,
    -(b * i - c * h) * s,
    (b * f - c * e) * s,
    B * s,
    (a * i - c * g) * s,
    -(a * f - c * d) * s,
    C * s,
    -(a * h - b * g) * s,
    (a * e - b * d) * s,
  ]);
}

/** Applies a homography to a point. */
export function applyH(m: Mat3, x: number, y: number): [number, number] {
  const w = m[6] * x + m[7] * y + m[8];
  return [(m[0] * x + m[1] * y + m[2]) / w, (m[3] * x + m[4] * y + m[5]) / w];
}

/**
 * Homography from a figure's side-view template (metres; x forward, y up, feet at y = 0) to
 * pixels: the template is a flat cut-out standing in a vertical plane, which keeps every coat point
 * on the same place of the body up to this one warp.
 */
export function figureHomography(cam: Camera, p: Placement): Mat3 {
  const cr = Math.cos(p.roll);
  const sr = Math.sin(p.roll);
  const template = Float64Array.from([
    p.dir * cr,
    -p.dir * sr,
    -p.dir * cr * p.pivotX,
    sr,
    cr,
    -sr * p.pivotX,
    0,
    0,
    1,
  ]);
  const world = Float64Array.from([
    Math.cos(p.yaw),
    0,
    p.x,
    0,
    1,
    -cam.heightM,
    Math.sin(p.yaw),
    0,
    p.z,
  ]);
  const cp = Math.cos(cam.pitch);
  const sp = Math.sin(cam.pitch);
  const tilt = Float64Array.from([1, 0, 0, 0, cp, sp, 0, -sp, cp]);
  const k = Float64Array.from([cam.f, 0, cam.cx, 0, -cam.f, cam.cy, 0, 0, 1]);
  return mul3(k, mul3(tilt, mul3(world, template)));
}

/** The homography of a photo flipped left to right. */
export function mirrorH(m: Mat3, width: number): Mat3 {
  return mul3(Float64Array.from([-1, 0, width - 1, 0, 1, 0, 0, 0, 1]), m);
}

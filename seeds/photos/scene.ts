/**
 * Composes one photo: the camera's background, objects and grass back to front with the subject
 * slotted in at its distance, an optional occluder, the lighting look, the data band and the
 * optional mirror. Returns the pixels and the geometric truth.
 */
import { background, sceneLight } from './background';
import {
  applyH,
  figureHomography,
  makeCamera,
  mirrorH,
  mul3,
  type Camera,
  type Mat3,
} from './camera';
import { makeIndividual, type Individual } from './coat';
import { applyDaylight, applyInfrared, bandHeight, drawBand } from './effects';
import type { Figure } from './figure';
import { compositeLayer, layerBox, renderFigure } from './figure-render';
import { drawText, textWidth } from './font';
import { leopardFigure } from './leopard';
import { paintOccluder } from './occluder';
import { BOARD_TEXT_AREA, boardFigure, humanFigure, vehicleFigure } from './people';
import { fillEllipse, mirrorRaster, type Raster } from './raster';
import { Rng } from './random';
import { speciesFigure } from './species';
import { stationLook, type StationLook } from './station';
import type { PhotoSpec, PixelBox, Variation } from './types';
import { resolveVariation } from './variation';
import { sceneDrawables } from './vegetation';

/** Pixels and truth of a painted scene. */
export interface SceneResult {
  readonly img: Raster;
  readonly variation: Variation;
  readonly bbox: PixelBox | null;
  readonly occludedFraction: number;
  readonly bodyToImage: Mat3 | null;
  readonly headDirection: 'left' | 'right' | null;
  readonly individual: Individual | null;
  readonly bandHeight: number;
}

interface Posed {
  figure: Figure;
  dir: 1 | -1;
  individual: Individual | null;
}

function buildSubject(spec: PhotoSpec, rng: Rng, gait: number, infrared: boolean): Posed | null {
  const s = spec.subject;
  const dir = (): 1 | -1 => (rng.chance(0.5) ? 1 : -1);
  switch (s.kind) {
    case 'target': {
      const ind = typeof s.individual === 'string' ? makeIndividual(s.individual) : s.individual;
      const pose = { gait, tailLift: rng.range(-0.15, 0.25), tailCurl: rng.range(0.7, 1.3) };
      // Convention: the right flank is seen with the head to image right (see types.ts).
      return {
        figure: leopardFigure(ind, s.flank, pose, infrared),
        dir: s.flank === 'right' ? 1 : -1,
        individual: ind,
      };
    }
    case 'animal':
      return {
        figure: speciesFigure(s.species, rng.fork('species'), gait, infrared),
        dir: dir(),
        individual: null,
      };
    case 'human':
      return {
        figure: humanFigure(rng.fork('person'), gait, infrared),
        dir: dir(),
        individual: null,
      };
    case 'vehicle':
      return { figure: vehicleFigure(rng.fork('vehicle'), infrared), dir: dir(), individual: null };
    case 'setup':
      return { figure: boardFigure(), dir: 1, individual: null };
    case 'blank':
      return null;
  }
}

/** Homography and rendered layer of the subject at its distance and pose. */
function placeSubject(subject: Posed, v: Variation, look: StationLook, cam: Camera) {
  const z = v.distanceM;
  const half = Math.tan((look.hfovDeg * Math.PI) / 360);
  const h = figureHomography(cam, {
    x: v.position * z * half * 0.8,
    z,
    yaw: (v.yawDeg * Math.PI) / 180,
    roll: (v.rollDeg * Math.PI) / 180,
    dir: subject.dir,
    pivotX: subject.figure.pivotX,
  });
  const ppm = cam.f / z;
  const blur = v.motionBlur * subject.figure.lengthM * ppm;
  return { h, layer: renderFigure(subject.figure, h, cam.width, cam.height, ppm, blur) };
}

/** Whole-frame light: the infrared night look, or daylight with warmth and dappled shade. */
function applyLight(img: Raster, spec: PhotoSpec, v: Variation, rng: Rng): void {
  if (spec.lighting === 'infrared') {
    applyInfrared(img, rng.int(0, 2 ** 30), v.exposure);
    return;
  }
  const seed = rng.int(0, 2 ** 30);
  applyDaylight(img, seed, v.exposure, warmthOf(spec, rng), rng.range(0, 0.22));
}

/** Paints the scene of a photo spec. */
export function paintScene(spec: PhotoSpec): SceneResult {
  const look = stationLook(spec.station, spec.camera);
  const cam = makeCamera(spec.width, spec.height, look.hfovDeg, look.cameraHeightM);
  const infrared = spec.lighting === 'infrared';
  const light = sceneLight(spec.lighting);
  // Independent streams per concern, so the same scene can be painted with and without a subject.
  const rng = new Rng(spec.seed);
  const v = resolveVariation(spec.variation, look, spec.subject.kind);
  const img = background(look, cam, spec.lighting);
  const subject = buildSubject(spec, rng.fork('subject'), v.gait, infrared);
  const placed = subject ? placeSubject(subject, v, look, cam) : null;
  const layer = placed?.layer ?? null;
  let h = placed?.h ?? null;
  const z = v.distanceM;
  const drawables = sceneDrawables(look, cam, light, rng.fork('wind').next(), v.wind);
  for (const d of drawables) if (d.z > z) d.draw(img);
  if (layer && h && subject && !infrared) groundShadow(img, h, subject.figure);
  if (layer) compositeLayer(img, layer, light.gain(z));
  if (h && spec.subject.kind === 'setup') drawBoardText(img, h, spec.subject.lines);
  // Scenery nearer than the subject distance (even in a blank) can be left out for clean views.
  if (spec.foreground !== false) for (const d of drawables) if (d.z <= z) d.draw(img);
  const occluderSeed = rng.fork('occluder').int(0, 2 ** 30);
  const occludedFraction =
    layer && v.occlusion > 0
      ? paintOccluder(img, layer, v.occlusion, occluderSeed, look, light)
      : 0;
  applyLight(img, spec, v, rng.fork('light'));
  const band = spec.band === false ? 0 : paintBand(img, spec, rng.fork('band'));
  let bbox = layer ? layerBox(layer, 0.25, spec.height - band) : null;
  if (v.mirror) {
    mirrorRaster(img);
    if (bbox) bbox = { ...bbox, x: spec.width - bbox.x - bbox.width };
    if (h) h = mirrorH(h, spec.width);
  }
  const headRight = subject ? (subject.dir === 1) !== v.mirror : null;
  const L = subject?.individual?.lengthM ?? 1;
  return {
    img,
    variation: v,
    bbox,
    occludedFraction,
    bodyToImage:
      h && subject?.individual ? mul3(h, Float64Array.from([L, 0, 0, 0, L, 0, 0, 0, 1])) : null,
    headDirection: headRight === null ? null : headRight ? 'right' : 'left',
    individual: subject?.individual ?? null,
    bandHeight: band,
  };
}

/** A soft contact shadow on the ground under a figure (daylight only: the flash casts it behind). */
function groundShadow(img: Raster, h: Mat3, fig: Figure): void {
  const [ax, ay] = applyH(h, fig.pivotX - fig.lengthM * 0.45, 0);
  const [bx, by] = applyH(h, fig.pivotX + fig.lengthM * 0.45, 0);
  const rx = Math.abs(bx - ax) / 2;
  if (rx < 1) return;
  for (const k of [1.15, 1, 0.85]) {
    fillEllipse(img, (ax + bx) / 2, (ay + by) / 2, rx * k, rx * 0.09 * k, 0, [0, 0, 0], 0.08);
  }
}

/** Warm light early and late in the day (read from the EXIF hour when there is one). */
function warmthOf(spec: PhotoSpec, rng: Rng): number {
  const hour = Number(spec.exif?.dateTimeOriginal.slice(11, 13) ?? rng.int(7, 17));
  const fromNoon = Math.abs(hour + 0.5 - 12.5);
  return Math.max(0, Math.min(1, (fromNoon - 2.5) / 3)) * rng.range(0.6, 1) + rng.range(-0.1, 0.1);
}

function paintBand(img: Raster, spec: PhotoSpec, rng: Rng): number {
  const left = (spec.band || `${spec.station} ${spec.camera}`).toUpperCase();
  const night = spec.lighting === 'infrared';
  const t = Math.round(spec.temperatureC ?? (night ? rng.range(9, 20) : rng.range(18, 33)));
  const dt = spec.exif?.dateTimeOriginal;
  const when = dt ? `${dt.slice(0, 10).replaceAll(':', '-')} ${dt.slice(11)}` : '';
  drawBand(img, left, `${t}°C`, when);
  return bandHeight(img.height);
}

/** Writes the set-up lines on the board, sized to fit its projected face. */
function drawBoardText(img: Raster, h: Mat3, lines: readonly string[]): void {
  const a = BOARD_TEXT_AREA;
  const [x0, y0] = applyH(h, a.x0, a.y1);
  const [x1, y1] = applyH(h, a.x1, a.y0);
  const left = Math.min(x0, x1);
  const w = Math.abs(x1 - x0);
  const hgt = Math.abs(y1 - y0);
  const longest = Math.max(1, ...lines.map((l) => l.length));
  const scale = Math.max(
    1,
    Math.floor(Math.min(w / (longest * 6), hgt / (Math.max(1, lines.length) * 9))),
  );
  const top = Math.min(y0, y1) + (hgt - lines.length * 9 * scale) / 2;
  lines.forEach((line, i) => {
    const lx = left + (w - textWidth(line, scale)) / 2;
    drawText(img, line, lx, top + i * 9 * scale, scale, [30, 40, 96]);
  });
}

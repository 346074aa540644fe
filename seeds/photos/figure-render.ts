import { applyH, invert3, type Mat3 } from './camera';
import {
  ellipse,
  figureBox,
  partBox,
  partDistance,
  smoothMin,
  type Figure,
  type Part,
  type PartBox,
  type ShadeInput,
} from './figure';
import type { Raster } from './raster';

/** A figure rendered on its own, premultiplied, so it can be blurred and then composited. */
export interface FigureLayer {
  readonly x0: number;
  readonly y0: number;
  readonly w: number;
  readonly h: number;
  /** Premultiplied colour, 3 floats per pixel. */
  readonly rgb: Float32Array;
  readonly alpha: Float32Array;
}

const TILE = 16;

/** Pixel box a figure can reach through a homography, clipped to the frame; null when outside. */
function screenBox(fig: Figure, h: Mat3, width: number, height: number, pad: number) {
  const b = figureBox(fig);
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (const [x, y] of [
    [b.x0, b.y0],
    [b.x1, b.y0],
    [b.x0, b.y1],
    [b.x1, b.y1],
  ]) {
    const [px, py] = applyH(h, x, y);
    x0 = Math.min(x0, px);
    y0 = Math.min(y0, py);
    x1 = Math.max(x1, px);
    y1 = Math.max(y1, py);
  }
  const bx0 = Math.max(0, Math.floor(x0 - pad));
  const by0 = Math.max(0, Math.floor(y0 - pad));
  const bx1 = Math.min(width - 1, Math.ceil(x1 + pad));
  const by1 = Math.min(height - 1, Math.ceil(y1 + pad));
  if (bx1 < bx0 || by1 < by0) return null;
  return { x0: bx0, y0: by0, w: bx1 - bx0 + 1, h: by1 - by0 + 1 };
}

/** Parts of one layer whose boxes meet a template-space box, with their boxes flattened. */
interface TileParts {
  parts: Part[];
  boxes: number[];
}

function partsIn(parts: readonly Part[], boxes: readonly PartBox[], q: PartBox): TileParts {
  const out: TileParts = { parts: [], boxes: [] };
  for (let i = 0; i < parts.length; i++) {
    const b = boxes[i];
    if (b.x1 >= q.x0 && b.x0 <= q.x1 && b.y1 >= q.y0 && b.y0 <= q.y1) {
      out.parts.push(parts[i]);
      out.boxes.push(b.x0, b.y0, b.x1, b.y1);
    }
  }
  return out;
}

/** Template box covered by a pixel rectangle (a homography keeps the quad convex). */
function tileTemplateBox(inv: Mat3, x0: number, y0: number, x1: number, y1: number): PartBox {
  const q: PartBox = { x0: Infinity, y0: Infinity, x1: -Infinity, y1: -Infinity };
  for (const [x, y] of [
    [x0 - 1, y0 - 1],
    [x1 + 1, y0 - 1],
    [x0 - 1, y1 + 1],
    [x1 + 1, y1 + 1],
  ]) {
    const [tx, ty] = applyH(inv, x, y);
    q.x0 = Math.min(q.x0, tx);
    q.y0 = Math.min(q.y0, ty);
    q.x1 = Math.max(q.x1, tx);
    q.y1 = Math.max(q.y1, ty);
  }
  return q;
}

// One shading record reused for every pixel (the renderer is synchronous).
const shadeIn: ShadeInput = { part: ellipse('none', [0, 0], 1, 1), x: 0, y: 0, inside: 0, px: 1 };

/**
 * Renders a figure through a template-to-pixel homography. Pixel centres sit on integer
 * coordinates; edges are anti-aliased from the signed distance at pxPerMetre.
 */
export function renderFigure(
  fig: Figure,
  h: Mat3,
  width: number,
  height: number,
  pxPerMetre: number,
  blurPx = 0,
): FigureLayer | null {
  const box = screenBox(fig, h, width, height, 2 + blurPx);
  if (!box) return null;
  const inv = invert3(h);
  const layers = [0, 1].map((l) => fig.parts.filter((p) => p.layer === l));
  // Part boxes grow by a pixel so anti-aliased edges are never cut off.
  const g = 1 / pxPerMetre;
  const boxes = layers.map((ps) =>
    ps.map(partBox).map((b) => ({ x0: b.x0 - g, y0: b.y0 - g, x1: b.x1 + g, y1: b.y1 + g })),
  );
  const rgb = new Float32Array(box.w * box.h * 3);
  const alpha = new Float32Array(box.w * box.h);
  const col = new Float32Array(3);
  const far = new Float32Array(3);
  for (let ty = box.y0; ty < box.y0 + box.h; ty += TILE) {
    for (let tx = box.x0; tx < box.x0 + box.w; tx += TILE) {
      const tx1 = Math.min(tx + TILE, box.x0 + box.w) - 1;
      const ty1 = Math.min(ty + TILE, box.y0 + box.h) - 1;
      const q = tileTemplateBox(inv, tx, ty, tx1, ty1);
      const near = partsIn(layers[1], boxes[1], q);
      const back = partsIn(layers[0], boxes[0], q);
      if (near.parts.length === 0 && back.parts.length === 0) continue;
      for (let y = ty; y <= ty1; y++) {
        for (let x = tx; x <= tx1; x++) {
          const w = inv[6] * x + inv[7] * y + inv[8];
          const px = (inv[0] * x + inv[1] * y + inv[2]) / w;
          const py = (inv[3] * x + inv[4] * y + inv[5]) / w;
          const a = near.parts.length ? shadeLayer(fig, near, px, py, pxPerMetre, col) : 0;
          let r = a > 0 ? col[0] * a : 0;
          let g = a > 0 ? col[1] * a : 0;
          let b = a > 0 ? col[2] * a : 0;
          let cov = a;
          if (a < 1 && back.parts.length) {
            const af = shadeLayer(fig, back, px, py, pxPerMetre, far) * (1 - a);
            r += far[0] * af;
            g += far[1] * af;
            b += far[2] * af;
            cov += af;
          }
          if (cov <= 0) continue;
          const i = (y - box.y0) * box.w + (x - box.x0);
          rgb[i * 3] = r;
          rgb[i * 3 + 1] = g;
          rgb[i * 3 + 2] = b;
          alpha[i] = cov;
        }
      }
    }
  }
  const layer = { ...box, rgb, alpha };
  if (blurPx >= 1) blurRows(layer, blurPx);
  return layer;
}

/** Coverage of one layer at a template point, with its colour written to out. */
function shadeLayer(
  fig: Figure,
  tile: TileParts,
  x: number,
  y: number,
  pxPerMetre: number,
  out: Float32Array,
): number {
  // Blended distance to the silhouette; the nearest part owns the point's colour.
  let d = Infinity;
  let own = Infinity;
  let owner: Part | null = null;
  const { parts, boxes } = tile;
  for (let k = 0; k < parts.length; k++) {
    const k4 = k * 4;
    if (x < boxes[k4] || y < boxes[k4 + 1] || x > boxes[k4 + 2] || y > boxes[k4 + 3]) continue;
    const p = parts[k];
    const di = partDistance(p, x, y);
    d = d === Infinity ? di : smoothMin(d, di, p.blend);
    if (di < own) {
      own = di;
      owner = p;
    }
  }
  const a = 0.5 - d * pxPerMetre;
  if (a <= 0 || !owner) return 0;
  shadeIn.part = owner;
  shadeIn.x = x;
  shadeIn.y = y;
  shadeIn.inside = -d;
  shadeIn.px = pxPerMetre;
  fig.shade(shadeIn, out);
  return a >= 1 ? 1 : a;
}

/**
 * Motion blur along image rows (the walking direction, up to the small roll), as a running box
 * average of the premultiplied layer.
 */
export function blurRows(layer: FigureLayer, length: number): void {
  const n = Math.max(1, Math.round(length));
  const half = n >> 1;
  const { w, h, rgb, alpha } = layer;
  const row = new Float32Array(w * 4);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      const i = y * w + x;
      row[x * 4] = rgb[i * 3];
      row[x * 4 + 1] = rgb[i * 3 + 1];
      row[x * 4 + 2] = rgb[i * 3 + 2];
      row[x * 4 + 3] = alpha[i];
    }
    const acc = [0, 0, 0, 0];
    for (let x = -half; x < w + half; x++) {
      const add = x + half;
      const drop = x - half - 1;
      for (let k = 0; k < 4; k++) {
        if (add >= 0 && add < w) acc[k] += row[add * 4 + k];
        if (drop >= 0 && drop < w) acc[k] -= row[drop * 4 + k];
      }
      if (x < 0 || x >= w) continue;
      const i = y * w + x;
      rgb[i * 3] = acc[0] / n;
      rgb[i * 3 + 1] = acc[1] / n;
      rgb[i * 3 + 2] = acc[2] / n;
      alpha[i] = Math.min(1, acc[3] / n);
    }
  }
}

/** Composites a figure layer over a raster, scaling its light by gain (flash fall-off). */
export function compositeLayer(img: Raster, layer: FigureLayer, gain = 1): void {
  const d = img.data;
  for (let y = 0; y < layer.h; y++) {
    for (let x = 0; x < layer.w; x++) {
      const i = y * layer.w + x;
      const a = layer.alpha[i];
      if (a <= 0) continue;
      const o = ((y + layer.y0) * img.width + x + layer.x0) * 4;
      d[o] = d[o] * (1 - a) + layer.rgb[i * 3] * gain;
      d[o + 1] = d[o + 1] * (1 - a) + layer.rgb[i * 3 + 1] * gain;
      d[o + 2] = d[o + 2] * (1 - a) + layer.rgb[i * 3 + 2] * gain;
    }
  }
}

/** Tight pixel box of the layer where coverage reaches minAlpha; null when nothing is visible. */
export function layerBox(
  layer: FigureLayer,
  minAlpha = 0.25,
  maxY = Infinity,
): { x: number; y: number; width: number; height: number } | null {
  let x0 = Infinity;
  let y0 = Infinity;
  let x1 = -Infinity;
  let y1 = -Infinity;
  for (let y = 0; y < layer.h; y++) {
    if (y + layer.y0 >= maxY) break;
    for (let x = 0; x < layer.w; x++) {
      if (layer.alpha[y * layer.w + x] < minAlpha) continue;
      if (x < x0) x0 = x;
      if (x > x1) x1 = x;
      if (y < y0) y0 = y;
      y1 = y;
    }
  }
  if (x1 < x0) return null;
  return { x: x0 + layer.x0, y: y0 + layer.y0, width: x1 - x0 + 1, height: y1 - y0 + 1 };
}

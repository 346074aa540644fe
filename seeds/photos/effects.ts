/** Whole-photo looks: daylight exposure and dappled shade, the infrared night look, the data band. */
import { drawText, textWidth } from './font';
import { valueNoise } from './noise';
import type { Raster } from './raster';
import { hashNoise } from './random';

/**
 * A smooth multiplier over the frame, evaluated on a coarse grid and interpolated one row at a
 * time, so a full-frame modulation costs a multiply per pixel.
 */
class CoarseField {
  private readonly gw: number;
  private readonly grid: Float32Array;
  readonly row: Float32Array;

  constructor(
    private readonly width: number,
    height: number,
    private readonly step: number,
    f: (x: number, y: number) => number,
  ) {
    this.gw = Math.ceil(width / step) + 2;
    const gh = Math.ceil(height / step) + 2;
    this.grid = new Float32Array(this.gw * gh);
    for (let j = 0; j < gh; j++) {
      for (let i = 0; i < this.gw; i++) this.grid[j * this.gw + i] = f(i * step, j * step);
    }
    this.row = new Float32Array(width);
    this.ix = new Int32Array(width);
    this.fx = new Float32Array(width);
    for (let x = 0; x < width; x++) {
      this.ix[x] = Math.floor(x / step);
      this.fx[x] = x / step - this.ix[x];
    }
  }

  private readonly ix: Int32Array;
  private readonly fx: Float32Array;

  private rowY = -1;

  /**
   * The field along image row y. Rows are refreshed every 4 image rows: the field changes over
   * tens of pixels, and evaluating it per row would cost as much as the pass it modulates.
   */
  fillRow(y: number): Float32Array {
    const yq = y - (y & 3);
    if (yq === this.rowY) return this.row;
    this.rowY = yq;
    const gy = yq / this.step;
    const j = Math.floor(gy);
    const fy = gy - j;
    const { grid, gw, row, ix } = this;
    for (let x = 0; x < this.width; x++) {
      const fx = this.fx[x];
      const k = j * gw + ix[x];
      const top = grid[k] + (grid[k + 1] - grid[k]) * fx;
      const bottom = grid[k + gw] + (grid[k + gw + 1] - grid[k + gw]) * fx;
      row[x] = top + (bottom - top) * fy;
    }
    return row;
  }
}

/** A 256×256 tile of grain in [-0.5, 0.5); each photo reads it at its own offset. */
const GRAIN = (() => {
  const t = new Float32Array(65536);
  for (let i = 0; i < t.length; i++) t[i] = hashNoise(i & 255, i >> 8, 0x9a1) - 0.5;
  return t;
})();

/** Grain row for image row y: an offset view into the tile. */
function grainRow(y: number, seed: number): number {
  return (((y + (seed >>> 8)) & 255) << 8) | 0;
}

/**
 * Daylight: exposure, colour temperature (warm = low sun), soft dappled shade over the lower part
 * of the frame and a mild lens vignette. (Daylight sensor noise is too faint to be worth its cost
 * in painting and in JPEG size; the ground already carries grit.)
 */
export function applyDaylight(
  img: Raster,
  seed: number,
  exposure: number,
  warmth: number,
  dapple: number,
): void {
  const { width, height, data } = img;
  const cx = width / 2;
  const cy = height / 2;
  const norm = 1 / (cx * cx + cy * cy);
  const field = new CoarseField(width, height, 16, (x, y) => {
    const n = valueNoise(x / (width * 0.12), y / (width * 0.08), seed);
    const shade =
      1 - dapple * Math.max(0, Math.min(1, (n - 0.5) * 2.5)) * Math.min(1, y / (height * 0.45));
    const dx = x - cx;
    const dy = y - cy;
    return shade * (1 - 0.22 * (dx * dx + dy * dy) * norm);
  });
  const kr = exposure * (1 + warmth * 0.08);
  const kg = exposure;
  const kb = exposure * (1 - warmth * 0.12);
  for (let y = 0; y < height; y++) {
    const row = field.fillRow(y);
    let i = y * width * 4;
    for (let x = 0; x < width; x++, i += 4) {
      const v = row[x];
      data[i] = data[i] * kr * v;
      data[i + 1] = data[i + 1] * kg * v;
      data[i + 2] = data[i + 2] * kb * v;
    }
  }
}

/**
 * The infrared night look: one grey channel (vegetation bright, as chlorophyll reflects near
 * infrared), flattened contrast, a strong flash vignette and visible sensor noise.
 */
export function applyInfrared(img: Raster, seed: number, exposure: number): void {
  const { width, height, data } = img;
  const cx = width / 2;
  const cy = height * 0.55;
  const norm = 1 / (cx * cx + cy * cy);
  // Tone curve as a table: lifts shadows like the camera's night gain does.
  const curve = new Float32Array(1024);
  for (let k = 0; k < 1024; k++) curve[k] = 255 * Math.pow(k / 1023, 0.8) * exposure;
  const field = new CoarseField(width, height, 16, (x, y) => {
    const dx = x - cx;
    const dy = y - cy;
    return 1 - 0.5 * (dx * dx + dy * dy) * norm;
  });
  for (let y = 0; y < height; y++) {
    const row = field.fillRow(y);
    const gy = grainRow(y, seed);
    const gx0 = seed & 255;
    let i = y * width * 4;
    for (let x = 0; x < width; x++, i += 4) {
      const r = data[i];
      const gr = data[i + 1];
      const b = data[i + 2];
      const hi = r > b ? r : b;
      const leaf = gr > hi ? (gr - hi) * 1.2 : 0;
      const lin = 0.3 * r + 0.52 * gr + 0.18 * b + leaf;
      const v =
        curve[lin >= 255 ? 1023 : (lin * 4.0118) | 0] * row[x] * 0.88 +
        14 +
        GRAIN[gy | ((x + gx0) & 255)] * 12;
      data[i] = v;
      data[i + 1] = v;
      data[i + 2] = v;
    }
  }
}

/** Band height for a frame height (a thin strip like many trail cameras print). */
export function bandHeight(height: number): number {
  return Math.max(12, Math.round(height * 0.032));
}

/** The data band: a dark strip with camera label, temperature and the camera's date and time. */
export function drawBand(img: Raster, left: string, centre: string, right: string): number {
  const bh = bandHeight(img.height);
  const y0 = img.height - bh;
  const d = img.data;
  for (let i = y0 * img.width * 4; i < d.length; i += 4) {
    d[i] = 18;
    d[i + 1] = 18;
    d[i + 2] = 18;
  }
  const scale = Math.max(1, Math.floor((bh - 4) / 7));
  const ty = y0 + Math.round((bh - 7 * scale) / 2);
  const pad = scale * 4;
  const white = [236, 236, 236] as const;
  drawText(img, left, pad, ty, scale, white);
  drawText(img, centre, Math.round((img.width - textWidth(centre, scale)) / 2), ty, scale, white);
  drawText(img, right, img.width - pad - textWidth(right, scale), ty, scale, white);
  return bh;
}

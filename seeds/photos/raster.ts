/** RGBA pixel buffers and the few anti-aliased primitives the painters draw with. */

/** An sRGB colour as 0–255 channels. */
export type Rgb = readonly [number, number, number];

/** An RGBA image in row-major order, 4 bytes per pixel, alpha ignored for the final photo. */
export interface Raster {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8ClampedArray<ArrayBuffer>;
}

/** A new raster filled with one opaque colour. */
export function createRaster(width: number, height: number, fill: Rgb = [0, 0, 0]): Raster {
  const data = new Uint8ClampedArray(width * height * 4);
  for (let i = 0; i < data.length; i += 4) {
    data[i] = fill[0];
    data[i + 1] = fill[1];
    data[i + 2] = fill[2];
    data[i + 3] = 255;
  }
  return { width, height, data };
}

/** A copy that can be painted on without touching the original (cached backgrounds). */
export function cloneRaster(src: Raster): Raster {
  return { width: src.width, height: src.height, data: new Uint8ClampedArray(src.data) };
}

/** Fills a rotated ellipse with an anti-aliased edge. */
export function fillEllipse(
  img: Raster,
  cx: number,
  cy: number,
  rx: number,
  ry: number,
  angle: number,
  c: Rgb,
  alpha = 1,
): void {
  const reach = Math.max(rx, ry) + 1;
  const x0 = Math.max(0, Math.floor(cx - reach));
  const x1 = Math.min(img.width - 1, Math.ceil(cx + reach));
  const y0 = Math.max(0, Math.floor(cy - reach));
  const y1 = Math.min(img.height - 1, Math.ceil(cy + reach));
  const cos = Math.cos(angle);
  const sin = Math.sin(angle);
  const minR = Math.max(0.5, Math.min(rx, ry));
  const d = img.data;
  for (let y = y0; y <= y1; y++) {
    const dy = y - cy;
    let i = (y * img.width + x0) * 4;
    for (let x = x0; x <= x1; x++, i += 4) {
      const dx = x - cx;
      const u = (dx * cos + dy * sin) / rx;
      const v = (-dx * sin + dy * cos) / ry;
      const dist = (Math.sqrt(u * u + v * v) - 1) * minR;
      if (dist >= 0.5) continue;
      const a = (dist <= -0.5 ? 1 : 0.5 - dist) * alpha;
      d[i] += (c[0] - d[i]) * a;
      d[i + 1] += (c[1] - d[i + 1]) * a;
      d[i + 2] += (c[2] - d[i + 2]) * a;
    }
  }
}

/** Fills a tapered stroke from (x0, y0) with radius r0 to (x1, y1) with radius r1. */
export function fillStroke(
  img: Raster,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
  r0: number,
  r1: number,
  c: Rgb,
  alpha = 1,
): void {
  const reach = Math.max(r0, r1) + 1;
  const bx0 = Math.max(0, Math.floor(Math.min(x0, x1) - reach));
  const bx1 = Math.min(img.width - 1, Math.ceil(Math.max(x0, x1) + reach));
  const by0 = Math.max(0, Math.floor(Math.min(y0, y1) - reach));
  const by1 = Math.min(img.height - 1, Math.ceil(Math.max(y0, y1) + reach));
  const ex = x1 - x0;
  const ey = y1 - y0;
  const len2 = ex * ex + ey * ey || 1e-9;
  const len = Math.sqrt(len2);
  // Per row, only the span within reach of the centre line (steep strokes like grass are thin).
  const steep = Math.abs(ey) > 0.25 * len;
  const spread = steep ? (reach * len) / Math.abs(ey) : 0;
  const d = img.data;
  for (let y = by0; y <= by1; y++) {
    let xa = bx0;
    let xb = bx1;
    if (steep) {
      const t = Math.min(1, Math.max(0, (y - y0) / ey));
      const xc = x0 + ex * ((y - y0) / ey);
      const xe = x0 + ex * t;
      xa = Math.max(bx0, Math.floor(Math.min(xc, xe) - spread));
      xb = Math.min(bx1, Math.ceil(Math.max(xc, xe) + spread));
    }
    let i = (y * img.width + xa) * 4;
    for (let x = xa; x <= xb; x++, i += 4) {
      const px = x - x0;
      const py = y - y0;
      let t = (px * ex + py * ey) / len2;
      t = t < 0 ? 0 : t > 1 ? 1 : t;
      const qx = px - ex * t;
      const qy = py - ey * t;
      // Widen thin strokes to half a pixel and fade them instead, so grass does not shimmer.
      const r = r0 + (r1 - r0) * t;
      const rr = r < 0.5 ? 0.5 : r;
      const q2 = qx * qx + qy * qy;
      if (q2 >= (rr + 0.5) * (rr + 0.5)) continue;
      const dist = Math.sqrt(q2) - rr;
      if (dist >= 0.5) continue;
      const a = (dist <= -0.5 ? 1 : 0.5 - dist) * alpha * (r < 0.5 ? r * 2 : 1);
      d[i] += (c[0] - d[i]) * a;
      d[i + 1] += (c[1] - d[i + 1]) * a;
      d[i + 2] += (c[2] - d[i + 2]) * a;
    }
  }
}

/** Flips a raster left to right in place. */
export function mirrorRaster(img: Raster): void {
  const { width, height, data } = img;
  for (let y = 0; y < height; y++) {
    let a = y * width * 4;
    let b = a + (width - 1) * 4;
    while (a < b) {
      for (let k = 0; k < 4; k++) {
        const t = data[a + k];
        data[a + k] = data[b + k];
        data[b + k] = t;
      }
      a += 4;
      b -= 4;
    }
  }
}

/** Downscale by averaging a grid of up to 4×4 samples per output pixel (EXIF thumbnails). */
export function downscale(src: Raster, width: number, height: number): Raster {
  const out = createRaster(width, height);
  const sx = src.width / width;
  const sy = src.height / height;
  const kx = Math.max(1, Math.min(4, Math.ceil(sx)));
  const ky = Math.max(1, Math.min(4, Math.ceil(sy)));
  const n = kx * ky;
  const s = src.data;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      let r = 0;
      let g = 0;
      let b = 0;
      for (let j = 0; j < ky; j++) {
        const yy = Math.min(src.height - 1, Math.floor((y + (j + 0.5) / ky) * sy));
        for (let i = 0; i < kx; i++) {
          const xx = Math.min(src.width - 1, Math.floor((x + (i + 0.5) / kx) * sx));
          const o = (yy * src.width + xx) * 4;
          r += s[o];
          g += s[o + 1];
          b += s[o + 2];
        }
      }
      const o = (y * width + x) * 4;
      out.data[o] = r / n;
      out.data[o + 1] = g / n;
      out.data[o + 2] = b / n;
    }
  }
  return out;
}

/** Bilinear enlargement (pixel centres aligned), used for backgrounds of large frames. */
export function upscale(src: Raster, width: number, height: number): Raster {
  const out = createRaster(width, height);
  const sx = src.width / width;
  const sy = src.height / height;
  const d = out.data;
  const s = src.data;
  for (let y = 0; y < height; y++) {
    const fy = Math.min(src.height - 1, Math.max(0, (y + 0.5) * sy - 0.5));
    const y0 = Math.floor(fy);
    const y1 = Math.min(src.height - 1, y0 + 1);
    const wy = fy - y0;
    for (let x = 0; x < width; x++) {
      const fx = Math.min(src.width - 1, Math.max(0, (x + 0.5) * sx - 0.5));
      const x0 = Math.floor(fx);
      const x1 = Math.min(src.width - 1, x0 + 1);
      const wx = fx - x0;
      const a = (y0 * src.width + x0) * 4;
      const b = (y0 * src.width + x1) * 4;
      const c = (y1 * src.width + x0) * 4;
      const e = (y1 * src.width + x1) * 4;
      const o = (y * width + x) * 4;
      for (let k = 0; k < 3; k++) {
        const top = s[a + k] + (s[b + k] - s[a + k]) * wx;
        const bottom = s[c + k] + (s[e + k] - s[c + k]) * wx;
        d[o + k] = top + (bottom - top) * wy;
      }
    }
  }
  return out;
}

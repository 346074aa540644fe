/** Reading rendered photos back with an independent decoder (Jimp's jpeg-js) for the seed tests. */
import { Jimp } from 'jimp';

/** Decoded RGBA pixels. */
export interface Decoded {
  readonly width: number;
  readonly height: number;
  readonly data: Buffer;
}

/** Decodes JPEG bytes. */
export async function decode(jpeg: Buffer): Promise<Decoded> {
  const img = await Jimp.fromBuffer(jpeg);
  return { width: img.bitmap.width, height: img.bitmap.height, data: img.bitmap.data };
}

/** Luma (BT.601) at a pixel. */
export function luma(img: Decoded, x: number, y: number): number {
  const i = (y * img.width + x) * 4;
  return 0.299 * img.data[i] + 0.587 * img.data[i + 1] + 0.114 * img.data[i + 2];
}

/** Bilinear luma at a sub-pixel position (pixel centres on integers); NaN outside. */
export function lumaAt(img: Decoded, x: number, y: number): number {
  const x0 = Math.floor(x);
  const y0 = Math.floor(y);
  if (x0 < 0 || y0 < 0 || x0 + 1 >= img.width || y0 + 1 >= img.height) return NaN;
  const fx = x - x0;
  const fy = y - y0;
  const top = luma(img, x0, y0) * (1 - fx) + luma(img, x0 + 1, y0) * fx;
  const bottom = luma(img, x0, y0 + 1) * (1 - fx) + luma(img, x0 + 1, y0 + 1) * fx;
  return top * (1 - fy) + bottom * fy;
}

/** Applies a row-major 3×3 homography. */
export function project(h: readonly number[], x: number, y: number): [number, number] {
  const w = h[6] * x + h[7] * y + h[8];
  return [(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w];
}

/** Pearson correlation of two equally long samples. */
export function correlation(a: readonly number[], b: readonly number[]): number {
  const n = a.length;
  const ma = a.reduce((s, v) => s + v, 0) / n;
  const mb = b.reduce((s, v) => s + v, 0) / n;
  let sab = 0;
  let saa = 0;
  let sbb = 0;
  for (let i = 0; i < n; i++) {
    sab += (a[i] - ma) * (b[i] - mb);
    saa += (a[i] - ma) ** 2;
    sbb += (b[i] - mb) ** 2;
  }
  return sab / Math.sqrt(saa * sbb);
}

/** Points on the flank (body units), clear of legs, neck and belly edge. */
export function flankPoints(step = 0.012): [number, number][] {
  const pts: [number, number][] = [];
  for (let u = 0.28; u <= 0.55; u += step) {
    for (let v = 0.33; v <= 0.46; v += step) pts.push([u, v]);
  }
  return pts;
}

/**
 * JPEG encoding. The default is our own baseline encoder (jpeg-encode.ts), about twice as fast as
 * mozjpeg here. mozjpeg compiled to WebAssembly (@jsquash/jpeg) gives files about 12 % smaller;
 * it is initialised once per process or worker from the .wasm file on disk (its own loader would
 * try to fetch a file URL in Node), with Jimp's pure-JS encoder as its fallback.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { Jimp } from 'jimp';
import { encodeBaseline } from './jpeg-encode';
import type { Raster } from './raster';

type Encoder = (img: Raster, quality: number) => Promise<Buffer>;

let encoder: Promise<Encoder> | null = null;

async function mozjpeg(): Promise<Encoder> {
  const require = createRequire(import.meta.url);
  const mod = await import('@jsquash/jpeg/encode.js');
  const wasm = await WebAssembly.compile(
    readFileSync(require.resolve('@jsquash/jpeg/codec/enc/mozjpeg_enc.wasm')),
  );
  // The published types only list the options argument; the code also takes a compiled module.
  const init = mod.init as unknown as (module: WebAssembly.Module) => Promise<void>;
  await init(wasm);
  return async (img, quality) => {
    const data: ImageData = {
      data: img.data,
      width: img.width,
      height: img.height,
      colorSpace: 'srgb',
    };
    // Baseline, non-progressive: what trail cameras write. trellis_loops must stay >= 1.
    const out = await mod.default(data, {
      quality,
      baseline: true,
      progressive: false,
      trellis_loops: 1,
    });
    return Buffer.from(out);
  };
}

async function jimpEncoder(): Promise<Encoder> {
  return async (img, quality) => {
    const j = new Jimp({ width: img.width, height: img.height });
    j.bitmap.data = Buffer.from(img.data.buffer, img.data.byteOffset, img.data.byteLength);
    return j.getBuffer('image/jpeg', { quality });
  };
}

/** Which JPEG encoder to use. */
export type JpegEncoder = 'baseline' | 'mozjpeg' | 'jimp';

/** Encodes an RGBA raster as a baseline JPEG with the chosen encoder. */
export async function encodeJpeg(
  img: Raster,
  quality: number,
  which: JpegEncoder = 'baseline',
): Promise<Buffer> {
  if (which === 'baseline') return encodeBaseline(img, quality);
  if (which === 'jimp') return (await jimpEncoder())(img, quality);
  encoder ??= mozjpeg().catch(() => jimpEncoder());
  return (await encoder)(img, quality);
}

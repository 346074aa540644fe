/**
 * JPEG encoding: mozjpeg compiled to WebAssembly (@jsquash/jpeg), initialised once per process or
 * worker from the .wasm file on disk (its own loader would try to fetch a file URL in Node);
 * Jimp's pure-JS encoder is the fallback if that ever fails.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { Jimp } from 'jimp';
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

/** Which encoder is in use ('mozjpeg' normally). */
export let encoderName: 'mozjpeg' | 'jimp' = 'mozjpeg';

/** Encodes an RGBA raster as a baseline JPEG. */
export async function encodeJpeg(img: Raster, quality: number): Promise<Buffer> {
  encoder ??= mozjpeg().catch(() => {
    encoderName = 'jimp';
    return jimpEncoder();
  });
  return (await encoder)(img, quality);
}

/** Forces the pure-JS encoder (for comparisons in the benchmark). */
export async function encodeJpegWithJimp(img: Raster, quality: number): Promise<Buffer> {
  return (await jimpEncoder())(img, quality);
}

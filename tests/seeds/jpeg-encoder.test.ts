/**
 * Our baseline JPEG encoder checked against two independent decoders: Jimp's jpeg-js and
 * libjpeg-turbo/mozjpeg compiled to WebAssembly (@jsquash/jpeg). Inputs are synthetic rasters.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { beforeAll, describe, expect, it } from 'vitest';
import { encodeBaseline } from '../../seeds/photos/jpeg-encode';
import { createRaster, type Raster } from '../../seeds/photos/raster';
import { Rng } from '../../seeds/photos/random';
import { paintScene } from '../../seeds/photos/scene';
import { decode } from './decoded';

type WasmDecode = (data: ArrayBuffer) => Promise<ImageData>;
let wasmDecode: WasmDecode;

beforeAll(async () => {
  const require = createRequire(import.meta.url);
  const mod = await import('@jsquash/jpeg/decode.js');
  const wasm = await WebAssembly.compile(
    readFileSync(require.resolve('@jsquash/jpeg/codec/dec/mozjpeg_dec.wasm')),
  );
  await (mod.init as unknown as (m: WebAssembly.Module) => Promise<void>)(wasm);
  wasmDecode = (data) => mod.default(data);
});

function psnr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let se = 0;
  let n = 0;
  for (let i = 0; i < a.length; i += 4) {
    for (let c = 0; c < 3; c++) se += (a[i + c] - b[i + c]) ** 2;
    n += 3;
  }
  return 10 * Math.log10((255 * 255) / (se / n));
}

/** PSNR of BT.601 luma only: chroma upsampling legitimately differs between decoders. */
function lumaPsnr(a: ArrayLike<number>, b: ArrayLike<number>): number {
  let se = 0;
  let n = 0;
  for (let i = 0; i < a.length; i += 4) {
    const ya = 0.299 * a[i] + 0.587 * a[i + 1] + 0.114 * a[i + 2];
    const yb = 0.299 * b[i] + 0.587 * b[i + 1] + 0.114 * b[i + 2];
    se += (ya - yb) ** 2;
    n++;
  }
  return 10 * Math.log10((255 * 255) / (se / n));
}

function noise(width: number, height: number): Raster {
  const img = createRaster(width, height);
  const rng = new Rng(9);
  for (let i = 0; i < img.data.length; i += 4) {
    img.data[i] = rng.int(0, 255);
    img.data[i + 1] = rng.int(0, 255);
    img.data[i + 2] = rng.int(0, 255);
  }
  return img;
}

async function bothDecoders(jpeg: Buffer) {
  const a = await decode(jpeg);
  const ab = jpeg.buffer.slice(jpeg.byteOffset, jpeg.byteOffset + jpeg.byteLength);
  const b = await wasmDecode(ab as ArrayBuffer);
  return { a, b };
}

describe('baseline JPEG encoder', () => {
  const scene = paintScene({
    width: 333,
    height: 201,
    seed: 2,
    station: 'TEST-JPEG',
    camera: 'A',
    lighting: 'day',
    subject: { kind: 'target', individual: 'T-J', flank: 'left' },
  });

  it('should be read the same way by two independent decoders, at sizes off the MCU grid', async () => {
    const { a, b } = await bothDecoders(encodeBaseline(scene.img, 85));
    expect([a.width, a.height, b.width, b.height]).toEqual([333, 201, 333, 201]);
    // Decoders differ only in IDCT and upsampling rounding.
    expect(psnr(a.data, b.data)).toBeGreaterThan(40);
  });

  it('should keep a painted scene close to the source at quality 85', async () => {
    const { a, b } = await bothDecoders(encodeBaseline(scene.img, 85));
    expect(psnr(scene.img.data, a.data)).toBeGreaterThan(30);
    expect(psnr(scene.img.data, b.data)).toBeGreaterThan(30);
  });

  it('should trade size for fidelity as the quality setting rises', async () => {
    const low = encodeBaseline(scene.img, 40);
    const high = encodeBaseline(scene.img, 95);
    expect(high.length).toBeGreaterThan(low.length * 1.5);
    const pl = psnr(scene.img.data, (await decode(low)).data);
    const ph = psnr(scene.img.data, (await decode(high)).data);
    expect(ph).toBeGreaterThan(pl + 3);
  });

  it('should encode pure noise (every symbol, long codes, 0xFF stuffing) decodably', async () => {
    const img = noise(64, 48);
    const jpeg = encodeBaseline(img, 100);
    const { a, b } = await bothDecoders(jpeg);
    expect(lumaPsnr(a.data, b.data)).toBeGreaterThan(40);
    expect(lumaPsnr(img.data, a.data)).toBeGreaterThan(30);
  });

  it('should encode a one-pixel image', async () => {
    const img = createRaster(1, 1, [200, 30, 90]);
    const { a } = await bothDecoders(encodeBaseline(img, 90));
    expect(
      Math.abs(a.data[0] - 200) + Math.abs(a.data[1] - 30) + Math.abs(a.data[2] - 90),
    ).toBeLessThan(12);
  });
});

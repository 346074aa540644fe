import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

/** RGBA pixels. */
export interface Pixels {
  data: Uint8ClampedArray;
  width: number;
  height: number;
}

type DecodeFn = (buffer: ArrayBuffer) => Promise<ImageData>;
type EncodeFn = (image: ImageData, options: Record<string, unknown>) => Promise<ArrayBuffer>;

let codecs: Promise<{ decode: DecodeFn; encode: EncodeFn }> | null = null;

// mozjpeg compiled to WebAssembly: ~6× faster to decode than Jimp's pure-JS codec. Its own loader
// would fetch() a file URL in Node, so each thread compiles the .wasm from disk once.
async function load(): Promise<{ decode: DecodeFn; encode: EncodeFn }> {
  const require = createRequire(import.meta.url);
  const decoder = await import('@jsquash/jpeg/decode.js');
  const encoder = await import('@jsquash/jpeg/encode.js');
  const compile = (path: string) => WebAssembly.compile(readFileSync(require.resolve(path)));
  const initDecoder = decoder.init as unknown as (module: WebAssembly.Module) => Promise<void>;
  const initEncoder = encoder.init as unknown as (module: WebAssembly.Module) => Promise<void>;
  await initDecoder(await compile('@jsquash/jpeg/codec/dec/mozjpeg_dec.wasm'));
  await initEncoder(await compile('@jsquash/jpeg/codec/enc/mozjpeg_enc.wasm'));
  return {
    decode: decoder.default as unknown as DecodeFn,
    encode: encoder.default as unknown as EncodeFn,
  };
}

function codecsOnce() {
  codecs ??= load();
  return codecs;
}

/** Decodes a JPEG to RGBA. */
export async function decodeJpeg(bytes: Buffer): Promise<Pixels> {
  const { decode } = await codecsOnce();
  const copy = bytes.buffer.slice(
    bytes.byteOffset,
    bytes.byteOffset + bytes.byteLength,
  ) as ArrayBuffer;
  const image = await decode(copy);
  return { data: image.data, width: image.width, height: image.height };
}

/** Encodes RGBA as a baseline JPEG with no metadata at all (so no GPS leaks into derivatives). */
export async function encodeJpeg(pixels: Pixels, quality: number): Promise<Buffer> {
  const { encode } = await codecsOnce();
  const image = {
    data: pixels.data,
    width: pixels.width,
    height: pixels.height,
    colorSpace: 'srgb',
  } as ImageData;
  // trellis_loops must stay >= 1: 0 crashes the encoder.
  const out = await encode(image, {
    quality,
    baseline: true,
    progressive: false,
    trellis_loops: 1,
    optimize_coding: true,
  });
  return Buffer.from(out);
}

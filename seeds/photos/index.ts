/**
 * Synthetic trail-camera photos for Maculo's demo, tests and benchmarks: painted by our own code,
 * deterministic for a spec, with EXIF and full ground truth.
 */
import Piscina from 'piscina';
import { makeIndividual, describeIndividual } from './coat';
import { buildExif, insertExif } from './exif';
import { encodeJpeg } from './jpeg';
import { downscale } from './raster';
import { paintScene } from './scene';
import { SPECIES_NAMES } from './species';
import type { PhotoSpec, PhotoTruth } from './types';

export type * from './types';
export type { IndividualDescription } from './coat';
export { makeIndividual, describeIndividual };
export { exifTime, exifTimeOfWallClock } from './exif';
export { randomVariation } from './variation';
export { SPECIES_NAMES };

/** A rendered photo: JPEG bytes and what it shows. */
export interface RenderedPhoto {
  readonly jpeg: Buffer;
  readonly truth: PhotoTruth;
}

const TARGET = { scientific: 'Panthera pardus', common: 'leopard' };

function checkSpec(spec: PhotoSpec): void {
  const ok = (n: number, lo: number, hi: number) => Number.isInteger(n) && n >= lo && n <= hi;
  if (!ok(spec.width, 64, 12000) || !ok(spec.height, 64, 12000)) {
    throw new Error(
      `photo size must be whole pixels in 64–12000, got ${spec.width}×${spec.height}`,
    );
  }
  if (spec.quality !== undefined && !ok(spec.quality, 1, 100)) {
    throw new Error(`JPEG quality must be an integer 1–100, got ${spec.quality}`);
  }
  if (!Number.isFinite(spec.seed)) throw new Error('seed must be a finite number');
}

function observationType(spec: PhotoSpec): PhotoTruth['observationType'] {
  const k = spec.subject.kind;
  if (k === 'target' || k === 'animal') return 'animal';
  if (k === 'setup') return 'unclassified';
  return k;
}

/** Renders one photo. The same spec always gives the same bytes. */
export async function renderPhoto(spec: PhotoSpec): Promise<RenderedPhoto> {
  checkSpec(spec);
  const scene = paintScene(spec);
  const quality = spec.quality ?? 85;
  let jpeg = await encodeJpeg(scene.img, quality);
  if (spec.exif) {
    let thumb: Buffer | undefined;
    if (spec.exif.thumbnail !== false) {
      const tw = 160;
      const th = Math.max(1, Math.round((tw * spec.height) / spec.width));
      thumb = await encodeJpeg(downscale(scene.img, tw, th), 75);
    }
    jpeg = insertExif(jpeg, buildExif(spec.exif, spec.width, spec.height, thumb));
  }
  const s = spec.subject;
  const names =
    s.kind === 'target' ? TARGET : s.kind === 'animal' ? SPECIES_NAMES[s.species] : null;
  const truth: PhotoTruth = {
    kind: s.kind,
    observationType: observationType(spec),
    species: names?.scientific ?? null,
    commonName: names?.common ?? null,
    individualId: scene.individual?.id ?? null,
    flank: s.kind === 'target' ? s.flank : null,
    headDirection: scene.headDirection,
    bbox: scene.bbox,
    occludedFraction: scene.occludedFraction,
    bodyToImage: scene.bodyToImage ? Array.from(scene.bodyToImage) : null,
    lighting: spec.lighting,
    variation: scene.variation,
    width: spec.width,
    height: spec.height,
    seed: spec.seed,
    station: String(spec.station),
    camera: spec.camera,
    exif: spec.exif ?? null,
    bandHeight: scene.bandHeight,
  };
  return { jpeg, truth };
}

/** Options for rendering many photos. */
export interface RenderSetOptions {
  /** Worker threads; 1 (the default) renders in this thread. */
  readonly concurrency?: number;
  /** Called as each photo is ready (in completion order). */
  readonly onPhoto?: (index: number, photo: RenderedPhoto) => void | Promise<void>;
}

function isRendered(value: unknown): value is { jpeg: Uint8Array; truth: PhotoTruth } {
  return (
    typeof value === 'object' &&
    value !== null &&
    'jpeg' in value &&
    value.jpeg instanceof Uint8Array
  );
}

/** Renders many specs, in worker threads when concurrency > 1; results keep the specs' order. */
export async function renderSet(
  specs: readonly PhotoSpec[],
  options: RenderSetOptions = {},
): Promise<RenderedPhoto[]> {
  const threads = Math.max(1, Math.floor(options.concurrency ?? 1));
  const out: RenderedPhoto[] = new Array<RenderedPhoto>(specs.length);
  if (threads === 1) {
    for (let i = 0; i < specs.length; i++) {
      out[i] = await renderPhoto(specs[i]);
      await options.onPhoto?.(i, out[i]);
    }
    return out;
  }
  const pool = new Piscina({
    filename: new URL('./render-worker.mjs', import.meta.url).href,
    minThreads: threads,
    maxThreads: threads,
  });
  try {
    await Promise.all(
      specs.map(async (spec, i) => {
        const result: unknown = await pool.run(spec);
        if (!isRendered(result)) throw new Error(`worker returned no photo for spec ${i}`);
        // Buffers arrive as plain Uint8Arrays after the thread hop.
        const jpeg = Buffer.from(
          result.jpeg.buffer,
          result.jpeg.byteOffset,
          result.jpeg.byteLength,
        );
        out[i] = { jpeg, truth: result.truth };
        await options.onPhoto?.(i, out[i]);
      }),
    );
  } finally {
    await pool.destroy();
  }
  return out;
}

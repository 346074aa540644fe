/**
 * The pattern engine's worker-thread tasks. Every OpenCV call happens here: OpenCV 4.12 installs
 * process-wide crash handlers and can be left corrupt by a C++ exception, so no error escapes a
 * task, and a thread that saw a C++ exception answers and then exits (piscina starts a fresh one).
 */
import { imageSize } from 'image-size';
import { decodeJpeg } from '../images/codec';
import { extractFeaturesWith } from './features';
import { type Cv, OpenCvError, cvError, loadOpenCv, wasmHeapTop } from './opencv';
import { type ShortlistedReference, rankShortlistWith } from './rank';
import type { CropBox, FeatureSet, RankedCandidate, RgbaPixels } from './types';

/** Largest photo the worker decodes (megapixels): camera traps rarely exceed 20. */
export const MAX_MEGAPIXELS = 50;

/** Extract features from JPEG bytes or RGBA pixels. */
export interface ExtractTask {
  readonly image: Uint8Array | RgbaPixels;
  readonly crop: CropBox | null;
  readonly mirror: boolean;
}

/** Rank a shortlist (pre-verification and verification). */
export interface RankTask {
  readonly query: FeatureSet;
  readonly shortlisted: readonly ShortlistedReference[];
}

/** What went wrong, for the caller: bad input, OpenCV itself, or anything else. */
export type FailureKind = 'input' | 'opencv' | 'internal';

/** A task's answer: never a thrown error, which OpenCV's handlers could turn into an abort. */
export type Outcome<T> =
  | { readonly ok: true; readonly value: T }
  | { readonly ok: false; readonly kind: FailureKind; readonly message: string };

async function pixelsOf(image: Uint8Array | RgbaPixels): Promise<RgbaPixels> {
  if (!(image instanceof Uint8Array)) return image;
  if (image.length < 4 || image[0] !== 0xff || image[1] !== 0xd8) {
    throw new RangeError('the pattern engine reads JPEG photos only');
  }
  const bytes = Buffer.from(image.buffer, image.byteOffset, image.byteLength);
  const size = imageSize(bytes);
  if ((size.width ?? 0) * (size.height ?? 0) > MAX_MEGAPIXELS * 1e6) {
    throw new RangeError(`photo larger than ${MAX_MEGAPIXELS} megapixels`);
  }
  return decodeJpeg(bytes);
}

let cvModule: Cv | null = null;
let retiring = false;

async function run<T>(work: (cv: Cv) => Promise<T> | T): Promise<Outcome<T>> {
  if (retiring) {
    // Never touch a possibly corrupt instance again: the pool retries this task elsewhere.
    process.exit(0);
  }
  try {
    cvModule ??= await loadOpenCv();
    return { ok: true, value: await work(cvModule) };
  } catch (raw) {
    const err = cvModule
      ? cvError(cvModule, raw)
      : raw instanceof Error
        ? raw
        : new Error(String(raw));
    if (err instanceof OpenCvError) {
      // The WebAssembly instance may be corrupt: answer, then let piscina replace this thread.
      retiring = true;
      setTimeout(() => process.exit(0), 20);
      return { ok: false, kind: 'opencv', message: err.message };
    }
    const kind: FailureKind = err instanceof RangeError ? 'input' : 'internal';
    return { ok: false, kind, message: err.message };
  }
}

/** Features of a photo's crop. */
export function extract(task: ExtractTask): Promise<Outcome<FeatureSet>> {
  return run(async (cv) => {
    const pixels = await pixelsOf(task.image);
    return extractFeaturesWith(cv, pixels, task.crop ?? undefined, { mirror: task.mirror });
  });
}

/** The ranking of a shortlist. */
export function rank(task: RankTask): Promise<Outcome<RankedCandidate[]>> {
  return run((cv) => rankShortlistWith(cv, task.query, task.shortlisted));
}

/** Bytes of OpenCV's heap in use up to its top (flat across calls unless something leaks). */
export function heap(): Promise<Outcome<number>> {
  return run((cv) => wasmHeapTop(cv));
}

/** Provokes an OpenCV C++ exception (tests of the recovery path only). */
export function fault(): Promise<Outcome<never>> {
  return run((cv) => {
    const rgba = new cv.Mat(4, 4, cv.CV_8UC1);
    const grey = new cv.Mat();
    try {
      cv.cvtColor(rgba, grey, cv.COLOR_RGBA2GRAY);
    } finally {
      rgba.delete();
      grey.delete();
    }
    throw new Error('expected OpenCV to refuse a one-channel image');
  });
}

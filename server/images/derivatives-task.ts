import { readFile } from 'node:fs/promises';
import { decodeJpeg, encodeJpeg } from './codec';
import { downscale, fitWithin } from './resize';
import { PhotoStorage } from './storage';

/** One derivatives job for the worker pool. */
export interface DerivativesTask {
  root: string;
  storedPath: string;
  sha256: string;
}

/** What the worker reports back. */
export interface DerivativesResult {
  width: number;
  height: number;
  ms: number;
}

export const PREVIEW_MAX = 1600;
export const THUMB_MAX = 320;

/**
 * Decodes an original once and writes a 1600 px preview and a 320 px thumbnail. Re-encoding from
 * pixels writes no metadata, so GPS and camera details never reach the derivatives. Idempotent:
 * running it twice writes the same files.
 */
export default async function makeDerivatives(task: DerivativesTask): Promise<DerivativesResult> {
  const started = performance.now();
  const storage = new PhotoStorage(task.root);
  const pixels = await decodeJpeg(await readFile(storage.absolute(task.storedPath)));
  const previewSize = fitWithin(pixels.width, pixels.height, PREVIEW_MAX);
  const preview = downscale(pixels, previewSize.width, previewSize.height);
  const thumbSize = fitWithin(preview.width, preview.height, THUMB_MAX);
  const thumb = downscale(preview, thumbSize.width, thumbSize.height);
  await storage.writeAtomic(
    storage.derivedPath(task.sha256, 'preview'),
    await encodeJpeg(preview, 80),
  );
  await storage.writeAtomic(storage.derivedPath(task.sha256, 'thumb'), await encodeJpeg(thumb, 75));
  return { width: pixels.width, height: pixels.height, ms: performance.now() - started };
}

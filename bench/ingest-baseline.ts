/**
 * Image pipelines timed over the same files on the same number of threads: stock Jimp with its
 * default codec (the baseline), and the server's own derivative job (mozjpeg WASM + area-average
 * downscale) run through the server's worker pool without HTTP, to separate codec speed from the
 * cost of receiving, checking and recording uploads.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, relative } from 'node:path';
import { Piscina } from 'piscina';
import { decodeJpeg, encodeJpeg } from '../server/images/codec';
import { PREVIEW_MAX, THUMB_MAX } from '../server/images/derivatives-task';
import { createImagePool } from '../server/images/pool';
import { downscale, fitWithin } from '../server/images/resize';

/** Throughput of one pipeline over a set of files. */
export interface PipelineTiming {
  photos: number;
  threads: number;
  seconds: number;
  photosPerSecond: number;
  /** Median time of one photo inside a worker. */
  medianMsPerPhoto: number;
}

function median(values: number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const mid = Math.floor(s.length / 2);
  return s.length % 2 ? s[mid]! : (s[mid - 1]! + s[mid]!) / 2;
}

/** `count` files spread evenly over the list (all of them when count ≥ the list). */
export function spreadSample(paths: string[], count: number): string[] {
  if (count >= paths.length) return [...paths];
  return Array.from({ length: count }, (_, i) => paths[Math.floor((i * paths.length) / count)]!);
}

async function timeAll(
  paths: string[],
  threads: number,
  run: (path: string, i: number) => Promise<number>,
): Promise<PipelineTiming> {
  // One warm-up task per thread (module loading, WASM compilation) stays out of the timing.
  await Promise.all(Array.from({ length: threads }, (_, i) => run(paths[0]!, -1 - i)));
  const perPhoto: number[] = [];
  const started = performance.now();
  await Promise.all(paths.map(async (p, i) => perPhoto.push(await run(p, i))));
  const seconds = (performance.now() - started) / 1000;
  return {
    photos: paths.length,
    threads,
    seconds,
    photosPerSecond: paths.length / seconds,
    medianMsPerPhoto: median(perPhoto),
  };
}

function msOf(result: unknown): number {
  const ms = typeof result === 'object' && result !== null ? Reflect.get(result, 'ms') : null;
  if (typeof ms !== 'number') throw new Error('a pipeline task returned no timing');
  return ms;
}

/** Stock Jimp 1.6 (jpeg-js): fromBuffer, resize to 1600, encode, resize to 320, encode. */
export async function timeStockJimp(paths: string[], threads: number): Promise<PipelineTiming> {
  const pool = new Piscina({
    filename: new URL('./jimp-baseline-worker.mjs', import.meta.url).href,
    minThreads: threads,
    maxThreads: threads,
  });
  try {
    return await timeAll(paths, threads, async (path) => msOf(await pool.run({ path })));
  } finally {
    await pool.destroy();
  }
}

/** The server's derivative job through its own worker pool, writing into a throwaway folder. */
export async function timeServerPipeline(
  paths: string[],
  threads: number,
): Promise<PipelineTiming> {
  const root = mkdtempSync(join(tmpdir(), 'maculo-bench-pipeline-'));
  const pool = createImagePool(threads);
  try {
    return await timeAll(paths, threads, async (path, i) => {
      const sha256 = (i < 0 ? `f${-i}` : String(i)).padStart(64, '0');
      const result = await pool.makeDerivatives({
        root,
        storedPath: relative(root, path),
        sha256,
      });
      return result.ms;
    });
  } finally {
    await pool.close();
    rmSync(root, { recursive: true, force: true });
  }
}

/** Median milliseconds of each step of the server's derivative job, in this thread. */
export interface StageProfile {
  photos: number;
  decode: number;
  resizePreview: number;
  resizeThumb: number;
  encodePreview: number;
  encodeThumb: number;
}

/**
 * Times each step of the server's derivative job on a few files, one thread, after one warm-up
 * photo: where a photo's time goes when the workers are the bottleneck.
 */
export async function profileServerStages(paths: string[]): Promise<StageProfile> {
  const steps: Record<Exclude<keyof StageProfile, 'photos'>, number[]> = {
    decode: [],
    resizePreview: [],
    resizeThumb: [],
    encodePreview: [],
    encodeThumb: [],
  };
  const lap = (() => {
    let last = performance.now();
    return () => {
      const now = performance.now();
      const ms = now - last;
      last = now;
      return ms;
    };
  })();
  for (const [i, path] of [paths[0]!, ...paths].entries()) {
    const bytes = readFileSync(path);
    lap();
    const pixels = await decodeJpeg(bytes);
    const decode = lap();
    const size = fitWithin(pixels.width, pixels.height, PREVIEW_MAX);
    const preview = downscale(pixels, size.width, size.height);
    const resizePreview = lap();
    const thumbSize = fitWithin(preview.width, preview.height, THUMB_MAX);
    const thumb = downscale(preview, thumbSize.width, thumbSize.height);
    const resizeThumb = lap();
    await encodeJpeg(preview, 80);
    const encodePreview = lap();
    await encodeJpeg(thumb, 75);
    const encodeThumb = lap();
    if (i === 0) continue;
    steps.decode.push(decode);
    steps.resizePreview.push(resizePreview);
    steps.resizeThumb.push(resizeThumb);
    steps.encodePreview.push(encodePreview);
    steps.encodeThumb.push(encodeThumb);
  }
  return {
    photos: paths.length,
    decode: median(steps.decode),
    resizePreview: median(steps.resizePreview),
    resizeThumb: median(steps.resizeThumb),
    encodePreview: median(steps.encodePreview),
    encodeThumb: median(steps.encodeThumb),
  };
}

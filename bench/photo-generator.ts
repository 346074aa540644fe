/**
 * Benchmark of the synthetic photo generator (not part of npm test).
 *
 *   npx tsx bench/photo-generator.ts [--count 40] [--sizes 1024x768,3000x2000]
 *
 * For each size: time per photo for a realistic mix (backgrounds already cached, as in a long
 * run), the one-off cost of painting a new camera background, and the JPEG encoders side by side
 * on the same painted frames: our baseline encoder against mozjpeg (WASM) and Jimp's jpeg-js,
 * reported as ratios. Medians of repeated runs, so other load on the machine matters less.
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { cpus, loadavg } from 'node:os';
import { parseArgs } from 'node:util';
import { renderPhoto } from '../seeds/photos/index';
import { encodeJpeg, type JpegEncoder } from '../seeds/photos/jpeg';
import { paintScene } from '../seeds/photos/scene';
import type { PhotoSpec, Subject } from '../seeds/photos/types';

const MIX: Subject[] = [
  { kind: 'blank' },
  { kind: 'blank' },
  { kind: 'target', individual: 'P01', flank: 'right' },
  { kind: 'animal', species: 'bushbuck' },
  { kind: 'blank' },
  { kind: 'target', individual: 'P02', flank: 'left' },
  { kind: 'human' },
  { kind: 'animal', species: 'porcupine' },
  { kind: 'vehicle' },
  { kind: 'blank' },
];

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)];
}

function spec(i: number, width: number, height: number, cameras: number): PhotoSpec {
  return {
    width,
    height,
    seed: i,
    station: `BENCH${i % cameras}`,
    camera: 'A',
    lighting: i % 3 === 2 ? 'infrared' : 'day',
    subject: MIX[i % MIX.length],
    variation: { position: ((i * 7) % 10) / 10 - 0.45, gait: (i * 0.37) % 1 },
    exif: { dateTimeOriginal: '2025:03:14 04:32:10', subSecTimeOriginal: '00', serial: 'BENCH' },
  };
}

async function timePhotos(width: number, height: number, count: number): Promise<number[]> {
  const cameras = 4;
  for (let i = 0; i < cameras * 3; i++) await renderPhoto(spec(i, width, height, cameras)); // warm caches
  const times: number[] = [];
  for (let i = 0; i < count; i++) {
    const t = performance.now();
    await renderPhoto(spec(i, width, height, cameras));
    times.push(performance.now() - t);
  }
  return times;
}

async function timeNewBackgrounds(width: number, height: number, n: number): Promise<number[]> {
  const times: number[] = [];
  for (let i = 0; i < n; i++) {
    const s = {
      ...spec(0, width, height, 1),
      station: `BENCH-NEW-${width}-${i}`,
      subject: { kind: 'blank' as const },
    };
    const t = performance.now();
    paintScene(s);
    const first = performance.now() - t;
    const t2 = performance.now();
    paintScene(s);
    times.push(first - (performance.now() - t2));
  }
  return times;
}

async function timeEncoders(width: number, height: number, n: number) {
  const frames = Array.from({ length: n }, (_, i) => paintScene(spec(i, width, height, 4)).img);
  const result: Record<JpegEncoder, number> = { baseline: 0, mozjpeg: 0, jimp: 0 };
  for (const which of ['baseline', 'mozjpeg', 'jimp'] as const) {
    await encodeJpeg(frames[0], 85, which); // initialise
    const times: number[] = [];
    for (const f of frames) {
      const t = performance.now();
      await encodeJpeg(f, 85, which);
      times.push(performance.now() - t);
    }
    result[which] = median(times);
  }
  return result;
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: { count: { type: 'string' }, sizes: { type: 'string' } },
  });
  const count = Number(values.count ?? 40);
  const sizes = (values.sizes ?? '1024x768,3000x2000')
    .split(',')
    .map((s) => s.split('x').map(Number));
  const report: unknown[] = [];
  for (const [width, height] of sizes) {
    const n = width * height > 3e6 ? Math.max(6, Math.round(count / 4)) : count;
    const photos = await timePhotos(width, height, n);
    const backgrounds = await timeNewBackgrounds(width, height, 3);
    const enc = await timeEncoders(width, height, Math.min(n, 6));
    const row = {
      size: `${width}x${height}`,
      // Other work on the machine inflates the absolute times (not the encoder ratios as much).
      loadAverage1m: +loadavg()[0].toFixed(2),
      cores: cpus().length,
      photos: n,
      msPerPhotoMedian: +median(photos).toFixed(1),
      msPerPhotoMean: +(photos.reduce((s, v) => s + v, 0) / n).toFixed(1),
      msNewCameraBackground: +median(backgrounds).toFixed(1),
      encodeMs: {
        baseline: +enc.baseline.toFixed(1),
        mozjpeg: +enc.mozjpeg.toFixed(1),
        jimp: +enc.jimp.toFixed(1),
      },
      encodeSpeedup: {
        vsMozjpeg: +(enc.mozjpeg / enc.baseline).toFixed(2),
        vsJimp: +(enc.jimp / enc.baseline).toFixed(2),
      },
    };
    report.push(row);
    process.stdout.write(`${JSON.stringify(row)}\n`);
  }
  await mkdir('bench/.out', { recursive: true });
  await writeFile('bench/.out/photo-generator.json', JSON.stringify(report, null, 2));
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof Error ? (err.stack ?? err.message) : String(err)}\n`);
  process.exitCode = 1;
});

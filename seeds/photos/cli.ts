/**
 * Writes a synthetic demo season as JPEGs plus truth.json.
 *
 *   npx tsx seeds/photos/cli.ts --out dir --count N --width W --height H
 *     [--seed S] [--quality Q] [--concurrency C]
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { demoPhotos } from './demo-set';
import { renderSet } from './index';

function intOption(values: Record<string, unknown>, name: string, fallback: number): number {
  const raw = values[name];
  if (raw === undefined) return fallback;
  const n = Number(raw);
  if (!Number.isInteger(n) || n < 0)
    throw new Error(`--${name} must be a whole number, got "${String(raw)}"`);
  return n;
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      out: { type: 'string' },
      count: { type: 'string' },
      width: { type: 'string' },
      height: { type: 'string' },
      seed: { type: 'string' },
      quality: { type: 'string' },
      concurrency: { type: 'string' },
    },
  });
  if (!values.out) throw new Error('--out <dir> is required');
  const count = intOption(values, 'count', 50);
  const width = intOption(values, 'width', 1024);
  const height = intOption(values, 'height', 768);
  const plan = demoPhotos({
    count,
    width,
    height,
    seed: intOption(values, 'seed', 2025),
    quality: intOption(values, 'quality', 85),
  });
  const out = values.out;
  const started = performance.now();
  const truth: unknown[] = [];
  const chunk = 64;
  for (let first = 0; first < plan.length; first += chunk) {
    const part = plan.slice(first, first + chunk);
    await renderSet(
      part.map((p) => p.spec),
      {
        concurrency: intOption(values, 'concurrency', 1),
        onPhoto: async (i, photo) => {
          const path = join(out, part[i].file);
          await mkdir(dirname(path), { recursive: true });
          await writeFile(path, photo.jpeg);
          truth[first + i] = {
            file: part[i].file,
            trueLocalTime: part[i].trueLocalTime,
            truth: photo.truth,
          };
        },
      },
    );
    process.stdout.write(`\r${Math.min(plan.length, first + chunk)}/${plan.length} photos`);
  }
  await writeFile(join(out, 'truth.json'), JSON.stringify(truth, null, 1));
  const ms = performance.now() - started;
  process.stdout.write(`\nwrote ${plan.length} photos to ${out} in ${(ms / 1000).toFixed(1)} s\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`${err instanceof Error ? err.message : String(err)}\n`);
  process.exitCode = 1;
});

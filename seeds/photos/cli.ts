/**
 * Writes the synthetic demo season (or a busier one) as JPEGs per camera plus truth.json.
 *
 *   npx tsx seeds/photos/cli.ts --out dir [--width 1024] [--height 768] [--density 1]
 *     [--seed 2026] [--quality 82] [--concurrency 2]
 */
import { mkdir, writeFile } from 'node:fs/promises';
import { dirname, join } from 'node:path';
import { parseArgs } from 'node:util';
import { demoSeason } from '../demo-season';
import { renderSet } from './index';

function numberOption(values: Record<string, unknown>, name: string, fallback: number): number {
  const raw = values[name];
  if (raw === undefined) return fallback;
  const n = Number(raw);
  if (!Number.isFinite(n) || n <= 0)
    throw new Error(`--${name} must be a positive number, got "${String(raw)}"`);
  return n;
}

async function main(): Promise<void> {
  const { values } = parseArgs({
    options: {
      out: { type: 'string' },
      width: { type: 'string' },
      height: { type: 'string' },
      density: { type: 'string' },
      seed: { type: 'string' },
      quality: { type: 'string' },
      concurrency: { type: 'string' },
    },
  });
  if (!values.out) throw new Error('--out <dir> is required');
  const plan = demoSeason({
    width: numberOption(values, 'width', 1024),
    height: numberOption(values, 'height', 768),
    density: numberOption(values, 'density', 1),
    seed: numberOption(values, 'seed', 2026),
    quality: numberOption(values, 'quality', 82),
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
        concurrency: numberOption(values, 'concurrency', 2),
        onPhoto: async (i, photo) => {
          const p = part[i]!;
          const file = `${p.stationCode}-${p.cameraLabel}/${p.file}`;
          const path = join(out, file);
          await mkdir(dirname(path), { recursive: true });
          await writeFile(path, photo.jpeg);
          truth[first + i] = { file, trueTime: p.trueTime, truth: photo.truth };
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

/**
 * Ingest benchmark: a synthetic card of 3000×2000 trail-camera JPEGs goes through the real HTTP
 * upload endpoint of a real server process (2 image workers), measured side by side in one run with
 * stock Jimp doing the same image work on the same number of threads.
 *
 *   npx tsx bench/ingest.ts [--count 200] [--card] [--baseline 24|all] [--batch 25]
 *
 * (a) time until every photo is sortable, per photo; (b) time until every preview and thumbnail is
 * made, as photos/s; (c) the stock-Jimp baseline in photos/s and the ratio (b)/(c); (d) the server
 * process's peak RSS (its worker threads included). `--card` sends a 2,000-photo card.
 */
import { execFileSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { createDeployment } from '../server/services/deployments.service';
import { createStation } from '../server/services/stations.service';
import { ApiSession } from './api-session';
import { BENCH_PASSWORD, createBenchProject, createMembers, openBenchDb } from './fixtures';
import { CARD_HEIGHT, CARD_SITE, CARD_WIDTH, ensureCard } from './ingest-card';
import {
  profileServerStages,
  spreadSample,
  timeServerPipeline,
  timeStockJimp,
} from './ingest-baseline';
import { printIngestReport, type IngestResult } from './ingest-report';
import { checkSortable, uploadCard, waitProcessed } from './ingest-upload';
import { LoadMeter, REPO_ROOT, writeResult } from './report';
import { MemorySampler, startServer } from './server-process';

const WORKERS = 2;
const SLUG = 'bench-ingest';

function options() {
  const { values } = parseArgs({
    options: {
      count: { type: 'string' },
      card: { type: 'boolean', default: false },
      baseline: { type: 'string', default: '24' },
      batch: { type: 'string', default: '25' },
    },
  });
  const count = Number(values.count ?? (values.card ? 2000 : 200));
  const batch = Number(values.batch);
  const baseline = values.baseline === 'all' ? Infinity : Number(values.baseline);
  for (const [name, v] of [
    ['count', count],
    ['batch', batch],
    ['baseline', baseline],
  ] as const) {
    if (!(v >= 1)) throw new Error(`--${name} must be a positive number`);
  }
  return { count: Math.floor(count), batch: Math.floor(batch), baseline };
}

/** Project, uploader, reviewer, station and deployment, written before the server starts. */
async function prepareDatabase(dataDir: string) {
  const { db } = await openBenchDb(dataDir);
  try {
    const { project, lead } = await createBenchProject(db, SLUG);
    const [volunteer] = await createMembers(db, project, lead, 'volunteer', 1, 'volunteer');
    const [reviewer] = await createMembers(db, project, lead, 'reviewer', 1, 'reviewer');
    const station = await createStation(
      db,
      project.id,
      {
        code: CARD_SITE.stationCode,
        name: 'Benchmark station',
        lat: CARD_SITE.lat,
        lon: CARD_SITE.lon,
        notes: '',
      },
      lead.id,
    );
    const deployment = await createDeployment(
      db,
      project.id,
      {
        stationId: station.id,
        cameraLabel: 'A',
        cameraSerial: CARD_SITE.serial,
        start: CARD_SITE.start,
        end: CARD_SITE.end,
        timezone: CARD_SITE.timezone,
        clockOffsetSeconds: 0,
        lastWorking: null,
        featureType: null,
        baitUse: false,
        notes: '',
      },
      lead.id,
    );
    return { volunteer: volunteer!, reviewer: reviewer!, deploymentId: deployment.id };
  } finally {
    await db.destroy();
  }
}

function gitCommit(): string {
  try {
    return execFileSync('git', ['rev-parse', '--short', 'HEAD'], { cwd: REPO_ROOT })
      .toString()
      .trim();
  } catch {
    return 'unknown';
  }
}

async function measureServer(paths: string[], batch: number) {
  const dataDir = mkdtempSync(join(tmpdir(), 'maculo-bench-ingest-'));
  try {
    const setup = await prepareDatabase(dataDir);
    const load = new LoadMeter();
    const server = await startServer(dataDir, { WORKERS: String(WORKERS) });
    load.track(server.pid);
    const memory = new MemorySampler(server.pid, 100);
    try {
      const volunteer = await new ApiSession(server.base).signIn(
        setup.volunteer.email,
        BENCH_PASSWORD,
      );
      const reviewer = await new ApiSession(server.base).signIn(
        setup.reviewer.email,
        BENCH_PASSWORD,
      );
      const started = performance.now();
      const upload = await uploadCard(volunteer, SLUG, setup.deploymentId, paths, batch, (done) =>
        process.stdout.write(`\r  uploaded ${done}/${paths.length}  `),
      );
      process.stdout.write('\n');
      const sortable = await checkSortable(reviewer, SLUG, upload.uploadId);
      const processed = await waitProcessed(volunteer, SLUG, upload.uploadId, 250, 3600_000);
      const processedSeconds = (performance.now() - started) / 1000;
      const peaks = memory.stop();
      const machine = load.finish();
      return {
        upload,
        sortable,
        processed,
        processedSeconds,
        peaks,
        timeline: memory.samples,
        machine,
      };
    } finally {
      memory.stop();
      await server.stop();
    }
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}

/** Runs one phase and records what the rest of the machine did meanwhile. */
async function measured<T extends object>(run: () => Promise<T>) {
  const load = new LoadMeter();
  const result = await run();
  return { ...result, machine: load.finish() };
}

async function main(): Promise<void> {
  const opts = options();
  console.log(`Ingest benchmark: ${opts.count} synthetic ${CARD_WIDTH}×${CARD_HEIGHT} JPEGs`);
  const cardStarted = performance.now();
  const card = await ensureCard(opts.count);
  const cardSeconds = (performance.now() - cardStarted) / 1000;
  const meanMb = card.bytes / card.paths.length / 1e6;
  console.log(
    `  card ready in ${cardSeconds.toFixed(1)} s (${card.painted} painted now), ` +
      `${(card.bytes / 1e9).toFixed(2)} GB, mean ${meanMb.toFixed(2)} MB per photo`,
  );

  const server = await measureServer(card.paths, opts.batch);
  const sample = spreadSample(card.paths, opts.baseline);
  console.log(`  baseline: stock Jimp over ${sample.length} of the same files, ${WORKERS} threads`);
  const stockJimp = await measured(() => timeStockJimp(sample, WORKERS));
  const pipeline = await measured(() => timeServerPipeline(sample, WORKERS));
  const stages = await profileServerStages(sample.slice(0, 3));

  const result: IngestResult = {
    benchmark: 'ingest',
    at: new Date().toISOString(),
    commit: gitCommit(),
    photos: card.paths.length,
    photoSize: `${CARD_WIDTH}x${CARD_HEIGHT}`,
    meanMbPerPhoto: meanMb,
    batchSize: opts.batch,
    workers: WORKERS,
    ...server,
    stockJimp,
    pipeline,
    stages,
  };
  writeResult('ingest', printIngestReport(result));
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? (err.stack ?? err.message) : err);
  process.exitCode = 1;
});

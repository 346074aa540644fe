/**
 * Sort queue benchmark: a project of 250,000 photos in 60,000 events (synthetic rows), the real
 * server in a child process, and 20 reviewers each with their own session asking for the next batch
 * of events at once — beside a trivial signed-in endpoint measured in the same run.
 *
 *   npx tsx bench/sort.ts [--photos 250000] [--events 60000] [--stations 20] [--clients 20]
 *                         [--seconds 20] [--sorted 0]
 *
 * The built database is cached under bench/.out/ and copied for each run (a run leases events).
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { openDatabase } from '../server/db/database';
import { ApiSession, arrayField, isRecord, stringField } from './api-session';
import { BENCH_PASSWORD, cachedDatabase } from './fixtures';
import { LoadMeter, writeResult } from './report';
import { startServer } from './server-process';
import { buildSortProject, type SortProject, type SortProjectSize } from './sort-data';
import { diagnoseQueue } from './sort-diagnose';
import { measureScenarios, type Scenario } from './sort-load';
import { printSortReport } from './sort-report';

function options() {
  const { values } = parseArgs({
    options: {
      photos: { type: 'string', default: '250000' },
      events: { type: 'string', default: '60000' },
      stations: { type: 'string', default: '20' },
      clients: { type: 'string', default: '20' },
      seconds: { type: 'string', default: '20' },
      sorted: { type: 'string', default: '0' },
    },
  });
  const n = (name: keyof typeof values) => {
    const v = Number(values[name]);
    if (!Number.isFinite(v) || v < 0) throw new Error(`--${name} must be a number ≥ 0`);
    return v;
  };
  const size: SortProjectSize = {
    photos: n('photos'),
    events: n('events'),
    stations: n('stations'),
    reviewers: n('clients'),
    sorted: Math.min(1, n('sorted')),
  };
  if (size.photos < size.events) throw new Error('--photos must be at least --events');
  return { size, seconds: Math.max(2, n('seconds')) };
}

/** The built project, from the cache when the same size was built before. */
function cachedProject(size: SortProjectSize, dataDir: string): Promise<SortProject> {
  const key = `sort-db-${size.photos}p-${size.events}e-${size.stations}s-${size.reviewers}r-${size.sorted}`;
  return cachedDatabase(key, dataDir, (buildDir) => {
    console.log(`  building ${size.photos} photos in ${size.events} events (cached afterwards)…`);
    return buildSortProject(buildDir, size);
  });
}

/** Signs every reviewer in and checks each gets its own full batch of events with thumbnail URLs. */
async function signInReviewers(base: string, project: SortProject) {
  const sessions = await Promise.all(
    project.reviewers.map((r) => new ApiSession(base).signIn(r.email, BENCH_PASSWORD)),
  );
  const seen = new Set<string>();
  let events = 0;
  let photos = 0;
  for (const s of sessions) {
    const { body } = await s.getJson(`/api/projects/${project.slug}/sort/next?limit=10`);
    for (const e of arrayField(body, 'events')) {
      const id = stringField(e, 'id');
      if (seen.has(id)) throw new Error(`event ${id} was leased to two reviewers`);
      seen.add(id);
      events++;
      for (const p of arrayField(e, 'photos')) {
        if (!stringField(p, 'thumbUrl').startsWith('/api/photos/')) throw new Error('no thumbUrl');
        photos++;
      }
    }
  }
  return { sessions, firstBatch: { events, photos, distinct: seen.size } };
}

function leaseCounts(dataDir: string) {
  const { sqlite } = openDatabase(join(dataDir, 'maculo.sqlite'));
  try {
    const row = sqlite
      .prepare(
        `select count(*) as leased, count(distinct lease_holder) as holders
         from events where lease_holder is not null and lease_until > ?`,
      )
      .get(new Date().toISOString());
    return isRecord(row)
      ? { leased: Number(row['leased']), holders: Number(row['holders']) }
      : null;
  } finally {
    sqlite.close();
  }
}

async function main(): Promise<void> {
  const { size, seconds } = options();
  console.log(
    `Sort benchmark: ${size.photos} photos, ${size.events} events, ${size.reviewers} clients`,
  );
  const dataDir = mkdtempSync(join(tmpdir(), 'maculo-bench-sort-'));
  try {
    const project = await cachedProject(size, dataDir);
    console.log('  profiling the queue statements in-process…');
    const diagnosis = await diagnoseQueue(dataDir, project.projectId, project.reviewers[0]!.id);
    const load = new LoadMeter();
    const server = await startServer(dataDir);
    load.track(server.pid);
    try {
      const { sessions, firstBatch } = await signInReviewers(server.base, project);
      const scenarios: Scenario[] = [
        { name: 'trivial: GET /api/auth/me', path: '/api/auth/me' },
        {
          name: 'next: GET sort/next?limit=10',
          path: `/api/projects/${project.slug}/sort/next?limit=10`,
        },
        {
          name: 'next by station: &order=station',
          path: `/api/projects/${project.slug}/sort/next?limit=10&order=station`,
        },
      ];
      const figures = await measureScenarios(
        server.base,
        server.pid,
        scenarios,
        sessions.map((s) => s.sessionCookie),
        seconds,
        2,
        (name, round) => console.log(`  measuring ${name} (slice ${round + 1}/2)`),
      );
      const leases = leaseCounts(dataDir);
      const machine = load.finish();
      writeResult(
        'sort',
        printSortReport({ size, project, figures, diagnosis, firstBatch, leases, machine }),
      );
    } finally {
      await server.stop();
    }
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? (err.stack ?? err.message) : err);
  process.exitCode = 1;
});

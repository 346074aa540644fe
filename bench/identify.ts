/**
 * Identify benchmark: 5,000 catalogued leopards and 250,000 photos (synthetic rows), the real
 * server in a child process, and 20 reviewers each with their own session asking for the next
 * sighting to identify at once — beside a trivial signed-in endpoint measured in the same run; then,
 * in this process, fuse.js catalogue search over 10,000 synthetic individuals.
 *
 *   npx tsx bench/identify.ts [--photos 250000] [--events 60000] [--stations 30] [--clients 20]
 *                             [--individuals 5000] [--detections 3] [--proposed 1000] [--open 3000]
 *                             [--seconds 20] [--search-individuals 10000] [--queries 300]
 *                             [--search-seconds 120] [--cpu-prof]
 *
 * The built database is cached under bench/.out/ and copied for each run (a run leases sightings).
 */
import { mkdirSync, mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parseArgs } from 'node:util';
import { openDatabase } from '../server/db/database';
import { ApiSession, arrayField, isRecord, stringField } from './api-session';
import { BENCH_PASSWORD, cachedDatabase } from './fixtures';
import { buildIdentifyProject, type IdentifyProject, type IdentifySize } from './identify-data';
import { diagnoseIdentify } from './identify-diagnose';
import { printIdentifyReport, type FirstCalls } from './identify-report';
import { measureSearch } from './identify-search';
import { LoadMeter, OUT_DIR, writeResult } from './report';
import { startServer } from './server-process';
import { measureScenarios } from './sort-load';

function options() {
  const { values } = parseArgs({
    options: {
      photos: { type: 'string', default: '250000' },
      events: { type: 'string', default: '60000' },
      stations: { type: 'string', default: '30' },
      clients: { type: 'string', default: '20' },
      individuals: { type: 'string', default: '5000' },
      detections: { type: 'string', default: '3' },
      proposed: { type: 'string', default: '1000' },
      open: { type: 'string', default: '3000' },
      seconds: { type: 'string', default: '20' },
      'search-individuals': { type: 'string', default: '10000' },
      queries: { type: 'string', default: '300' },
      'search-seconds': { type: 'string', default: '120' },
      'cpu-prof': { type: 'boolean', default: false },
    },
  });
  const n = (name: Exclude<keyof typeof values, 'cpu-prof'>) => {
    const v = Number(values[name]);
    if (!Number.isFinite(v) || v < 0) throw new Error(`--${name} must be a number ≥ 0`);
    return v;
  };
  const size: IdentifySize = {
    photos: n('photos'),
    events: n('events'),
    stations: n('stations'),
    reviewers: Math.max(2, n('clients')),
    sorted: 1,
    individuals: Math.max(1, n('individuals')),
    detections: Math.max(1, n('detections')),
    proposed: n('proposed'),
    open: n('open'),
  };
  if (size.photos < size.events) throw new Error('--photos must be at least --events');
  if (size.proposed + size.open < size.reviewers)
    throw new Error('--proposed plus --open must give every client a sighting');
  return {
    size,
    seconds: Math.max(2, n('seconds')),
    search: {
      individuals: Math.max(1, n('search-individuals')),
      queries: Math.max(1, n('queries')),
      seconds: n('search-seconds'),
    },
    cpuProf: values['cpu-prof'],
  };
}

/** The built project, from the cache when the same size was built before. */
function cachedProject(size: IdentifySize, dataDir: string): Promise<IdentifyProject> {
  const key =
    `identify-db-${size.photos}p-${size.events}e-${size.stations}s-${size.reviewers}r-` +
    `${size.individuals}i-${size.detections}d-${size.proposed}pr-${size.open}o`;
  return cachedDatabase(key, dataDir, (buildDir) => {
    console.log(
      `  building ${size.photos} photos, ${size.individuals} individuals and their sightings (cached afterwards)…`,
    );
    return buildIdentifyProject(buildDir, size);
  });
}

/** Reviewers whose leased sighting they had already called (the blind review forbids it). */
function ownCallsOffered(dataDir: string): number {
  const { sqlite } = openDatabase(join(dataDir, 'maculo.sqlite'));
  try {
    const row = sqlite
      .prepare(
        `select count(*) as n from sightings s
         join calls c on c.sighting_id = s.id and c.reviewer_id = s.lease_holder`,
      )
      .get();
    return isRecord(row) ? Number(row['n']) : NaN;
  } finally {
    sqlite.close();
  }
}

/** Signs every reviewer in and checks each is offered a sighting of its own, with candidates. */
async function signInReviewers(base: string, project: IdentifyProject, dataDir: string) {
  const sessions = await Promise.all(
    project.reviewers.map((r) => new ApiSession(base).signIn(r.email, BENCH_PASSWORD)),
  );
  const seen = new Set<string>();
  const firstCalls: FirstCalls = {
    distinctSightings: 0,
    secondReviews: 0,
    candidatesPerAnswer: [],
    ownCallsOffered: 0,
  };
  for (const s of sessions) {
    const { body } = await s.getJson(`/api/projects/${project.slug}/identify/next`);
    const sighting = isRecord(body) ? body['sighting'] : undefined;
    seen.add(stringField(sighting, 'id'));
    if (isRecord(sighting) && sighting['round'] === 2) firstCalls.secondReviews++;
    firstCalls.candidatesPerAnswer.push(arrayField(body, 'candidates').length);
  }
  firstCalls.distinctSightings = seen.size;
  firstCalls.ownCallsOffered = ownCallsOffered(dataDir);
  if (seen.size !== sessions.length) throw new Error('two reviewers were given the same sighting');
  return { sessions, firstCalls };
}

async function main(): Promise<void> {
  const { size, seconds, search, cpuProf } = options();
  console.log(
    `Identify benchmark: ${size.photos} photos, ${size.individuals} individuals, ${size.reviewers} clients`,
  );
  const dataDir = mkdtempSync(join(tmpdir(), 'maculo-bench-identify-'));
  try {
    const project = await cachedProject(size, dataDir);
    // The rows stand for photos whose files are not here (as after importing a package without
    // media): without this the server would queue coat-pattern work for 35,000 missing files at
    // start and fail it in the background during the run. bench:pattern measures that signal.
    const { sqlite: plain } = openDatabase(join(dataDir, 'maculo.sqlite'));
    plain.exec("update photos set stored_path = '', status = 'external'");
    plain.close();
    console.log('  profiling the endpoint in-process…');
    const diagnosis = await diagnoseIdentify(dataDir, project.projectId, project.reviewers[0]!.id);
    const profDir = join(OUT_DIR, 'identify-profile');
    if (cpuProf) mkdirSync(profDir, { recursive: true });
    const httpLoad = new LoadMeter();
    const server = await startServer(
      dataDir,
      {},
      cpuProf ? ['--cpu-prof', `--cpu-prof-dir=${profDir}`] : [],
    );
    httpLoad.track(server.pid);
    let figures;
    let firstCalls;
    let httpMachine;
    try {
      const signedIn = await signInReviewers(server.base, project, dataDir);
      firstCalls = signedIn.firstCalls;
      figures = await measureScenarios(
        server.base,
        server.pid,
        [
          { name: 'trivial: GET /api/auth/me', path: '/api/auth/me' },
          { name: 'next: GET identify/next', path: `/api/projects/${project.slug}/identify/next` },
        ],
        signedIn.sessions.map((s) => s.sessionCookie),
        seconds,
        2,
        (name, round) => console.log(`  measuring ${name} (slice ${round + 1}/2)`),
      );
      httpMachine = httpLoad.finish();
    } finally {
      await server.stop();
    }
    if (cpuProf) console.log(`  server CPU profile written to ${profDir}`);
    console.log(`  timing catalogue search over ${search.individuals} individuals…`);
    const searchLoad = new LoadMeter();
    const searchFigures = measureSearch(search.individuals, search.queries, search.seconds);
    const searchMachine = searchLoad.finish();
    writeResult(
      'identify',
      printIdentifyReport({
        size,
        project,
        figures,
        firstCalls,
        diagnosis,
        httpMachine,
        search: searchFigures,
        searchMachine,
      }),
    );
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}

main().catch((err: unknown) => {
  console.error(err instanceof Error ? (err.stack ?? err.message) : err);
  process.exitCode = 1;
});

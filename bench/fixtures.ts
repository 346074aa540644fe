/**
 * The project, accounts and stations a benchmark starts from, written straight into a freshly
 * migrated database through the app's own services (before the server is started on it).
 */
import {
  copyFileSync,
  existsSync,
  mkdirSync,
  mkdtempSync,
  readFileSync,
  renameSync,
  rmSync,
  writeFileSync,
} from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { openDatabase, type Db } from '../server/db/database';
import { migrateToLatest } from '../server/db/migrate';
import type { ProjectsTable } from '../server/db/schema/projects.table';
import { setMemberRole } from '../server/services/members.service';
import { createProject } from '../server/services/projects.service';
import { createUser } from '../server/services/users.service';
import type { ProjectRole } from '../shared/roles';
import { OUT_DIR } from './report';

/** Password of every benchmark account (local throwaway databases only). */
export const BENCH_PASSWORD = 'benchmark-password-2026';

/** An account created for a benchmark. */
export interface BenchUser {
  id: string;
  email: string;
}

/** Opens and migrates the benchmark database in `dataDir`. */
export async function openBenchDb(dataDir: string) {
  const handle = openDatabase(join(dataDir, 'maculo.sqlite'));
  await migrateToLatest(handle.db);
  return handle;
}

/** A project run by a lead ecologist (who is also the actor of every set-up change). */
export async function createBenchProject(
  db: Db,
  slug: string,
): Promise<{ project: ProjectsTable; lead: BenchUser }> {
  const lead = await createUser(
    db,
    { email: `lead@${slug}.test`, name: 'Bench lead', password: BENCH_PASSWORD },
    null,
  );
  const project = await createProject(
    db,
    {
      slug,
      name: `Benchmark ${slug}`,
      description: 'synthetic benchmark project',
      targetSpeciesScientific: 'Panthera pardus',
      targetSpeciesCommon: 'Leopard',
      timezone: 'Africa/Nairobi',
      independenceMinutes: 30,
      occasionHours: 24,
      reviewersPerSighting: 2,
      sensitivity: 'high',
      sensitivityReviewDate: null,
      codePrefix: 'BN',
      boundary: null,
      tileUrl: null,
      gpsToleranceM: 250,
      humanRetentionDays: null,
    },
    lead.id,
  );
  await setMemberRole(db, project.id, lead.id, 'ecologist', lead.id);
  return { project, lead: { id: lead.id, email: lead.email } };
}

/** Accounts `<prefix>NN@<slug>.test` with a role in the project. */
export async function createMembers(
  db: Db,
  project: ProjectsTable,
  actor: BenchUser,
  prefix: string,
  count: number,
  role: ProjectRole,
): Promise<BenchUser[]> {
  const users: BenchUser[] = [];
  for (let i = 1; i <= count; i++) {
    const u = await createUser(
      db,
      {
        email: `${prefix}${String(i).padStart(2, '0')}@${project.slug}.test`,
        name: `Bench ${prefix} ${i}`,
        password: BENCH_PASSWORD,
      },
      actor.id,
    );
    await setMemberRole(db, project.id, u.id, role, actor.id);
    users.push({ id: u.id, email: u.email });
  }
  return users;
}

/**
 * A benchmark database built once and cached as bench/.out/<key>.sqlite (with what `build` returned
 * in <key>.json), then copied into `dataDir` as maculo.sqlite for each run (a run writes to it).
 * `build` gets an empty folder of its own and must leave its database there as maculo.sqlite.
 */
export async function cachedDatabase<T>(
  key: string,
  dataDir: string,
  build: (buildDir: string) => Promise<T>,
): Promise<T> {
  const cacheDb = join(OUT_DIR, `${key}.sqlite`);
  const cacheMeta = join(OUT_DIR, `${key}.json`);
  if (!existsSync(cacheDb) || !existsSync(cacheMeta)) {
    const buildDir = mkdtempSync(join(tmpdir(), `maculo-bench-build-`));
    try {
      const built = await build(buildDir);
      mkdirSync(OUT_DIR, { recursive: true });
      copyFileSync(join(buildDir, 'maculo.sqlite'), `${cacheDb}.part`);
      renameSync(`${cacheDb}.part`, cacheDb);
      writeFileSync(cacheMeta, JSON.stringify(built));
    } finally {
      rmSync(buildDir, { recursive: true, force: true });
    }
  }
  copyFileSync(cacheDb, join(dataDir, 'maculo.sqlite'));
  // A cache built before a newer migration is brought up to date, as the server would at start.
  const { db } = openDatabase(join(dataDir, 'maculo.sqlite'));
  try {
    await migrateToLatest(db);
  } finally {
    await db.destroy();
  }
  return JSON.parse(readFileSync(cacheMeta, 'utf8')) as T;
}

import type { Logger } from 'pino';
import type { Db } from '../server/db/database';
import type { IngestRuntime } from '../server/ingest-runtime';
import { createProject } from '../server/services/projects.service';
import { setProjectSpecies } from '../server/services/species.service';
import { seedDemoPhotos } from './demo-photos';
import { seedDemoIdentities, seedDemoReferences } from './demo-identities';
import { seedDemoSorting } from './demo-sorting';
import { SPECIES_NAMES } from './photos/species';
import { setMemberRole } from '../server/services/members.service';
import { createUser } from '../server/services/users.service';
import {
  DEMO_PASSWORD,
  DEMO_PROJECT,
  DEMO_USERS,
  demoBoundary,
  demoDeployments,
  demoStations,
} from './scenario';
import { newId, nowIso } from '../server/services/ids';

/** Options for seeding: the ingest runtime stores the demo photos; painted photos are cached. */
export interface SeedOptions {
  log?: Logger;
  ingest: IngestRuntime;
  cacheDir: string;
  /** Skip painting and ingesting photos (accounts, project and grid only). */
  withoutPhotos?: boolean;
}

/**
 * Seeds the fictional demo project into an empty database (no users yet). Returns false and changes
 * nothing when the database already has accounts.
 */
export async function seedDemo(db: Db, options: SeedOptions): Promise<boolean> {
  const anyUser = await db.selectFrom('users').select('id').limit(1).executeTakeFirst();
  if (anyUser) return false;

  const ids = new Map<string, string>();
  for (const user of DEMO_USERS) {
    const row = await createUser(
      db,
      { email: user.email, name: user.name, password: DEMO_PASSWORD, isAdmin: user.isAdmin },
      null,
    );
    ids.set(user.email, row.id);
  }
  const adminId = ids.get('admin@demo.test') ?? null;
  if (!adminId) throw new Error('demo admin missing');
  const project = await createProject(db, { ...DEMO_PROJECT, boundary: demoBoundary() }, adminId);
  for (const user of DEMO_USERS) {
    const id = ids.get(user.email);
    if (user.role && id) await setMemberRole(db, project.id, id, user.role, adminId);
  }
  await seedStations(db, project.id, adminId);
  await setProjectSpecies(
    db,
    project,
    Object.values(SPECIES_NAMES).map((s) => ({
      scientific: s.scientific,
      common: s.common[0]!.toUpperCase() + s.common.slice(1),
    })),
    adminId,
  );
  if (options.withoutPhotos) return true;
  const photos = await seedDemoPhotos(db, {
    projectId: project.id,
    uploaderId: ids.get('volunteer@demo.test')!,
    cacheDir: options.cacheDir,
    ingest: options.ingest,
    log: options.log,
  });
  const sorted = await seedDemoSorting(db, {
    projectId: project.id,
    reviewerIds: [ids.get('reviewer@demo.test')!, ids.get('reviewer2@demo.test')!],
    photos,
    sortedShare: 0.65,
  });
  await seedDemoIdentities(db, {
    projectId: project.id,
    firstReviewer: ids.get('reviewer@demo.test')!,
    secondReviewer: ids.get('curator@demo.test')!,
    sorted,
  });
  await seedDemoReferences(db, {
    projectId: project.id,
    curatorId: ids.get('curator@demo.test')!,
    photos,
  });
  return true;
}

/** The demo grid: 20 stations, two cameras each, for the 60-day season. */
async function seedStations(db: Db, projectId: string, actorId: string): Promise<void> {
  const ids = new Map<string, string>();
  await db.transaction().execute(async (trx) => {
    for (const s of demoStations()) {
      const id = newId();
      ids.set(s.code, id);
      await trx
        .insertInto('stations')
        .values({
          id,
          project_id: projectId,
          code: s.code,
          name: s.name,
          lat: s.lat,
          lon: s.lon,
          notes: '',
          created_at: nowIso(),
        })
        .execute();
    }
    for (const d of demoDeployments()) {
      await trx
        .insertInto('deployments')
        .values({
          id: newId(),
          project_id: projectId,
          station_id: ids.get(d.stationCode)!,
          camera_label: d.cameraLabel,
          camera_serial: d.cameraSerial,
          start: d.start,
          end: d.end,
          timezone: DEMO_PROJECT.timezone,
          clock_offset_seconds: 0,
          last_working: d.lastWorking,
          feature_type: d.featureType,
          bait_use: 0,
          notes: d.notes,
          clock_fix: null,
          created_by: actorId,
          created_at: nowIso(),
        })
        .execute();
    }
  });
}

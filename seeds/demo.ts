import type { Logger } from 'pino';
import type { Db } from '../server/db/database';
import { createProject } from '../server/services/projects.service';
import { setMemberRole } from '../server/services/members.service';
import { createUser } from '../server/services/users.service';
import { DEMO_PASSWORD, DEMO_PROJECT, DEMO_USERS } from './scenario';

/** Options for seeding; uploadsDir is where the demo photos will be written. */
export interface SeedOptions {
  log?: Logger;
  uploadsDir: string;
}

/**
 * Seeds the fictional demo project into an empty database (no users yet). Returns false and changes
 * nothing when the database already has accounts.
 */
export async function seedDemo(db: Db, _options: SeedOptions): Promise<boolean> {
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
  const project = await createProject(db, { ...DEMO_PROJECT }, adminId);
  for (const user of DEMO_USERS) {
    const id = ids.get(user.email);
    if (user.role && id) await setMemberRole(db, project.id, id, user.role, adminId);
  }
  // Stations, deployments and the demo photos are added by the ingest seed step (see seeds/README.md).
  return true;
}

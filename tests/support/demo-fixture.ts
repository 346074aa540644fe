import { join } from 'node:path';
import { seedDemo } from '../../seeds/demo';
import { DEMO_PASSWORD, DEMO_PROJECT } from '../../seeds/scenario';
import type { Db } from '../../server/db/database';
import { createTestContext, signIn, type TestClient, type TestContext } from './test-app';

/** Painted demo photos are cached here between runs (the browser tests use the same cache). */
export const DEMO_CACHE = join(process.cwd(), 'tests/.tmp/demo-cache');
export const DEMO_SLUG = DEMO_PROJECT.slug;

/** Waits until the job queue has nothing left to do (derivatives, blur copies). */
export async function drainJobs(db: Db, timeoutMs = 300_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    const open = await db
      .selectFrom('jobs')
      .select('id')
      .where('status', 'in', ['queued', 'running'])
      .limit(1)
      .executeTakeFirst();
    if (!open) return;
    if (Date.now() > deadline) throw new Error('jobs still running');
    await new Promise((r) => setTimeout(r, 200));
  }
}

/**
 * A test instance holding the fictional demo season (synthetic data: painted photos, generated
 * ground truth), with every photo processed.
 */
export async function demoContext(env: Record<string, string> = {}): Promise<TestContext> {
  const ctx = await createTestContext(env);
  const seeded = await seedDemo(ctx.db, { ingest: ctx.ingest, cacheDir: DEMO_CACHE });
  if (!seeded) throw new Error('the demo did not seed');
  ctx.ingest.runner.kick();
  await drainJobs(ctx.db);
  return ctx;
}

/** Signs in one of the demo accounts (`reviewer` → reviewer@demo.test). */
export function demoUser(ctx: TestContext, who: string): Promise<TestClient> {
  return signIn(ctx.app, `${who}@demo.test`, DEMO_PASSWORD);
}

import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { Express } from 'express';
import { pino } from 'pino';
import request from 'supertest';
import { createApp } from '../../server/app';
import { loadConfig, type Config } from '../../server/config';
import { openDatabase, type Db } from '../../server/db/database';
import { migrateToLatest } from '../../server/db/migrate';
import { startFakeSmtp, type FakeSmtp } from '../../server/mail/fake-smtp';
import { startIngest, type IngestRuntime } from '../../server/ingest-runtime';
import { createSmtpMailer, type Mailer } from '../../server/mail/mailer';
import { createProject } from '../../server/services/projects.service';
import { setMemberRole } from '../../server/services/members.service';
import { createUser } from '../../server/services/users.service';
import type { ProjectRole } from '../../shared/roles';

/** A real app on a freshly migrated SQLite file, with a real SMTP fake behind its mailer. */
export interface TestContext {
  app: Express;
  db: Db;
  config: Config;
  mailer: Mailer;
  smtp: FakeSmtp;
  ingest: IngestRuntime;
  dir: string;
  close(): Promise<void>;
}

/** Builds a test context; `env` overrides configuration variables. */
export async function createTestContext(env: Record<string, string> = {}): Promise<TestContext> {
  const dir = mkdtempSync(join(tmpdir(), 'maculo-test-'));
  const config = loadConfig({
    DATABASE_PATH: join(dir, 'maculo.sqlite'),
    UPLOADS_DIR: join(dir, 'uploads'),
    SESSION_SECRET: 'test-secret-that-is-long-enough-for-the-check',
    PUBLIC_URL: 'http://maculo.test',
    LOG_LEVEL: 'silent',
    LOGIN_RATE_LIMIT: '1000',
    SEED_DEMO: 'false',
    CLIENT_DIST: join(dir, 'no-client'),
    WORKERS: '1',
    ...env,
  });
  const { db, sqlite } = openDatabase(config.databasePath);
  await migrateToLatest(db);
  const smtp = await startFakeSmtp(db);
  const mailer = createSmtpMailer(smtp.url, config.mailFrom);
  const log = pino({ level: process.env['TEST_LOG_LEVEL'] ?? 'silent' });
  const ingest = await startIngest(db, config, log);
  const app = createApp({ db, sqlite, config, log, mailer, ingest });
  return {
    app,
    db,
    config,
    mailer,
    smtp,
    ingest,
    dir,
    async close() {
      await ingest.stop();
      mailer.close();
      await smtp.close();
      await db.destroy();
      rmSync(dir, { recursive: true, force: true });
    },
  };
}

export const TEST_PASSWORD = 'correct-horse-battery';

/** A supertest agent that keeps cookies and sends the CSRF header on state-changing requests. */
export class TestClient {
  readonly agent: ReturnType<typeof request.agent>;
  private token = '';

  constructor(readonly app: Express) {
    this.agent = request.agent(app);
  }

  /** The CSRF token this client echoes. */
  get csrf(): string {
    return this.token;
  }

  /** Fetches the CSRF cookie (any API response sets it). */
  async init(): Promise<this> {
    const res = await this.agent.get('/api/health');
    const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
    const xsrf = cookies.find((c) => c.startsWith('XSRF-TOKEN='));
    if (xsrf) this.token = decodeURIComponent(xsrf.split(';')[0]!.slice('XSRF-TOKEN='.length));
    return this;
  }

  get(url: string) {
    return this.agent.get(url);
  }
  post(url: string, body?: object) {
    return this.agent.post(url).set('X-XSRF-TOKEN', this.token).send(body);
  }
  put(url: string, body?: object) {
    return this.agent.put(url).set('X-XSRF-TOKEN', this.token).send(body);
  }
  patch(url: string, body?: object) {
    return this.agent.patch(url).set('X-XSRF-TOKEN', this.token).send(body);
  }
  delete(url: string) {
    return this.agent.delete(url).set('X-XSRF-TOKEN', this.token);
  }
  /** Any method, for route sweeps. */
  send(method: string, url: string, body?: object) {
    const m = method.toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
    const req = this.agent[m](url);
    return m === 'get' ? req : req.set('X-XSRF-TOKEN', this.token).send(body ?? {});
  }
}

/** Signs in through the real login route and returns the client. */
export async function signIn(
  app: Express,
  email: string,
  password = TEST_PASSWORD,
): Promise<TestClient> {
  const client = await new TestClient(app).init();
  const res = await client.post('/api/auth/login', { email, password });
  if (res.status !== 200)
    throw new Error(`sign-in of ${email} failed: ${res.status} ${JSON.stringify(res.body)}`);
  return client;
}

/** A project with one member per role, an admin and a non-member; all with TEST_PASSWORD. */
export async function seedTeam(db: Db, slug = 'test-survey') {
  const admin = await createUser(
    db,
    { email: `admin@${slug}.test`, name: 'Admin', password: TEST_PASSWORD, isAdmin: true },
    null,
  );
  const project = await createProject(
    db,
    {
      slug,
      name: `Survey ${slug}`,
      description: 'synthetic test project',
      targetSpeciesScientific: 'Panthera pardus',
      targetSpeciesCommon: 'Leopard',
      timezone: 'Africa/Nairobi',
      independenceMinutes: 30,
      occasionHours: 24,
      reviewersPerSighting: 2,
      sensitivity: 'high',
      sensitivityReviewDate: null,
      codePrefix: 'TS',
      boundary: null,
      tileUrl: null,
      gpsToleranceM: 250,
      humanRetentionDays: null,
    },
    admin.id,
  );
  const users: Record<ProjectRole | 'outsider' | 'admin', { id: string; email: string }> = {
    admin: { id: admin.id, email: admin.email },
  } as Record<ProjectRole | 'outsider' | 'admin', { id: string; email: string }>;
  for (const role of ['volunteer', 'reviewer', 'curator', 'ecologist', 'outsider'] as const) {
    const u = await createUser(
      db,
      { email: `${role}@${slug}.test`, name: `The ${role}`, password: TEST_PASSWORD },
      admin.id,
    );
    if (role !== 'outsider') await setMemberRole(db, project.id, u.id, role, admin.id);
    users[role] = { id: u.id, email: u.email };
  }
  return { project, users };
}

/** Waits until the SMTP fake has stored a message to `to` (it arrives asynchronously). */
export async function waitForMail(db: Db, to: string, timeoutMs = 5000) {
  const deadline = Date.now() + timeoutMs;
  while (Date.now() < deadline) {
    const row = await db
      .selectFrom('mail_messages')
      .selectAll()
      .where('to_addr', 'like', `%${to}%`)
      .orderBy('received_at', 'desc')
      .executeTakeFirst();
    if (row) return row;
    await new Promise((r) => setTimeout(r, 25));
  }
  throw new Error(`no e-mail to ${to} within ${timeoutMs} ms`);
}

/** The first URL in a text. */
export function linkIn(text: string): string {
  const match = /https?:\/\/\S+/.exec(text);
  if (!match) throw new Error('no link in the e-mail');
  return match[0];
}

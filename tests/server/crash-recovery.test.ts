import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { openDatabase } from '../../server/db/database';
import { migrateToLatest } from '../../server/db/migrate';
import { createStation } from '../../server/services/stations.service';
import { exifJpeg } from '../support/photo-fixtures';
import { seedTeam, TEST_PASSWORD } from '../support/test-app';

// Kills a real server process (SIGKILL) in the middle of a card, restarts it, and checks that every
// photo ends processed or failed with a reason: none stuck, none twice, no file without a row and
// no row without a file. Synthetic photos.

const dir = mkdtempSync(join(tmpdir(), 'maculo-crash-'));
const port = 41_000 + Math.floor(Math.random() * 2000);
const base = `http://127.0.0.1:${port}`;
let child: ChildProcess | null = null;

function start(): Promise<ChildProcess> {
  const proc = spawn(process.execPath, ['--import', 'tsx', 'server/main.ts'], {
    cwd: process.cwd(),
    env: {
      ...process.env,
      PORT: String(port),
      HOST: '127.0.0.1',
      DATABASE_PATH: join(dir, 'maculo.sqlite'),
      UPLOADS_DIR: join(dir, 'uploads'),
      SESSION_SECRET: 'crash-test-secret-crash-test-secret-xx',
      SEED_DEMO: 'false',
      LOG_LEVEL: 'warn',
      WORKERS: '2',
    },
    stdio: ['ignore', 'ignore', 'inherit'],
  });
  return new Promise((resolve, reject) => {
    const deadline = Date.now() + 30_000;
    const poll = () => {
      request(base)
        .get('/api/health')
        .then((r) => (r.status === 200 ? resolve(proc) : setTimeout(poll, 100)))
        .catch(() =>
          Date.now() > deadline ? reject(new Error('server did not start')) : setTimeout(poll, 100),
        );
    };
    poll();
  });
}

async function signedIn(email: string) {
  const agent = request.agent(base);
  const first = await agent.get('/api/health');
  const cookie = ([] as string[])
    .concat(first.headers['set-cookie'] ?? [])
    .find((c) => c.startsWith('XSRF-TOKEN='))!;
  const token = cookie.split(';')[0]!.slice('XSRF-TOKEN='.length);
  const login = await agent
    .post('/api/auth/login')
    .set('X-XSRF-TOKEN', token)
    .send({ email, password: TEST_PASSWORD });
  expect(login.status).toBe(200);
  return { agent, token };
}

afterAll(() => {
  child?.kill('SIGKILL');
  rmSync(dir, { recursive: true, force: true });
});

describe('crash and restart', () => {
  it('should finish every photo exactly once after kill -9 in the middle of a card', async () => {
    const { db } = openDatabase(join(dir, 'maculo.sqlite'));
    await migrateToLatest(db);
    const team = await seedTeam(db);
    const station = await createStation(
      db,
      team.project.id,
      { code: 'C01', name: '', lat: -1.2, lon: 36.6, notes: '' },
      team.users.admin.id,
    );
    await db.destroy();

    child = await start();
    const { agent, token } = await signedIn(team.users.volunteer.email);
    const dep = await agent
      .post('/api/projects/test-survey/deployments')
      .set('X-XSRF-TOKEN', token)
      .send({
        stationId: station.id,
        cameraLabel: 'A',
        start: '2026-07-01T00:00:00Z',
        end: '2026-08-30T00:00:00Z',
        timezone: 'Africa/Nairobi',
      });
    expect(dep.status).toBe(201);
    const files: Buffer[] = [];
    for (let i = 0; i < 36; i++) {
      files.push(
        await exifJpeg(
          { dateTimeOriginal: `2026:07:02 03:${String(i).padStart(2, '0')}:00` },
          { width: 1400, height: 1000, color: 0x203040ff + i * 0x10100 },
        ),
      );
    }
    const send = (batch: Buffer[], offset: number) => {
      let req = agent
        .post(`/api/projects/test-survey/deployments/${dep.body.id}/uploads`)
        .set('X-XSRF-TOKEN', token);
      batch.forEach((b, i) => (req = req.attach('photos', b, `IMG_${offset + i}.JPG`)));
      return req;
    };
    const first = await send(files.slice(0, 24), 0);
    expect(first.status).toBe(201);
    // Kill while the workers are busy with the first batch and a second request is on the wire.
    const second = send(files.slice(24), 24).then(
      () => 'finished',
      () => 'cut off',
    );
    await new Promise((r) => setTimeout(r, 150));
    child.kill('SIGKILL');
    await second;
    await new Promise((r) => child!.once('exit', r));

    child = await start();
    const again = await signedIn(team.users.volunteer.email);
    const deadline = Date.now() + 120_000;
    for (;;) {
      const uploads = (await again.agent.get('/api/projects/test-survey/uploads')).body as {
        done: boolean;
      }[];
      if (uploads.every((u) => u.done)) break;
      if (Date.now() > deadline) throw new Error('photos still processing after restart');
      await new Promise((r) => setTimeout(r, 250));
    }

    const check = openDatabase(join(dir, 'maculo.sqlite')).db;
    const photos = await check
      .selectFrom('photos')
      .select(['id', 'status', 'stored_path', 'sha256', 'error'])
      .execute();
    const jobs = await check.selectFrom('jobs').select(['payload', 'status']).execute();
    await check.destroy();
    expect(photos.length).toBeGreaterThanOrEqual(24);
    for (const p of photos) {
      expect(['ready', 'failed']).toContain(p.status);
      if (p.status === 'failed') expect(p.error).toBeTruthy();
      expect(existsSync(join(dir, 'uploads', p.stored_path))).toBe(true);
      expect(
        existsSync(join(dir, 'uploads', 'derived', p.sha256.slice(0, 2), p.sha256, 'thumb.jpg')),
      ).toBe(p.status === 'ready');
    }
    // One job per photo, none left running or queued.
    expect(jobs).toHaveLength(photos.length);
    expect(new Set(jobs.map((j) => j.payload)).size).toBe(photos.length);
    expect(jobs.every((j) => j.status === 'done' || j.status === 'failed')).toBe(true);
    // No file without a row: every stored original belongs to a photo; nothing left in tmp.
    const originals = readdirSync(join(dir, 'uploads', 'originals'), { recursive: true })
      .map(String)
      .filter((f) => f.endsWith('.jpg'));
    expect(originals.map((f) => f.split('/').pop()!.replace('.jpg', '')).sort()).toEqual(
      [...new Set(photos.map((p) => p.sha256))].sort(),
    );
    expect(readdirSync(join(dir, 'uploads', 'tmp'))).toEqual([]);
  }, 240_000);
});

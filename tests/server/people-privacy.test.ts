import request from 'supertest';
import { existsSync } from 'node:fs';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { purgeExpiredHumanPhotos } from '../../server/services/retention.service';
import { hourly, stationWithEvents } from '../support/sort-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Photos of people: hidden from volunteers on every route they can reach, blurred for reviewers
// until revealed (and the reveal is logged), deleted after the retention period. Synthetic photos.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let reviewer: TestClient;
let volunteer: TestClient;
let humanEvent: { id: string; photos: { id: string }[] };
const stationCode = 'P01';
let uploadId: string;
const SLUG = 'test-survey';

async function waitFor(check: () => Promise<boolean>, ms = 20_000): Promise<void> {
  const deadline = Date.now() + ms;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 100));
  }
}

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  const ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  const made = await stationWithEvents(ecologist, volunteer, SLUG, stationCode, hourly(3));
  uploadId = made.uploadId;
  const queue = await reviewer.get(`/api/projects/${SLUG}/sort/next?limit=3`);
  humanEvent = queue.body.events[1];
  const res = await reviewer.post(`/api/projects/${SLUG}/events/${humanEvent.id}/label`, {
    label: 'human',
  });
  expect(res.body.photos[0].blurred).toBe(true);
  await reviewer.post(`/api/projects/${SLUG}/events/${queue.body.events[0].id}/label`, {
    label: 'blank',
  });
});
afterAll(async () => ctx.close());

describe('photos of people', () => {
  it('should refuse every photo file of a human event to the volunteer who uploaded it', async () => {
    const id = humanEvent.photos[0]!.id;
    for (const kind of ['thumb', 'preview', 'original']) {
      const res = await volunteer.get(`/api/photos/${id}/${kind}`);
      expect(res.status).toBe(403);
      expect(res.body.error.message).toMatch(/not shown to volunteers/);
    }
    expect((await volunteer.post(`/api/photos/${id}/reveal`)).status).toBe(403);
    expect((await request(ctx.app).get(`/api/photos/${id}/thumb`)).status).toBe(401);
  });

  it('should leave human photos out of every list and count a volunteer can reach', async () => {
    const list = await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${uploadId}`);
    expect(list.body.map((p: { id: string }) => p.id)).not.toContain(humanEvent.photos[0]!.id);
    expect(list.body).toHaveLength(2);
    const progress = await volunteer.get(`/api/projects/${SLUG}/progress`);
    expect(progress.body.photos.total).toBe(2);
    expect(progress.body.events.byLabel.human).toBeUndefined();
    expect(
      progress.body.byStation.find((s: { stationCode: string }) => s.stationCode === stationCode),
    ).toMatchObject({ photos: 2, events: 2 });
    const reviewerView = await reviewer.get(`/api/projects/${SLUG}/progress`);
    expect(reviewerView.body.photos.total).toBe(3);
    expect(reviewerView.body.events.byLabel.human).toBe(1);
    expect((await volunteer.get(`/api/projects/${SLUG}/events`)).status).toBe(403);
    expect((await volunteer.get(`/api/projects/${SLUG}/sort/next`)).status).toBe(403);
  });

  it('should show reviewers a blurred copy until they reveal the photo, and log the reveal', async () => {
    const id = humanEvent.photos[0]!.id;
    await waitFor(async () => (await reviewer.get(`/api/photos/${id}/thumb`)).status === 200);
    const blurred = await reviewer.get(`/api/photos/${id}/preview`).buffer(true);
    expect(blurred.status).toBe(200);
    expect(blurred.headers['cache-control']).toBe('no-store');
    const reveal = await reviewer.post(`/api/photos/${id}/reveal`);
    expect(reveal.body).toEqual({ revealed: true });
    const clear = await reviewer.get(`/api/photos/${id}/preview`).buffer(true);
    expect(Buffer.compare(clear.body as Buffer, blurred.body as Buffer)).not.toBe(0);
    const audit = await ctx.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'reveal-human-photo')
      .execute();
    expect(audit).toHaveLength(1);
    expect(audit[0]).toMatchObject({ user_id: team.users.reviewer.id, entity_id: id });
    // Another reviewer's session still sees the blurred copy.
    const other = await signIn(ctx.app, team.users.curator.email);
    const theirs = await other.get(`/api/photos/${id}/preview`).buffer(true);
    expect(Buffer.compare(theirs.body as Buffer, blurred.body as Buffer)).toBe(0);
  });

  it('should delete human photos after the retention period and keep the record', async () => {
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    await ecologist.patch(`/api/projects/${SLUG}`, { humanRetentionDays: 30 });
    const row = await ctx.db
      .selectFrom('photos')
      .selectAll()
      .where('id', '=', humanEvent.photos[0]!.id)
      .executeTakeFirstOrThrow();
    const file = `${ctx.config.uploadsDir}/${row.stored_path}`;
    expect(existsSync(file)).toBe(true);
    expect(
      await purgeExpiredHumanPhotos(
        ctx.db,
        ctx.ingest.storage,
        new Date(Date.now() + 29 * 86_400_000),
      ),
    ).toBe(0);
    expect(
      await purgeExpiredHumanPhotos(
        ctx.db,
        ctx.ingest.storage,
        new Date(Date.now() + 31 * 86_400_000),
      ),
    ).toBe(1);
    expect(existsSync(file)).toBe(false);
    const after = await ctx.db
      .selectFrom('photos')
      .selectAll()
      .where('id', '=', row.id)
      .executeTakeFirstOrThrow();
    expect(after.status).toBe('purged');
    expect((await reviewer.get(`/api/photos/${row.id}/original`)).status).toBe(410);
    // Photos of other events are untouched.
    const others = await ctx.db
      .selectFrom('photos')
      .select('status')
      .where('id', '!=', row.id)
      .execute();
    expect(others.every((p) => p.status === 'ready')).toBe(true);
  });
});

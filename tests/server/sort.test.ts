import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser } from '../../server/services/users.service';
import { setMemberRole } from '../../server/services/members.service';
import { hourly, stationWithEvents } from '../support/sort-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  TEST_PASSWORD,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic photos; every event id below comes from the real queue.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let reviewer: TestClient;
let reviewer2: TestClient;
let volunteer: TestClient;
const SLUG = 'test-survey';

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  const second = await createUser(
    ctx.db,
    { email: 'reviewer2@test-survey.test', name: 'Second reviewer', password: TEST_PASSWORD },
    null,
  );
  await setMemberRole(ctx.db, team.project.id, second.id, 'reviewer', team.users.admin.id);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  reviewer2 = await signIn(ctx.app, 'reviewer2@test-survey.test');
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  await stationWithEvents(ecologist, volunteer, SLUG, 'S01', hourly(12));
});
afterAll(async () => ctx.close());

const next = (c: TestClient, limit = 3) => c.get(`/api/projects/${SLUG}/sort/next?limit=${limit}`);
const ids = (res: { body: { events: { id: string }[] } }) => res.body.events.map((e) => e.id);

describe('the sort queue', () => {
  it('should hand out events oldest first with their photos, and lease them to one reviewer', async () => {
    const a = await next(reviewer);
    expect(a.status).toBe(200);
    expect(a.body.events).toHaveLength(3);
    const first = a.body.events[0];
    expect(first).toMatchObject({
      stationId: expect.any(String),
      start: '2026-07-01T21:00:00Z',
      end: '2026-07-01T21:00:00Z',
    });
    expect(first.photos[0]).toMatchObject({
      id: expect.any(String),
      thumbUrl: expect.stringMatching(/^\/api\/photos\/[0-9a-f]{20}\/thumb$/),
    });
    const starts = a.body.events.map((e: { start: string }) => e.start);
    expect([...starts].sort()).toEqual(starts);
    const b = await next(reviewer2);
    expect(ids(b).filter((id: string) => ids(a).includes(id))).toEqual([]);
    // Asking again returns the caller's own leased events first.
    expect(ids(await next(reviewer))).toEqual(ids(a));
  });

  it('should never give two reviewers the same event when they ask at the same moment', async () => {
    await reviewer.post(`/api/projects/${SLUG}/sort/release`);
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
    const [x, y] = await Promise.all([next(reviewer, 6), next(reviewer2, 6)]);
    const overlap = ids(x).filter((id: string) => ids(y).includes(id));
    expect(overlap).toEqual([]);
    expect(ids(x).length + ids(y).length).toBe(12);
  });

  it('should hand a stale lease to the next reviewer', async () => {
    const held = ids(await next(reviewer, 6));
    expect(ids(await next(reviewer2, 6))).not.toContain(held[0]);
    await ctx.db
      .updateTable('events')
      .set({ lease_until: '2000-01-01T00:00:00Z' })
      .where('id', 'in', held)
      .execute();
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
    expect(ids(await next(reviewer2, 12))).toEqual(expect.arrayContaining(held));
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
  });

  it('should refuse the queue to volunteers', async () => {
    expect((await next(volunteer)).status).toBe(403);
  });
});

describe('labels', () => {
  it('should label an event and record who did it', async () => {
    const [event] = (await next(reviewer, 1)).body.events;
    const res = await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'blank',
    });
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({
      id: event.id,
      label: 'blank',
      species: null,
      count: null,
      version: 1,
      sortedBy: { id: team.users.reviewer.id },
    });
    expect(ids(await next(reviewer2, 12))).not.toContain(event.id);
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
  });

  it('should refuse a second label that did not see the first, and record a deliberate change', async () => {
    const [event] = (await next(reviewer, 1)).body.events;
    await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, { label: 'vehicle' });
    const late = await reviewer2.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'human',
    });
    expect(late.status).toBe(409);
    expect(late.body.error.message).toMatch(/already sorted this event as vehicle/);
    const change = await reviewer2.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'unknown',
      expectedVersion: 1,
    });
    expect(change.status).toBe(200);
    expect(change.body).toMatchObject({
      label: 'unknown',
      version: 2,
      sortedBy: { name: 'Second reviewer' },
    });
    const detail = await reviewer.get(`/api/projects/${SLUG}/events/${event.id}`);
    expect(
      detail.body.history.map((h: { action: string; by: string }) => `${h.action} by ${h.by}`),
    ).toEqual(['label by The reviewer', 'relabel by Second reviewer']);
    expect(detail.body.history[1].before).toMatchObject({ label: 'vehicle' });
  });

  it('should refuse to label an event another reviewer holds', async () => {
    const [held] = (await next(reviewer2, 1)).body.events;
    const res = await reviewer.post(`/api/projects/${SLUG}/events/${held.id}/label`, {
      label: 'blank',
    });
    expect(res.status).toBe(409);
    expect(res.body.error.message).toMatch(/Second reviewer is sorting this event/);
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
  });

  it('should undo a label by clearing it with the version just written', async () => {
    const [event] = (await next(reviewer, 1)).body.events;
    const labelled = await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'blank',
    });
    const undone = await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'unclassified',
      expectedVersion: labelled.body.version,
    });
    expect(undone.body).toMatchObject({ label: null, sortedBy: null, version: 2 });
    expect(ids(await next(reviewer, 1))).toEqual([event.id]);
  });

  it('should check species and counts', async () => {
    const [event] = (await next(reviewer, 1)).body.events;
    const url = `/api/projects/${SLUG}/events/${event.id}/label`;
    expect((await reviewer.post(url, { label: 'animal' })).body.error.message).toMatch(
      /Say which species/,
    );
    expect(
      (await reviewer.post(url, { label: 'animal', species: 'Felis imaginaria' })).status,
    ).toBe(400);
    expect((await reviewer.post(url, { label: 'blank', species: 'Panthera pardus' })).status).toBe(
      400,
    );
    expect(
      (await reviewer.post(url, { label: 'animal', species: 'Panthera pardus', count: 0 })).status,
    ).toBe(400);
    expect((await reviewer.post(url, { label: 'cat' })).status).toBe(400);
    const ok = await reviewer.post(url, {
      label: 'animal',
      species: 'Tragelaphus scriptus',
      count: 2,
    });
    expect(ok.body).toMatchObject({ label: 'animal', species: 'Tragelaphus scriptus', count: 2 });
  });

  it('should label a run of events at once and say what happened to each', async () => {
    const batch = ids(await next(reviewer, 3));
    const [heldByOther] = ids(await next(reviewer2, 1));
    const res = await reviewer.post(`/api/projects/${SLUG}/events/label-batch`, {
      eventIds: [...batch, heldByOther],
      label: 'blank',
    });
    expect(res.status).toBe(200);
    expect(res.body.labelled).toBe(3);
    expect(res.body.results.at(-1)).toMatchObject({ id: heldByOther, ok: false });
    await reviewer2.post(`/api/projects/${SLUG}/sort/release`);
  });
});

describe('sightings', () => {
  it('should record one sighting per animal of the target species, with flank, quality, best photo and crop', async () => {
    const [event] = (await next(reviewer, 1)).body.events;
    const url = `/api/projects/${SLUG}/events/${event.id}/sightings`;
    const photoId = event.photos[0].id;
    expect(
      (await reviewer.post(url, { flank: 'left', quality: 'good', bestPhotoId: photoId })).status,
    ).toBe(409);
    await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'animal',
      species: 'Panthera pardus',
      count: 1,
    });
    const bad = await reviewer.post(url, {
      flank: 'sideways',
      quality: 'great',
      bestPhotoId: photoId,
      crop: { x: 0.8, y: 0, w: 0.5, h: 0.5 },
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.request.map((d: { path: string }) => d.path).sort()).toEqual([
      'crop',
      'flank',
      'quality',
    ]);
    const created = await reviewer.post(url, {
      flank: 'left',
      quality: 'good',
      bestPhotoId: photoId,
      crop: { x: 0.1, y: 0.2, w: 0.5, h: 0.4 },
      sex: 'female',
      ageClass: 'adult',
    });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      state: 'open',
      flank: 'left',
      sex: 'female',
      crop: { x: 0.1, y: 0.2, w: 0.5, h: 0.4 },
    });
    expect(
      (await reviewer.post(url, { flank: 'right', quality: 'fair', bestPhotoId: photoId })).status,
    ).toBe(409);
    const other = await ctx.db
      .selectFrom('photos')
      .select('id')
      .where('event_id', '!=', event.id)
      .executeTakeFirstOrThrow();
    const moved = await reviewer.patch(`/api/projects/${SLUG}/sightings/${created.body.id}`, {
      bestPhotoId: other.id,
    });
    expect(moved.status).toBe(400);
    const edited = await reviewer.patch(`/api/projects/${SLUG}/sightings/${created.body.id}`, {
      flank: 'both',
      quality: 'fair',
    });
    expect(edited.body).toMatchObject({ flank: 'both', quality: 'fair' });
    const detail = await reviewer.get(`/api/projects/${SLUG}/events/${event.id}`);
    expect(detail.body.sightings).toHaveLength(1);
  });

  it('should remove open sightings when the event is relabelled as something else', async () => {
    const event = await ctx.db
      .selectFrom('events')
      .selectAll()
      .where('species', '=', 'Panthera pardus')
      .executeTakeFirstOrThrow();
    const res = await reviewer.post(`/api/projects/${SLUG}/events/${event.id}/label`, {
      label: 'animal',
      species: 'Hystrix cristata',
      expectedVersion: event.label_version,
    });
    expect(res.status).toBe(200);
    expect(res.body.sightings).toEqual([]);
  });
});

describe('species list', () => {
  it('should start with the target species and let ecologists set the quick list', async () => {
    expect((await reviewer.get(`/api/projects/${SLUG}/species`)).body).toEqual([
      { scientific: 'Panthera pardus', common: 'Leopard', target: true },
    ]);
    const put = await ecologist.put(`/api/projects/${SLUG}/species`, {
      species: [
        { scientific: 'Crocuta crocuta', common: 'Spotted hyena' },
        { scientific: 'Tragelaphus scriptus', common: 'Bushbuck' },
      ],
    });
    expect(put.body.map((s: { scientific: string }) => s.scientific)).toEqual([
      'Panthera pardus',
      'Crocuta crocuta',
      'Tragelaphus scriptus',
    ]);
    expect((await reviewer.put(`/api/projects/${SLUG}/species`, { species: [] })).status).toBe(403);
  });
});

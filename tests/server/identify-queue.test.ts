import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { leopardSightings } from '../support/identify-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic photos and sightings made through the real API. The Identify queue walks sightings by
// their event's start through a copy kept by database triggers; these tests move events and check
// the queue follows.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let reviewer: TestClient;
const SLUG = 'test-survey';
let late: string[] = [];

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
});
afterAll(async () => ctx.close());

const copiedStart = async (sightingId: string) =>
  (await ctx.db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .select(['events.start'])
    .select((eb) => eb.ref('sightings.queue_start' as never).as('queueStart'))
    .where('sightings.id', '=', sightingId)
    .executeTakeFirstOrThrow()) as { start: string; queueStart: string };

describe('Identify queue order', () => {
  it('should copy the event start onto each new sighting and hand out the oldest event first', async () => {
    const early = await leopardSightings(ecologist, reviewer, SLUG, 'Q01', 2, 'left', 10);
    late = await leopardSightings(ecologist, reviewer, SLUG, 'Q02', 2, 'left', 12);
    for (const id of [...early, ...late]) {
      const { start, queueStart } = await copiedStart(id);
      expect(queueStart).toBe(start);
    }
    const first = await ecologist.get(`/api/projects/${SLUG}/identify/next`);
    expect(first.status).toBe(200);
    expect(first.body.sighting.id).toBe(early[0]);
    await ecologist.post(`/api/projects/${SLUG}/identify/skip`, { sightingId: early[0] });
  });

  const firstPhotoAt = (code: string) =>
    ctx.db
      .selectFrom('photos')
      .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
      .innerJoin('stations', 'stations.id', 'deployments.station_id')
      .select(['photos.id', 'photos.deployment_id', 'photos.taken_at_exif'])
      .where('stations.code', '=', code)
      .orderBy('photos.taken_at_exif')
      .executeTakeFirstOrThrow();
  /** Says the first photo's true time was `days` earlier than the camera's clock showed. */
  const clockFix = async (code: string, days: number) => {
    const photo = await firstPhotoAt(code);
    const exif = photo
      .taken_at_exif!.replace(/^(\d{4}):(\d{2}):(\d{2}) /, '$1-$2-$3T')
      .slice(0, 19);
    const trueTime = new Date(Date.parse(`${exif}Z`) - days * 86_400_000)
      .toISOString()
      .slice(0, 19);
    return ecologist.post(`/api/projects/${SLUG}/deployments/${photo.deployment_id}/clock-fix`, {
      photoId: photo.id,
      trueTime,
    });
  };

  it('should refuse a clock fix that would put photos with sightings before the deployment, and change nothing', async () => {
    const before = await ctx.db.selectFrom('sightings').select(['id', 'event_id']).execute();
    const deployment = (await firstPhotoAt('Q02')).deployment_id;
    const offset = async () =>
      (
        await ctx.db
          .selectFrom('deployments')
          .select('clock_offset_seconds')
          .where('id', '=', deployment)
          .executeTakeFirstOrThrow()
      ).clock_offset_seconds;
    const offsetBefore = await offset();
    // Twelve days earlier is 30 June, before the deployment started on 1 July.
    const fix = await clockFix('Q02', 12);
    expect(fix.status).toBe(409);
    expect(fix.body.error.code).toBe('conflict');
    expect(fix.body.error.message).toMatch(
      /2 photos with recorded sightings outside the deployment/,
    );
    expect(await ctx.db.selectFrom('sightings').select(['id', 'event_id']).execute()).toEqual(
      before,
    );
    expect(await offset()).toBe(offsetBefore);
  });

  it('should follow a clock fix that moves a station’s events before all others', async () => {
    // The camera at Q02 ran four days fast: its events move from 12 July to 8 July.
    const fix = await clockFix('Q02', 4);
    expect(fix.status).toBe(200);
    const moved = await ctx.db
      .selectFrom('sightings')
      .innerJoin('events', 'events.id', 'sightings.event_id')
      .innerJoin('stations', 'stations.id', 'events.station_id')
      .select(['sightings.id', 'events.start'])
      .where('stations.code', '=', 'Q02')
      .orderBy('events.start')
      .execute();
    expect(moved).toHaveLength(2);
    for (const s of moved) expect((await copiedStart(s.id)).queueStart).toBe(s.start);
    // A reviewer who has not skipped anything now gets Q02's first sighting.
    const next = await reviewer.get(`/api/projects/${SLUG}/identify/next`);
    expect(next.status).toBe(200);
    expect(next.body.sighting.id).toBe(moved[0]!.id);
    expect(next.body.sighting.stationCode).toBe('Q02');
  });
});

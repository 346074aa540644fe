import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser } from '../../server/services/users.service';
import { setMemberRole } from '../../server/services/members.service';
import { leopardSightings } from '../support/identify-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  TEST_PASSWORD,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic photos and sightings; every sighting below was made through the real API.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let a: TestClient;
let b: TestClient;
const SLUG = 'test-survey';

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  const second = await createUser(
    ctx.db,
    { email: 'b@test-survey.test', name: 'Reviewer B', password: TEST_PASSWORD },
    null,
  );
  await setMemberRole(ctx.db, team.project.id, second.id, 'reviewer', team.users.admin.id);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  a = await signIn(ctx.app, team.users.reviewer.email);
  b = await signIn(ctx.app, 'b@test-survey.test');
});
afterAll(async () => ctx.close());

const next = (c: TestClient) => c.get(`/api/projects/${SLUG}/identify/next`);
const call = (c: TestClient, id: string, body: object) =>
  c.post(`/api/projects/${SLUG}/sightings/${id}/calls`, body);

describe('blind double review', () => {
  let sightings: string[];

  beforeAll(async () => {
    sightings = await leopardSightings(ecologist, a, SLUG, 'I01', 5);
  });

  it('should make a first call proposed, hide it from the second reviewer, and confirm when they agree', async () => {
    const first = await next(a);
    expect(first.status).toBe(200);
    expect(first.body.sighting).toMatchObject({
      id: sightings[0],
      round: 1,
      state: 'open',
      flank: 'left',
      stationCode: 'I01',
    });
    expect(first.body.candidates).toEqual([]);
    const proposed = await call(a, sightings[0]!, {
      verdict: 'new',
      individual: {
        nickname: 'Tembo',
        sex: 'female',
        notes: 'notched left ear',
        tags: ['notched left ear'],
      },
    });
    expect(proposed.body.sighting).toEqual({
      id: sightings[0],
      state: 'proposed',
      individualId: null,
    });
    // The provisional individual is nobody's candidate and not in the catalogue yet.
    expect((await a.get(`/api/projects/${SLUG}/individuals`)).body).toEqual([]);

    const second = await next(b);
    expect(second.body.sighting).toMatchObject({ id: sightings[0], round: 2, state: 'proposed' });
    const text = JSON.stringify(second.body);
    expect(text).not.toContain(team.users.reviewer.id);
    expect(text).not.toContain('Tembo');
    expect(text).not.toContain('"new"');
    const agreed = await call(b, sightings[0]!, { verdict: 'new' });
    expect(agreed.body.sighting.state).toBe('confirmed');
    expect(agreed.body.individual).toMatchObject({ code: 'TS-001', status: 'active' });
    const catalogue = (await a.get(`/api/projects/${SLUG}/individuals`)).body;
    expect(catalogue).toHaveLength(1);
    expect(catalogue[0]).toMatchObject({
      code: 'TS-001',
      nickname: 'Tembo',
      sex: 'female',
      sightings: 1,
      coverage: { left: true, right: false, partial: true },
    });
    expect(catalogue[0].references).toEqual([expect.objectContaining({ flank: 'left' })]);
  });

  it('should confirm two matches of the same individual and dispute two different calls', async () => {
    const tembo = (await a.get(`/api/projects/${SLUG}/individuals`)).body[0].id as string;
    expect((await next(a)).body.sighting.id).toBe(sightings[1]);
    await call(a, sightings[1]!, { verdict: 'match', individualId: tembo });
    expect((await next(b)).body.sighting.id).toBe(sightings[1]);
    const same = await call(b, sightings[1]!, { verdict: 'match', individualId: tembo });
    expect(same.body.sighting).toEqual({
      id: sightings[1],
      state: 'confirmed',
      individualId: tembo,
    });

    expect((await next(a)).body.sighting.id).toBe(sightings[2]);
    await call(a, sightings[2]!, { verdict: 'match', individualId: tembo });
    await next(b);
    const differ = await call(b, sightings[2]!, {
      verdict: 'new',
      individual: { nickname: 'Other', sex: 'unknown', notes: '', tags: [] },
    });
    expect(differ.body.sighting.state).toBe('disputed');
    expect((await a.get(`/api/projects/${SLUG}/individuals`)).body).toHaveLength(1);

    await next(a);
    await call(a, sightings[3]!, { verdict: 'unidentifiable' });
    await next(b);
    expect((await call(b, sightings[3]!, { verdict: 'unidentifiable' })).body.sighting.state).toBe(
      'unidentifiable',
    );
  });

  it('should never give a reviewer their own proposed sighting', async () => {
    const mine = await next(a);
    expect(mine.body.sighting.id).toBe(sightings[4]);
    await call(a, sightings[4]!, { verdict: 'unidentifiable' });
    const again = await next(a);
    expect(again.status).toBe(204);
    expect((await next(b)).body.sighting.id).toBe(sightings[4]);
  });

  it('should refuse bad calls with clear messages', async () => {
    const s = sightings[4]!;
    expect((await call(a, s, { verdict: 'match' })).body.error.message).toMatch(
      /needs the individual/,
    );
    expect((await call(a, s, { verdict: 'maybe' })).status).toBe(400);
    expect(
      (await call(a, s, { verdict: 'unidentifiable', individualId: '0123456789abcdef0123' }))
        .status,
    ).toBe(400);
    expect(
      (await call(b, s, { verdict: 'match', individualId: '0123456789abcdef0123' })).status,
    ).toBe(404);
    const twice = await call(a, s, { verdict: 'unidentifiable' });
    expect(twice.status).toBe(409);
    expect(twice.body.error.message).toMatch(/already made a call/);
    const done = await call(b, sightings[0]!, { verdict: 'unidentifiable' });
    expect(done.status).toBe(409);
    const volunteer = await signIn(ctx.app, team.users.volunteer.email);
    expect((await next(volunteer)).status).toBe(403);
    expect((await call(volunteer, s, { verdict: 'unidentifiable' })).status).toBe(403);
  });

  it('should let one call decide when the project asks for one reviewer per sighting', async () => {
    // B finishes the double review it was given, then the project switches to one reviewer.
    expect((await call(b, sightings[4]!, { verdict: 'unidentifiable' })).body.sighting.state).toBe(
      'unidentifiable',
    );
    await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 1 });
    try {
      const [single] = await leopardSightings(ecologist, a, SLUG, 'I02', 1, 'right', 5);
      expect((await next(b)).body.sighting.id).toBe(single);
      const res = await call(b, single!, {
        verdict: 'new',
        individual: {
          nickname: null,
          sex: 'male',
          notes: 'kinked tail tip',
          tags: ['kinked tail tip'],
        },
      });
      expect(res.body.sighting.state).toBe('confirmed');
      expect(res.body.individual.code).toBe('TS-002');
    } finally {
      await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 2 });
    }
  });
});

describe('the catalogue', () => {
  it('should search by code, nickname and marking notes, and filter by flank coverage and sex', async () => {
    const search = async (q: string) =>
      (await a.get(`/api/projects/${SLUG}/individuals?query=${encodeURIComponent(q)}`)).body.map(
        (e: { code: string }) => e.code,
      );
    // Fuzzy text search puts the best match first; a code or alias finds exactly that individual.
    expect((await search('Tembo'))[0]).toBe('TS-001');
    expect((await search('kinked tail'))[0]).toBe('TS-002');
    expect(await search('ts-001')).toEqual(['TS-001']);
    expect(await search('TS-002')).toEqual(['TS-002']);
    const right = await a.get(`/api/projects/${SLUG}/individuals?coverage=right`);
    expect(right.body.map((e: { code: string }) => e.code)).toEqual(['TS-002']);
    const females = await a.get(`/api/projects/${SLUG}/individuals?sex=female`);
    expect(females.body.map((e: { code: string }) => e.code)).toEqual(['TS-001']);
    expect((await a.get(`/api/projects/${SLUG}/individuals?coverage=sideways`)).status).toBe(400);
  });

  it('should show an individual page with its timeline and generalised stations, by id, code or alias', async () => {
    const byCode = await a.get(`/api/projects/${SLUG}/individuals/TS-001`);
    expect(byCode.status).toBe(200);
    expect(byCode.body.timeline).toHaveLength(2);
    expect(byCode.body.stationsDetected).toEqual([
      expect.objectContaining({ code: 'I01', detections: 2, lat: -1.2, lon: 36.6 }),
    ]);
    expect(byCode.body.coordinatePrecision).toBe(0.1);
    const exact = await ecologist.get(`/api/projects/${SLUG}/individuals/${byCode.body.id}`);
    expect(exact.body.coordinatePrecision).toBeNull();
    await ctx.db
      .insertInto('aliases')
      .values({
        project_id: team.project.id,
        code: 'TS-900',
        individual_id: byCode.body.id,
        change_id: null,
        created_at: new Date().toISOString(),
      })
      .execute();
    const byAlias = await a.get(`/api/projects/${SLUG}/individuals/ts-900`);
    expect(byAlias.body).toMatchObject({
      id: byCode.body.id,
      code: 'TS-001',
      resolvedFromAlias: true,
    });
    expect(
      (await a.get(`/api/projects/${SLUG}/individuals?query=TS-900`)).body.map(
        (e: { code: string }) => e.code,
      ),
    ).toEqual(['TS-001']);
    expect((await a.get(`/api/projects/${SLUG}/individuals/TS-999`)).status).toBe(404);
  });

  it('should let curators edit records and choose reference photos, with history, and nobody else', async () => {
    const detail = (await a.get(`/api/projects/${SLUG}/individuals/TS-001`)).body;
    expect(
      (await a.patch(`/api/projects/${SLUG}/individuals/${detail.id}`, { nickname: 'X' })).status,
    ).toBe(403);
    const curator = await signIn(ctx.app, team.users.curator.email);
    const edited = await curator.patch(`/api/projects/${SLUG}/individuals/${detail.id}`, {
      nickname: 'Tembo II',
      tags: ['notched left ear', 'scar on right shoulder'],
    });
    expect(edited.body).toMatchObject({ nickname: 'Tembo II' });
    expect(edited.body.history[0]).toMatchObject({
      action: 'update',
      by: 'The curator',
      before: { nickname: 'Tembo' },
    });
    const photos = detail.timeline.map((t: { photoId: string }) => t.photoId);
    const refs = await curator.put(`/api/projects/${SLUG}/individuals/${detail.id}/references`, {
      flank: 'left',
      photoIds: [photos[1], photos[0]],
    });
    expect(refs.body.references.map((r: { photoId: string }) => r.photoId)).toEqual([
      photos[1],
      photos[0],
    ]);
    const foreign = (
      await ctx.db
        .selectFrom('photos')
        .select('id')
        .where('id', 'not in', photos)
        .executeTakeFirstOrThrow()
    ).id;
    expect(
      (
        await curator.put(`/api/projects/${SLUG}/individuals/${detail.id}/references`, {
          flank: 'left',
          photoIds: [foreign],
        })
      ).status,
    ).toBe(400);
  });
});

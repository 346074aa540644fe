import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { identityDump, individualWithSightings } from '../support/curate-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic sightings catalogued through the real API (one reviewer per sighting).

let ctx: TestContext;
let ecologist: TestClient;
let reviewer: TestClient;
let curator: TestClient;
let a: { id: string; code: string; sightings: string[] };
let b: { id: string; code: string; sightings: string[] };
let c: { id: string; code: string; sightings: string[] };
const SLUG = 'test-survey';
const url = (path: string) => `/api/projects/${SLUG}${path}`;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  curator = await signIn(ctx.app, team.users.curator.email);
  await ecologist.patch(url(''), { reviewersPerSighting: 1 });
  a = await individualWithSightings(ecologist, reviewer, SLUG, 'M01', 3, 'left', 2, {
    notes: 'notched left ear',
  });
  b = await individualWithSightings(ecologist, reviewer, SLUG, 'M02', 2, 'both', 3);
  c = await individualWithSightings(ecologist, reviewer, SLUG, 'M03', 2, 'left', 4);
});
afterAll(async () => ctx.close());

describe('merge and undo', () => {
  it('should move every sighting and call, keep the old code as an alias, and undo to the very same rows', async () => {
    const before = await identityDump(ctx.db);
    const merged = await curator.post(url(`/individuals/${a.id}/merge`), {
      into: b.id,
      reason: 'same rosettes on both flanks',
    });
    expect(merged.status).toBe(200);
    expect(merged.body.change).toMatchObject({
      kind: 'merge',
      moved: { sightings: 3, calls: 3 },
      reason: 'same rosettes on both flanks',
    });
    expect(merged.body.change.summary).toBe(
      `${a.code} merged into ${b.code}: 3 sightings and 3 calls moved`,
    );

    const viaAlias = await reviewer.get(url(`/individuals/${a.code}`));
    expect(viaAlias.body).toMatchObject({
      id: b.id,
      code: b.code,
      resolvedFromAlias: true,
      sightings: 5,
      aliases: [a.code],
    });
    const search = await reviewer.get(url(`/individuals?query=${a.code}`));
    expect(search.body.map((e: { code: string }) => e.code)).toEqual([b.code]);
    const merging = await ctx.db
      .selectFrom('sightings')
      .select('individual_id')
      .where('id', 'in', a.sightings)
      .execute();
    expect(merging.every((s) => s.individual_id === b.id)).toBe(true);

    const undone = await curator.post(url(`/identity-changes/${merged.body.change.id}/undo`), {
      reason: 'merged too early',
    });
    expect(undone.status).toBe(200);
    expect(undone.body.change).toMatchObject({ kind: 'undo', undoes: merged.body.change.id });
    expect(await identityDump(ctx.db)).toEqual(before);
    expect((await reviewer.get(url(`/individuals/${a.code}`))).body.id).toBe(a.id);
    const again = await curator.post(url(`/identity-changes/${merged.body.change.id}/undo`), {});
    expect(again.status).toBe(409);
  });

  it('should undo a merge after later unrelated changes', async () => {
    const before = await identityDump(ctx.db);
    const merged = await curator.post(url(`/individuals/${a.id}/merge`), {
      into: b.id,
      reason: 'same animal',
    });
    const unrelated = await curator.post(url(`/individuals/${c.id}/split`), {
      sightingIds: [c.sightings[1]],
      reason: 'different tail',
    });
    expect(unrelated.status).toBe(200);
    expect(
      (await curator.post(url(`/identity-changes/${merged.body.change.id}/undo`), {})).status,
    ).toBe(200);
    expect(
      (await curator.post(url(`/identity-changes/${unrelated.body.change.id}/undo`), {})).status,
    ).toBe(200);
    const after = await identityDump(ctx.db);
    // The split's new individual is kept as discarded (its code is never reused); all else is as before.
    expect({
      ...after,
      individuals: after.individuals.filter((i) => i.status !== 'discarded'),
    }).toEqual(before);
  });

  it('should refuse an undo that conflicts with a later change on the same individuals, and change nothing', async () => {
    const merged = await curator.post(url(`/individuals/${a.id}/merge`), {
      into: b.id,
      reason: 'same animal',
    });
    const split = await curator.post(url(`/individuals/${b.id}/split`), {
      sightingIds: [a.sightings[0]],
      reason: 'this one is a different cat',
    });
    expect(split.status).toBe(200);
    const before = await identityDump(ctx.db);
    const blocked = await curator.post(url(`/identity-changes/${merged.body.change.id}/undo`), {});
    expect(blocked.status).toBe(409);
    expect(blocked.body.error.message).toMatch(/later change \(split\)/);
    expect(blocked.body.error.details.changes[0].id).toBe(split.body.change.id);
    expect(await identityDump(ctx.db)).toEqual(before);
    expect(
      (await curator.post(url(`/identity-changes/${split.body.change.id}/undo`), {})).status,
    ).toBe(200);
    expect(
      (await curator.post(url(`/identity-changes/${merged.body.change.id}/undo`), {})).status,
    ).toBe(200);
  });
});

describe('split and undo', () => {
  it('should move chosen sightings to a new individual with a fresh code, and undo exactly', async () => {
    const before = await identityDump(ctx.db);
    const split = await curator.post(url(`/individuals/${a.id}/split`), {
      sightingIds: [a.sightings[1], a.sightings[2]],
      reason: 'two animals were lumped',
      individual: { nickname: 'Twin', sex: 'female', notes: '', tags: [] },
    });
    expect(split.status).toBe(200);
    const newId = split.body.change.individuals[1].id as string;
    const newCode = split.body.change.individuals[1].code as string;
    expect(split.body.change.summary).toBe(
      `2 sightings of ${a.code} moved to new individual ${newCode}`,
    );
    expect((await reviewer.get(url(`/individuals/${newId}`))).body).toMatchObject({
      nickname: 'Twin',
      sightings: 2,
    });
    expect(
      (await curator.post(url(`/identity-changes/${split.body.change.id}/undo`), {})).status,
    ).toBe(200);
    const after = await identityDump(ctx.db);
    expect(after.individuals.find((i) => i.id === newId)).toMatchObject({
      status: 'discarded',
      code: newCode,
    });
    expect({ ...after, individuals: after.individuals.filter((i) => i.id !== newId) }).toEqual({
      ...before,
      individuals: before.individuals.filter((i) => i.id !== newId),
    });
    // Codes are never reused.
    const next = await curator.post(url(`/individuals/${a.id}/split`), {
      sightingIds: [a.sightings[2]],
      reason: 'again',
    });
    expect(next.body.change.individuals[1].code).not.toBe(newCode);
    await curator.post(url(`/identity-changes/${next.body.change.id}/undo`), {});
  });

  it('should move sightings into an existing individual', async () => {
    const res = await curator.post(url(`/individuals/${a.id}/split`), {
      sightingIds: [a.sightings[0]],
      into: c.id,
      reason: 'it is C',
    });
    expect(res.body.change.summary).toBe(`1 sightings of ${a.code} moved to ${c.code}`);
    await curator.post(url(`/identity-changes/${res.body.change.id}/undo`), {});
  });
});

describe('bad requests and roles', () => {
  it('should refuse nonsense with clear messages', async () => {
    expect(
      (await curator.post(url(`/individuals/${a.id}/merge`), { into: a.id, reason: 'self' }))
        .status,
    ).toBe(400);
    expect(
      (
        await curator.post(url(`/individuals/${a.id}/merge`), {
          into: '0123456789abcdef0123',
          reason: 'nobody',
        })
      ).status,
    ).toBe(404);
    expect(
      (await curator.post(url(`/individuals/${a.id}/merge`), { into: b.id, reason: '' })).body.error
        .message,
    ).toMatch(/Say why/);
    expect(
      (
        await curator.post(url(`/individuals/${a.id}/split`), {
          sightingIds: [b.sightings[0]],
          reason: 'not mine',
        })
      ).status,
    ).toBe(400);
    const all = await curator.post(url(`/individuals/${a.id}/split`), {
      sightingIds: a.sightings,
      reason: 'everything',
    });
    expect(all.status).toBe(409);
    expect(all.body.error.message).toMatch(/merge instead/);
    expect(
      (await curator.post(url('/identity-changes/0123456789abcdef0123/undo'), {})).status,
    ).toBe(404);
  });

  it('should refuse every curation action to reviewers', async () => {
    expect(
      (await reviewer.post(url(`/individuals/${a.id}/merge`), { into: b.id, reason: 'same' }))
        .status,
    ).toBe(403);
    expect(
      (
        await reviewer.post(url(`/individuals/${a.id}/split`), {
          sightingIds: [a.sightings[0]],
          reason: 'x',
        })
      ).status,
    ).toBe(403);
    expect((await reviewer.get(url('/identity-changes'))).status).toBe(403);
    expect((await reviewer.get(url('/duplicates'))).status).toBe(403);
    expect((await reviewer.get(url('/disputes'))).status).toBe(403);
    expect((await reviewer.post(url('/curate/digest'))).status).toBe(403);
  });

  it('should list the history of identity changes, newest first, with what each moved', async () => {
    const history = await curator.get(url('/identity-changes'));
    expect(history.body.length).toBeGreaterThan(6);
    expect(history.body[0].kind).toBe('undo');
    const merges = history.body.filter((h: { kind: string }) => h.kind === 'merge');
    expect(merges.every((m: { undoneBy: string | null }) => m.undoneBy)).toBe(true);
  });
});

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

// Ten reviewers work the same Identify queue at once (synthetic sightings): nobody calls a
// sighting twice, no call is lost, and every sighting ends with exactly two independent calls.

let ctx: TestContext;
let reviewers: TestClient[];
let sightings: string[];
let individualId: string;
const SLUG = 'test-survey';

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  const ecologist = await signIn(ctx.app, team.users.ecologist.email);
  const first = await signIn(ctx.app, team.users.reviewer.email);
  // One known individual, made in single-review mode, that every call will match.
  await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 1 });
  const [seed] = await leopardSightings(ecologist, first, SLUG, 'C00', 1);
  const made = await first.post(`/api/projects/${SLUG}/sightings/${seed}/calls`, {
    verdict: 'new',
  });
  individualId = made.body.individual.id;
  await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 2 });
  sightings = await leopardSightings(ecologist, first, SLUG, 'C01', 20, 'left', 3);
  reviewers = [];
  for (let i = 0; i < 10; i++) {
    const u = await createUser(
      ctx.db,
      { email: `r${i}@test-survey.test`, name: `Reviewer ${i}`, password: TEST_PASSWORD },
      null,
    );
    await setMemberRole(ctx.db, team.project.id, u.id, 'reviewer', team.users.admin.id);
    reviewers.push(await signIn(ctx.app, u.email));
  }
});
afterAll(async () => ctx.close());

describe('ten reviewers on one queue', () => {
  it('should record every call once and finish every sighting with two calls from different people', async () => {
    const accepted: { reviewer: number; sighting: string }[] = [];
    const refused: string[] = [];
    await Promise.all(
      reviewers.map(async (client, r) => {
        for (let round = 0; round < 60; round++) {
          const next = await client.get(`/api/projects/${SLUG}/identify/next`);
          if (next.status === 204) return;
          const id = next.body.sighting.id as string;
          const res = await client.post(`/api/projects/${SLUG}/sightings/${id}/calls`, {
            verdict: 'match',
            individualId,
          });
          if (res.status === 200) accepted.push({ reviewer: r, sighting: id });
          else refused.push(`${res.status} ${res.body.error?.message}`);
        }
      }),
    );
    const calls = await ctx.db
      .selectFrom('calls')
      .selectAll()
      .where('sighting_id', 'in', sightings)
      .execute();
    expect(calls).toHaveLength(accepted.length);
    expect(calls).toHaveLength(40);
    const pairs = new Set(calls.map((c) => `${c.sighting_id}/${c.reviewer_id}`));
    expect(pairs.size).toBe(calls.length);
    const rows = await ctx.db
      .selectFrom('sightings')
      .select(['id', 'state', 'individual_id'])
      .where('id', 'in', sightings)
      .execute();
    expect(rows.every((s) => s.state === 'confirmed' && s.individual_id === individualId)).toBe(
      true,
    );
    for (const id of sightings) expect(calls.filter((c) => c.sighting_id === id)).toHaveLength(2);
    // Refusals, if any, are explained conflicts, never errors.
    expect(refused.every((m) => m.startsWith('409'))).toBe(true);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sendDueDigests } from '../../server/services/digest.service';
import { createUser } from '../../server/services/users.service';
import { setMemberRole } from '../../server/services/members.service';
import { identityDump, individualWithSightings } from '../support/curate-helpers';
import { leopardSightings } from '../support/identify-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  TEST_PASSWORD,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Disputes, suggested duplicates and the digest e-mail, on synthetic sightings made through the API.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let reviewer: TestClient;
let second: TestClient;
let curator: TestClient;
const SLUG = 'test-survey';
const url = (path: string) => `/api/projects/${SLUG}${path}`;

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  const other = await createUser(
    ctx.db,
    { email: 'second@test-survey.test', name: 'Second', password: TEST_PASSWORD },
    null,
  );
  await setMemberRole(ctx.db, team.project.id, other.id, 'reviewer', team.users.admin.id);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  second = await signIn(ctx.app, 'second@test-survey.test');
  curator = await signIn(ctx.app, team.users.curator.email);
});
afterAll(async () => ctx.close());

describe('disputes', () => {
  it('should show both calls to the curator, record the decision, tell both reviewers, and undo it', async () => {
    await ecologist.patch(url(''), { reviewersPerSighting: 1 });
    const known = await individualWithSightings(ecologist, reviewer, SLUG, 'D01', 1, 'left', 2);
    await ecologist.patch(url(''), { reviewersPerSighting: 2 });
    const [s] = await leopardSightings(ecologist, reviewer, SLUG, 'D02', 1, 'left', 3);
    await reviewer.get(url('/identify/next'));
    await reviewer.post(url(`/sightings/${s}/calls`), { verdict: 'match', individualId: known.id });
    await second.get(url('/identify/next'));
    const disputed = await second.post(url(`/sightings/${s}/calls`), {
      verdict: 'new',
      note: 'tail is different',
    });
    expect(disputed.body.sighting.state).toBe('disputed');

    const list = await curator.get(url('/disputes'));
    expect(list.body).toHaveLength(1);
    expect(
      list.body[0].calls.map((c: { reviewer: string; verdict: string; code: string | null }) => [
        c.reviewer,
        c.verdict,
        c.code,
      ]),
    ).toEqual([
      ['The reviewer', 'match', known.code],
      ['Second', 'new', null],
    ]);
    const before = await identityDump(ctx.db);
    const decided = await curator.post(url(`/sightings/${s}/resolve`), {
      verdict: 'match',
      individualId: known.id,
      reason: 'the shoulder rosettes match',
    });
    expect(decided.status).toBe(200);
    expect(decided.body.change.summary).toBe(`Dispute decided: confirmed as ${known.code}`);
    for (const client of [reviewer, second]) {
      const mine = (await client.get(url('/calls/mine'))).body.find(
        (c: { sightingId: string }) => c.sightingId === s,
      );
      expect(mine).toMatchObject({ outcome: 'confirmed', finalCode: known.code });
    }
    // The second reviewer's provisional individual was left out, so it is discarded.
    const provisional = await ctx.db
      .selectFrom('individuals')
      .select('status')
      .where('status', '=', 'discarded')
      .execute();
    expect(provisional).toHaveLength(1);
    expect(
      (await curator.post(url(`/identity-changes/${decided.body.change.id}/undo`), {})).status,
    ).toBe(200);
    expect(await identityDump(ctx.db)).toEqual(before);
    expect(
      (
        await curator.post(url(`/sightings/${s}/resolve`), {
          verdict: 'new',
          reason: 'a new leopard after all',
        })
      ).status,
    ).toBe(200);
    expect(
      (await curator.post(url(`/sightings/${s}/resolve`), { verdict: 'new', reason: 'again' }))
        .status,
    ).toBe(409);
  });
});

describe('suggested duplicates', () => {
  it('should suggest two opposite-flank partial identities seen in the same event, with evidence, until dismissed', async () => {
    await ecologist.patch(url(''), { reviewersPerSighting: 1 });
    const left = await individualWithSightings(ecologist, reviewer, SLUG, 'G01', 2, 'left', 6, {
      notes: 'scar on left flank',
    });
    // The same events also show a right flank, catalogued as a second animal (the "ghost").
    const events = await ctx.db
      .selectFrom('sightings')
      .select(['event_id', 'best_photo_id'])
      .where('id', 'in', left.sightings)
      .execute();
    const ghost: string[] = [];
    for (const e of events) {
      await ctx.db
        .updateTable('events')
        .set({ animal_count: 2 })
        .where('id', '=', e.event_id)
        .execute();
      const made = await reviewer.post(url(`/events/${e.event_id}/sightings`), {
        flank: 'right',
        quality: 'good',
        bestPhotoId: e.best_photo_id,
      });
      ghost.push(made.body.id);
    }
    const first = await reviewer.post(url(`/sightings/${ghost[0]}/calls`), { verdict: 'new' });
    await reviewer.post(url(`/sightings/${ghost[1]}/calls`), {
      verdict: 'match',
      individualId: first.body.individual.id,
    });
    const suggestions = await curator.get(url('/duplicates'));
    const pair = suggestions.body.find(
      (s: { first: { id: string }; second: { id: string } }) =>
        [s.first.id, s.second.id].sort().join() ===
        [left.id, first.body.individual.id].sort().join(),
    );
    expect(pair.evidence.map((e: { kind: string }) => e.kind)).toContain('opposite-flanks');
    expect(pair.evidence[0].text).toMatch(/same event/);
    expect([pair.first.flanks, pair.second.flanks].sort()).toEqual([
      'left flank only',
      'right flank only',
    ]);
    const dismissed = await curator.post(url('/duplicates/dismiss'), {
      first: left.id,
      second: first.body.individual.id,
      reason: 'different animals',
    });
    expect(dismissed.status).toBe(204);
    const after = await curator.get(url('/duplicates'));
    expect(
      after.body.some(
        (s: { first: { id: string }; second: { id: string } }) =>
          [s.first.id, s.second.id].includes(left.id) &&
          [s.first.id, s.second.id].includes(first.body.individual.id),
      ),
    ).toBe(false);
  });
});

describe('the curators’ digest', () => {
  async function digests(): Promise<{ to_addr: string; subject: string; text: string }[]> {
    return ctx.db
      .selectFrom('mail_messages')
      .select(['to_addr', 'subject', 'text'])
      .where('subject', 'like', 'Maculo:%')
      .orderBy('received_at')
      .execute();
  }

  it('should mail every curator and ecologist the pending counts with a link to Curate, on demand', async () => {
    const res = await curator.post(url('/curate/digest'));
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ recipients: 2 });
    const mails = await digests();
    expect(mails.map((m) => m.to_addr).sort()).toEqual(
      [team.users.curator.email, team.users.ecologist.email].sort(),
    );
    expect(mails[0]!.subject).toBe(
      `Maculo: ${res.body.disputes} disputes and ${res.body.suggestions} possible duplicates in Survey test-survey`,
    );
    expect(mails[0]!.text).toContain('http://maculo.test/p/test-survey/curate');
  });

  it('should send the daily digest once a day from 06:00 project time, and not before', async () => {
    await ctx.db.deleteFrom('mail_messages').execute();
    // Something must be pending: mark one sighting disputed.
    const any = await ctx.db
      .selectFrom('sightings')
      .select('id')
      .where('state', '=', 'confirmed')
      .executeTakeFirstOrThrow();
    await ctx.db
      .updateTable('sightings')
      .set({ state: 'disputed' })
      .where('id', '=', any.id)
      .execute();
    await ctx.db.updateTable('projects').set({ last_digest_at: '2026-07-09T05:00:00Z' }).execute();
    // Africa/Nairobi is UTC+3: 02:30 UTC is 05:30 local (too early); 03:30 UTC is 06:30 local.
    expect(
      await sendDueDigests(
        ctx.db,
        ctx.mailer,
        'http://maculo.test',
        Date.parse('2026-07-10T02:30:00Z'),
      ),
    ).toBe(0);
    expect(
      await sendDueDigests(
        ctx.db,
        ctx.mailer,
        'http://maculo.test',
        Date.parse('2026-07-10T03:30:00Z'),
      ),
    ).toBe(1);
    await ctx.db.updateTable('projects').set({ last_digest_at: '2026-07-10T03:30:00Z' }).execute();
    expect(
      await sendDueDigests(
        ctx.db,
        ctx.mailer,
        'http://maculo.test',
        Date.parse('2026-07-10T15:00:00Z'),
      ),
    ).toBe(0);
    expect(
      await sendDueDigests(
        ctx.db,
        ctx.mailer,
        'http://maculo.test',
        Date.parse('2026-07-11T04:00:00Z'),
      ),
    ).toBe(1);
    expect((await digests()).length).toBe(4);
    // Nothing pending, nothing sent.
    await ctx.db
      .updateTable('sightings')
      .set({ state: 'confirmed' })
      .where('id', '=', any.id)
      .execute();
    await ctx.db.updateTable('projects').set({ last_digest_at: null }).execute();
    const pendingPairs = (await curator.get(url('/duplicates'))).body.length;
    expect(
      await sendDueDigests(
        ctx.db,
        ctx.mailer,
        'http://maculo.test',
        Date.parse('2026-07-12T04:00:00Z'),
      ),
    ).toBe(pendingPairs ? 1 : 0);
  });
});

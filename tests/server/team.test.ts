import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  createTestContext,
  linkIn,
  seedTeam,
  signIn,
  TestClient,
  waitForMail,
  type TestContext,
} from '../support/test-app';

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;

beforeEach(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
});
afterEach(async () => ctx.close());

describe('invitations', () => {
  it('should invite by e-mail and let the person set a password, join and be signed in', async () => {
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    const invited = await ecologist.post('/api/projects/test-survey/invitations', {
      email: 'New.Person@Example.org',
      role: 'reviewer',
    });
    expect(invited.status).toBe(201);
    expect(invited.body).toMatchObject({
      email: 'new.person@example.org',
      role: 'reviewer',
      acceptedAt: null,
    });

    const mail = await waitForMail(ctx.db, 'new.person@example.org');
    expect(mail.subject).toBe('Invitation to Survey test-survey on Maculo');
    const link = linkIn(mail.text);
    expect(link.startsWith('http://maculo.test/invitations/')).toBe(true);
    const token = link.split('/invitations/')[1]!;

    const guest = await new TestClient(ctx.app).init();
    const preview = await guest.get(`/api/invitations/${token}`);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      email: 'new.person@example.org',
      projectSlug: 'test-survey',
      role: 'reviewer',
      accountExists: false,
    });

    const accepted = await guest.post(`/api/invitations/${token}/accept`, {
      name: 'New Person',
      password: 'a-good-long-password',
    });
    expect(accepted.status).toBe(200);
    expect(accepted.body.memberships).toEqual([{ projectSlug: 'test-survey', role: 'reviewer' }]);
    expect((await guest.get('/api/auth/me')).body.user.name).toBe('New Person');

    const reused = await new TestClient(ctx.app)
      .init()
      .then((c) =>
        c.post(`/api/invitations/${token}/accept`, { name: 'X', password: 'a-good-long-password' }),
      );
    expect(reused.status).toBe(410);
    await signIn(ctx.app, 'new.person@example.org', 'a-good-long-password');
  });

  it('should add an existing account to the project only with its password', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    await admin.post('/api/admin/projects', {
      slug: 'second-survey',
      name: 'Second survey',
      targetSpeciesScientific: 'Panthera pardus',
      targetSpeciesCommon: 'Leopard',
      codePrefix: 'SS',
    });
    await admin.post('/api/projects/second-survey/invitations', {
      email: team.users.volunteer.email,
      role: 'curator',
    });
    const token = linkIn((await waitForMail(ctx.db, team.users.volunteer.email)).text).split(
      '/invitations/',
    )[1]!;
    const guest = await new TestClient(ctx.app).init();
    expect((await guest.get(`/api/invitations/${token}`)).body.accountExists).toBe(true);
    const wrong = await guest.post(`/api/invitations/${token}/accept`, {
      name: 'x',
      password: 'not-my-password',
    });
    expect(wrong.status).toBe(401);
    const ok = await guest.post(`/api/invitations/${token}/accept`, {
      name: 'x',
      password: 'correct-horse-battery',
    });
    expect(ok.status).toBe(200);
    expect(ok.body.memberships).toEqual(
      expect.arrayContaining([
        { projectSlug: 'second-survey', role: 'curator' },
        { projectSlug: 'test-survey', role: 'volunteer' },
      ]),
    );
  });

  it('should refuse invitations from roles below ecologist and to existing members', async () => {
    const curator = await signIn(ctx.app, team.users.curator.email);
    expect(
      (
        await curator.post('/api/projects/test-survey/invitations', {
          email: 'a@b.org',
          role: 'volunteer',
        })
      ).status,
    ).toBe(403);
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    const dup = await ecologist.post('/api/projects/test-survey/invitations', {
      email: team.users.reviewer.email,
      role: 'curator',
    });
    expect(dup.status).toBe(409);
    const bad = await ecologist.post('/api/projects/test-survey/invitations', {
      email: 'not-an-email',
      role: 'boss',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.details.request).toHaveLength(2);
  });

  it('should refuse an expired or made-up invitation link', async () => {
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    await ecologist.post('/api/projects/test-survey/invitations', {
      email: 'late@example.org',
      role: 'volunteer',
    });
    const token = linkIn((await waitForMail(ctx.db, 'late@example.org')).text).split(
      '/invitations/',
    )[1]!;
    await ctx.db.updateTable('invitations').set({ expires_at: '2001-01-01T00:00:00Z' }).execute();
    const guest = await new TestClient(ctx.app).init();
    expect((await guest.get(`/api/invitations/${token}`)).status).toBe(410);
    expect((await guest.get(`/api/invitations/${'x'.repeat(43)}`)).status).toBe(404);
    expect((await guest.get('/api/invitations/bad$token')).status).toBe(400);
  });
});

describe('members and roles', () => {
  it('should list members with e-mails only for ecologists', async () => {
    const volunteer = await signIn(ctx.app, team.users.volunteer.email);
    const list = await volunteer.get('/api/projects/test-survey/members');
    expect(list.status).toBe(200);
    expect(list.body.map((m: { role: string }) => m.role)).toEqual([
      'ecologist',
      'curator',
      'reviewer',
      'volunteer',
    ]);
    expect(list.body.every((m: { email: string | null }) => m.email === null)).toBe(true);
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    const full = await ecologist.get('/api/projects/test-survey/members');
    expect(full.body.every((m: { email: string | null }) => typeof m.email === 'string')).toBe(
      true,
    );
  });

  it('should let an ecologist change a role and record it in the audit log', async () => {
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    const res = await ecologist.put(
      `/api/projects/test-survey/members/${team.users.volunteer.id}`,
      { role: 'reviewer' },
    );
    expect(res.status).toBe(200);
    const volunteer = await signIn(ctx.app, team.users.volunteer.email);
    expect((await volunteer.get('/api/auth/me')).body.memberships).toEqual([
      { projectSlug: 'test-survey', role: 'reviewer' },
    ]);
    const audit = await ctx.db
      .selectFrom('audit_log')
      .selectAll()
      .where('action', '=', 'change-role')
      .execute();
    expect(audit).toHaveLength(1);
    expect(JSON.parse(audit[0]!.before!)).toEqual({ role: 'volunteer' });
    expect(JSON.parse(audit[0]!.after!)).toEqual({ role: 'reviewer' });
  });

  it('should show a member only their own projects', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    await admin.post('/api/admin/projects', {
      slug: 'other-survey',
      name: 'Other',
      targetSpeciesScientific: 'Panthera pardus',
      targetSpeciesCommon: 'Leopard',
      codePrefix: 'OT',
    });
    const reviewer = await signIn(ctx.app, team.users.reviewer.email);
    expect((await reviewer.get('/api/projects')).body).toEqual([
      { slug: 'test-survey', name: 'Survey test-survey', role: 'reviewer' },
    ]);
    expect((await reviewer.get('/api/projects/other-survey')).status).toBe(403);
    expect((await reviewer.get('/api/projects/no-such-survey')).status).toBe(404);
  });
});

describe('admin', () => {
  it('should create a user without a password and mail them a set-password link', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.post('/api/admin/users', {
      email: 'fresh@example.org',
      name: 'Fresh Person',
    });
    expect(res.status).toBe(201);
    expect(res.body).toMatchObject({ email: 'fresh@example.org', isAdmin: false, disabled: false });
    const token = linkIn((await waitForMail(ctx.db, 'fresh@example.org')).text).split(
      '/reset-password/',
    )[1]!;
    const guest = await new TestClient(ctx.app).init();
    expect(
      (
        await guest.post('/api/auth/password-reset/confirm', {
          token,
          newPassword: 'my-chosen-password',
        })
      ).status,
    ).toBe(204);
    await signIn(ctx.app, 'fresh@example.org', 'my-chosen-password');
    expect(
      (await admin.post('/api/admin/users', { email: 'fresh@example.org', name: 'Again' })).status,
    ).toBe(409);
  });

  it("should stop a disabled user's open sessions at once", async () => {
    const reviewer = await signIn(ctx.app, team.users.reviewer.email);
    expect((await reviewer.get('/api/projects')).status).toBe(200);
    const admin = await signIn(ctx.app, team.users.admin.email);
    expect(
      (await admin.patch(`/api/admin/users/${team.users.reviewer.id}`, { disabled: true })).status,
    ).toBe(200);
    expect((await reviewer.get('/api/projects')).status).toBe(401);
    await expect(signIn(ctx.app, team.users.reviewer.email)).rejects.toThrow(/401/);
  });

  it('should keep admins from disabling themselves', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.patch(`/api/admin/users/${team.users.admin.id}`, { disabled: true });
    expect(res.status).toBe(409);
  });

  it('should let admins read the local outbox, newest first, page by page', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    for (const n of [1, 2, 3]) {
      await admin.post('/api/projects/test-survey/invitations', {
        email: `p${n}@example.org`,
        role: 'volunteer',
      });
    }
    await waitForMail(ctx.db, 'p3@example.org');
    const first = await admin.get('/api/admin/outbox?limit=2');
    expect(first.status).toBe(200);
    expect(first.body.items).toHaveLength(2);
    expect(first.body.next).toBeTruthy();
    const second = await admin.get(`/api/admin/outbox?limit=2&after=${first.body.next}`);
    expect(second.body.items).toHaveLength(1);
    expect(second.body.next).toBeNull();
    const all = [...first.body.items, ...second.body.items].map((m: { to: string }) => m.to).sort();
    expect(all).toEqual(['p1@example.org', 'p2@example.org', 'p3@example.org']);
    const one = await admin.get(`/api/admin/outbox/${first.body.items[0].id}`);
    expect(one.body.text).toContain('/invitations/');
    expect((await admin.get('/api/admin/outbox?after=garbage')).status).toBe(400);
  });
});

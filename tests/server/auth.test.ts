import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  createTestContext,
  linkIn,
  seedTeam,
  signIn,
  TestClient,
  TEST_PASSWORD,
  waitForMail,
  type TestContext,
} from '../support/test-app';

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;

beforeEach(async () => {
  ctx = await createTestContext({ LOGIN_RATE_LIMIT: '3' });
  team = await seedTeam(ctx.db);
});
afterEach(async () => ctx.close());

function sessionCookie(res: { headers: Record<string, unknown> }): string | undefined {
  const cookies = ([] as string[]).concat(
    (res.headers['set-cookie'] as string[] | undefined) ?? [],
  );
  return cookies.find((c) => c.startsWith('maculo.sid='));
}

describe('sign-in', () => {
  it('should answer health without sign-in', async () => {
    const res = await new TestClient(ctx.app).get('/api/health');
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ status: 'ok' });
  });

  it('should sign in and return the user with memberships and an httpOnly lax session cookie', async () => {
    const client = await new TestClient(ctx.app).init();
    const res = await client.post('/api/auth/login', {
      email: 'Curator@Test-Survey.test',
      password: TEST_PASSWORD,
    });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({
      user: {
        id: team.users.curator.id,
        email: 'curator@test-survey.test',
        name: 'The curator',
        isAdmin: false,
      },
      memberships: [{ projectSlug: 'test-survey', role: 'curator' }],
    });
    const cookie = sessionCookie(res);
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=Lax/i);
    expect(cookie).not.toMatch(/Secure/i);
    const me = await client.get('/api/auth/me');
    expect(me.status).toBe(200);
    expect(me.body.user.email).toBe('curator@test-survey.test');
  });

  it('should set Secure cookies when served over https (behind a TLS proxy on loopback)', async () => {
    const secure = await createTestContext({ PUBLIC_URL: 'https://maculo.example' });
    try {
      await seedTeam(secure.db);
      const request = (await import('supertest')).default;
      const first = await request(secure.app).get('/api/health').set('X-Forwarded-Proto', 'https');
      const xsrf = ([] as string[])
        .concat(first.headers['set-cookie'] ?? [])
        .find((c) => c.startsWith('XSRF-TOKEN='))!;
      expect(xsrf).toMatch(/Secure/i);
      const token = xsrf.split(';')[0]!.slice('XSRF-TOKEN='.length);
      const res = await request(secure.app)
        .post('/api/auth/login')
        .set('X-Forwarded-Proto', 'https')
        .set('Cookie', `XSRF-TOKEN=${token}`)
        .set('X-XSRF-TOKEN', token)
        .send({ email: 'curator@test-survey.test', password: TEST_PASSWORD });
      expect(res.status).toBe(200);
      expect(sessionCookie(res)).toMatch(/Secure/i);
    } finally {
      await secure.close();
    }
  });

  it('should give a new session id at every sign-in', async () => {
    const client = await new TestClient(ctx.app).init();
    const first = await client.post('/api/auth/login', {
      email: team.users.reviewer.email,
      password: TEST_PASSWORD,
    });
    const second = await client.post('/api/auth/login', {
      email: team.users.reviewer.email,
      password: TEST_PASSWORD,
    });
    const a = sessionCookie(first)?.split(';')[0];
    const b = sessionCookie(second)?.split(';')[0];
    expect(a).toBeTruthy();
    expect(b).toBeTruthy();
    expect(a).not.toBe(b);
    const sessions = await ctx.db.selectFrom('sessions').select('sid').execute();
    expect(sessions).toHaveLength(1);
  });

  it('should answer a wrong password and an unknown e-mail with the same generic 401', async () => {
    const client = await new TestClient(ctx.app).init();
    const wrong = await client.post('/api/auth/login', {
      email: team.users.reviewer.email,
      password: 'not-the-password',
    });
    const unknown = await client.post('/api/auth/login', {
      email: 'nobody@test-survey.test',
      password: 'not-the-password',
    });
    expect(wrong.status).toBe(401);
    expect(unknown.status).toBe(401);
    expect(wrong.body).toEqual(unknown.body);
    expect(wrong.body.error.message).toBe('Wrong e-mail or password.');
  });

  it('should refuse sign-in after too many failures with 429', async () => {
    const client = await new TestClient(ctx.app).init();
    for (let i = 0; i < 3; i++) {
      const res = await client.post('/api/auth/login', {
        email: team.users.reviewer.email,
        password: 'wrong-password',
      });
      expect(res.status).toBe(401);
    }
    const blocked = await client.post('/api/auth/login', {
      email: team.users.reviewer.email,
      password: TEST_PASSWORD,
    });
    expect(blocked.status).toBe(429);
    expect(blocked.body.error.code).toBe('rate_limited');
  });

  it('should sign out and then answer 401 to /auth/me', async () => {
    const client = await signIn(ctx.app, team.users.volunteer.email);
    expect((await client.post('/api/auth/logout')).status).toBe(204);
    const me = await client.get('/api/auth/me');
    expect(me.status).toBe(401);
    expect(me.body.error.code).toBe('unauthenticated');
  });

  it('should refuse state-changing requests without the matching CSRF header', async () => {
    const client = await new TestClient(ctx.app).init();
    const none = await client.agent
      .post('/api/auth/login')
      .send({ email: team.users.volunteer.email, password: TEST_PASSWORD });
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe('csrf_failed');
    const mismatched = await client.agent
      .post('/api/auth/login')
      .set('X-XSRF-TOKEN', 'a-token-that-does-not-match-the-cookie')
      .send({ email: team.users.volunteer.email, password: TEST_PASSWORD });
    expect(mismatched.status).toBe(403);
  });

  it('should keep sessions across an app restart on the same database', async () => {
    const client = await signIn(ctx.app, team.users.ecologist.email);
    const { createApp } = await import('../../server/app');
    const { pino } = await import('pino');
    const restarted = createApp({
      db: ctx.db,
      config: ctx.config,
      log: pino({ level: 'silent' }),
      mailer: ctx.mailer,
      ingest: ctx.ingest,
    });
    const cookie = (await ctx.db.selectFrom('sessions').select('sid').executeTakeFirstOrThrow())
      .sid;
    expect(cookie).toBeTruthy();
    const jarCookies = client.agent.jar.getCookies({
      domain: '127.0.0.1',
      path: '/',
      secure: false,
      script: false,
    });
    const header = jarCookies.toValueString();
    const request = (await import('supertest')).default;
    const res = await request(restarted).get('/api/auth/me').set('Cookie', header);
    expect(res.status).toBe(200);
    expect(res.body.user.email).toBe(team.users.ecologist.email);
  });

  it('should change the password only with the current one', async () => {
    const client = await signIn(ctx.app, team.users.reviewer.email);
    const wrong = await client.post('/api/auth/password', {
      currentPassword: 'nope-nope-nope',
      newPassword: 'a-new-long-password',
    });
    expect(wrong.status).toBe(401);
    const short = await client.post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'short',
    });
    expect(short.status).toBe(400);
    const ok = await client.post('/api/auth/password', {
      currentPassword: TEST_PASSWORD,
      newPassword: 'a-new-long-password',
    });
    expect(ok.status).toBe(204);
    expect((await client.get('/api/auth/me')).status).toBe(200);
    await signIn(ctx.app, team.users.reviewer.email, 'a-new-long-password');
    await expect(signIn(ctx.app, team.users.reviewer.email)).rejects.toThrow(/401/);
  });
});

describe('password reset', () => {
  it('should answer the same for known and unknown e-mails and mail only the known one', async () => {
    const client = await new TestClient(ctx.app).init();
    const known = await client.post('/api/auth/password-reset', {
      email: team.users.curator.email,
    });
    const unknown = await client.post('/api/auth/password-reset', {
      email: 'ghost@test-survey.test',
    });
    expect(known.status).toBe(202);
    expect(unknown.status).toBe(202);
    expect(known.body).toEqual(unknown.body);
    const mail = await waitForMail(ctx.db, team.users.curator.email);
    expect(mail.subject).toMatch(/reset/i);
    const all = await ctx.db.selectFrom('mail_messages').select('to_addr').execute();
    expect(all.map((m) => m.to_addr)).toEqual([team.users.curator.email]);
  });

  it('should reset once with the e-mailed token, end old sessions and refuse the token again', async () => {
    const old = await signIn(ctx.app, team.users.curator.email);
    const client = await new TestClient(ctx.app).init();
    await client.post('/api/auth/password-reset', { email: team.users.curator.email });
    const link = linkIn((await waitForMail(ctx.db, team.users.curator.email)).text);
    const token = link.split('/reset-password/')[1]!;
    const stored = await ctx.db
      .selectFrom('password_resets')
      .select('token_hash')
      .executeTakeFirstOrThrow();
    expect(stored.token_hash).not.toContain(token);
    const ok = await client.post('/api/auth/password-reset/confirm', {
      token,
      newPassword: 'brand-new-password',
    });
    expect(ok.status).toBe(204);
    expect((await old.get('/api/auth/me')).status).toBe(401);
    await signIn(ctx.app, team.users.curator.email, 'brand-new-password');
    const again = await client.post('/api/auth/password-reset/confirm', {
      token,
      newPassword: 'another-new-password',
    });
    expect(again.status).toBe(400);
  });

  it('should refuse an expired reset token', async () => {
    const client = await new TestClient(ctx.app).init();
    await client.post('/api/auth/password-reset', { email: team.users.curator.email });
    const token = linkIn((await waitForMail(ctx.db, team.users.curator.email)).text).split(
      '/reset-password/',
    )[1]!;
    await ctx.db
      .updateTable('password_resets')
      .set({ expires_at: '2000-01-01T00:00:00Z' })
      .execute();
    const res = await client.post('/api/auth/password-reset/confirm', {
      token,
      newPassword: 'brand-new-password',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/not valid any more/);
  });
});

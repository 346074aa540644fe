import { sql } from 'kysely';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createTestContext, seedTeam, signIn, type TestContext } from '../support/test-app';

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;

beforeEach(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
});
afterEach(async () => ctx.close());

describe('bad input gets the one error shape', () => {
  it('should answer malformed JSON with 400 malformed_json', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.agent
      .post('/api/admin/users')
      .set('X-XSRF-TOKEN', admin.csrf)
      .set('Content-Type', 'application/json')
      .send('{"email": "x@y.org", "name": ');
    expect(res.status).toBe(400);
    expect(res.body).toEqual({
      error: { code: 'malformed_json', message: 'The request body is not valid JSON.' },
    });
  });

  it('should answer a body over the size limit with 400 and keep nothing', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.post('/api/admin/users', {
      email: 'big@example.org',
      name: 'x'.repeat(2 * 1024 * 1024),
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('payload_too_large');
    const stored = await ctx.db
      .selectFrom('users')
      .select('id')
      .where('email', '=', 'big@example.org')
      .execute();
    expect(stored).toHaveLength(0);
  });

  it('should name unknown and mistyped fields', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.post('/api/admin/users', {
      email: 'x@example.org',
      name: 42,
      shoeSize: 44,
    });
    expect(res.status).toBe(400);
    expect(res.body.error.code).toBe('validation_failed');
    const details = res.body.error.details.request as { path: string; message: string }[];
    expect(details).toEqual(
      expect.arrayContaining([
        { path: 'name', message: 'Expected string.' },
        { path: '(body)', message: 'Unknown field: shoeSize.' },
      ]),
    );
  });

  it('should refuse an empty PATCH with 400 instead of running it', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    const id = '0123456789abcdef0123';
    const cases: [typeof admin, string][] = [
      [admin, `/api/admin/users/${team.users.volunteer.id}`],
      [ecologist, '/api/projects/test-survey'],
      [ecologist, `/api/projects/test-survey/stations/${id}`],
      [ecologist, `/api/projects/test-survey/deployments/${id}`],
      [ecologist, `/api/projects/test-survey/individuals/${id}`],
      [ecologist, `/api/projects/test-survey/sightings/${id}`],
    ];
    for (const [client, url] of cases) {
      const res = await client.patch(url, {});
      expect(res.status, url).toBe(400);
      expect(res.body.error.code, url).toBe('validation_failed');
      expect(res.body.error.message, url).toContain('Send at least one field to change.');
    }
  });

  it('should answer bad ids with 400', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.patch('/api/admin/users/not-an-id', { disabled: true });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/id is not valid/);
    const ecologist = await signIn(ctx.app, team.users.ecologist.email);
    expect(
      (await ecologist.put('/api/projects/test-survey/members/ZZZ', { role: 'reviewer' })).status,
    ).toBe(400);
    expect((await ecologist.get('/api/projects/Bad_Slug!')).status).toBe(400);
  });

  it('should answer unknown API routes with a JSON 404', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    const res = await admin.get('/api/no/such/thing');
    expect(res.status).toBe(404);
    expect(res.headers['content-type']).toMatch(/json/);
    expect(res.body.error.code).toBe('not_found');
  });

  it('should hide an unexpected error behind a generic 500', async () => {
    const admin = await signIn(ctx.app, team.users.admin.email);
    await sql`drop table mail_messages`.execute(ctx.db);
    const res = await admin.get('/api/admin/outbox');
    expect(res.status).toBe(500);
    expect(res.body).toEqual({
      error: { code: 'internal', message: 'Something went wrong on the server. Please try again.' },
    });
    expect(JSON.stringify(res.body)).not.toMatch(/mail_messages|sqlite|at /i);
  });

  it('should send security headers', async () => {
    const res = await (await signIn(ctx.app, team.users.admin.email)).get('/api/health');
    expect(res.headers['content-security-policy']).toContain("default-src 'self'");
    expect(res.headers['x-content-type-options']).toBe('nosniff');
    expect(res.headers['x-powered-by']).toBeUndefined();
  });
});

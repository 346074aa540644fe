import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { PROJECT_ROLES } from '../../shared/roles';
import { registeredRoutes, fillPath, type RegisteredRoute } from '../support/routes';
import {
  createTestContext,
  seedTeam,
  signIn,
  TestClient,
  type TestContext,
} from '../support/test-app';

// Every API route is found in the app itself; a route without a guard, or a guard that lets a
// lower role through, makes this suite fail.

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let routes: RegisteredRoute[];
const clients: Record<string, TestClient> = {};

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db, 'access-survey');
  routes = registeredRoutes(ctx.app);
  for (const who of [
    'volunteer',
    'reviewer',
    'curator',
    'ecologist',
    'outsider',
    'admin',
  ] as const) {
    clients[who] = await signIn(ctx.app, team.users[who].email);
  }
});
afterAll(async () => ctx.close());

describe('access control on every API route', () => {
  it('should find the routes in the app', () => {
    expect(routes.length).toBeGreaterThan(15);
    expect(routes).toContainEqual(expect.objectContaining({ method: 'GET', path: '/api/health' }));
    expect(routes).toContainEqual(
      expect.objectContaining({ method: 'GET', path: '/api/projects/:slug/members' }),
    );
  });

  it('should notice a route registered without a guard', async () => {
    const express = (await import('express')).default;
    const probe = express();
    const api = express.Router();
    api.get('/projects/:slug/forgotten', (_req, res) => res.json({}));
    probe.use('/api', api);
    expect(registeredRoutes(probe)).toEqual([
      { method: 'GET', path: '/api/projects/:slug/forgotten', access: null },
    ]);
  });

  it('should give every route exactly one declared guard', () => {
    const unguarded = routes.filter((r) => r.access === null).map((r) => `${r.method} ${r.path}`);
    expect(unguarded).toEqual([]);
  });

  it('should refuse anonymous requests to every non-public route with 401', async () => {
    const anonymous = await new TestClient(ctx.app).init();
    const failures: string[] = [];
    for (const route of routes.filter((r) => r.access && r.access.kind !== 'public')) {
      const res = await anonymous.send(route.method, fillPath(route.path, 'access-survey'));
      if (res.status !== 401 || res.body?.error?.code !== 'unauthenticated') {
        failures.push(`${route.method} ${route.path} → ${res.status}`);
      }
    }
    expect(failures).toEqual([]);
  });

  it('should refuse non-admins on admin routes with 403', async () => {
    const failures: string[] = [];
    for (const route of routes.filter((r) => r.access?.kind === 'admin')) {
      for (const who of ['ecologist', 'volunteer'] as const) {
        const res = await clients[who]!.send(route.method, fillPath(route.path, 'access-survey'));
        if (res.status !== 403)
          failures.push(`${who} ${route.method} ${route.path} → ${res.status}`);
      }
    }
    expect(failures).toEqual([]);
  });

  it('should refuse every role below the required one, and non-members, with 403', async () => {
    const failures: string[] = [];
    let checked = 0;
    for (const route of routes) {
      const access = route.access;
      if (access?.kind !== 'project') continue;
      const below = PROJECT_ROLES.slice(0, PROJECT_ROLES.indexOf(access.role));
      for (const who of [...below, 'outsider'] as const) {
        const res = await clients[who]!.send(route.method, fillPath(route.path, 'access-survey'));
        checked++;
        if (res.status !== 403)
          failures.push(`${who} ${route.method} ${route.path} → ${res.status}`);
      }
    }
    expect(checked).toBeGreaterThan(10);
    expect(failures).toEqual([]);
  });

  it('should let the required role past the guard', async () => {
    const failures: string[] = [];
    for (const route of routes) {
      const access = route.access;
      if (access?.kind !== 'project') continue;
      const res = await clients[access.role]!.send(
        route.method,
        fillPath(route.path, 'access-survey'),
      );
      if (
        res.status === 401 ||
        (res.status === 403 &&
          res.body?.error?.code === 'forbidden' &&
          /role|member/.test(res.body.error.message))
      ) {
        failures.push(`${access.role} ${route.method} ${route.path} → ${res.status}`);
      }
    }
    expect(failures).toEqual([]);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SecrRequest } from '../../shared/estimate';
import type { SecrJobView, SecrResponse } from '../../shared/estimate-api';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { fitSecr } from '../../server/estimation/secr/fit';
import { simulateSecr, trapGrid } from '../../server/estimation/secr/simulate';
import { closeSecrPool } from '../../server/workers/secr-pool';
import {
  createTestContext,
  seedTeam,
  signIn,
  TestClient,
  type TestContext,
} from '../support/test-app';

// SECR through real HTTP; fits run in the worker thread. Every survey here is synthetic: simulated
// with known density, so the truth is known, not published.

let ctx: TestContext;
let client: TestClient;
let other: TestClient;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db, 'secr-survey');
  client = await signIn(ctx.app, team.users.reviewer.email);
  other = await signIn(ctx.app, team.users.curator.email);
});
afterAll(async () => {
  await closeSecrPool();
  await ctx.close();
});

/** 6 × 6 traps 100 m apart, σ = 50 m, g0 = 0.2, 1.2 animals/ha = 120 per km² (synthetic). */
const TRUE_DENSITY_PER_KM2 = 120;
const survey = (detector: 'proximity' | 'count' = 'proximity', seed = 2): SecrRequest => {
  const sim = simulateSecr(
    {
      traps: trapGrid(6, 6, 100),
      occasions: 5,
      detector,
      density: TRUE_DENSITY_PER_KM2 / 100,
      g0OrLambda0: 0.2,
      sigma: 50,
      buffer: 200,
    },
    new SeededRandom(seed),
  );
  return { ...sim, usage: undefined, mask: { spacing: 25, buffer: 200 } };
};

async function waitForJob(id: string, done: (job: SecrJobView) => boolean): Promise<SecrJobView> {
  const deadline = Date.now() + 30_000;
  for (;;) {
    const res = await client.get(`/api/estimate/secr/jobs/${id}`);
    expect(res.status).toBe(200);
    const job = res.body as SecrJobView;
    if (done(job) || Date.now() > deadline) return job;
    await new Promise((r) => setTimeout(r, 40));
  }
}

describe('POST /api/estimate/secr', () => {
  let body: SecrResponse;
  const input = survey();

  beforeAll(async () => {
    const res = await client.post('/api/estimate/secr', input);
    expect(res.status).toBe(200);
    body = res.body as SecrResponse;
  });

  it('should report density per km², 100 times the library’s per-hectare figure', () => {
    const perHectare = fitSecr(input);
    expect(body.D).toBeCloseTo((perHectare.D ?? NaN) * 100, 6);
    expect(body.densityPer100km2).toBeCloseTo((perHectare.D ?? NaN) * 1e4, 4);
    expect(body.ci?.[0]).toBeCloseTo((perHectare.ci?.[0] ?? NaN) * 100, 6);
    expect(body.sigma).toBeCloseTo(perHectare.sigma ?? NaN, 6);
    expect(body.units).toEqual({ D: 'animals per km²', sigma: 'm', esa: 'km²', mask: 'm' });
  });

  it('should keep D̂ = n / esa with esa in km² (the maximum-likelihood identity)', () => {
    expect((body.D ?? NaN) * (body.esa ?? NaN)).toBeCloseTo(body.n, 8);
  });

  it('should recover the simulated density within its interval (synthetic survey)', () => {
    const [lo, hi] = body.ci ?? [NaN, NaN];
    expect(lo).toBeLessThan(TRUE_DENSITY_PER_KM2);
    expect(hi).toBeGreaterThan(TRUE_DENSITY_PER_KM2);
    expect(body.sigma).toBeGreaterThan(30); // metres; truth 50
    expect(body.sigma).toBeLessThan(80);
    expect(body.g0).toBeGreaterThan(0);
    expect(body).not.toHaveProperty('lambda0');
    expect(body.assumptions.length).toBeGreaterThan(0);
  });

  it('should report λ0 rather than g0 for count detectors', async () => {
    const res = await client.post('/api/estimate/secr', survey('count', 3));
    expect(res.status).toBe(200);
    expect((res.body as SecrResponse).lambda0).toBeGreaterThan(0);
    expect(res.body).not.toHaveProperty('g0');
  });

  it('should report σ not identifiable as no estimate with the reason', async () => {
    const res = await client.post('/api/estimate/secr', {
      traps: trapGrid(3, 3, 50),
      occasions: 3,
      detector: 'proximity',
      captures: [
        { animal: 'a', occasion: 1, trap: 'T1' },
        { animal: 'a', occasion: 2, trap: 'T1' },
        { animal: 'b', occasion: 1, trap: 'T5' },
      ],
    });
    expect(res.status).toBe(200);
    const r = res.body as SecrResponse;
    expect(r.D).toBeNull();
    expect(r.densityPer100km2).toBeNull();
    expect(r.sigma).toBeNull();
    expect(r.reason).toMatch(/σ cannot be estimated/);
  });

  const base = survey();
  const bad: [string, object, RegExp][] = [
    [
      'a trap without coordinates',
      { ...base, traps: [{ id: 'T1', x: 0 }, ...base.traps.slice(1)] },
      /Trap T1 has no usable y coordinate/,
    ],
    [
      'a capture at an unknown trap',
      { ...base, captures: [...base.captures, { animal: 'z', occasion: 1, trap: 'NOPE' }] },
      /trap NOPE, which is not in the trap list/,
    ],
    [
      'a mask too large for memory',
      { ...base, mask: { spacing: 0.5, buffer: 400 } },
      /mask is too large.*larger spacing/,
    ],
  ];
  for (const [what, request, message] of bad) {
    it(`should refuse ${what} with 400 and a clear message`, async () => {
      const res = await client.post('/api/estimate/secr', request);
      expect(res.status).toBe(400);
      expect(res.body.error.message).toMatch(message);
    });
  }
  it('should still fit after a caller gave up on a direct fit mid-way', async () => {
    const slow = { ...survey(), mask: { spacing: 5, buffer: 200 } };
    await expect(client.post('/api/estimate/secr', slow).timeout(400)).rejects.toThrow(/Timeout/);
    // The abandoned fit's worker is terminated; the next fit gets a fresh one.
    const res = await client.post('/api/estimate/secr', survey());
    expect(res.status).toBe(200);
    expect(res.body.D).toBeGreaterThan(0);
  });
});

describe('SECR jobs', () => {
  it('should run a fit as a job with progress and give the same answer as the direct route', async () => {
    const input = survey();
    const started = await client.post('/api/estimate/secr/jobs', input);
    expect(started.status).toBe(202);
    const job = await waitForJob(started.body.id, (j) => j.status !== 'running');
    expect(job.status).toBe('done');
    expect(job.progress.fraction).toBe(1);
    const direct = await client.post('/api/estimate/secr', input);
    expect(job.result?.D).toBeCloseTo(direct.body.D, 8);
  });

  it('should keep answering /api/health while a long fit runs', async () => {
    // A fine mask (about 16,000 points) keeps the worker busy for a second or two.
    const started = await client.post('/api/estimate/secr/jobs', {
      ...survey(),
      mask: { spacing: 7, buffer: 200 },
    });
    expect(started.status).toBe(202);
    const running = await waitForJob(started.body.id, (j) => j.progress.fraction >= 0.05);
    expect(running.status).toBe('running');
    const t0 = Date.now();
    const health = await client.get('/api/health');
    const elapsed = Date.now() - t0;
    expect(health.status).toBe(200);
    expect(elapsed).toBeLessThan(1000);
    const after = await client.get(`/api/estimate/secr/jobs/${started.body.id}`);
    expect(after.body.status).toBe('running');
    const finished = await waitForJob(started.body.id, (j) => j.status !== 'running');
    expect(finished.status).toBe('done');
  });

  it('should refuse at once a job whose mask would not fit in memory (400)', async () => {
    const started = await client.post('/api/estimate/secr/jobs', {
      ...survey(),
      mask: { spacing: 0.5, buffer: 400 },
    });
    expect(started.status).toBe(400);
    expect(started.body.error.message).toMatch(/mask is too large/);
  });

  it('should hide one person’s job from another (404)', async () => {
    const started = await client.post('/api/estimate/secr/jobs', survey());
    const res = await other.get(`/api/estimate/secr/jobs/${started.body.id}`);
    expect(res.status).toBe(404);
    await waitForJob(started.body.id, (j) => j.status !== 'running');
  });

  it('should refuse a malformed job id with 400 and an unknown one with 404', async () => {
    expect((await client.get('/api/estimate/secr/jobs/nope')).status).toBe(400);
    expect((await client.get('/api/estimate/secr/jobs/0123456789abcdef0123')).status).toBe(404);
  });
});

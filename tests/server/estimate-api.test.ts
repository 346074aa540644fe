import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { ClosedResponse, PlotsResponse, TwoSampleResponse } from '../../shared/estimate-api';
import { closeSecrPool } from '../../server/workers/secr-pool';
import { DEER_MICE, historiesFromOccasionSummary } from '../estimation/fixtures/published-data';
import {
  createTestContext,
  seedTeam,
  signIn,
  TestClient,
  type TestContext,
} from '../support/test-app';

// Real HTTP through createApp(). SECR cases live in estimate-secr-api.test.ts.

let ctx: TestContext;
let client: TestClient;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db, 'estimate-survey');
  // Any signed-in user may use the calculators: the lowest role is enough.
  client = await signIn(ctx.app, team.users.volunteer.email);
});
afterAll(async () => {
  await closeSecrPool();
  await ctx.close();
});

const near = (actual: number | null | undefined, expected: number, digits = 4) =>
  expect(actual).toBeCloseTo(expected, digits);

describe('POST /api/estimate/two-sample', () => {
  it('should give Chapman 281.8182 with Seber variance 4285.124 for M=50, C=60, R=10', async () => {
    const res = await client.post('/api/estimate/two-sample', { M: 50, C: 60, R: 10 });
    expect(res.status).toBe(200);
    const body = res.body as TwoSampleResponse;
    near(body.chapman.N, 281.8182); // [D]
    near(body.chapman.se, Math.sqrt(4285.124), 3); // [D]
    // Lincoln–Petersen MC/R and Seber's M²C(C−R)/R³, by hand: 300 and √7500.
    near(body.lincolnPetersen.N, 300, 10);
    near(body.lincolnPetersen.se, Math.sqrt(7500), 8);
    // Log-normal interval on f0 (Chao 1987), worked by hand from S = 100 and the [D] values.
    const f0 = 281.8182 - 100;
    const C = Math.exp(1.959964 * Math.sqrt(Math.log(1 + 4285.124 / (f0 * f0))));
    near(body.chapman.ci?.[0], 100 + f0 / C, 2);
    near(body.chapman.ci?.[1], 100 + f0 * C, 2);
    expect(body.warnings).toEqual([]);
  });

  it('should warn in plain language when fewer than 7 marked animals were recaptured', async () => {
    const res = await client.post('/api/estimate/two-sample', { M: 20, C: 15, R: 3 });
    expect(res.status).toBe(200);
    expect((res.body as TwoSampleResponse).warnings.join(' ')).toMatch(/fewer than 7 recaptures/);
  });

  it('should report R = 0 as no estimate with the reason, not as a number', async () => {
    const res = await client.post('/api/estimate/two-sample', { M: 20, C: 15, R: 0 });
    expect(res.status).toBe(200);
    const body = res.body as TwoSampleResponse;
    expect(body.lincolnPetersen.N).toBeNull();
    expect(body.chapman.N).toBeNull();
    expect(body.chapman.ci).toBeNull();
    expect(body.reason).toMatch(/R = 0/);
  });

  it('should refuse R > C and negative counts with 400 and a clear message', async () => {
    const over = await client.post('/api/estimate/two-sample', { M: 50, C: 10, R: 12 });
    expect(over.status).toBe(400);
    expect(over.body.error.message).toMatch(/R \(12\) cannot exceed C \(10\)/);
    const negative = await client.post('/api/estimate/two-sample', { M: -5, C: 10, R: 2 });
    expect(negative.status).toBe(400);
    expect(negative.body.error.message).toMatch(/cannot be negative/);
  });
});

describe('POST /api/estimate/closed', () => {
  const deerMice = historiesFromOccasionSummary(DEER_MICE.u, DEER_MICE.m);
  let body: ClosedResponse;

  beforeAll(async () => {
    const res = await client.post('/api/estimate/closed', { histories: deerMice });
    expect(res.status).toBe(200);
    body = res.body as ClosedResponse;
  });

  it('should reproduce the deer-mice summaries: S = 38, t = 6, n_j and u_j', () => {
    expect(body.S).toBe(38); // [P] Amstrup et al. 2005, p. 25
    expect(body.t).toBe(6);
    expect(body.summary.caught).toEqual(DEER_MICE.n); // [P]
    expect(body.summary.firstCaptures).toEqual(DEER_MICE.u); // [P]
    expect(body.summary.recaptures).toEqual(DEER_MICE.m); // [P]
    const f = body.summary.frequencies;
    expect(f).toHaveLength(6);
    expect(f.reduce((a, v) => a + v, 0)).toBe(38);
    expect(f.reduce((a, v, i) => a + (i + 1) * v, 0)).toBe(120); // Σ n_j [P]
  });

  it('should give the estimating-equation roots for M0, Mt and Mb on the deer mice', () => {
    const model = (name: string) => body.models.find((m) => m.model === name);
    near(model('M0')?.N, 38.4713); // [D]
    near(model('Mt')?.N, 38.4026); // [D]
    const mb = model('Mb');
    near(mb?.N, 42.2557); // [D]
    near(mb?.params?.['p'] as number, 0.3179); // [D]
    near(mb?.params?.['c'] as number, 0.61194); // [D]
    for (const m of body.models) {
      expect(m.se).toBeGreaterThan(0);
      expect(m.ci?.[0]).toBeLessThanOrEqual(m.N ?? NaN);
      expect(Array.isArray(m.warnings)).toBe(true);
    }
  });

  it('should flag Schnabel and Schumacher–Eschmeyer below S beside those models', () => {
    const schnabel = body.models.find((m) => m.model === 'Schnabel');
    const se = body.models.find((m) => m.model === 'Schumacher-Eschmeyer');
    near(schnabel?.N, 35.2927); // [D]
    near(se?.N, 36.2726); // [D]
    expect(schnabel?.warnings.join(' ')).toMatch(/below the 38 animals/);
    expect(se?.warnings.join(' ')).toMatch(/below the 38 animals/);
  });

  it('should select Mb by AICc with n = S and keep the list to the contract models', () => {
    expect(body.aiccTable.n).toBe(38);
    expect(body.aiccTable.rows[0]?.model).toBe('Mb'); // [D]
    expect(body.aiccTable.note).toMatch(/n = S = 38/);
    expect(body.models.map((m) => m.model)).toEqual([
      'M0',
      'Mt',
      'Mb',
      'Mh-jackknife',
      'Mh-chao',
      'Mth-chao',
      'Schnabel',
      'Schumacher-Eschmeyer',
    ]);
    expect(body.otherModels.map((m) => m.model)).toEqual(['Mh-mixture']);
    expect(body.closureTest?.p).toBeGreaterThan(0);
    expect(body.assumptions.join(' ')).toMatch(/closed/);
  });

  it('should report Mb as not estimable, with its reason, when first captures do not decline', async () => {
    const res = await client.post('/api/estimate/closed', {
      histories: ['100', '101', '001', '001', '010'],
    });
    expect(res.status).toBe(200);
    const mb = (res.body as ClosedResponse).models.find((m) => m.model === 'Mb');
    expect(mb?.N).toBeNull();
    expect(mb?.ci).toBeNull();
    expect(mb?.reason).toMatch(/cannot be estimated/);
  });

  it('should switch Chao to the bias-corrected form when f2 = 0 and say so', async () => {
    const res = await client.post('/api/estimate/closed', {
      histories: ['1000', '0100', '0010', '0001', '1110', '0111', '1000'],
    });
    const chao = (res.body as ClosedResponse).models.find((m) => m.model === 'Mh-chao');
    // S + ((t−1)/t)·f1(f1−1)/(2(f2+1)) = 7 + (3/4)·5·4/2 = 14.5, by hand.
    expect(chao?.N).toBeCloseTo(14.5, 10);
    expect(chao?.warnings.join(' ')).toMatch(/f2 = 0.*bias-corrected/);
  });

  const bad: [string, string[], RegExp][] = [
    ['histories of unequal length', ['0101', '011'], /has 3 occasions but history 1 has 4/],
    ['characters other than 0 and 1', ['0101', '01x1'], /characters other than 0 and 1/],
    ['an animal never caught', ['0101', '0000'], /all zeros/],
    ['a single occasion', ['1', '1'], /single occasion/],
  ];
  for (const [what, histories, message] of bad) {
    it(`should refuse ${what} with 400 and a clear message`, async () => {
      const res = await client.post('/api/estimate/closed', { histories });
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('validation_failed');
      expect(res.body.error.message).toMatch(message);
    });
  }
});

describe('POST /api/estimate/plots', () => {
  it('should give N = N·ȳ with the finite-population variance and a t interval', async () => {
    const counts = [3, 1, 4, 1, 5, 9, 2, 6, 5, 3];
    const res = await client.post('/api/estimate/plots', { counts, totalPlots: 100 });
    expect(res.status).toBe(200);
    const body = res.body as PlotsResponse;
    // By hand (Cochran 1977 formulas): ȳ = 3.9, s² = 54.9/9 = 6.1, var = 100²·0.9·6.1/10 = 5490.
    near(body.N, 390, 8);
    near(body.se, Math.sqrt(5490), 8);
    const t9 = 2.262157; // Student t, 9 df, 0.975 (standard tables)
    near(body.ci[0], 390 - t9 * Math.sqrt(5490), 3);
    near(body.ci[1], 390 + t9 * Math.sqrt(5490), 3);
    near(body.varianceToMean, 6.1 / 3.9, 8);
    expect(body.warnings.join(' ')).not.toMatch(/clumped/);
  });

  it('should warn that clumped counts make the plot estimate unreliable', async () => {
    const res = await client.post('/api/estimate/plots', {
      counts: [0, 0, 0, 0, 12, 0, 0, 15, 0, 1],
      totalPlots: 50,
    });
    const body = res.body as PlotsResponse;
    expect(body.varianceToMean).toBeGreaterThan(5);
    expect(body.warnings.join(' ')).toMatch(/clumped.*unreliable/);
  });

  it('should refuse negative counts with 400', async () => {
    const res = await client.post('/api/estimate/plots', { counts: [2, -1, 3], totalPlots: 10 });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/cannot be negative/);
  });
});

describe('estimation routes without a session', () => {
  const routes: [string, string][] = [
    ['POST', '/api/estimate/two-sample'],
    ['POST', '/api/estimate/closed'],
    ['POST', '/api/estimate/plots'],
    ['POST', '/api/estimate/secr'],
    ['POST', '/api/estimate/secr/jobs'],
    ['GET', '/api/estimate/secr/jobs/0123456789abcdef0123'],
  ];
  for (const [method, path] of routes) {
    it(`should refuse ${method} ${path} with 401`, async () => {
      const anonymous = await new TestClient(ctx.app).init();
      const res = await anonymous.send(method, path, { M: 50, C: 60, R: 10 });
      expect(res.status).toBe(401);
      expect(res.body.error.code).toBe('unauthenticated');
    });
  }
});

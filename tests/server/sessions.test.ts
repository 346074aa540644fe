import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SessionPreview } from '../../shared/analyses';
import { canonicalJson, sha256Hex } from '../../server/services/session-freeze';
import { closeSecrPool } from '../../server/workers/secr-pool';
import {
  seedSyntheticSurvey,
  SYNTHETIC_SESSION,
  type SyntheticSurvey,
} from '../support/analyses-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic survey (tests/support/analyses-helpers.ts): four stations, six individuals, times
// chosen so every effort cell and every history can be worked out by hand.

let ctx: TestContext;
let ecologist: TestClient;
let curator: TestClient;
let survey: SyntheticSurvey;
const SLUG = 'test-survey';
const url = (path: string) => `/api/projects/${SLUG}${path}`;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  curator = await signIn(ctx.app, team.users.curator.email);
  survey = await seedSyntheticSurvey(ctx.db, team.project.id);
});
afterAll(async () => {
  await closeSecrPool();
  await ctx.close();
});

async function preview(body: object): Promise<SessionPreview> {
  const res = await ecologist.post(url('/sessions/preview'), { ...SYNTHETIC_SESSION, ...body });
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as SessionPreview;
}

/** Histories by individual code, for comparisons that do not depend on id order. */
function historiesByCode(p: SessionPreview): Record<string, string> {
  return Object.fromEntries(
    p.inputs.individuals.map((ind, i) => [ind.code, p.inputs.histories[i]]),
  );
}

describe('effort grid', () => {
  it('should count days active per station and occasion as counted by hand', async () => {
    const p = await preview({ flankPolicy: 'all' });
    const codes = p.inputs.stations.map((s) => s.code);
    expect(codes).toEqual(['D', 'L', 'P', 'Z']);
    const grid = Object.fromEntries(codes.map((c, k) => [c, p.inputs.effort[k]]));
    // Counted by hand from the deployment times (tests/support/analyses-helpers.ts), 24 h occasions
    // starting 07-01 00:00, 07-02, 07-03, 07-04 UTC:
    // P: camera A works 07-01 06:00 → 07-02 18:00 (then dead), camera B 07-02 12:00 → 07-04 12:00;
    //    together 07-01 06:00 → 07-04 12:00 (the 6 h both worked count once):
    //    occasion 1: 18 h = 0.75; 2: 24 h = 1; 3: 24 h = 1; 4: 12 h = 0.5.
    expect(grid['P']).toEqual([0.75, 1, 1, 0.5]);
    // D: 07-01 00:00 → 07-03 06:00 (last working): 1, 1, 6 h = 0.25, 0.
    expect(grid['D']).toEqual([1, 1, 0.25, 0]);
    // L: from 07-03 00:00: 0, 0, 1, 1.
    expect(grid['L']).toEqual([0, 0, 1, 1]);
    // Z: deployed in June only: never active, and said so.
    expect(grid['Z']).toEqual([0, 0, 0, 0]);
    expect(p.warnings.join(' ')).toContain('Station(s) Z had no working camera');
    // 3.25 + 2.25 + 2 = 7.5 station-days; 3 stations ever active.
    expect(p.summary.effortDays).toBe(7.5);
    expect(p.summary.activeStations).toBe(3);
  });

  it('should pool days into longer occasions', async () => {
    const p = await preview({ flankPolicy: 'all', occasionHours: 48 });
    const grid = Object.fromEntries(p.inputs.stations.map((s, k) => [s.code, p.inputs.effort[k]]));
    // The same days in two 48 h occasions: P 0.75 + 1 and 1 + 0.5; D 1 + 1 and 0.25 + 0; L 0 and 2.
    expect(grid['P']).toEqual([1.75, 1.5]);
    expect(grid['D']).toEqual([2, 0.25]);
    expect(grid['L']).toEqual([0, 2]);
    expect(p.inputs.occasions).toEqual([
      { start: '2026-07-01T00:00:00Z', end: '2026-07-03T00:00:00Z' },
      { start: '2026-07-03T00:00:00Z', end: '2026-07-05T00:00:00Z' },
    ]);
  });
});

describe('flank policies and photo quality', () => {
  it('should build left-flank histories from left and both-flank sightings only', async () => {
    const p = await preview({ flankPolicy: 'left' });
    const { I1, I3, I4 } = survey.individuals;
    // I1: P occasion 1, D occasion 2 (its occasion-4 sighting falls while D's camera was dead);
    // I3: the both-flank sighting at P on occasion 3, left at L on 4; I4: left at D on occasion 1.
    expect(historiesByCode(p)).toEqual({ [I1.code]: '1100', [I3.code]: '0011', [I4.code]: '1000' });
    // Left out: I2's two right flanks, I4's right flank, I6's front view; I5 is poor; I1 at dead D.
    expect(p.summary.leftOut).toEqual({ flank: 4, quality: 1, offEffort: 1 });
    expect(p.warnings.join(' ')).toContain('no working camera');
  });

  it('should build right-flank histories from right and both-flank sightings only', async () => {
    const p = await preview({ flankPolicy: 'right' });
    const { I2, I3, I4 } = survey.individuals;
    expect(historiesByCode(p)).toEqual({ [I2.code]: '0110', [I3.code]: '0010', [I4.code]: '0001' });
  });

  it('should keep only individuals known from both flanks, with all their sightings', async () => {
    const p = await preview({ flankPolicy: 'both-linked' });
    const { I3, I4 } = survey.individuals;
    // I3 has a both-flank sighting; I4 is known from a left and a right sighting. I1 (left only)
    // and I2 (right only; its right-flank proposal is not confirmed) are partial identities.
    expect(historiesByCode(p)).toEqual({ [I3.code]: '0011', [I4.code]: '1001' });
  });

  it('should use every confirmed sighting under "all", and poor photos only when allowed', async () => {
    const fair = await preview({ flankPolicy: 'all' });
    const { I1, I2, I3, I4, I5, I6 } = survey.individuals;
    expect(historiesByCode(fair)).toEqual({
      [I1.code]: '1100',
      [I2.code]: '0110',
      [I3.code]: '0011',
      [I4.code]: '1001',
      [I6.code]: '0100',
    });
    expect(fair.warnings.join(' ')).toContain('counts as two');
    // Rows follow the display codes, as the catalogue lists them.
    expect(fair.inputs.individuals.map((i) => i.code)).toEqual([
      I1.code,
      I2.code,
      I3.code,
      I4.code,
      I6.code,
    ]);
    const poor = await preview({ flankPolicy: 'all', minQuality: 'poor' });
    expect(historiesByCode(poor)[I5.code]).toBe('0010');
    const good = await preview({ flankPolicy: 'all', minQuality: 'good' });
    // I1's occasion-2 sighting is only fair.
    expect(historiesByCode(good)[I1.code]).toBe('1000');
  });

  it('should put each detection at its station and count two sightings of one event once', async () => {
    const p = await preview({ flankPolicy: 'all' });
    const at = (code: string) => p.inputs.individuals.findIndex((i) => i.code === code);
    const station = (code: string) => p.inputs.stations.findIndex((s) => s.code === code);
    const { I3, I4 } = survey.individuals;
    const of = (i: number) => p.inputs.detections.filter((d) => d[0] === i);
    expect(of(at(I4.code))).toEqual([
      [at(I4.code), 0, station('D'), 1],
      [at(I4.code), 3, station('P'), 1],
    ]);
    expect(of(at(I3.code))).toEqual([
      [at(I3.code), 2, station('P'), 1],
      [at(I3.code), 3, station('L'), 1],
    ]);
    // I1 2 + I2 2 + I3 2 + I4 2 + I6 1 detections; I3's two sightings of one event are both used.
    expect(p.summary.detections).toBe(9);
    expect(p.inputs.sightingIds).toContain(survey.sightings['I3-P3-left']);
    expect(p.inputs.sightingIds).not.toContain(survey.sightings['I1-late']);
    expect(p.inputs.sightingIds).not.toContain(survey.sightings['I2-proposed']);
    expect(p.summary.sightings).toBe(10);
  });

  it('should restrict the session to the chosen stations', async () => {
    const p = await preview({ flankPolicy: 'all', stationIds: [survey.stations.P] });
    expect(p.inputs.stations.map((s) => s.code)).toEqual(['P']);
    expect(p.summary.detections).toBe(5); // I1, I2, I3, I4 and I6 each once at P
  });

  it('should warn when the session is longer than the closure period', async () => {
    const p = await preview({ closurePeriodDays: 3 });
    expect(p.warnings.join(' ')).toContain('longer than the 3-day period');
  });
});

describe('session defaults', () => {
  it("should start the form from the deployments' span in local days and list the stations", async () => {
    const res = await ecologist.get(url('/sessions/defaults'));
    expect(res.status).toBe(200);
    // Earliest start 06-01 00:00 UTC and latest end 07-20 00:00 UTC are 03:00 in Nairobi (UTC+3).
    expect(res.body).toMatchObject({
      timezone: 'Africa/Nairobi',
      occasionHours: 24,
      firstDay: '2026-06-01',
      lastDay: '2026-07-20',
    });
    expect(res.body.stations.map((s: { code: string }) => s.code)).toEqual(['D', 'L', 'P', 'Z']);
  });
});

describe('session input errors and downloads', () => {
  it('should refuse a session that ends before it starts, and unknown stations', async () => {
    const backwards = await ecologist.post(url('/sessions/preview'), {
      start: '2026-07-05T00:00:00Z',
      end: '2026-07-01T00:00:00Z',
    });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toContain('must end after it starts');
    const unknown = await ecologist.post(url('/sessions/preview'), {
      ...SYNTHETIC_SESSION,
      stationIds: ['0123456789abcdef0123'],
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toContain('not in this project');
  });

  it('should refuse curators: sessions and analyses are for ecologists', async () => {
    const res = await curator.post(url('/sessions/preview'), SYNTHETIC_SESSION);
    expect(res.status).toBe(403);
  });

  it('should download the effort grid, histories and detections as CSV', async () => {
    const body = { ...SYNTHETIC_SESSION, flankPolicy: 'both-linked' };
    const effort = await ecologist.post(url('/sessions/csv/effort'), body);
    expect(effort.status).toBe(200);
    expect(effort.headers['content-type']).toContain('text/csv');
    expect(effort.headers['content-disposition']).toContain('test-survey-session-effort.csv');
    expect(effort.text.split('\r\n').slice(0, 4)).toEqual([
      'station,occasion_1,occasion_2,occasion_3,occasion_4',
      'D,1,1,0.25,0',
      'L,0,0,1,1',
      'P,0.75,1,1,0.5',
    ]);
    const histories = await ecologist.post(url('/sessions/csv/histories'), body);
    const { I3, I4 } = survey.individuals;
    expect(histories.text.trim().split('\r\n').slice(1).sort()).toEqual(
      [`${I3.code},0011`, `${I4.code},1001`].sort(),
    );
    const detections = await ecologist.post(url('/sessions/csv/detections'), body);
    expect(detections.text).toContain(`${I4.code},4,P,1`);
    expect(detections.text.split('\r\n')[0]).toBe('individual,occasion,station,detections');
  });
});

describe('freeze hash', () => {
  it('should hash the canonical serialisation with SHA-256', () => {
    // FIPS 180-2, appendix B.1: SHA-256("abc") [P].
    expect(sha256Hex('abc')).toBe(
      'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad',
    );
    // Key order does not matter; array order does.
    expect(canonicalJson({ b: [1, 2], a: { d: null, c: 'x' } })).toBe(
      '{"a":{"c":"x","d":null},"b":[1,2]}',
    );
    expect(canonicalJson({ a: 1, b: 2 })).toBe(canonicalJson({ b: 2, a: 1 }));
    expect(canonicalJson([2, 1])).not.toBe(canonicalJson([1, 2]));
  });

  it('should give the same hash for the same catalogue and a different one for other parameters', async () => {
    const a = await preview({ flankPolicy: 'all' });
    const b = await preview({ flankPolicy: 'all' });
    const c = await preview({ flankPolicy: 'left' });
    expect(a.hash).toMatch(/^[0-9a-f]{64}$/);
    expect(b.hash).toBe(a.hash);
    expect(c.hash).not.toBe(a.hash);
    expect(sha256Hex(canonicalJson(a.inputs))).toBe(a.hash);
  });
});

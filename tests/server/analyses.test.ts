import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { AnalysisDetail, RerunComparison, SessionPreview } from '../../shared/analyses';
import type { SecrJobView } from '../../shared/estimate-api';
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

// Synthetic survey (tests/support/analyses-helpers.ts); under the "all" flank policy it has five
// individuals (I1, I2, I3, I4, I6) with nine detections on four occasions.

let ctx: TestContext;
let ecologist: TestClient;
let curator: TestClient;
let survey: SyntheticSurvey;
const SLUG = 'test-survey';
const url = (path: string) => `/api/projects/${SLUG}${path}`;
const ALL = { ...SYNTHETIC_SESSION, flankPolicy: 'all' };

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

async function save(name: string, session: object, secr: object | null = null) {
  const res = await ecologist.post(url('/analyses'), { name, session, secr });
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body as AnalysisDetail;
}

async function read(id: string): Promise<AnalysisDetail> {
  const res = await ecologist.get(url(`/analyses/${id}`));
  expect(res.status, JSON.stringify(res.body)).toBe(200);
  return res.body as AnalysisDetail;
}

async function until<T>(poll: () => Promise<T>, done: (v: T) => boolean): Promise<T> {
  const deadline = Date.now() + 60_000;
  for (;;) {
    const v = await poll();
    if (done(v) || Date.now() > deadline) return v;
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('running models on a session', () => {
  it('should run every closed model and the two-step comparison without saving', async () => {
    const res = await ecologist.post(url('/sessions/estimate'), { session: ALL });
    expect(res.status, JSON.stringify(res.body)).toBe(200);
    const { results } = res.body as { results: AnalysisDetail['results'] };
    expect(results.closed?.S).toBe(5);
    expect(results.closed?.t).toBe(4);
    expect(results.closed?.models.map((m) => m.model)).toContain('Mh-chao');
    // The library's plain-language guards reach the session's results.
    const warnings = results.closed?.warnings.join(' ') ?? '';
    expect(warnings).toContain('Only 4 occasions');
    expect(warnings).toContain('Only 5 animals');
    expect(results.twoStep?.critique).toContain('Sollmann et al. 2011');
    expect(results.twoStep?.basis.model).toBe(results.closed?.aiccTable.rows[0]?.model);
    // Half the MMDM buffers a smaller area than the full MMDM, so its density is higher.
    const half = results.twoStep?.halfMmdm.densityPer100km2 ?? 0;
    const full = results.twoStep?.mmdm.densityPer100km2 ?? 0;
    expect(half).toBeGreaterThan(full);
    expect((await ctx.db.selectFrom('analyses').select('id').execute()).length).toBe(0);
  });

  it('should treat a two-occasion session as two samples (Lincoln–Petersen and Chapman)', async () => {
    const res = await ecologist.post(url('/sessions/estimate'), {
      session: { ...ALL, occasionHours: 48 },
    });
    expect(res.status).toBe(200);
    const { results } = res.body as { results: AnalysisDetail['results'] };
    // Pooled histories (48 h): I1 11, I2 11, I3 01, I4 11, I6 10, so M = 4, C = 4, R = 3.
    // Chapman (1951): (M+1)(C+1)/(R+1) − 1 = 25/4 − 1 = 5.25; Lincoln–Petersen MC/R = 16/3 (arithmetic by hand).
    expect(results.twoSample?.chapman.N).toBeCloseTo(5.25, 10);
    expect(results.twoSample?.lincolnPetersen.N).toBeCloseTo(16 / 3, 10);
    const four = await ecologist.post(url('/sessions/estimate'), { session: ALL });
    expect(four.body.results.twoSample).toBeNull();
  });

  it('should say why there is no estimate when fewer than two animals were detected', async () => {
    const res = await ecologist.post(url('/sessions/estimate'), {
      session: { ...ALL, stationIds: [survey.stations.Z] },
    });
    expect(res.status).toBe(200);
    expect(res.body.results.closed).toBeNull();
    expect(res.body.results.closedReason).toContain('at least two are needed');
  });

  it('should fit SECR density on the session as a job with progress', async () => {
    const start = await ecologist.post(url('/sessions/secr-jobs'), {
      session: ALL,
      secr: { detector: 'proximity' },
    });
    expect(start.status, JSON.stringify(start.body)).toBe(202);
    const job = await until(
      async () =>
        (await ecologist.get(url(`/sessions/secr-jobs/${start.body.id}`))).body as SecrJobView,
      (j) => j.status !== 'running',
    );
    expect(job.status).toBe('done');
    expect(job.result?.n).toBe(5);
    expect(job.result?.detections).toBe(9);
  });
});

describe('saved analyses', () => {
  it('should save parameters, the data freeze and results, and list them', async () => {
    const p = (await ecologist.post(url('/sessions/preview'), ALL)).body as SessionPreview;
    const saved = await save('All sightings, dry season', ALL);
    expect(saved).toMatchObject({
      name: 'All sightings, dry season',
      status: 'done',
      hash: p.hash,
    });
    expect(saved.inputs).toEqual(p.inputs);
    expect(saved.parameters.session).toMatchObject({
      start: '2026-07-01T00:00:00Z',
      flankPolicy: 'all',
      minQuality: 'fair',
      occasionHours: 24,
      stationIds: null,
    });
    expect(saved.results.closed?.S).toBe(5);
    expect(saved.freeze).toMatchObject({ matches: true, currentHash: p.hash, changesSince: [] });
    const list = await ecologist.get(url('/analyses'));
    expect(list.body.items[0]).toMatchObject({ id: saved.id, individuals: 5, occasions: 4 });
  });

  it('should report a merge since the freeze, show S one lower on re-run, and match again after undo', async () => {
    const saved = await save('Before curation', ALL);
    const { I2, I6 } = survey.individuals;
    const merge = await curator.post(url(`/individuals/${I6.id}/merge`), {
      into: I2.id,
      reason: 'same rosettes seen from the front',
    });
    expect(merge.status, JSON.stringify(merge.body)).toBe(200);

    const after = await read(saved.id);
    expect(after.freeze.matches).toBe(false);
    expect(after.freeze.currentHash).not.toBe(saved.hash);
    expect(after.freeze.changesSince).toEqual([
      expect.objectContaining({ kind: 'merge', individuals: [I6.code, I2.code] }),
    ]);
    // The saved analysis keeps its data: the CSV still lists the merged-away individual.
    const csv = await ecologist.get(url(`/analyses/${saved.id}/csv/histories`));
    expect(csv.text).toContain(`${I6.code},0100`);

    const rerun = await ecologist.post(url(`/analyses/${saved.id}/rerun`));
    expect(rerun.status, JSON.stringify(rerun.body)).toBe(200);
    const cmp = rerun.body as RerunComparison;
    expect(cmp.changed).toBe(true);
    expect(cmp.differences.S).toEqual({ before: 5, after: 4, change: -1 });
    expect(cmp.current.closed?.S).toBe(4);
    expect(cmp.differences.individualsDisappeared).toEqual([I6]);
    expect(cmp.differences.individualsAppeared).toEqual([]);
    // The same sightings, now under I2: I6's occasion-2 detection at P joins I2's (another event).
    expect(cmp.differences.sightingsAppeared).toEqual([]);
    expect(cmp.differences.sightingsDisappeared).toEqual([]);
    expect(cmp.differences.detections).toEqual({ before: 9, after: 9, change: 0 });
    const m0 = cmp.differences.models.find((m) => m.model === 'M0');
    expect(m0?.before).toBe(saved.results.closed?.models.find((m) => m.model === 'M0')?.N);
    expect(m0?.after).toBe(cmp.current.closed?.models.find((m) => m.model === 'M0')?.N);

    const undo = await curator.post(url(`/identity-changes/${merge.body.change.id}/undo`), {
      reason: 'merged too early',
    });
    expect(undo.status, JSON.stringify(undo.body)).toBe(200);
    const restored = await read(saved.id);
    expect(restored.freeze.matches).toBe(true);
    expect(restored.freeze.currentHash).toBe(saved.hash);
    expect(restored.freeze.changesSince.map((c) => c.kind)).toEqual(['merge', 'undo']);
  });

  it('should not count identity changes of individuals outside the analysis', async () => {
    const left = await save('Left flanks', { ...SYNTHETIC_SESSION, flankPolicy: 'left' });
    const { I2, I6 } = survey.individuals;
    const merge = await curator.post(url(`/individuals/${I6.id}/merge`), {
      into: I2.id,
      reason: 'same animal',
    });
    expect(merge.status).toBe(200);
    const after = await read(left.id);
    // I2 and I6 have no left-flank sightings, so the left-flank analysis is untouched.
    expect(after.freeze).toMatchObject({ matches: true, changesSince: [] });
    await curator.post(url(`/identity-changes/${merge.body.change.id}/undo`), {});
  });

  it('should fit SECR after saving and store the density with the analysis', async () => {
    const saved = await save('With density', ALL, { detector: 'proximity' });
    expect(['running', 'done']).toContain(saved.status);
    const done = await until(
      () => read(saved.id),
      (a) => a.status !== 'running',
    );
    expect(done.status).toBe('done');
    expect(done.results.secrRequested).toBe(true);
    expect(done.results.secr?.n).toBe(5);
    expect(done.results.secr?.detections).toBe(9);
    expect(done.finishedAt).not.toBeNull();
    expect(done.progress).toBeNull();
  });

  it('should page the list newest first without repeating an analysis', async () => {
    const all = await ctx.db
      .selectFrom('analyses')
      .select('id')
      .orderBy('created_at', 'desc')
      .orderBy('id', 'desc')
      .execute();
    expect(all.length).toBeGreaterThanOrEqual(4);
    const seen: string[] = [];
    let next: string | null = null;
    do {
      const res = await ecologist.get(
        url(`/analyses?limit=2${next ? `&after=${encodeURIComponent(next)}` : ''}`),
      );
      expect(res.status).toBe(200);
      seen.push(...res.body.items.map((a: { id: string }) => a.id));
      next = res.body.next;
    } while (next);
    expect(seen).toEqual(all.map((a) => a.id));
  });

  it('should report a density fit cut off by a restart as failed, not as running forever', async () => {
    const saved = await save('Cut off', ALL);
    // As a server that stopped mid-fit leaves it: still running, with no fit in this process.
    await ctx.db
      .updateTable('analyses')
      .set({ status: 'running' })
      .where('id', '=', saved.id)
      .execute();
    const read1 = await read(saved.id);
    expect(read1.status).toBe('failed');
    expect(read1.error).toContain('stopped while the density fit was running');
    expect(read1.results.secrReason).toBe(read1.error);
  });

  it('should refuse an analysis without a name and answer 404 for an unknown one', async () => {
    const nameless = await ecologist.post(url('/analyses'), { session: ALL });
    expect(nameless.status).toBe(400);
    const missing = await ecologist.get(url('/analyses/0123456789abcdef0123'));
    expect(missing.status).toBe(404);
    const curatorRead = await curator.get(url('/analyses'));
    expect(curatorRead.status).toBe(403);
  });
});

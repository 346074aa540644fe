/**
 * The coat pattern on the Identify screen through real HTTP: features computed by the job queue
 * after sightings are made, a "pattern: N matching points" reason once they exist (and a plain
 * ranking that says so before), and the matched points for the compare view with its access and
 * bad-input checks. Photos are synthetic leopards painted by seeds/photos.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { exifTime } from '../../seeds/photos/exif';
import { renderPhoto } from '../../seeds/photos/index';
import { newId } from '../../server/services/ids';
import { queueMissingPatternWork } from '../../server/services/pattern.service';
import { planPhoto, reviewerCrop, type Condition } from '../pattern/photo-set';
import { drainJobs } from '../support/demo-fixture';
import { addDeployment, addStation, upload, waitForUpload } from '../support/ingest-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

const SLUG = 'test-survey';
const SHAPE = { width: 800, height: 600, stations: 1 };
/** Synthetic photos in time order: two catalogued leopards, then a new photo of the first. */
const PLAN: { individual: string; condition: Condition; hour: number }[] = [
  { individual: 'APIA-000', condition: 'reference', hour: 0 },
  { individual: 'APIB-000', condition: 'reference', hour: 2 },
  { individual: 'APIA-000', condition: 'day', hour: 4 },
];

let ctx: TestContext;
let ecologist: TestClient;
let reviewer: TestClient;
let volunteer: TestClient;
const sightings: string[] = [];
const photos: string[] = [];
const individuals: string[] = [];

const url = (path: string) => `/api/projects/${SLUG}${path}`;

beforeAll(async () => {
  // Failed jobs retry after milliseconds, not seconds, so the failure path below is quick.
  ctx = await createTestContext({ JOB_RETRY_MS: '5' });
  const team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  await ecologist.patch(url(''), { reviewersPerSighting: 1 });
  const stationId = await addStation(ecologist, SLUG, 'PAT1');
  const deploymentId = await addDeployment(ecologist, SLUG, { stationId, cameraLabel: 'A' });
  const files = [];
  const crops = new Map<string, { x: number; y: number; w: number; h: number }>();
  for (const [i, p] of PLAN.entries()) {
    const plan = planPhoto(p.individual, 'left', p.condition, 0, SHAPE);
    const spec = { ...plan.spec, exif: { dateTimeOriginal: exifTime(2026, 7, 2, p.hour, 0, 0) } };
    const { jpeg, truth } = await renderPhoto(spec);
    const c = reviewerCrop(plan, truth);
    const name = `PAT1_${i}.jpg`;
    crops.set(name, {
      x: c.x / SHAPE.width,
      y: c.y / SHAPE.height,
      w: c.width / SHAPE.width,
      h: c.height / SHAPE.height,
    });
    files.push({ name, body: jpeg });
  }
  const res = await upload(ecologist, SLUG, deploymentId, files);
  expect(res.status).toBe(201);
  await waitForUpload(ecologist, SLUG, res.body.upload.id);
  const events = await reviewer.get(url(`/events?stationId=${stationId}&limit=10`));
  const list = events.body.items as { id: string; photos: { id: string; fileName?: string }[] }[];
  expect(list).toHaveLength(PLAN.length);
  for (const [i, event] of list.entries()) {
    await reviewer.post(url(`/events/${event.id}/label`), {
      label: 'animal',
      species: 'Panthera pardus',
    });
    const photoId = event.photos[0]!.id;
    const s = await reviewer.post(url(`/events/${event.id}/sightings`), {
      flank: 'left',
      quality: 'good',
      bestPhotoId: photoId,
      crop: crops.get(`PAT1_${i}.jpg`),
    });
    expect(s.status).toBe(201);
    sightings.push(s.body.id as string);
    photos.push(photoId);
  }
  // The two earlier sightings become the catalogue: each a new individual, its photo a reference.
  for (const id of sightings.slice(0, 2)) {
    const next = await reviewer.get(url('/identify/next'));
    expect(next.body.sighting.id).toBe(id);
    const made = await reviewer.post(url(`/sightings/${id}/calls`), { verdict: 'new' });
    expect(made.status).toBe(200);
    individuals.push(made.body.individual.id as string);
  }
}, 120_000);

afterAll(async () => ctx?.close());

describe('coat pattern on the Identify screen', () => {
  it('should queue features in the job queue for every new sighting', async () => {
    const jobs = await ctx.db
      .selectFrom('jobs')
      .select(['payload'])
      .where('kind', '=', 'pattern')
      .execute();
    const queued = new Set(jobs.map((j) => (JSON.parse(j.payload) as { photoId: string }).photoId));
    expect([...queued].sort()).toEqual([...photos].sort());
  });

  it('should rank without the pattern and say so while features are not ready', async () => {
    await ctx.ingest.runner.stop();
    await ctx.db.deleteFrom('pattern_features').where('photo_id', '=', photos[2]!).execute();
    const next = await reviewer.get(url('/identify/next'));
    expect(next.status).toBe(200);
    expect(next.body.sighting.id).toBe(sightings[2]);
    expect(next.body.pattern.state).toBe('pending');
    expect(next.body.pattern.text).toMatch(/still being computed/);
    const reasons = (next.body.candidates as { reasons: { signal: string }[] }[]).flatMap(
      (c) => c.reasons,
    );
    expect(reasons.some((r) => r.signal === 'pattern')).toBe(false);
    await ctx.ingest.runner.start();
  });

  it('should give the matching individual a pattern reason once features exist', async () => {
    await drainJobs(ctx.db, 90_000);
    const next = await reviewer.get(url('/identify/next'));
    expect(next.status).toBe(200);
    expect(next.body.sighting.id).toBe(sightings[2]);
    expect(next.body.pattern).toMatchObject({ state: 'ready', references: 2 });
    const [top] = next.body.candidates as {
      individualId: string;
      reasons: { signal: string; text: string }[];
    }[];
    expect(top!.individualId).toBe(individuals[0]);
    const reason = top!.reasons.find((r) => r.signal === 'pattern');
    expect(reason?.text).toMatch(/^pattern: \d+ matching points$/);
    expect(Number(/\d+/.exec(reason!.text)![0])).toBeGreaterThanOrEqual(10);
    // The other leopard's coat does not match: no pattern reason for it.
    const other = (
      next.body.candidates as { individualId: string; reasons: { signal: string }[] }[]
    ).find((c) => c.individualId === individuals[1]);
    expect(other?.reasons.some((r) => r.signal === 'pattern')).toBe(false);
  });

  it('should return the matched points between the sighting and a reference photo', async () => {
    const res = await reviewer.get(url(`/sightings/${sightings[2]}/pattern-matches/${photos[0]}`));
    expect(res.status).toBe(200);
    expect(res.body.referencePhotoId).toBe(photos[0]);
    expect(res.body.inliers).toBeGreaterThanOrEqual(10);
    expect(res.body.pairs).toHaveLength(res.body.inliers);
    expect(res.body.mirrored).toBe(false);
    expect(res.body.sightingPhoto).toEqual({ width: SHAPE.width, height: SHAPE.height });
    expect(res.body.referencePhoto).toEqual({ width: SHAPE.width, height: SHAPE.height });
    for (const pair of res.body.pairs as number[][]) {
      expect(pair).toHaveLength(4);
      for (const v of pair) expect(v >= 0 && v <= 1).toBe(true);
    }
  });

  it('should refuse bad ids, unknown photos, photos that are not references and volunteers', async () => {
    const bad = await reviewer.get(url(`/sightings/not-an-id/pattern-matches/${photos[0]}`));
    expect(bad.status).toBe(400);
    expect(bad.body.error.code).toBe('validation_failed');
    const badPhoto = await reviewer.get(url(`/sightings/${sightings[2]}/pattern-matches/xyz`));
    expect(badPhoto.status).toBe(400);
    const unknownSighting = await reviewer.get(
      url(`/sightings/${newId()}/pattern-matches/${photos[0]}`),
    );
    expect(unknownSighting.status).toBe(404);
    expect(unknownSighting.body.error.code).toBe('not_found');
    const notReference = await reviewer.get(
      url(`/sightings/${sightings[2]}/pattern-matches/${photos[2]}`),
    );
    expect(notReference.status).toBe(404);
    expect(notReference.body.error.message).toMatch(/not a reference photo/);
    const refused = await volunteer.get(
      url(`/sightings/${sightings[2]}/pattern-matches/${photos[0]}`),
    );
    expect(refused.status).toBe(403);
  });

  it('should find and queue features that are missing, as at start-up after seeding or an import', async () => {
    await drainJobs(ctx.db, 90_000);
    expect(await queueMissingPatternWork(ctx.db)).toBe(0);
    await ctx.db.deleteFrom('pattern_features').where('photo_id', '=', photos[1]!).execute();
    expect(await queueMissingPatternWork(ctx.db)).toBe(1);
    // Already queued: not queued twice.
    expect(await queueMissingPatternWork(ctx.db)).toBe(0);
    ctx.ingest.runner.kick();
    await drainJobs(ctx.db, 90_000);
    const row = await ctx.db
      .selectFrom('pattern_features')
      .select(['crop', 'vocabulary', 'keypoints'])
      .where('photo_id', '=', photos[1]!)
      .executeTakeFirstOrThrow();
    expect(JSON.parse(row.crop)).toMatchObject({ x: expect.any(Number), w: expect.any(Number) });
    expect(row.keypoints).toBeGreaterThan(100);
  });

  it('should compute only the crop a sighting ends with when its box is adjusted several times', async () => {
    await drainJobs(ctx.db, 90_000);
    const sightingId = sightings[2]!;
    const boxes = [
      { x: 0.1, y: 0.1, w: 0.5, h: 0.5 },
      { x: 0.12, y: 0.1, w: 0.5, h: 0.5 },
      { x: 0.14, y: 0.1, w: 0.5, h: 0.5 },
    ];
    // Nobody has called this sighting yet: it is still open, so its crop box may change.
    for (const crop of boxes) {
      const res = await reviewer.patch(url(`/sightings/${sightingId}`), { crop });
      expect(res.status).toBe(200);
    }
    ctx.ingest.runner.kick();
    await drainJobs(ctx.db, 90_000);
    const rows = await ctx.db
      .selectFrom('pattern_features')
      .select('crop')
      .where('photo_id', '=', photos[2]!)
      .execute();
    const computed = rows.map((r) => JSON.parse(r.crop || 'null') as object | null);
    expect(computed).toContainEqual(boxes[2]);
    expect(computed).not.toContainEqual(boxes[0]);
    expect(computed).not.toContainEqual(boxes[1]);
  });

  it('should rank without the pattern and say why when the features cannot be computed', async () => {
    // A crop box of 8 × 6 pixels holds too little coat to describe: the job fails as bad input.
    const tiny = { x: 0.5, y: 0.5, w: 0.01, h: 0.01 };
    const res = await reviewer.patch(url(`/sightings/${sightings[2]}`), { crop: tiny });
    expect(res.status).toBe(200);
    ctx.ingest.runner.kick();
    await drainJobs(ctx.db, 90_000);
    const failed = await ctx.db
      .selectFrom('jobs')
      .select(['error', 'attempts'])
      .where('kind', '=', 'pattern')
      .where('status', '=', 'failed')
      .execute();
    expect(failed).toHaveLength(1);
    expect(failed[0]!.error).toMatch(/too small/);
    const next = await reviewer.get(url('/identify/next'));
    expect(next.status).toBe(200);
    expect(next.body.sighting.id).toBe(sightings[2]);
    expect(next.body.pattern.state).toBe('unavailable');
    expect(next.body.pattern.text).toMatch(/could not be computed.*ranked without it/);
    expect(next.body.pattern.text).not.toMatch(/\//);
    expect(next.body.candidates.length).toBeGreaterThan(0);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newId, nowIso } from '../../server/services/ids';
import { createUser } from '../../server/services/users.service';
import { setMemberRole } from '../../server/services/members.service';
import {
  createTestContext,
  seedTeam,
  signIn,
  TEST_PASSWORD,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Twenty reviewers identify while a curator merges (and now and then undoes) for a minute.
// Sightings are synthetic rows written straight into the database (no photo files are needed:
// nothing here serves photos). Afterwards no call is lost and no sighting points to an
// individual that was merged away.

const DURATION_MS = 60_000;
const SLUG = 'test-survey';
let ctx: TestContext;
let curator: TestClient;
let reviewers: TestClient[];

async function syntheticSightings(projectId: string, count: number): Promise<void> {
  const now = nowIso();
  const stationId = newId();
  const deploymentId = newId();
  const uploadId = newId();
  await ctx.db
    .insertInto('stations')
    .values({
      id: stationId,
      project_id: projectId,
      code: 'S01',
      name: '',
      lat: -1.2,
      lon: 36.6,
      notes: '',
      created_at: now,
    })
    .execute();
  await ctx.db
    .insertInto('deployments')
    .values({
      id: deploymentId,
      project_id: projectId,
      station_id: stationId,
      camera_label: 'A',
      camera_serial: null,
      start: '2026-07-01T00:00:00Z',
      end: '2026-08-30T00:00:00Z',
      timezone: 'UTC',
      clock_offset_seconds: 0,
      last_working: null,
      feature_type: null,
      bait_use: 0,
      notes: '',
      clock_fix: null,
      created_by: null,
      created_at: now,
    })
    .execute();
  await ctx.db
    .insertInto('card_uploads')
    .values({
      id: uploadId,
      project_id: projectId,
      deployment_id: deploymentId,
      uploader_id: null,
      accepted: count,
      duplicate: 0,
      rejected: 0,
      created_at: now,
    })
    .execute();
  await ctx.db.transaction().execute(async (trx) => {
    for (let i = 0; i < count; i++) {
      const start = new Date(Date.UTC(2026, 6, 2) + i * 3_600_000).toISOString();
      const eventId = newId();
      const photoId = newId();
      await trx
        .insertInto('events')
        .values({
          id: eventId,
          project_id: projectId,
          station_id: stationId,
          start,
          end: start,
          photo_count: 1,
          created_at: now,
          label: 'animal',
          species: 'Panthera pardus',
          animal_count: 1,
          sorted_by: null,
          sorted_at: now,
          label_version: 1,
          lease_holder: null,
          lease_until: null,
        })
        .execute();
      await trx
        .insertInto('photos')
        .values({
          id: photoId,
          project_id: projectId,
          deployment_id: deploymentId,
          upload_id: uploadId,
          sha256: `${i}`.padStart(64, '0'),
          original_name: `IMG_${i}.JPG`,
          stored_path: 'synthetic',
          bytes: 1,
          width: 1,
          height: 1,
          taken_at_exif: null,
          taken_at: start,
          gps_lat: null,
          gps_lon: null,
          make: null,
          model: null,
          serial: null,
          status: 'ready',
          error: null,
          flags: '[]',
          exif_thumb: 0,
          event_id: eventId,
          created_at: now,
        })
        .execute();
      await trx
        .insertInto('sightings')
        .values({
          id: newId(),
          project_id: projectId,
          event_id: eventId,
          flank: i % 2 ? 'left' : 'right',
          quality: 'good',
          best_photo_id: photoId,
          crop: null,
          sex: null,
          age_class: null,
          state: 'open',
          individual_id: null,
          created_by: null,
          created_at: now,
          updated_at: now,
        })
        .execute();
    }
  });
}

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  const ecologist = await signIn(ctx.app, team.users.ecologist.email);
  await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 1 });
  curator = await signIn(ctx.app, team.users.curator.email);
  await syntheticSightings(team.project.id, 3000);
  reviewers = [];
  for (let i = 0; i < 20; i++) {
    const u = await createUser(
      ctx.db,
      { email: `storm${i}@test-survey.test`, name: `Storm ${i}`, password: TEST_PASSWORD },
      null,
    );
    await setMemberRole(ctx.db, team.project.id, u.id, 'reviewer', team.users.admin.id);
    reviewers.push(await signIn(ctx.app, u.email));
  }
}, 120_000);
afterAll(async () => ctx.close());

describe('identifying while a curator merges', () => {
  it(
    'should lose no call and leave no sighting with a merged-away individual',
    async () => {
      const stopAt = Date.now() + DURATION_MS;
      let accepted = 0;
      const failures: string[] = [];
      let merges = 0;
      let undos = 0;

      const reviewing = reviewers.map(async (client, r) => {
        let n = 0;
        while (Date.now() < stopAt) {
          const next = await client.get(`/api/projects/${SLUG}/identify/next`);
          if (next.status === 204) return;
          const candidates = next.body.candidates as { individualId: string }[];
          const body =
            candidates.length && (n + r) % 4 !== 0
              ? { verdict: 'match', individualId: candidates[n % candidates.length]!.individualId }
              : { verdict: 'new' };
          const res = await client.post(
            `/api/projects/${SLUG}/sightings/${next.body.sighting.id}/calls`,
            body,
          );
          if (res.status === 200) accepted++;
          else failures.push(`${res.status}: ${res.body.error?.message}`);
          n++;
        }
      });

      const curating = (async () => {
        const changes: string[] = [];
        while (Date.now() < stopAt) {
          const list = (await curator.get(`/api/projects/${SLUG}/individuals`)).body as {
            id: string;
          }[];
          if (list.length >= 2) {
            const [x, y] = [list[merges % list.length]!, list[(merges + 1) % list.length]!];
            const res = await curator.post(`/api/projects/${SLUG}/individuals/${x.id}/merge`, {
              into: y.id,
              reason: 'storm test',
            });
            if (res.status === 200) {
              merges++;
              changes.push(res.body.change.id);
            } else if (res.status !== 409 && res.status !== 404)
              failures.push(`merge ${res.status}: ${res.body.error?.message}`);
            if (merges % 5 === 0 && changes.length) {
              const undo = await curator.post(
                `/api/projects/${SLUG}/identity-changes/${changes.pop()}/undo`,
                {},
              );
              if (undo.status === 200) undos++;
            }
          }
          await new Promise((r) => setTimeout(r, 50));
        }
      })();

      await Promise.all([...reviewing, curating]);
      const calls = await ctx.db.selectFrom('calls').select('id').execute();
      expect(calls).toHaveLength(accepted);
      expect(failures.filter((f) => !f.startsWith('409'))).toEqual([]);
      expect(merges).toBeGreaterThan(10);
      expect(undos).toBeGreaterThan(0);
      const orphaned = await ctx.db
        .selectFrom('sightings')
        .innerJoin('individuals', 'individuals.id', 'sightings.individual_id')
        .select('sightings.id')
        .where('individuals.status', '!=', 'active')
        .execute();
      expect(orphaned).toEqual([]);
      const confirmedWithout = await ctx.db
        .selectFrom('sightings')
        .select('id')
        .where('state', '=', 'confirmed')
        .where('individual_id', 'is', null)
        .execute();
      expect(confirmedWithout).toEqual([]);
    },
    DURATION_MS + 60_000,
  );
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { newId, nowIso } from '../../server/services/ids';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// A hand-checked small dataset (synthetic): events and effort are counted by hand below.
//
// Station R1: camera A 1–11 July (10 days), camera B 6–16 July (10 days). At least one camera
//   worked 1–16 July: 15 station-days (20 camera-days).
// Station R2: camera A 1–21 July, but it died on 11 July at 00:00: 10 station-days.
// Leopard events: R1 3, R2 2 → R1 3/15·100 = 20.0; R2 2/10·100 = 20.0; overall 5/25·100 = 20.0.
// Bushbuck events: R1 1, R2 0 → R1 1/15·100 = 6.667; R2 0; overall 1/25·100 = 4.0.
// Blank and human events never count.

let ctx: TestContext;
let reviewer: TestClient;
let volunteer: TestClient;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  const projectId = team.project.id;
  const station = async (code: string) => {
    const id = newId();
    await ctx.db
      .insertInto('stations')
      .values({
        id,
        project_id: projectId,
        code,
        name: '',
        lat: -1.2,
        lon: 36.6,
        notes: '',
        created_at: nowIso(),
      })
      .execute();
    return id;
  };
  const deployment = async (
    stationId: string,
    label: string,
    start: string,
    end: string,
    lastWorking: string | null = null,
  ) =>
    ctx.db
      .insertInto('deployments')
      .values({
        id: newId(),
        project_id: projectId,
        station_id: stationId,
        camera_label: label,
        camera_serial: null,
        start,
        end,
        timezone: 'UTC',
        clock_offset_seconds: 0,
        last_working: lastWorking,
        feature_type: null,
        bait_use: 0,
        notes: '',
        clock_fix: null,
        created_by: null,
        created_at: nowIso(),
      })
      .execute();
  const event = async (stationId: string, day: number, label: string, species: string | null) =>
    ctx.db
      .insertInto('events')
      .values({
        id: newId(),
        project_id: projectId,
        station_id: stationId,
        start: `2026-07-${String(day).padStart(2, '0')}T03:00:00Z`,
        end: `2026-07-${String(day).padStart(2, '0')}T03:00:00Z`,
        photo_count: 1,
        created_at: nowIso(),
        label,
        species,
        animal_count: species ? 1 : null,
        sorted_by: null,
        sorted_at: nowIso(),
        label_version: 1,
        lease_holder: null,
        lease_until: null,
      })
      .execute();
  const r1 = await station('R1');
  const r2 = await station('R2');
  await deployment(r1, 'A', '2026-07-01T00:00:00Z', '2026-07-11T00:00:00Z');
  await deployment(r1, 'B', '2026-07-06T00:00:00Z', '2026-07-16T00:00:00Z');
  await deployment(r2, 'A', '2026-07-01T00:00:00Z', '2026-07-21T00:00:00Z', '2026-07-11T00:00:00Z');
  for (const day of [2, 5, 9]) await event(r1, day, 'animal', 'Panthera pardus');
  await event(r1, 12, 'animal', 'Tragelaphus scriptus');
  for (const day of [3, 8]) await event(r2, day, 'animal', 'Panthera pardus');
  await event(r2, 4, 'blank', null);
  await event(r1, 4, 'human', null);
});
afterAll(async () => ctx.close());

describe('relative abundance index', () => {
  it('should give independent events per 100 station-days per species, per station and overall', async () => {
    const res = await reviewer.get('/api/projects/test-survey/relative-abundance');
    expect(res.status).toBe(200);
    expect(res.body.label).toMatch(/not an estimate of abundance/);
    expect(res.body.effortDays).toBe(25);
    expect(res.body.cameraDays).toBe(30);
    const leopard = res.body.species.find(
      (s: { species: string }) => s.species === 'Panthera pardus',
    );
    expect(leopard.events).toBe(5);
    expect(leopard.overall).toBeCloseTo(20, 10);
    expect(leopard.stations).toEqual([
      { stationCode: 'R1', events: 3, effortDays: 15, per100Days: 20 },
      { stationCode: 'R2', events: 2, effortDays: 10, per100Days: 20 },
    ]);
    const bushbuck = res.body.species.find(
      (s: { species: string }) => s.species === 'Tragelaphus scriptus',
    );
    expect(bushbuck.overall).toBeCloseTo(4, 10);
    expect(bushbuck.stations[0].per100Days).toBeCloseTo(100 / 15, 10);
    expect(bushbuck.stations[1].per100Days).toBe(0);
    expect(res.body.species.map((s: { species: string }) => s.species)).toEqual([
      'Panthera pardus',
      'Tragelaphus scriptus',
    ]);
  });

  it('should give volunteers the overall index without the per-station breakdown', async () => {
    const res = await volunteer.get('/api/projects/test-survey/relative-abundance');
    expect(res.body.species[0].overall).toBeCloseTo(20, 10);
    expect(res.body.species[0].stations).toEqual([]);
  });
});

import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDeployment, addStation } from '../support/ingest-helpers';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let volunteer: TestClient;

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
});
afterAll(async () => ctx.close());

describe('stations', () => {
  it('should create stations with unique codes, for ecologists only', async () => {
    await addStation(ecologist, 'test-survey', 'ST01', -1.18204, 36.61796);
    const dup = await ecologist.post('/api/projects/test-survey/stations', {
      code: 'ST01',
      lat: -1.1,
      lon: 36.6,
    });
    expect(dup.status).toBe(409);
    const byVolunteer = await volunteer.post('/api/projects/test-survey/stations', {
      code: 'ST09',
      lat: -1.1,
      lon: 36.6,
    });
    expect(byVolunteer.status).toBe(403);
    const bad = await ecologist.post('/api/projects/test-survey/stations', {
      code: '',
      lat: 95,
      lon: 'east',
    });
    expect(bad.status).toBe(400);
    expect(
      [...new Set(bad.body.error.details.request.map((d: { path: string }) => d.path))].sort(),
    ).toEqual(['code', 'lat', 'lon']);
  });

  it('should show exact coordinates to ecologists and 0.1° grid points to volunteers on a high-sensitivity project', async () => {
    const exact = (await ecologist.get('/api/projects/test-survey/stations')).body[0];
    expect([exact.lat, exact.lon]).toEqual([-1.18204, 36.61796]);
    const general = (await volunteer.get('/api/projects/test-survey/stations')).body[0];
    expect([general.lat, general.lon, general.coordinatePrecision]).toEqual([-1.2, 36.6, 0.1]);
  });

  it('should withhold coordinates from volunteers when the project is extremely sensitive', async () => {
    await ecologist.patch('/api/projects/test-survey', { sensitivity: 'extreme' });
    const s = (await volunteer.get('/api/projects/test-survey/stations')).body[0];
    expect([s.lat, s.lon, s.coordinatesWithheld]).toEqual([null, null, true]);
    await ecologist.patch('/api/projects/test-survey', { sensitivity: 'high' });
  });

  it('should import a clean CSV and refuse a file with any bad row, importing nothing', async () => {
    const bad = [
      'code,name,latitude,longitude',
      'ST10,ok,-1.21,36.62',
      ',no code,-1.22,36.63',
      'ST12,swapped,36.64,-1.23',
      'ST13,not numbers,abc,36.6',
      'ST10,duplicate in file,-1.24,36.65',
      'ST01,exists already,-1.25,36.66',
    ].join('\n');
    const res = await ecologist.post('/api/projects/test-survey/stations/import', { csv: bad });
    expect(res.status).toBe(400);
    const report = res.body.error.details.report;
    const byRow = Object.fromEntries(
      report.problems.map((p: { row: number; problems: string[] }) => [
        p.row,
        p.problems.join(' '),
      ]),
    );
    expect(byRow[3]).toMatch(/code is missing/);
    expect(byRow[4]).toMatch(/swapped/);
    expect(byRow[5]).toMatch(/not decimal degrees/);
    expect(byRow[6]).toMatch(/also used on row 2/);
    expect(byRow[7]).toMatch(/already exists/);
    expect(byRow[2]).toBeUndefined();
    expect((await ecologist.get('/api/projects/test-survey/stations')).body).toHaveLength(1);

    const clean = 'code,name,lat,lon\nST10,Ridge,-1.21,36.62\nST11,Gully,-1.22,36.63\n';
    const dry = await ecologist.post('/api/projects/test-survey/stations/import?dryRun=1', {
      csv: clean,
    });
    expect(dry.body).toMatchObject({ imported: 0, rows: 2, dryRun: true, problems: [] });
    const ok = await ecologist.post('/api/projects/test-survey/stations/import', { csv: clean });
    expect(ok.status).toBe(201);
    expect(ok.body.imported).toBe(2);
    expect(
      (await ecologist.get('/api/projects/test-survey/stations')).body.map(
        (s: { code: string }) => s.code,
      ),
    ).toEqual(['ST01', 'ST10', 'ST11']);
  });

  it('should refuse a CSV without the needed columns', async () => {
    const res = await ecologist.post('/api/projects/test-survey/stations/import', {
      csv: 'name,x\nA,1\n',
    });
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/needs a "code" column/);
  });
});

describe('deployments and effort', () => {
  it('should record deployments, refuse bad windows, and count camera-days and station-days', async () => {
    const stations = (await ecologist.get('/api/projects/test-survey/stations')).body as {
      id: string;
      code: string;
    }[];
    const st10 = stations.find((s) => s.code === 'ST10')!.id;
    const a = await addDeployment(volunteer, 'test-survey', {
      stationId: st10,
      cameraLabel: 'A',
      start: '2026-07-01T00:00:00Z',
      end: '2026-07-21T00:00:00Z',
    });
    await addDeployment(volunteer, 'test-survey', {
      stationId: st10,
      cameraLabel: 'B',
      start: '2026-07-11T00:00:00Z',
      end: '2026-07-31T00:00:00Z',
    });
    const backwards = await volunteer.post('/api/projects/test-survey/deployments', {
      stationId: st10,
      cameraLabel: 'C',
      start: '2026-07-10T00:00:00Z',
      end: '2026-07-01T00:00:00Z',
      timezone: 'Africa/Nairobi',
    });
    expect(backwards.status).toBe(400);
    expect(backwards.body.error.message).toMatch(/end must be after the start/);
    const noZone = await volunteer.post('/api/projects/test-survey/deployments', {
      stationId: st10,
      cameraLabel: 'C',
      start: '2026-07-01T00:00',
      end: '2026-07-02T00:00:00Z',
      timezone: 'Mars/Olympus',
    });
    expect(noZone.status).toBe(400);
    expect(noZone.body.error.details.request.map((d: { path: string }) => d.path).sort()).toEqual([
      'start',
      'timezone',
    ]);
    const unknownStation = await volunteer.post('/api/projects/test-survey/deployments', {
      stationId: '0123456789abcdef0123',
      cameraLabel: 'C',
      start: '2026-07-01T00:00:00Z',
      end: '2026-07-02T00:00:00Z',
      timezone: 'UTC',
    });
    expect(unknownStation.status).toBe(400);

    // Camera A died on 11 July at noon: effort stops there.
    const patched = await volunteer.patch(`/api/projects/test-survey/deployments/${a}`, {
      lastWorking: '2026-07-11T12:00:00Z',
    });
    expect(patched.body.cameraDays).toBe(10.5);
    const station = (await volunteer.get(`/api/projects/test-survey/stations/${st10}`)).body;
    // A: 1 Jul–11 Jul 12:00 (10.5 d), B: 11–31 Jul (20 d): sum 30.5 camera-days; union 1–31 Jul = 30 station-days.
    expect(station.cameraDays).toBe(30.5);
    expect(station.stationDays).toBe(30);
    expect(station.deploymentList).toHaveLength(2);
  });
});

import { existsSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import exifr from 'exifr';
import { imageSize } from 'image-size';
import { readFileSync } from 'node:fs';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDeployment, addStation, upload, waitForUpload } from '../support/ingest-helpers';
import { exifJpeg } from '../support/photo-fixtures';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Synthetic test photos: tiny JPEGs with EXIF written by the test itself (piexifjs).

let ctx: TestContext;
let team: Awaited<ReturnType<typeof seedTeam>>;
let ecologist: TestClient;
let volunteer: TestClient;
let reviewer: TestClient;
let stationId: string;
let camA: string;
let camB: string;

const SLUG = 'test-survey';

beforeAll(async () => {
  ctx = await createTestContext();
  team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  stationId = await addStation(ecologist, SLUG, 'KH01', -1.2, 36.6);
  camA = await addDeployment(volunteer, SLUG, {
    stationId,
    cameraLabel: 'A',
    cameraSerial: 'SN-A-1',
  });
  camB = await addDeployment(volunteer, SLUG, {
    stationId,
    cameraLabel: 'B',
    cameraSerial: 'SN-B-1',
  });
});
afterAll(async () => ctx.close());

describe('card upload', () => {
  it('should accept photos, read EXIF and give exact corrected times in UTC', async () => {
    const photo = await exifJpeg({
      dateTimeOriginal: '2026:07:02 06:30:15',
      subSec: '5',
      lat: -1.2001,
      lon: 36.6002,
      make: 'Fieldcam',
      model: 'FC-2',
      serial: 'SN-A-1',
    });
    const res = await upload(volunteer, SLUG, camA, [{ name: 'IMG_0001.JPG', body: photo }]);
    expect(res.status).toBe(201);
    expect(res.body.files).toEqual([
      { name: 'IMG_0001.JPG', status: 'accepted', photoId: expect.any(String) },
    ]);
    const list = await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`);
    expect(list.body).toHaveLength(1);
    // Africa/Nairobi is UTC+3 all year: 06:30:15.5 local is 03:30:15.5 UTC.
    expect(list.body[0]).toMatchObject({
      originalName: 'IMG_0001.JPG',
      takenAtExif: '2026-07-02T06:30:15.5',
      takenAt: '2026-07-02T03:30:15.500Z',
      width: 64,
      height: 48,
      flags: [],
    });
    // Volunteers on a high-sensitivity project see GPS on the 0.1° grid.
    expect([list.body[0].lat, list.body[0].lon]).toEqual([-1.2, 36.6]);
  });

  it('should apply a deployment clock offset to the corrected time', async () => {
    const offsetCam = await addDeployment(volunteer, SLUG, {
      stationId,
      cameraLabel: 'C',
      clockOffsetSeconds: 3600,
    });
    const res = await upload(volunteer, SLUG, offsetCam, [
      {
        name: 'x.jpg',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:02 06:00:00', make: 'c' }),
      },
    ]);
    const list = await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`);
    expect(list.body[0].takenAt).toBe('2026-07-02T04:00:00Z');
  });

  it('should flag GPS far from the station, a different camera serial and a missing time, and keep the photos', async () => {
    const far = await exifJpeg({
      dateTimeOriginal: '2026:07:03 10:00:00',
      lat: -1.25,
      lon: 36.6,
      serial: 'SN-OTHER',
    });
    const timeless = await exifJpeg({ make: 'no time here' });
    const res = await upload(volunteer, SLUG, camA, [
      { name: 'far.jpg', body: far },
      { name: 'timeless.jpg', body: timeless },
    ]);
    expect(res.body.files.map((f: { status: string }) => f.status)).toEqual([
      'accepted',
      'accepted',
    ]);
    const list = await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`);
    const byName = Object.fromEntries(
      list.body.map((p: { originalName: string; flags: string[] }) => [p.originalName, p.flags]),
    );
    expect(byName['far.jpg']).toEqual(['gps_far_from_station', 'serial_mismatch']);
    expect(byName['timeless.jpg']).toEqual(['no_exif_time']);
    const progress = await volunteer.get(`/api/projects/${SLUG}/uploads/${res.body.upload.id}`);
    expect(progress.body.flagged).toEqual({
      gps_far_from_station: 1,
      serial_mismatch: 1,
      no_exif_time: 1,
    });
    const filtered = await volunteer.get(`/api/projects/${SLUG}/photos?flag=no_exif_time`);
    expect(filtered.body.map((p: { originalName: string }) => p.originalName)).toEqual([
      'timeless.jpg',
    ]);
  });

  it('should deduplicate by content: the same card twice adds nothing, same name with other bytes is kept', async () => {
    const files = [
      {
        name: 'IMG_0100.JPG',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:05 01:00:00' }, { color: 0x112233ff }),
      },
      {
        name: 'IMG_0101.JPG',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:05 01:00:05' }, { color: 0x223344ff }),
      },
    ];
    const first = await upload(volunteer, SLUG, camA, files);
    expect(first.body.files.map((f: { status: string }) => f.status)).toEqual([
      'accepted',
      'accepted',
    ]);
    const before = await ctx.db.selectFrom('photos').select('id').execute();
    const again = await upload(volunteer, SLUG, camA, files);
    expect(again.body.files.map((f: { status: string }) => f.status)).toEqual([
      'duplicate',
      'duplicate',
    ]);
    expect(again.body.files[0].photoId).toBe(first.body.files[0].photoId);
    const renamed = await upload(volunteer, SLUG, camB, [
      { name: 'DSC_9.JPG', body: files[0]!.body },
    ]);
    expect(renamed.body.files[0].status).toBe('duplicate');
    // Trail cameras restart numbering: the same name with different bytes is a different photo.
    const sameName = await upload(volunteer, SLUG, camB, [
      {
        name: 'IMG_0100.JPG',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:05 01:00:09' }, { color: 0x445566ff }),
      },
    ]);
    expect(sameName.body.files[0].status).toBe('accepted');
    const after = await ctx.db.selectFrom('photos').select('id').execute();
    expect(after.length).toBe(before.length + 1);
  });

  it('should add more files to the same card upload with ?uploadId=', async () => {
    const first = await upload(volunteer, SLUG, camB, [
      {
        name: 'a.jpg',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:06 02:00:00' }, { color: 0x010203ff }),
      },
    ]);
    const uploadId = first.body.upload.id as string;
    const second = await upload(
      volunteer,
      SLUG,
      camB,
      [
        {
          name: 'b.jpg',
          body: await exifJpeg({ dateTimeOriginal: '2026:07:06 02:00:01' }, { color: 0x040506ff }),
        },
      ],
      uploadId,
    );
    expect(second.body.upload.id).toBe(uploadId);
    const progress = await waitForUpload(volunteer, SLUG, uploadId);
    expect(progress.counts).toMatchObject({
      accepted: 2,
      duplicate: 0,
      rejected: 0,
      ready: 2,
      queued: 0,
      processing: 0,
      failed: 0,
    });
    expect(progress.done).toBe(true);
    const wrongDeployment = await upload(
      volunteer,
      SLUG,
      camA,
      [{ name: 'c.jpg', body: await exifJpeg({}, { color: 0x070809ff }) }],
      uploadId,
    );
    expect(wrongDeployment.status).toBe(409);
  });

  it('should make a 1600 px preview and a 320 px thumbnail without any metadata', async () => {
    const big = await exifJpeg(
      { dateTimeOriginal: '2026:07:07 03:00:00', lat: -1.2, lon: 36.6, make: 'Fieldcam' },
      { width: 2000, height: 1200 },
    );
    const res = await upload(volunteer, SLUG, camA, [{ name: 'big.jpg', body: big }]);
    await waitForUpload(volunteer, SLUG, res.body.upload.id);
    const id = res.body.files[0].photoId as string;
    const preview = await volunteer.get(`/api/photos/${id}/preview`).buffer(true);
    const thumb = await volunteer.get(`/api/photos/${id}/thumb`).buffer(true);
    expect(preview.status).toBe(200);
    expect(imageSize(preview.body as Buffer)).toMatchObject({
      width: 1600,
      height: 960,
      type: 'jpg',
    });
    expect(imageSize(thumb.body as Buffer)).toMatchObject({ width: 320, height: 192 });
    expect(
      await exifr.parse(preview.body as Buffer, { gps: true }).catch(() => undefined),
    ).toBeUndefined();
    expect(await exifr.gps(thumb.body as Buffer).catch(() => undefined)).toBeUndefined();
    // The ecologist gets the original byte for byte; on this high-sensitivity project the
    // volunteer's copy has the metadata segments (with the camera GPS) cut out, pixels untouched.
    const original = await ecologist.get(`/api/photos/${id}/original`).buffer(true);
    expect(Buffer.compare(original.body as Buffer, big)).toBe(0);
    const stripped = (await volunteer.get(`/api/photos/${id}/original`).buffer(true))
      .body as Buffer;
    expect(await exifr.gps(stripped).catch(() => undefined)).toBeUndefined();
    expect(imageSize(stripped)).toMatchObject({ width: 2000, height: 1200 });
    expect(stripped.length).toBeLessThan(big.length);
    // Everything after the metadata is the same bytes: the scan data are not re-encoded.
    expect(Buffer.compare(stripped.subarray(-1000), big.subarray(-1000))).toBe(0);
  });

  it('should serve the embedded EXIF thumbnail before the worker has made one', async () => {
    await ctx.ingest.runner.stop();
    try {
      const res = await upload(volunteer, SLUG, camA, [
        {
          name: 'early.jpg',
          body: await exifJpeg({ dateTimeOriginal: '2026:07:08 04:00:00' }, { color: 0x0a0b0cff }),
        },
      ]);
      const id = res.body.files[0].photoId as string;
      const thumb = await volunteer.get(`/api/photos/${id}/thumb`).buffer(true);
      expect(thumb.status).toBe(200);
      expect(imageSize(thumb.body as Buffer)).toMatchObject({ width: 16, height: 12 });
    } finally {
      await ctx.ingest.runner.start();
    }
  });
});

describe('who may see photos', () => {
  it('should let volunteers see only their own uploads, and refuse outsiders and anonymous callers', async () => {
    const other = await signIn(ctx.app, team.users.curator.email);
    const res = await upload(other, SLUG, camA, [
      {
        name: 'curators.jpg',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:09 05:00:00' }, { color: 0x0d0e0fff }),
      },
    ]);
    const id = res.body.files[0].photoId as string;
    expect((await volunteer.get(`/api/photos/${id}/thumb`)).status).toBe(403);
    expect(
      (await volunteer.get(`/api/projects/${SLUG}/uploads/${res.body.upload.id}`)).status,
    ).toBe(403);
    expect(
      (await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`)).body,
    ).toEqual([]);
    expect((await reviewer.get(`/api/photos/${id}/thumb`)).status).toBe(200);
    const outsider = await signIn(ctx.app, team.users.outsider.email);
    for (const kind of ['thumb', 'preview', 'original']) {
      expect((await outsider.get(`/api/photos/${id}/${kind}`)).status).toBe(403);
      expect((await request(ctx.app).get(`/api/photos/${id}/${kind}`)).status).toBe(401);
    }
    expect((await reviewer.get('/api/photos/not-an-id/thumb')).status).toBe(400);
    expect((await reviewer.get('/api/photos/0123456789abcdef0123/thumb')).status).toBe(404);
  });
});

describe('events', () => {
  it('should group both cameras of a station into one event and split exactly after the interval', async () => {
    const station = await addStation(ecologist, SLUG, 'KH02', -1.21, 36.61);
    const a = await addDeployment(volunteer, SLUG, { stationId: station, cameraLabel: 'A' });
    const b = await addDeployment(volunteer, SLUG, { stationId: station, cameraLabel: 'B' });
    const at = (time: string, color: number) => exifJpeg({ dateTimeOriginal: time }, { color });
    // Camera A 20:00:00 and camera B 20:00:02 (one pass, both flanks); A again at 20:30:02
    // (exactly 30 min after the previous photo: same event); B at 21:00:03 (30 min 1 s: new event).
    await upload(volunteer, SLUG, a, [
      { name: 'a1.jpg', body: await at('2026:07:10 20:00:00', 0x100000ff) },
      { name: 'a2.jpg', body: await at('2026:07:10 20:30:02', 0x200000ff) },
    ]);
    await upload(volunteer, SLUG, b, [
      { name: 'b1.jpg', body: await at('2026:07:10 20:00:02', 0x300000ff) },
      { name: 'b2.jpg', body: await at('2026:07:10 21:00:03', 0x400000ff) },
    ]);
    const events = await ctx.db
      .selectFrom('events')
      .selectAll()
      .where('station_id', '=', station)
      .orderBy('start')
      .execute();
    expect(events.map((e) => [e.start, e.end, e.photo_count])).toEqual([
      ['2026-07-10T17:00:00Z', '2026-07-10T17:30:02Z', 3],
      ['2026-07-10T18:00:03Z', '2026-07-10T18:00:03Z', 1],
    ]);
  });

  it('should regroup when the independence interval changes, keeping the ids of events that stay whole', async () => {
    const station = (
      await ctx.db
        .selectFrom('stations')
        .select('id')
        .where('code', '=', 'KH02')
        .executeTakeFirstOrThrow()
    ).id;
    const before = await ctx.db
      .selectFrom('events')
      .select('id')
      .where('station_id', '=', station)
      .orderBy('start')
      .execute();
    const patched = await ecologist.patch(`/api/projects/${SLUG}`, { independenceMinutes: 60 });
    expect(patched.body).toMatchObject({ independenceMinutes: 60 });
    const after = await ctx.db
      .selectFrom('events')
      .selectAll()
      .where('station_id', '=', station)
      .execute();
    expect(after).toHaveLength(1);
    expect(after[0]!.id).toBe(before[0]!.id);
    expect(after[0]!.photo_count).toBe(4);
    await ecologist.patch(`/api/projects/${SLUG}`, { independenceMinutes: 30 });
    expect(
      await ctx.db.selectFrom('events').select('id').where('station_id', '=', station).execute(),
    ).toHaveLength(2);
  });
});

describe('clock fix', () => {
  it('should shift every photo of the deployment by true − EXIF, keep EXIF times, and regroup', async () => {
    const station = await addStation(ecologist, SLUG, 'KH03', -1.22, 36.62);
    // The camera's clock was reset to 2000-01-01 when its batteries died.
    const dep = await addDeployment(volunteer, SLUG, { stationId: station, cameraLabel: 'A' });
    const setup = await exifJpeg(
      { dateTimeOriginal: '2000:01:01 00:05:00' },
      { color: 0x500000ff },
    );
    const later = await exifJpeg(
      { dateTimeOriginal: '2000:01:03 14:25:30' },
      { color: 0x600000ff },
    );
    const res = await upload(volunteer, SLUG, dep, [
      { name: 'setup.jpg', body: setup },
      { name: 'later.jpg', body: later },
    ]);
    const [setupId] = res.body.files.map((f: { photoId: string }) => f.photoId);
    let photos = (
      await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`)
    ).body;
    expect(
      photos.every(
        (p: { flags: string[] }) =>
          p.flags.includes('outside_deployment') && p.flags.includes('clock_reset_suspected'),
      ),
    ).toBe(true);
    expect(
      await ctx.db.selectFrom('events').select('id').where('station_id', '=', station).execute(),
    ).toHaveLength(0);

    // The setup photo shows the reference clock at 2026-07-01 10:05:00 local time.
    const fix = await volunteer.post(`/api/projects/${SLUG}/deployments/${dep}/clock-fix`, {
      photoId: setupId,
      trueTime: '2026-07-01T10:05:00',
    });
    expect(fix.status).toBe(200);
    const offset = (Date.UTC(2026, 6, 1, 10, 5, 0) - Date.UTC(2000, 0, 1, 0, 5, 0)) / 1000;
    expect(fix.body.clockOffsetSeconds).toBe(offset);
    expect(fix.body.clockFix).toMatchObject({
      photoId: setupId,
      exifTime: '2000-01-01T00:05:00',
      trueTime: '2026-07-01T10:05:00',
    });
    photos = (await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`))
      .body;
    const byName = Object.fromEntries(
      photos.map((p: { originalName: string }) => [p.originalName, p]),
    );
    expect(byName['setup.jpg']).toMatchObject({
      takenAtExif: '2000-01-01T00:05:00',
      takenAt: '2026-07-01T07:05:00Z',
      flags: ['clock_reset_suspected'],
    });
    // 2 days 14 h 20 min 30 s after the setup photo.
    expect(byName['later.jpg']).toMatchObject({
      takenAtExif: '2000-01-03T14:25:30',
      takenAt: '2026-07-03T21:25:30Z',
    });
    expect(
      await ctx.db.selectFrom('events').select('id').where('station_id', '=', station).execute(),
    ).toHaveLength(2);
    const audit = await ctx.db
      .selectFrom('audit_log')
      .select('action')
      .where('entity_id', '=', dep)
      .execute();
    expect(audit.map((a) => a.action)).toContain('clock-fix');
  });

  it('should refuse a reference photo from another deployment and a malformed time', async () => {
    const other = (
      await ctx.db
        .selectFrom('photos')
        .select('id')
        .where('deployment_id', '=', camA)
        .executeTakeFirstOrThrow()
    ).id;
    const dep = await addDeployment(volunteer, SLUG, { stationId, cameraLabel: 'D' });
    expect(
      (
        await volunteer.post(`/api/projects/${SLUG}/deployments/${dep}/clock-fix`, {
          photoId: other,
          trueTime: '2026-07-01T10:05',
        })
      ).status,
    ).toBe(400);
    const bad = await volunteer.post(`/api/projects/${SLUG}/deployments/${camA}/clock-fix`, {
      photoId: other,
      trueTime: 'ten past ten',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.message).toMatch(/YYYY-MM-DD/);
  });
});

describe('storage', () => {
  it('should store each distinct photo once under its SHA-256 and leave no temp files', async () => {
    const photos = await ctx.db.selectFrom('photos').select(['sha256', 'stored_path']).execute();
    for (const p of photos) {
      expect(p.stored_path).toBe(join('originals', p.sha256.slice(0, 2), `${p.sha256}.jpg`));
      expect(existsSync(join(ctx.config.uploadsDir, p.stored_path))).toBe(true);
    }
    expect(readdirSync(join(ctx.config.uploadsDir, 'tmp'))).toEqual([]);
    const stored = readdirSync(join(ctx.config.uploadsDir, 'originals'), {
      recursive: true,
    }).filter((f) => String(f).endsWith('.jpg'));
    expect(stored.length).toBe(new Set(photos.map((p) => p.sha256)).size);
    expect(
      readFileSync(join(ctx.config.uploadsDir, photos[0]!.stored_path)).length,
    ).toBeGreaterThan(100);
  });
});

import { readdirSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { addDeployment, addStation, upload, waitForUpload } from '../support/ingest-helpers';
import {
  corruptExifJpeg,
  exifJpeg,
  jpegClaiming,
  multipart,
  plainJpeg,
  pngBombHeader,
} from '../support/photo-fixtures';
import {
  createTestContext,
  seedTeam,
  signIn,
  type TestClient,
  type TestContext,
} from '../support/test-app';

// Every bad file gets its own verdict and the rest of the card goes on. Synthetic files only.

let ctx: TestContext;
let volunteer: TestClient;
let deployment: string;
const SLUG = 'test-survey';

beforeAll(async () => {
  ctx = await createTestContext({
    UPLOAD_MAX_FILES: '12',
    UPLOAD_MAX_FILE_MB: '1',
    UPLOAD_MAX_REQUEST_MB: '3',
    JOB_RETRY_MS: '20',
  });
  const team = await seedTeam(ctx.db);
  const ecologist = await signIn(ctx.app, team.users.ecologist.email);
  volunteer = await signIn(ctx.app, team.users.volunteer.email);
  deployment = await addDeployment(volunteer, SLUG, {
    stationId: await addStation(ecologist, SLUG, 'B01'),
    cameraLabel: 'A',
  });
});
afterAll(async () => ctx.close());

function verdicts(files: { name: string; status: string; code?: string }[]) {
  return Object.fromEntries(files.map((f) => [f.name, f.code ?? f.status]));
}

describe('bad files in a card', () => {
  it('should reject each bad file with a code and a message, and accept the good ones', async () => {
    const good = await exifJpeg({ dateTimeOriginal: '2026:07:04 09:00:00' }, { color: 0x778899ff });
    const jpeg = await plainJpeg(64, 48, 0x123456ff);
    const mp4 = Buffer.concat([
      Buffer.from([0, 0, 0, 0x20]),
      Buffer.from('ftypisom', 'latin1'),
      Buffer.alloc(200),
    ]);
    const res = await upload(volunteer, SLUG, deployment, [
      { name: 'good.jpg', body: good },
      { name: 'empty.jpg', body: Buffer.alloc(0) },
      { name: 'notes.jpg', body: Buffer.from('field notes: KH07 camera B card full\n') },
      {
        name: 'page.jpg',
        body: Buffer.from('<!doctype html><html><body>Not a photo</body></html>'),
      },
      { name: 'cut.jpg', body: jpeg.subarray(0, Math.floor(jpeg.length / 2)) },
      { name: 'bomb.png', body: pngBombHeader() },
      { name: 'bomb.jpg', body: await jpegClaiming(60_000, 60_000) },
      { name: 'clip.mp4', body: mp4 },
      { name: 'bad-exif.jpg', body: await corruptExifJpeg() },
    ]);
    expect(res.status).toBe(201);
    expect(verdicts(res.body.files)).toEqual({
      'good.jpg': 'accepted',
      'empty.jpg': 'empty_file',
      'notes.jpg': 'not_an_image',
      'page.jpg': 'not_an_image',
      'cut.jpg': 'truncated',
      'bomb.png': 'too_many_pixels',
      'bomb.jpg': 'too_many_pixels',
      'clip.mp4': 'unsupported_format',
      'bad-exif.jpg': 'accepted',
    });
    for (const f of res.body.files.filter((x: { status: string }) => x.status === 'rejected')) {
      expect(f.message.length).toBeGreaterThan(15);
    }
    expect(res.body.files.find((f: { name: string }) => f.name === 'clip.mp4').message).toMatch(
      /video clip.*not supported yet|supported yet/,
    );
    const photos = await volunteer.get(
      `/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`,
    );
    const badExif = photos.body.find(
      (p: { originalName: string }) => p.originalName === 'bad-exif.jpg',
    );
    expect(badExif.flags).toContain('no_exif_time');
    const progress = await volunteer.get(`/api/projects/${SLUG}/uploads/${res.body.upload.id}`);
    expect(progress.body.counts).toMatchObject({ accepted: 2, rejected: 7, duplicate: 0 });
    const files = await volunteer.get(`/api/projects/${SLUG}/uploads/${res.body.upload.id}/files`);
    expect(files.body.map((f: { name: string }) => f.name)).toEqual(
      res.body.files.map((f: { name: string }) => f.name),
    );
    expect(readdirSync(join(ctx.config.uploadsDir, 'tmp'))).toEqual([]);
    expect((await volunteer.get('/api/health')).status).toBe(200);
  });

  it('should refuse file names with paths, dot-dot, control characters or invalid UTF-8, never using them as paths', async () => {
    const body = (c: number) => exifJpeg({ dateTimeOriginal: '2026:07:04 09:30:00' }, { color: c });
    const form = multipart([
      { filename: 'DCIM/100MEDIA/IMG_0001.JPG', body: await body(0x010101ff) },
      { filename: '..\\..\\boot.ini', body: await body(0x020202ff) },
      { filename: '..', body: await body(0x030303ff) },
      { filename: 'bell.jpg', filenameStar: 'bell\u0007.jpg', body: await body(0x040404ff) },
      {
        filename: Buffer.from([0x49, 0x4d, 0x47, 0xff, 0xfe, 0x2e, 0x6a, 0x70, 0x67]),
        body: await body(0x050505ff),
      },
      { filename: 'Löwe_0001.jpg', body: await body(0x060606ff) },
    ]);
    const res = await volunteer.agent
      .post(`/api/projects/${SLUG}/deployments/${deployment}/uploads`)
      .set('X-XSRF-TOKEN', volunteer.csrf)
      .set('Content-Type', form.contentType)
      .send(form.body);
    expect(res.status).toBe(201);
    expect(
      res.body.files.map((f: { status: string; code?: string }) => f.code ?? f.status),
    ).toEqual([
      'bad_file_name',
      'bad_file_name',
      'bad_file_name',
      'bad_file_name',
      'bad_file_name',
      'accepted',
    ]);
    expect(res.body.files[5].name).toBe('Löwe_0001.jpg');
    const stored = await ctx.db.selectFrom('photos').select('stored_path').execute();
    expect(
      stored.every((p) => /^originals\/[0-9a-f]{2}\/[0-9a-f]{64}\.jpg$/.test(p.stored_path)),
    ).toBe(true);
  });

  it('should answer a multipart body the parser cannot read with 400 and keep nothing', async () => {
    const before = await ctx.db.selectFrom('photos').select('id').execute();
    const form = multipart([
      {
        filename: 'ok.jpg',
        body: await exifJpeg({ dateTimeOriginal: '2026:07:04 09:40:00' }, { color: 0x070707ff }),
      },
      { filename: 'raw\u0007control.jpg', body: await plainJpeg() },
    ]);
    const res = await volunteer.agent
      .post(`/api/projects/${SLUG}/deployments/${deployment}/uploads`)
      .set('X-XSRF-TOKEN', volunteer.csrf)
      .set('Content-Type', form.contentType)
      .send(form.body);
    expect(res.status).toBe(400);
    expect(res.body.error.message).toMatch(/could not be read/);
    expect(await ctx.db.selectFrom('photos').select('id').execute()).toHaveLength(before.length);
    expect(readdirSync(join(ctx.config.uploadsDir, 'tmp'))).toEqual([]);
  });

  it('should reject files over the size limit, files beyond the per-request count and bytes beyond the request limit', async () => {
    const big = Buffer.concat([await plainJpeg(64, 48, 0x0f0f0fff), Buffer.alloc(1_200_000)]);
    const small = (i: number) =>
      exifJpeg(
        { dateTimeOriginal: `2026:07:05 10:00:${String(i).padStart(2, '0')}` },
        { color: 0x100000ff + i * 0x100 },
      );
    const many: { name: string; body: Buffer }[] = [{ name: 'big.jpg', body: big }];
    for (let i = 0; i < 12; i++) many.push({ name: `s${i}.jpg`, body: await small(i) });
    const res = await upload(volunteer, SLUG, deployment, many);
    expect(res.status).toBe(201);
    const codes = res.body.files.map((f: { code?: string; status: string }) => f.code ?? f.status);
    expect(codes[0]).toBe('file_too_large');
    expect(codes.slice(1, 12).every((c: string) => c === 'accepted')).toBe(true);
    expect(codes[12]).toBe('too_many_files');

    const chunk = Buffer.concat([await plainJpeg(64, 48, 0x0e0e0eff), Buffer.alloc(900_000)]);
    const heavy = [0, 1, 2, 3].map((i) => ({
      name: `heavy${i}.jpg`,
      body: Buffer.concat([chunk, Buffer.from([i])]),
    }));
    const over = await upload(volunteer, SLUG, deployment, heavy);
    expect(
      over.body.files.map((f: { code?: string; status: string }) => f.code ?? f.status).at(-1),
    ).toBe('request_too_large');
    expect(readdirSync(join(ctx.config.uploadsDir, 'tmp'))).toEqual([]);
  });

  it('should refuse a request that is not multipart, and uploads to an unknown deployment', async () => {
    const notMultipart = await volunteer.post(
      `/api/projects/${SLUG}/deployments/${deployment}/uploads`,
      { photos: [] },
    );
    expect(notMultipart.status).toBe(400);
    const unknown = await upload(volunteer, SLUG, '0123456789abcdef0123', [
      { name: 'x.jpg', body: await plainJpeg() },
    ]);
    expect(unknown.status).toBe(404);
    const badId = await upload(volunteer, SLUG, 'nope', [
      { name: 'x.jpg', body: await plainJpeg() },
    ]);
    expect(badId.status).toBe(400);
  });

  it('should mark a photo that cannot be decoded as failed with a reason, and retry it on request', async () => {
    const good = Buffer.from(
      await exifJpeg(
        { dateTimeOriginal: '2026:07:06 11:00:00' },
        { width: 200, height: 150, color: 0x334455ff },
      ),
    );
    const sos = good.lastIndexOf(Buffer.from([0xff, 0xda]));
    // Keep the headers and the end marker but replace the compressed data with nonsense.
    const broken = Buffer.concat([
      good.subarray(0, sos),
      Buffer.from([0xff, 0xc4, 0x00, 0x03, 0x77]),
      Buffer.alloc(300, 0x5a),
      Buffer.from([0xff, 0xd9]),
    ]);
    const res = await upload(volunteer, SLUG, deployment, [{ name: 'broken.jpg', body: broken }]);
    expect(res.body.files[0].status).toBe('accepted');
    const done = await waitForUpload(volunteer, SLUG, res.body.upload.id, 30_000);
    expect(done.counts).toMatchObject({ failed: 1, ready: 0 });
    const photo = (
      await volunteer.get(`/api/projects/${SLUG}/photos?uploadId=${res.body.upload.id}`)
    ).body[0];
    expect(photo.status).toBe('failed');
    expect(photo.error).toMatch(/could not be decoded|Processing failed/);
    const retry = await volunteer.post(`/api/projects/${SLUG}/uploads/${res.body.upload.id}/retry`);
    expect(retry.body).toEqual({ requeued: 1 });
    const again = await waitForUpload(volunteer, SLUG, res.body.upload.id, 30_000);
    expect(again.counts.failed).toBe(1);
    const job = await ctx.db
      .selectFrom('jobs')
      .selectAll()
      .where('payload', '=', JSON.stringify({ photoId: photo.id }))
      .execute();
    expect(job).toHaveLength(1);
    expect(job[0]!.attempts).toBe(3);
  });
});

import { readdirSync } from 'node:fs';
import yazl from 'yazl';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { individualWithSightings } from '../support/curate-helpers';
import { drainJobs } from '../support/demo-fixture';
import { jpegClaiming, plainJpeg } from '../support/photo-fixtures';
import { parseTable } from '../support/camtrap-spec';
import {
  createTestContext,
  seedTeam,
  signIn,
  TestClient,
  type TestContext,
} from '../support/test-app';
import { binaryParser, unzip } from '../support/zip';

// Exports and imports of a small synthetic project (made through the API in this file), and every
// bad input the export and import routes can meet: each gets one clear error, and nothing is
// half-imported.

let ctx: TestContext;
let ecologist: TestClient;
let reviewer: TestClient;
let admin: TestClient;
let anonymous: TestClient;
const SLUG = 'test-survey';
let exported: Buffer;

beforeAll(async () => {
  ctx = await createTestContext();
  const team = await seedTeam(ctx.db);
  ecologist = await signIn(ctx.app, team.users.ecologist.email);
  reviewer = await signIn(ctx.app, team.users.reviewer.email);
  admin = await signIn(ctx.app, team.users.admin.email);
  anonymous = await new TestClient(ctx.app).init();
  await ecologist.patch(`/api/projects/${SLUG}`, { reviewersPerSighting: 1 });
  await individualWithSightings(ecologist, reviewer, SLUG, 'E01', 3, 'left', 2);
  await individualWithSightings(ecologist, reviewer, SLUG, 'E02', 2, 'both', 3);
  const res = await ecologist
    .get(`/api/projects/${SLUG}/exports/camtrap-dp`)
    .buffer(true)
    .parse(binaryParser);
  expect(res.status).toBe(200);
  exported = res.body as Buffer;
});
afterAll(async () => ctx.close());

function zipOf(entries: Record<string, string | Buffer>): Promise<Buffer> {
  const zip = new yazl.ZipFile();
  for (const [name, body] of Object.entries(entries))
    zip.addBuffer(Buffer.isBuffer(body) ? body : Buffer.from(body), name);
  zip.end();
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    zip.outputStream
      .on('data', (c: Buffer) => chunks.push(c))
      .on('end', () => resolve(Buffer.concat(chunks)))
      .on('error', reject);
  });
}

function importZip(client: TestClient, bytes: Buffer, field = 'package') {
  return client.agent
    .post('/api/projects/import/camtrap-dp')
    .set('X-XSRF-TOKEN', client.csrf)
    .attach(field, bytes, { filename: 'package.zip', contentType: 'application/zip' });
}

/** A zip whose entry is named `../outside.txt` (yazl refuses to write one, so the name is patched). */
async function climbing(): Promise<Buffer> {
  const zip = await zipOf({
    'datapackage.json': '{}',
    'xx/outside.txt': 'a name that climbs out of the package',
  });
  return Buffer.from(
    zip.toString('latin1').replaceAll('xx/outside.txt', '../outside.txt'),
    'latin1',
  );
}

async function projectCount(): Promise<number> {
  return Number(
    (
      await ctx.db
        .selectFrom('projects')
        .select((eb) => eb.fn.countAll<number>().as('n'))
        .executeTakeFirstOrThrow()
    ).n,
  );
}

const files = async () => unzip(exported);

describe('import with the media files in the package', () => {
  it('should store the photos of a package and process them like an upload', async () => {
    const before = await unzip(exported);
    const media = parseTable(before.get('media.csv')!.toString()).rows;
    expect(media.length).toBe(5);
    const res = await importZip(admin, exported);
    expect(res.status).toBe(201);
    expect(res.body.report.counts).toMatchObject({ media: 5, individuals: 2, sightings: 5 });
    // Previews of near-identical synthetic frames can be the very same file: one copy is stored,
    // the twin is kept as a record and reported.
    const twins = res.body.report.skipped.filter((s: { reason: string }) =>
      s.reason.startsWith('same file as media'),
    );
    expect(res.body.report.skipped.length).toBe(twins.length);
    expect(res.body.report.counts.mediaFiles + twins.length).toBe(5);
    expect(res.body.report.counts.mediaFiles).toBeGreaterThan(0);
    expect(res.body.report.notes[0]).toContain('0.1 degrees');
    await drainJobs(ctx.db, 60_000);
    const project = await ctx.db
      .selectFrom('projects')
      .selectAll()
      .where('slug', '=', res.body.project.slug)
      .executeTakeFirstOrThrow();
    expect(project.sensitivity).toBe('high');
    const photos = await ctx.db
      .selectFrom('photos')
      .select(['id', 'status'])
      .where('project_id', '=', project.id)
      .execute();
    expect(photos.filter((p) => p.status === 'ready').length).toBe(
      res.body.report.counts.mediaFiles,
    );
    expect(photos.filter((p) => p.status === 'external').length).toBe(twins.length);
    photos.sort((a, b) => (a.status === 'ready' ? -1 : 1) - (b.status === 'ready' ? -1 : 1));
    const thumb = await admin.get(`/api/photos/${photos[0]!.id}/thumb`);
    expect(thumb.status).toBe(200);
    expect(thumb.headers['content-type']).toBe('image/jpeg');
  });

  it('should keep a record without its file when the file is not a usable photo, and say why', async () => {
    const f = await files();
    const media = parseTable(f.get('media.csv')!.toString()).rows;
    const [first, second] = [media[0]!['filePath']!, media[1]!['filePath']!];
    f.set(first, await jpegClaiming(30_000, 30_000));
    f.set(second, Buffer.from('not a photo at all'));
    const res = await importZip(admin, await zipOf(Object.fromEntries(f)));
    expect(res.status).toBe(201);
    const reasons = res.body.report.skipped
      .map((s: { table: string; reason: string }) => `${s.table}: ${s.reason}`)
      .filter((r: string) => !r.includes('same file as media'));
    expect(reasons).toHaveLength(2);
    expect(reasons.join(' ')).toMatch(/megapixel|pixels/i);
    expect(
      reasons.every(
        (r: string) => r.startsWith('media: ') && r.includes('Kept as a record without the file'),
      ),
    ).toBe(true);
  });
});

describe('bad packages', () => {
  it('should refuse anyone but an admin, and signed-out callers', async () => {
    expect((await importZip(ecologist, exported)).status).toBe(403);
    const res = await importZip(anonymous, exported);
    expect(res.status).toBe(401);
    expect(res.body.error.code).toBe('unauthenticated');
  });

  it('should answer 400 with one error shape for each unreadable package, creating nothing', async () => {
    const projects = await projectCount();
    const f = await files();
    const without = (name: string) => Object.fromEntries([...f].filter(([n]) => n !== name));
    const cases: [string, Promise<Buffer> | Buffer, RegExp][] = [
      ['not a zip', Buffer.from('PK but not really a zip file'), /not a readable zip/],
      ['no datapackage.json', zipOf(without('datapackage.json')), /datapackage\.json is missing/],
      [
        'broken JSON',
        zipOf({ ...Object.fromEntries(f), 'datapackage.json': '{"name": ' }),
        /not valid JSON/,
      ],
      ['no deployments table', zipOf(without('deployments.csv')), /no deployments\.csv/],
      [
        'empty deployments table',
        zipOf({
          ...Object.fromEntries(f),
          'deployments.csv': 'deploymentID,latitude,longitude,deploymentStart,deploymentEnd\n',
        }),
        /no rows/,
      ],
      ['a name climbing out of the package', climbing(), /could not be read/],
      [
        'broken CSV',
        zipOf({
          ...Object.fromEntries(f),
          'observations.csv': 'observationID,deploymentID\n"unterminated,x\n',
        }),
        /not valid CSV/,
      ],
    ];
    for (const [what, bytes, message] of cases) {
      const res = await importZip(admin, await bytes);
      expect(res.status, what).toBe(400);
      expect(Object.keys(res.body), what).toEqual(['error']);
      expect(res.body.error.message, what).toMatch(message);
    }
    expect(await projectCount()).toBe(projects);
    // The uploaded package is not left behind in the temp area.
    expect(readdirSync(ctx.ingest.storage.tmpDir)).toEqual([]);
  });

  it('should refuse a request without multipart, in another field, or without a file', async () => {
    const json = await admin.post('/api/projects/import/camtrap-dp', { package: 'x' });
    expect(json.status).toBe(400);
    expect(json.body.error.message).toMatch(/multipart\/form-data in the field "package"/);
    const field = await importZip(admin, exported, 'file');
    expect(field.status).toBe(400);
    expect(field.body.error.message).toMatch(/form field "package" \(got "file"\)/);
    const none = await admin.agent
      .post('/api/projects/import/camtrap-dp')
      .set('X-XSRF-TOKEN', admin.csrf)
      .field('note', 'no file');
    expect(none.status).toBe(400);
    expect(none.body.error.message).toMatch(/Attach a Camtrap DP zip/);
  });

  it('should import the good rows and report each bad row with its table, row number and reason', async () => {
    const f = await files();
    const deployments = parseTable(f.get('deployments.csv')!.toString());
    const media = parseTable(f.get('media.csv')!.toString());
    const observations = parseTable(f.get('observations.csv')!.toString());
    const csv = (t: { header: string[]; rows: Record<string, string>[] }) =>
      [t.header.join(','), ...t.rows.map((r) => t.header.map((h) => r[h] ?? '').join(','))].join(
        '\n',
      );
    deployments.rows.push({
      ...deployments.rows[0]!,
      deploymentID: 'bad-latitude',
      latitude: '95',
    });
    media.rows[0]!['filePath'] = '../../etc/passwd';
    media.rows[1]!['deploymentID'] = 'nowhere';
    observations.rows.push({
      ...observations.rows[0]!,
      observationID: 'late',
      eventID: 'late-event',
      eventStart: 'yesterday',
    });
    const res = await importZip(
      admin,
      await zipOf({
        ...Object.fromEntries(f),
        'deployments.csv': csv(deployments),
        'media.csv': csv(media),
        'observations.csv': csv(observations),
      }),
    );
    expect(res.status).toBe(201);
    const skipped = res.body.report.skipped as {
      table: string;
      row: number;
      id: string;
      reason: string;
    }[];
    expect(skipped).toContainEqual({
      table: 'deployments',
      row: deployments.rows.length + 1,
      id: 'bad-latitude',
      reason: 'missing or invalid deploymentID, coordinates or times',
    });
    expect(skipped).toContainEqual(
      expect.objectContaining({
        table: 'media',
        row: 2,
        reason: 'filePath must be relative (no leading ., / or ~, no ..)',
      }),
    );
    expect(skipped).toContainEqual(
      expect.objectContaining({ table: 'media', row: 3, reason: 'unknown deploymentID' }),
    );
    expect(skipped).toContainEqual(
      expect.objectContaining({
        table: 'observations',
        id: 'late',
        reason: 'invalid eventStart or eventEnd',
      }),
    );
    expect(res.body.report.counts.deployments).toBe(deployments.rows.length - 1);
    expect(res.body.report.counts.media).toBe(media.rows.length - 2);
  });

  it('should refuse a package larger than the server accepts', async () => {
    const small = await createTestContext({ UPLOAD_MAX_REQUEST_MB: '1' });
    try {
      const team = await seedTeam(small.db, 'small-survey');
      const boss = await signIn(small.app, team.users.admin.email);
      const big = await zipOf({
        'datapackage.json': '{}',
        'padding.bin': Buffer.concat(
          await Promise.all(
            Array.from({ length: 8 }, (_, i) => plainJpeg(640 + i, 480, 0x11223344 + i)),
          ),
        ).fill(7, 0),
      });
      const padded = Buffer.concat([
        big,
        Buffer.alloc(1_200_000 - Math.min(big.length, 1_200_000), 1),
      ]);
      const res = await importZip(boss, padded);
      expect(res.status).toBe(400);
      expect(res.body.error.code).toBe('payload_too_large');
      expect(readdirSync(small.ingest.storage.tmpDir)).toEqual([]);
    } finally {
      await small.close();
    }
  });
});

describe('bad export requests', () => {
  it('should answer 400 for unknown profiles, options and media modes', async () => {
    for (const query of [
      '?profile=secret',
      '?media=all',
      '?includeSensitiveSites=maybe',
      '?format=xml',
    ]) {
      const res = await ecologist.get(`/api/projects/${SLUG}/exports/camtrap-dp${query}`);
      expect(res.status, query).toBe(400);
      expect(res.body.error.code, query).toBe('validation_failed');
    }
    expect((await ecologist.get(`/api/projects/${SLUG}/exports/dwc?profile=everyone`)).status).toBe(
      400,
    );
  });

  it('should answer 404 for a project that does not exist and 401 when signed out', async () => {
    const missing = await ecologist.get('/api/projects/no-such-survey/exports/camtrap-dp');
    expect(missing.status).toBe(404);
    expect((await anonymous.get(`/api/projects/${SLUG}/exports/dwc`)).status).toBe(401);
  });
});

import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import ExcelJS from 'exceljs';
import { sql } from 'kysely';
import { DEMO_PASSWORD } from '../../seeds/scenario';
import exifr from 'exifr';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { imageSize } from 'image-size';
import { createUser } from '../../server/services/users.service';
import {
  createTestContext,
  signIn,
  TEST_PASSWORD,
  type TestClient,
  type TestContext,
} from '../support/test-app';
import { DEMO_SLUG, demoContext, demoUser } from '../support/demo-fixture';
import { packageProblems, parseTable, tableProblems } from '../support/camtrap-spec';
import { binaryParser, unzip } from '../support/zip';

// Exports of the fictional demo season (synthetic data), checked against the Camtrap DP 1.0.2
// table schemas as listed in the handbook [S1], Darwin Core term rules [S7, S10] and GBIF's
// generalisation categories (Chapman 2020 [S29]: high sensitivity → 0.1° grid).

let ctx: TestContext;
let ecologist: TestClient;
let reviewer: TestClient;
let volunteer: TestClient;
let admin: TestClient;

beforeAll(async () => {
  ctx = await demoContext();
  ecologist = await demoUser(ctx, 'ecologist');
  reviewer = await demoUser(ctx, 'reviewer');
  volunteer = await demoUser(ctx, 'volunteer');
  admin = await demoUser(ctx, 'admin');
}, 900_000);
afterAll(async () => ctx?.close());

async function download(client: TestClient, url: string) {
  const res = await client.get(url).buffer(true).parse(binaryParser);
  return res as typeof res & { body: Buffer };
}

async function exportZip(client: TestClient, query = '') {
  const res = await download(client, `/api/projects/${DEMO_SLUG}/exports/camtrap-dp${query}`);
  if (res.status !== 200) throw new Error(`export ${query}: ${res.status} ${res.body.toString()}`);
  expect(res.headers['content-type']).toBe('application/zip');
  return unzip(res.body);
}

const text = (files: Map<string, Buffer>, name: string) => files.get(name)!.toString('utf8');
const onGrid = (v: number, step: number) => Math.abs(v / step - Math.round(v / step)) < 1e-6;

async function projectRow() {
  return ctx.db
    .selectFrom('projects')
    .selectAll()
    .where('slug', '=', DEMO_SLUG)
    .executeTakeFirstOrThrow();
}

/** Photo ids of events labelled human or vehicle. */
async function peoplePhotoIds(): Promise<Set<string>> {
  const rows = await ctx.db
    .selectFrom('photos')
    .innerJoin('events', 'events.id', 'photos.event_id')
    .select('photos.id')
    .where('events.label', 'in', ['human', 'vehicle'])
    .execute();
  return new Set(rows.map((r) => r.id));
}

describe('Camtrap DP export of the demo project', () => {
  let pub: Map<string, Buffer>;
  beforeAll(async () => {
    pub = await exportZip(ecologist);
  }, 300_000);

  it('should pass the 1.0.2 field checks for the package and all three tables', () => {
    const pkg = JSON.parse(text(pub, 'datapackage.json')) as Record<string, unknown>;
    expect(packageProblems(pkg)).toEqual([]);
    for (const table of ['deployments', 'media', 'observations'] as const) {
      expect(tableProblems(table, text(pub, `${table}.csv`))).toEqual([]);
    }
    expect(pkg['project']).toMatchObject({ individualAnimals: true, observationLevel: ['event'] });
    // Generalised package: coordinatePrecision is given (high → 0.1° [S29]).
    expect(pkg['coordinatePrecision']).toBe(0.1);
  });

  it('should give one observation per identified animal per event, with its individualID', async () => {
    const obs = parseTable(text(pub, 'observations.csv')).rows;
    const identified = obs.filter((o) => o['individualID']);
    expect(identified.length).toBeGreaterThan(20);
    const keys = identified.map((o) => `${o['eventID']}/${o['individualID']}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(
      identified.every((o) => o['count'] === '1' && o['scientificName'] === 'Panthera pardus'),
    ).toBe(true);
    // Each identified row matches a confirmed sighting of an active individual in the database.
    const confirmed = await ctx.db
      .selectFrom('sightings')
      .innerJoin('individuals', 'individuals.id', 'sightings.individual_id')
      .select(['sightings.id', 'individuals.code'])
      .where('sightings.state', '=', 'confirmed')
      .where('individuals.status', '=', 'active')
      .execute();
    const code = new Map(confirmed.map((c) => [c.id, c.code]));
    for (const o of identified) expect(o['individualID']).toBe(code.get(o['observationID']!));
    // Times carry the project's offset (Africa/Nairobi, +03:00).
    expect(obs.every((o) => o['eventStart']!.endsWith('+03:00'))).toBe(true);
  });

  it('should carry flank, quality and agreement in a custom table keyed on observationID', () => {
    const pkg = JSON.parse(text(pub, 'datapackage.json')) as {
      resources: { name: string; schema: { foreignKeys?: unknown[] } | string }[];
    };
    const custom = pkg.resources.find((r) => r.name === 'individual-sightings')!;
    expect(typeof custom.schema).toBe('object');
    expect((custom.schema as { foreignKeys: unknown[] }).foreignKeys).toHaveLength(1);
    const ids = new Set(
      parseTable(text(pub, 'observations.csv')).rows.map((o) => o['observationID']),
    );
    const rows = parseTable(text(pub, 'individual-sightings.csv')).rows;
    expect(rows.length).toBeGreaterThan(20);
    for (const r of rows) {
      expect(ids.has(r['observationID'])).toBe(true);
      expect(['left', 'right', 'both', 'front', 'back', 'unknown']).toContain(r['flank']);
      expect(['good', 'fair', 'poor']).toContain(r['photoQuality']);
    }
    expect(new Set(rows.map((r) => r['reviewAgreement']))).toContain('two-reviewers-agree');
  });

  it('should list paired cameras as two deployments sharing a locationID', () => {
    const deployments = parseTable(text(pub, 'deployments.csv')).rows;
    const perLocation = new Map<string, number>();
    for (const d of deployments)
      perLocation.set(d['locationID']!, (perLocation.get(d['locationID']!) ?? 0) + 1);
    expect([...perLocation.values()].filter((n) => n === 2).length).toBeGreaterThanOrEqual(18);
  });

  it('should generalise every coordinate to the 0.1° grid and widen the uncertainty', () => {
    const deployments = parseTable(text(pub, 'deployments.csv')).rows;
    for (const d of deployments) {
      expect(onGrid(Number(d['latitude']), 0.1)).toBe(true);
      expect(onGrid(Number(d['longitude']), 0.1)).toBe(true);
      // Rounding to 0.1° moves a point up to ~7.9 km (half the cell diagonal) [S9: uncertainty sums rounding, GPS and detection].
      expect(Number(d['coordinateUncertainty'])).toBeGreaterThan(7_800);
    }
    const pkg = JSON.parse(text(pub, 'datapackage.json')) as {
      spatial: { coordinates: number[][][] };
    };
    for (const [lon, lat] of pkg.spatial.coordinates[0]!) {
      expect(onGrid(lon!, 0.1) && onGrid(lat!, 0.1)).toBe(true);
    }
  });

  it('should leave the water-source station out unless the ecologist includes it knowingly', async () => {
    const sensitive = await ctx.db
      .selectFrom('deployments')
      .select('id')
      .where('feature_type', '=', 'waterSource')
      .execute();
    expect(sensitive.length).toBeGreaterThan(0);
    const listed = new Set(
      parseTable(text(pub, 'deployments.csv')).rows.map((d) => d['deploymentID']),
    );
    for (const d of sensitive) expect(listed.has(d.id)).toBe(false);
    const media = parseTable(text(pub, 'media.csv')).rows;
    expect(media.some((m) => sensitive.some((d) => d.id === m['deploymentID']))).toBe(false);
    const knowingly = await exportZip(ecologist, '?includeSensitiveSites=true&media=none');
    const all = new Set(
      parseTable(text(knowingly, 'deployments.csv')).rows.map((d) => d['deploymentID']),
    );
    for (const d of sensitive) expect(all.has(d.id)).toBe(true);
  });

  it('should keep people and vehicles, and their photos, out of the public package', async () => {
    const people = await peoplePhotoIds();
    expect(people.size).toBeGreaterThan(0);
    const media = parseTable(text(pub, 'media.csv')).rows;
    expect(media.length).toBeGreaterThan(100);
    expect(media.filter((m) => people.has(m['mediaID']!))).toEqual([]);
    expect(media.every((m) => m['filePublic'] === 'true')).toBe(true);
    const files = [...pub.keys()].filter((n) => n.startsWith('media/'));
    expect(files.length).toBe(media.length);
    expect(files.filter((n) => people.has(n.split('/')[2]!.replace('.jpg', '')))).toEqual([]);
    const types = new Set(
      parseTable(text(pub, 'observations.csv')).rows.map((o) => o['observationType']),
    );
    expect(types.has('human') || types.has('vehicle')).toBe(false);
  });

  it('should ship metadata-free previews, not originals with the camera GPS', async () => {
    const [name, bytes] = [...pub.entries()].find(([n]) => n.startsWith('media/'))!;
    expect(name).toMatch(/^media\/[0-9a-f]{20}\/[0-9a-f]{20}\.jpg$/);
    const gps = await exifr.gps(bytes).catch(() => undefined);
    expect(gps?.latitude).toBeUndefined();
    const size = imageSize(bytes);
    expect(Math.max(size.width!, size.height!)).toBeLessThanOrEqual(1600);
  });

  it('should give the ecologist a private backup with exact positions and people marked filePublic=false', async () => {
    const priv = await exportZip(ecologist, '?profile=private&media=none');
    expect(tableProblems('media', text(priv, 'media.csv'))).toEqual([]);
    const people = await peoplePhotoIds();
    const media = parseTable(text(priv, 'media.csv')).rows;
    const humans = await ctx.db
      .selectFrom('photos')
      .innerJoin('events', 'events.id', 'photos.event_id')
      .select('photos.id')
      .where('events.label', '=', 'human')
      .execute();
    for (const h of humans)
      expect(media.find((m) => m['mediaID'] === h.id)?.['filePublic']).toBe('false');
    expect(media.filter((m) => m['filePublic'] === 'false').length).toBe(humans.length);
    expect(media.filter((m) => people.has(m['mediaID']!)).length).toBe(people.size);
    const stations = await ctx.db.selectFrom('stations').select(['id', 'lat', 'lon']).execute();
    for (const d of parseTable(text(priv, 'deployments.csv')).rows) {
      const s = stations.find((x) => x.id === d['locationID'])!;
      expect(Number(d['latitude'])).toBe(s.lat);
      expect(Number(d['longitude'])).toBe(s.lon);
    }
    expect('coordinatePrecision' in (JSON.parse(text(priv, 'datapackage.json')) as object)).toBe(
      false,
    );
  });

  it('should refuse the private profile to an admin without the ecologist role, and exports to reviewers', async () => {
    const privateAsAdmin = await admin.get(
      `/api/projects/${DEMO_SLUG}/exports/camtrap-dp?profile=private`,
    );
    expect(privateAsAdmin.status).toBe(403);
    expect(privateAsAdmin.body.error.code).toBe('forbidden');
    for (const client of [reviewer, volunteer]) {
      for (const path of ['camtrap-dp', 'dwc', 'preview']) {
        const res = await client.get(`/api/projects/${DEMO_SLUG}/exports/${path}`);
        expect(res.status).toBe(403);
      }
    }
  });

  it('should preview what each profile leaves out', async () => {
    const res = await ecologist.get(`/api/projects/${DEMO_SLUG}/exports/preview`);
    expect(res.status).toBe(200);
    expect(res.body).toMatchObject({ profile: 'public', precision: 0.1, withheld: false });
    expect(res.body.leftOut.sensitiveSites).toBeGreaterThan(0);
    expect(res.body.leftOut.privateMedia).toBe((await peoplePhotoIds()).size);
    expect(res.body.dataGeneralizations).toContain('2027-06-30');
  });
});

describe('Camtrap DP round trip', () => {
  const TABLES = [
    'deployments.csv',
    'media.csv',
    'observations.csv',
    'individual-sightings.csv',
    'individual-references.csv',
  ];
  let first: Buffer;
  beforeAll(async () => {
    const res = await download(
      ecologist,
      `/api/projects/${DEMO_SLUG}/exports/camtrap-dp?profile=private&includeSensitiveSites=true&media=none`,
    );
    expect(res.status).toBe(200);
    first = res.body;
  });

  async function importAs(client: TestClient, bytes: Buffer) {
    return client.agent
      .post('/api/projects/import/camtrap-dp')
      .set('X-XSRF-TOKEN', client.csrf)
      .attach('package', bytes, { filename: 'package.zip', contentType: 'application/zip' });
  }

  it('should import into a fresh instance and export exactly the same tables', async () => {
    const fresh = await createTestContext();
    try {
      await createUser(
        fresh.db,
        {
          email: 'admin@elsewhere.test',
          name: 'Other admin',
          password: TEST_PASSWORD,
          isAdmin: true,
        },
        null,
      );
      const other = await signIn(fresh.app, 'admin@elsewhere.test');
      const imported = await importAs(other, first);
      expect(imported.status).toBe(201);
      expect(imported.body.report.skipped).toEqual([]);
      const a = await unzip(first);
      expect(imported.body.report.counts).toMatchObject({
        deployments: parseTable(text(a, 'deployments.csv')).rows.length,
        media: parseTable(text(a, 'media.csv')).rows.length,
        sightings: parseTable(text(a, 'individual-sightings.csv')).rows.length,
        mediaFiles: 0,
      });
      const slug = imported.body.project.slug as string;
      expect(slug).toBe(DEMO_SLUG);
      // The importer is the new project's ecologist and may take its private export.
      const again = await other
        .get(
          `/api/projects/${slug}/exports/camtrap-dp?profile=private&includeSensitiveSites=true&media=none`,
        )
        .buffer(true)
        .parse(binaryParser);
      expect(again.status).toBe(200);
      const b = await unzip(again.body as Buffer);
      for (const table of TABLES) expect(text(b, table), table).toBe(text(a, table));
      const pa = JSON.parse(text(a, 'datapackage.json')) as Record<string, unknown>;
      const pb = JSON.parse(text(b, 'datapackage.json')) as Record<string, unknown>;
      for (const key of ['spatial', 'temporal', 'taxonomic', 'resources', 'project', 'title'])
        expect(pb[key], key).toEqual(pa[key]);
      // The catalogue came across: the same codes, browsable in the new project.
      const codes = (r: { body: { code: string }[] }) => r.body.map((i) => i.code).sort();
      expect(codes(await other.get(`/api/projects/${slug}/individuals`))).toEqual(
        codes(await ecologist.get(`/api/projects/${DEMO_SLUG}/individuals`)),
      );
    } finally {
      await fresh.close();
    }
  }, 300_000);

  it('should import into the same instance under new ids and keep every row', async () => {
    const imported = await importAs(admin, first);
    expect(imported.status).toBe(201);
    expect(imported.body.report.skipped).toEqual([]);
    const slug = imported.body.project.slug as string;
    expect(slug).toBe(`${DEMO_SLUG}-2`);
    const again = await download(
      admin,
      `/api/projects/${slug}/exports/camtrap-dp?profile=private&includeSensitiveSites=true&media=none`,
    );
    const [a, b] = [await unzip(first), await unzip(again.body)];
    for (const table of TABLES) {
      const [ra, rb] = [parseTable(text(a, table)), parseTable(text(b, table))];
      expect(rb.header).toEqual(ra.header);
      expect(rb.rows.length, table).toBe(ra.rows.length);
    }
    // Same content once the ids are set aside: individual codes and event times match row for row.
    const pick = (t: Map<string, Buffer>) =>
      parseTable(text(t, 'observations.csv'))
        .rows.map((o) => `${o['eventStart']} ${o['observationType']} ${o['individualID']}`)
        .sort();
    expect(pick(b)).toEqual(pick(a));
    const ids = new Set(parseTable(text(a, 'media.csv')).rows.map((m) => m['mediaID']));
    expect(parseTable(text(b, 'media.csv')).rows.some((m) => ids.has(m['mediaID']))).toBe(false);
  }, 300_000);
});

describe('Darwin Core occurrences', () => {
  it('should give one generalised row per animal observation with Darwin Core terms', async () => {
    const res = await download(ecologist, `/api/projects/${DEMO_SLUG}/exports/dwc`);
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toMatch(/^text\/csv/);
    const rows = parseTable(res.body.toString('utf8')).rows;
    const pub = await exportZip(ecologist, '?media=none');
    const animals = parseTable(text(pub, 'observations.csv')).rows.filter(
      (o) => o['observationType'] === 'animal',
    );
    expect(rows.length).toBe(animals.length);
    expect(new Set(rows.map((r) => r['occurrenceID'])).size).toBe(rows.length);
    for (const r of rows) {
      // [S10] occurrenceID = observationID, MachineObservation, eventDate the event interval.
      expect(r['basisOfRecord']).toBe('MachineObservation');
      expect(r['eventDate']).toMatch(
        /^\d{4}-\d{2}-\d{2}T[\d:]{8}\+03:00\/\d{4}-\d{2}-\d{2}T[\d:]{8}\+03:00$/,
      );
      expect(
        onGrid(Number(r['decimalLatitude']), 0.1) && onGrid(Number(r['decimalLongitude']), 0.1),
      ).toBe(true);
      // [S7] coordinateUncertaintyInMeters: zero is not valid.
      expect(Number(r['coordinateUncertaintyInMeters'])).toBeGreaterThan(0);
      expect(r['dataGeneralizations']).toMatch(
        /^coordinates rounded to 0\.1 degrees .*2027-06-30$/,
      );
      expect(r['samplingEffort']).toMatch(/^[\d.]+ trap-nights$/);
      expect(r['geodeticDatum']).toBe('EPSG:4326');
    }
    const identified = rows.filter((r) => r['organismID']);
    expect(identified.length).toBe(animals.filter((o) => o['individualID']).length);
    for (const r of identified)
      expect(animals.find((o) => o['observationID'] === r['occurrenceID'])?.['individualID']).toBe(
        r['organismID'],
      );
    expect(
      rows.some((r) => r['identificationVerificationStatus'] === 'verified using recorded media'),
    ).toBe(true);
  });
});

describe('spreadsheets', () => {
  it('should give the catalogue as CSV and XLSX with the same rows under a readable header', async () => {
    const csv = await download(reviewer, `/api/projects/${DEMO_SLUG}/exports/sheets/catalogue.csv`);
    expect(csv.status).toBe(200);
    const table = parseTable(csv.body.toString('utf8'));
    expect(table.header.slice(0, 4)).toEqual(['Code', 'Nickname', 'Sex', 'Confirmed sightings']);
    const catalogue = await reviewer.get(`/api/projects/${DEMO_SLUG}/individuals`);
    expect(table.rows.map((r) => r['Code'])).toEqual(
      catalogue.body.map((i: { code: string }) => i.code),
    );
    const xlsx = await download(
      reviewer,
      `/api/projects/${DEMO_SLUG}/exports/sheets/catalogue.xlsx`,
    );
    expect(xlsx.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(xlsx.body as unknown as ArrayBuffer);
    const sheet = book.worksheets[0]!;
    expect(sheet.getRow(1).getCell(1).value).toBe('Code');
    expect(sheet.rowCount).toBe(table.rows.length + 1);
    expect(String(sheet.getRow(2).getCell(1).value)).toBe(table.rows[0]!['Code']);
  });

  it('should give a reviewer the sightings with generalised positions only', async () => {
    const csv = await download(reviewer, `/api/projects/${DEMO_SLUG}/exports/sheets/sightings.csv`);
    expect(csv.status).toBe(200);
    const rows = parseTable(csv.body.toString('utf8')).rows;
    expect(rows.length).toBeGreaterThan(20);
    for (const r of rows) {
      expect(onGrid(Number(r['Latitude']), 0.1) && onGrid(Number(r['Longitude']), 0.1)).toBe(true);
      expect(r['Position']).toBe('rounded to 0.1 degrees');
    }
  });

  it('should give the capture histories and effort grid of a saved analysis, matching its frozen inputs', async () => {
    const saved = await ecologist.post(`/api/projects/${DEMO_SLUG}/analyses`, {
      name: 'Export check',
      session: {
        start: '2026-07-01T00:00:00+03:00',
        end: '2026-08-30T00:00:00+03:00',
        flankPolicy: 'left',
      },
    });
    expect(saved.status, JSON.stringify(saved.body)).toBe(201);
    const inputs = saved.body.inputs as {
      individuals: { code: string }[];
      histories: string[];
      stations: { code: string }[];
      effort: number[][];
      occasions: unknown[];
    };
    const histories = parseTable(
      (
        await download(
          ecologist,
          `/api/projects/${DEMO_SLUG}/exports/sheets/histories.csv?analysisId=${saved.body.id}`,
        )
      ).body.toString('utf8'),
    );
    expect(histories.header.slice(0, 3)).toEqual([
      'Individual',
      'Capture history',
      'Occasions detected',
    ]);
    expect(histories.header).toHaveLength(3 + inputs.occasions.length);
    expect(histories.header[3]).toBe('Occasion 1 (2026-07-01 00:00)');
    expect(histories.rows.map((r) => [r['Individual'], r['Capture history']])).toEqual(
      inputs.individuals.map((ind, i) => [ind.code, inputs.histories[i]]),
    );
    for (const r of histories.rows)
      expect(Number(r['Occasions detected'])).toBe(
        [...r['Capture history']!].filter((c) => c === '1').length,
      );
    const effort = await download(
      ecologist,
      `/api/projects/${DEMO_SLUG}/exports/sheets/effort.xlsx?analysisId=${saved.body.id}`,
    );
    expect(effort.status).toBe(200);
    const book = new ExcelJS.Workbook();
    await book.xlsx.load(effort.body as unknown as ArrayBuffer);
    const sheet = book.worksheets[0]!;
    expect(sheet.rowCount).toBe(inputs.stations.length + 1);
    expect(sheet.getRow(2).getCell(1).value).toBe(inputs.stations[0]!.code);
    expect(sheet.getRow(2).getCell(3).value).toBe(inputs.effort[0]![0]);
    // Histories need a saved analysis, and are the ecologist's (like the analyses themselves).
    const without = await ecologist.get(`/api/projects/${DEMO_SLUG}/exports/sheets/histories.csv`);
    expect(without.status).toBe(400);
    expect(without.body.error.message).toMatch(/saved analysis/);
    expect(
      (
        await ecologist.get(
          `/api/projects/${DEMO_SLUG}/exports/sheets/effort.csv?analysisId=0123456789abcdef0123`,
        )
      ).status,
    ).toBe(404);
    expect(
      (await ecologist.get(`/api/projects/${DEMO_SLUG}/exports/sheets/effort.csv?analysisId=nope`))
        .status,
    ).toBe(400);
    expect(
      (
        await reviewer.get(
          `/api/projects/${DEMO_SLUG}/exports/sheets/histories.csv?analysisId=${saved.body.id}`,
        )
      ).status,
    ).toBe(403);
  }, 120_000);

  it('should refuse spreadsheets to volunteers and unknown sheets or formats', async () => {
    expect(
      (await volunteer.get(`/api/projects/${DEMO_SLUG}/exports/sheets/catalogue.csv`)).status,
    ).toBe(403);
    const unknown = await reviewer.get(`/api/projects/${DEMO_SLUG}/exports/sheets/passwords.csv`);
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.code).toBe('validation_failed');
    const format = await reviewer.get(`/api/projects/${DEMO_SLUG}/exports/sheets/catalogue.pdf`);
    expect(format.status).toBe(400);
  });
});

describe('no precise location for roles below ecologist (high sensitivity)', () => {
  const COORDINATE_KEYS =
    /^(lat|lon|lng|latitude|longitude|decimalLatitude|decimalLongitude|gpsLat|gpsLon)$/;

  /** Every coordinate-like number in a JSON body, with where it was found. */
  function coordinates(value: unknown, path = '$', out: { path: string; value: number }[] = []) {
    if (Array.isArray(value)) value.forEach((v, i) => coordinates(v, `${path}[${i}]`, out));
    else if (value && typeof value === 'object') {
      for (const [k, v] of Object.entries(value)) {
        if (COORDINATE_KEYS.test(k) && typeof v === 'number')
          out.push({ path: `${path}.${k}`, value: v });
        else if (k === 'coordinates')
          JSON.stringify(v)
            .match(/-?\d+\.\d+/g)
            ?.forEach((n) => out.push({ path: `${path}.coordinates`, value: Number(n) }));
        else coordinates(v, `${path}.${k}`, out);
      }
    }
    return out;
  }

  it('should sweep every API route as volunteer, reviewer and curator and find only 0.1° positions', async () => {
    const { registeredRoutes } = await import('../support/routes');
    const project = await projectRow();
    expect(project.sensitivity).toBe('high');
    const pick = async (
      table:
        | 'stations'
        | 'deployments'
        | 'events'
        | 'sightings'
        | 'individuals'
        | 'card_uploads'
        | 'identity_changes',
      n = 3,
    ) =>
      (
        await ctx.db
          .selectFrom(table)
          .select('id')
          .where('project_id', '=', project.id)
          .limit(n)
          .execute()
      ).map((r) => r.id);
    const photos = (
      await ctx.db
        .selectFrom('photos')
        .select('id')
        .where('project_id', '=', project.id)
        .where('status', '=', 'ready')
        .limit(3)
        .execute()
    ).map((r) => r.id);
    const individuals = await ctx.db
      .selectFrom('individuals')
      .select(['id', 'code'])
      .where('project_id', '=', project.id)
      .where('status', '=', 'active')
      .limit(2)
      .execute();
    const values: Record<string, string[]> = {
      slug: [DEMO_SLUG],
      stationId: await pick('stations'),
      deploymentId: await pick('deployments'),
      eventId: await pick('events'),
      sightingId: await pick('sightings'),
      individualId: individuals.map((i) => i.id),
      idOrCode: [...individuals.map((i) => i.id), ...individuals.map((i) => i.code!)],
      uploadId: await pick('card_uploads'),
      changeId: await pick('identity_changes', 1),
      id: photos,
      sheet: ['catalogue', 'sightings'],
      format: ['csv', 'xlsx'],
      userId: [
        (
          await ctx.db
            .selectFrom('users')
            .select('id')
            .where('email', '=', 'volunteer@demo.test')
            .executeTakeFirstOrThrow()
        ).id,
      ],
      token: ['x'.repeat(43)],
    };
    const urls = (path: string): string[] => {
      let out = [path];
      for (const name of path.match(/:[A-Za-z]+/g) ?? []) {
        const options = values[name.slice(1)] ?? ['0123456789abcdef0123'];
        out = out.flatMap((u) => options.map((v) => u.replace(name, v)));
      }
      return out;
    };
    const stations = await ctx.db
      .selectFrom('stations')
      .select(['lat', 'lon'])
      .where('project_id', '=', project.id)
      .execute();
    const exact = stations
      .flatMap((s) => [String(s.lat), String(s.lon)])
      .filter((v) => v.replace(/^-?\d+\.?/, '').length >= 3);
    expect(exact.length).toBeGreaterThan(10);
    const routes = registeredRoutes(ctx.app);
    let checked = 0;
    let found = 0;
    for (const who of ['volunteer', 'reviewer', 'curator'] as const) {
      const client = await demoUser(ctx, who);
      for (const route of routes) {
        // Every route as the volunteer (writes with an empty body); reads for the other roles.
        if (route.method !== 'GET' && (who !== 'volunteer' || route.path.includes('logout')))
          continue;
        for (const url of urls(route.path)) {
          const res = await client.send(route.method, url).buffer(true).parse(binaryParser);
          checked++;
          const body = (res.body as Buffer).toString('latin1');
          for (const v of exact)
            expect(body.includes(v), `${who} ${route.method} ${url} shows ${v}`).toBe(false);
          if (!/json/.test(String(res.headers['content-type']))) {
            if (/image\/jpeg/.test(String(res.headers['content-type']))) {
              const gps = await exifr.gps(res.body as Buffer).catch(() => undefined);
              expect(gps?.latitude, `${who} ${url} photo GPS`).toBeUndefined();
            }
            continue;
          }
          for (const c of coordinates(JSON.parse((res.body as Buffer).toString('utf8')))) {
            found++;
            expect(onGrid(c.value, 0.1), `${who} ${url} ${c.path} = ${c.value}`).toBe(true);
          }
        }
      }
    }
    expect(checked).toBeGreaterThan(150);
    expect(found).toBeGreaterThan(20);
  }, 300_000);

  it('should strip the camera GPS from originals for reviewers but keep it for ecologists', async () => {
    const photo = await ctx.db
      .selectFrom('photos')
      .select('id')
      .where('status', '=', 'ready')
      .where('gps_lat', 'is not', null)
      .executeTakeFirstOrThrow();
    const forEcologist = await download(ecologist, `/api/photos/${photo.id}/original`);
    const forReviewer = await download(reviewer, `/api/photos/${photo.id}/original`);
    expect(forEcologist.status).toBe(200);
    expect(forReviewer.status).toBe(200);
    expect((await exifr.gps(forEcologist.body))?.latitude).toBeTypeOf('number');
    expect(await exifr.gps(forReviewer.body).catch(() => undefined)).toBeUndefined();
    // Same picture: the stripped file decodes to the same dimensions.
    expect(imageSize(forReviewer.body)).toMatchObject({
      width: imageSize(forEcologist.body).width,
    });
  });
});

describe('backup and restore', () => {
  it('should refuse the backup to anyone but an admin', async () => {
    for (const client of [ecologist, reviewer, volunteer]) {
      const res = await client.get('/api/admin/backup');
      expect(res.status).toBe(403);
      expect(res.body.error.code).toBe('forbidden');
    }
  });

  it('should back up while people work, and restore into a fresh instance with everything in it', async () => {
    // Reviewers keep labelling while the backup is taken.
    const event = await ctx.db
      .selectFrom('events')
      .select(['id', 'label', 'species'])
      .where('label', '=', 'blank')
      .executeTakeFirstOrThrow();
    let writing = true;
    let writes = 0;
    const version = async () =>
      (
        await ctx.db
          .selectFrom('events')
          .select('label_version')
          .where('id', '=', event.id)
          .executeTakeFirstOrThrow()
      ).label_version;
    const relabel = async (label: string) =>
      reviewer.post(`/api/projects/${DEMO_SLUG}/events/${event.id}/label`, {
        label,
        expectedVersion: await version(),
      });
    const storm = (async () => {
      while (writing) {
        const res = await relabel(writes % 2 ? 'blank' : 'unknown');
        if (res.status !== 200) return `label: ${res.status} ${JSON.stringify(res.body)}`;
        writes++;
        // Let the backup's own steps run between writes.
        await new Promise((r) => setTimeout(r, 5));
      }
      return null;
    })();
    const backup = await download(admin, '/api/admin/backup');
    writing = false;
    expect(await storm).toBeNull();
    expect(backup.status).toBe(200);
    expect(backup.headers['content-disposition']).toMatch(/maculo-backup-.*\.zip/);
    expect(writes).toBeGreaterThan(0);
    // Put the labels back as they were, so counts compare like for like.
    if (writes % 2) expect((await relabel('blank')).status).toBe(200);

    const files = await unzip(backup.body);
    const dir = mkdtempSync(join(tmpdir(), 'maculo-restore-'));
    try {
      // The restore steps of the README: the database file and the uploads folder, then start.
      for (const [name, bytes] of files) {
        if (name !== 'maculo.sqlite' && !name.startsWith('uploads/')) continue;
        mkdirSync(dirname(join(dir, name)), { recursive: true });
        writeFileSync(join(dir, name), bytes);
      }
      const restored = await createTestContext({
        DATABASE_PATH: join(dir, 'maculo.sqlite'),
        UPLOADS_DIR: join(dir, 'uploads'),
      });
      try {
        const check = await sql<{ integrity_check: string }>`pragma integrity_check`.execute(
          restored.db,
        );
        expect(check.rows[0]!.integrity_check).toBe('ok');
        for (const table of [
          'users',
          'projects',
          'memberships',
          'stations',
          'deployments',
          'photos',
          'events',
          'sightings',
          'individuals',
          'calls',
          'reference_photos',
          'identity_changes',
        ] as const) {
          const count = async (db: typeof ctx.db) =>
            Number(
              (
                await db
                  .selectFrom(table)
                  .select((eb) => eb.fn.countAll<number>().as('n'))
                  .executeTakeFirstOrThrow()
              ).n,
            );
          expect(await count(restored.db), table).toBe(await count(ctx.db));
        }
        // Every stored photo is in the restored store, byte for byte.
        const photos = await restored.db
          .selectFrom('photos')
          .select(['stored_path', 'sha256'])
          .where('stored_path', '!=', '')
          .execute();
        expect(photos.length).toBeGreaterThan(300);
        for (const p of photos) {
          const bytes = readFileSync(join(dir, 'uploads', p.stored_path));
          expect(createHash('sha256').update(bytes).digest('hex')).toBe(p.sha256);
        }
        // People sign in with their own passwords and find their project as it was.
        const again = await signIn(restored.app, 'ecologist@demo.test', DEMO_PASSWORD);
        const [before, after] = [
          await ecologist.get(`/api/projects/${DEMO_SLUG}/individuals`),
          await again.get(`/api/projects/${DEMO_SLUG}/individuals`),
        ];
        expect(after.body).toEqual(before.body);
        const photo = photos[0]!;
        const id = (
          await restored.db
            .selectFrom('photos')
            .select('id')
            .where('sha256', '=', photo.sha256)
            .executeTakeFirstOrThrow()
        ).id;
        const preview = await again.get(`/api/photos/${id}/preview`);
        expect(preview.status).toBe(200);
      } finally {
        await restored.close();
      }
    } finally {
      rmSync(dir, { recursive: true, force: true });
    }
  }, 300_000);
});

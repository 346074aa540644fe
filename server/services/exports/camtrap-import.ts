import { createHash } from 'node:crypto';
import Papa from 'papaparse';
import type { Db } from '../../db/database';
import type { PhotoStorage } from '../../images/storage';
import { ApiError } from '../../errors/api-error';
import { sniffUpload } from '../../images/sniff';
import { recordAudit } from '../audit.service';
import { newId, nowIso } from '../ids';
import { enqueueJob } from '../jobs.service';
import type { ImportReportView } from '../../../shared/exports';
import { zoneFor, importRows, type Tables } from './camtrap-import-rows';

type CsvRow = Record<string, string>;

function parseCsv(files: Map<string, Buffer>, name: string, required: boolean): CsvRow[] {
  const bytes = files.get(name);
  if (!bytes) {
    if (required) throw new ApiError('validation_failed', `The package has no ${name}.`);
    return [];
  }
  const parsed = Papa.parse<CsvRow>(bytes.toString('utf8').replace(/^\uFEFF/, ''), {
    header: true,
    skipEmptyLines: 'greedy',
  });
  if (parsed.errors.length) {
    throw new ApiError(
      'validation_failed',
      `${name} is not valid CSV: ${parsed.errors[0]!.message} (row ${(parsed.errors[0]!.row ?? 0) + 2}).`,
    );
  }
  return parsed.data;
}

function resourcePath(
  pkg: { resources?: { name?: string; path?: string }[] },
  name: string,
  fallback: string,
): string {
  const r = pkg.resources?.find((x) => x.name === name);
  return typeof r?.path === 'string' ? r.path : fallback;
}

/**
 * The new project's sensitivity: from the package's coordinate precision when it was generalised,
 * else high (the safe side; the ecologist can lower it in the project settings).
 */
function sensitivityOf(precision: unknown): { sensitivity: string; note: string } {
  const known: [number, string][] = [
    [1, 'extreme'],
    [0.1, 'high'],
    [0.01, 'medium'],
    [0.001, 'low'],
  ];
  const match =
    typeof precision === 'number'
      ? known.find(([p]) => Math.abs(p - precision) < 1e-9 || precision > p)
      : undefined;
  if (match)
    return {
      sensitivity: match[1],
      note: `The package's coordinates were rounded to ${precision} degrees: the project's sensitivity is set to ${match[1]}.`,
    };
  return {
    sensitivity: 'high',
    note: 'The package gives exact coordinates: the project’s sensitivity is set to high until an ecologist reviews it.',
  };
}

async function freeSlug(db: Db, wanted: string): Promise<string> {
  const base =
    wanted
      .toLowerCase()
      .replace(/[^a-z0-9-]+/g, '-')
      .replace(/^-+|-+$/g, '')
      .slice(0, 40) || 'imported';
  for (let n = 1; n < 1000; n++) {
    const slug = n === 1 ? base : `${base}-${n}`;
    if (!(await db.selectFrom('projects').select('id').where('slug', '=', slug).executeTakeFirst()))
      return slug.length >= 3 ? slug : `${slug}-project`;
  }
  throw new ApiError('conflict', 'No free project slug for this package.');
}

/**
 * Creates a project from a Camtrap DP package: stations (from locationID), deployments, media
 * (stored when the file is in the package, else kept as a reference), events and labels,
 * sightings and individuals. Identifiers of the package are kept where they fit Maculo's, so that
 * exporting the imported project gives back the same tables. Returns a report of what was
 * imported and what was skipped, and why.
 */
export async function importCamtrapPackage(
  db: Db,
  storage: PhotoStorage,
  files: Map<string, Buffer>,
  importer: { id: string },
  maxMegapixels: number,
): Promise<{ slug: string; report: ImportReportView }> {
  const raw = files.get('datapackage.json');
  if (!raw)
    throw new ApiError(
      'validation_failed',
      'This is not a Camtrap DP package: datapackage.json is missing.',
    );
  let pkg: Record<string, unknown>;
  try {
    pkg = JSON.parse(raw.toString('utf8')) as Record<string, unknown>;
  } catch {
    throw new ApiError('validation_failed', 'datapackage.json is not valid JSON.');
  }
  const p = pkg as {
    name?: string;
    title?: string;
    description?: string;
    project?: { id?: unknown; description?: unknown };
    taxonomic?: { scientificName?: string; vernacularNames?: Record<string, string> }[];
    resources?: { name?: string; path?: string }[];
  };
  const tables: Tables = {
    deployments: parseCsv(files, resourcePath(p, 'deployments', 'deployments.csv'), true),
    media: parseCsv(files, resourcePath(p, 'media', 'media.csv'), true),
    observations: parseCsv(files, resourcePath(p, 'observations', 'observations.csv'), true),
    sightings: parseCsv(
      files,
      resourcePath(p, 'individual-sightings', 'individual-sightings.csv'),
      false,
    ),
    references: files.has(resourcePath(p, 'individual-references', 'individual-references.csv'))
      ? parseCsv(files, resourcePath(p, 'individual-references', 'individual-references.csv'), true)
      : null,
  };
  if (tables.deployments.length === 0)
    throw new ApiError('validation_failed', 'deployments.csv has no rows.');
  const identified = tables.observations.find((o) => o['individualID']);
  const target = identified?.['scientificName'] || p.taxonomic?.[0]?.scientificName || 'Animalia';
  const common =
    p.taxonomic?.find((t) => t.scientificName === target)?.vernacularNames?.['eng'] ?? target;
  const prefix = (identified?.['individualID'] ?? '').match(/^([A-Z]{1,6})-\d+$/)?.[1] ?? 'IND';
  const slug = await freeSlug(db, p.name ?? p.title ?? 'imported');
  // The package's project id is kept when it is Maculo-shaped and free here.
  const givenId =
    typeof p.project?.id === 'string' && /^[0-9a-f]{20}$/.test(p.project.id) ? p.project.id : null;
  const projectId =
    givenId &&
    !(await db.selectFrom('projects').select('id').where('id', '=', givenId).executeTakeFirst())
      ? givenId
      : newId();
  const { sensitivity, note } = sensitivityOf(
    (pkg as { coordinatePrecision?: unknown }).coordinatePrecision,
  );
  const timezone = zoneFor(tables.deployments[0]!['deploymentStart'] ?? '');
  const report = await db.transaction().execute(async (trx) => {
    await trx
      .insertInto('projects')
      .values({
        id: projectId,
        slug,
        name: (p.title ?? slug).slice(0, 120),
        description: (typeof p.project?.description === 'string'
          ? p.project.description
          : (p.description ?? '')
        ).slice(0, 2000),
        target_species_scientific: target,
        target_species_common: common,
        timezone,
        independence_minutes: 30,
        occasion_hours: 24,
        reviewers_per_sighting: 2,
        sensitivity,
        sensitivity_review_date: null,
        code_prefix: prefix,
        code_next: 1,
        created_at: nowIso(),
        created_by: importer.id,
        boundary_geojson: null,
        tile_url: null,
        gps_tolerance_m: 250,
        human_retention_days: null,
        last_digest_at: null,
      })
      .execute();
    await trx
      .insertInto('memberships')
      .values({
        project_id: projectId,
        user_id: importer.id,
        role: 'ecologist',
        created_at: nowIso(),
      })
      .execute();
    // The package's species list (with English names) becomes the project's species list.
    let position = 0;
    for (const t of p.taxonomic ?? []) {
      if (typeof t.scientificName !== 'string' || !t.scientificName) continue;
      await trx
        .insertInto('project_species')
        .values({
          project_id: projectId,
          scientific_name: t.scientificName.slice(0, 200),
          common_name: (t.vernacularNames?.['eng'] ?? '').slice(0, 200),
          position: position++,
        })
        .onConflict((oc) => oc.doNothing())
        .execute();
    }
    const result = await importRows(trx, { projectId, tables, importerId: importer.id, target });
    await recordAudit(trx, {
      userId: importer.id,
      projectId,
      action: 'import-camtrap-dp',
      entity: 'project',
      entityId: projectId,
      after: result.counts,
    });
    return result;
  });
  // Photos whose files came in the package are stored and processed like an upload.
  for (const m of report.mediaToStore) {
    const bytes = files.get(m.filePath);
    if (!bytes) continue;
    const sha256 = createHash('sha256').update(bytes).digest('hex');
    const twin = await db
      .selectFrom('photos')
      .select('id')
      .where('project_id', '=', projectId)
      .where('sha256', '=', sha256)
      .executeTakeFirst();
    if (twin) {
      report.skipped.push({
        table: 'media',
        row: m.row,
        id: m.mediaId,
        reason: `same file as media ${twin.id}; kept as a record without its own copy`,
      });
      continue;
    }
    const tmp = storage.tmpPath();
    await storage.writeAtomic(tmp, bytes);
    // The same checks as a card upload: JPEG by its bytes, complete, within the pixel cap.
    const sniffed = await sniffUpload(tmp, bytes.length, maxMegapixels);
    if (!sniffed.ok) {
      await storage.discard(tmp);
      report.skipped.push({
        table: 'media',
        row: m.row,
        id: m.mediaId,
        reason: `${sniffed.message} Kept as a record without the file.`,
      });
      continue;
    }
    const stored = await storage.adoptOriginal(tmp, sha256);
    await db
      .updateTable('photos')
      .set({
        sha256,
        stored_path: stored,
        bytes: bytes.length,
        width: sniffed.width,
        height: sniffed.height,
        status: 'queued',
      })
      .where('id', '=', m.photoId)
      .execute();
    await enqueueJob(db, 'derivatives', { photoId: m.photoId });
    report.counts.mediaFiles++;
  }
  return { slug, report: { counts: report.counts, skipped: report.skipped, notes: [note] } };
}

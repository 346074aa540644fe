import { FEATURE_TYPES, type FeatureType } from '../../../shared/stations';
import { PHOTO_FLAGS, type PhotoFlag } from '../../../shared/ingest';
import type { Db } from '../../db/database';
import { newId, nowIso } from '../ids';
import type { ImportReportView } from '../../../shared/exports';

type CsvRow = Record<string, string>;

/** The tables of a package as parsed CSV rows. */
export interface Tables {
  deployments: CsvRow[];
  media: CsvRow[];
  observations: CsvRow[];
  sightings: CsvRow[];
  /** Our reference-photo table; null when the package has none (then favourites stand in). */
  references: CsvRow[] | null;
}

/** What an import did (without the notes the caller adds). */
export type ImportReport = Omit<ImportReportView, 'notes'>;

const OUR_ID = /^[0-9a-f]{20}$/;
type IdTable = 'stations' | 'deployments' | 'photos' | 'events' | 'sightings';

/** A fixed-offset IANA zone for an ISO time's offset (`+03:00` → `Etc/GMT-3`). */
export function zoneFor(iso: string): string {
  const m = /([+-])(\d{2}):(\d{2})$/.exec(iso);
  if (!m || (m[2] === '00' && m[3] === '00')) return 'UTC';
  if (m[3] !== '00') return 'UTC';
  const hours = Number(m[2]);
  return `Etc/GMT${m[1] === '+' ? '-' : '+'}${hours}`;
}

function utc(value: string | undefined): string | null {
  if (!value) return null;
  const t = Date.parse(value);
  return Number.isNaN(t) ? null : new Date(t).toISOString().replace('.000Z', 'Z');
}

function bool(value: string | undefined): boolean {
  return value?.toLowerCase() === 'true';
}

/** An active individual under its imported display code. */
async function insertIndividual(
  db: Db,
  projectId: string,
  code: string,
  now: string,
  id = newId(),
): Promise<string> {
  await db
    .insertInto('individuals')
    .values({
      id,
      project_id: projectId,
      code,
      nickname: null,
      sex: 'unknown',
      notes: '',
      tags: '[]',
      status: 'active',
      merged_into: null,
      created_by: null,
      created_at: now,
      updated_at: now,
    })
    .execute();
  return id;
}

/** Inserts the rows of a package into a new project (inside the caller's transaction). */
export async function importRows(
  db: Db,
  input: { projectId: string; tables: Tables; importerId: string; target: string },
): Promise<
  ImportReport & {
    mediaToStore: { photoId: string; filePath: string; row: number; mediaId: string }[];
  }
> {
  const { projectId, tables } = input;
  const report: ImportReport = {
    counts: {
      stations: 0,
      deployments: 0,
      media: 0,
      mediaFiles: 0,
      events: 0,
      observations: 0,
      sightings: 0,
      individuals: 0,
    },
    skipped: [],
  };
  const skip = (table: string, row: number, id: string | null, reason: string) =>
    report.skipped.push({ table, row: row + 2, id, reason });
  const used = new Set<string>();
  // A package's own ids are kept when they have Maculo's form and are free in this instance
  // (importing into a fresh instance gives back the same tables); otherwise new ids are made.
  const idFor = async (table: IdTable, given: string | undefined) => {
    const free =
      given &&
      OUR_ID.test(given) &&
      !used.has(given) &&
      !(await db.selectFrom(table).select('id').where('id', '=', given).executeTakeFirst());
    const id = free ? given : newId();
    used.add(id);
    return id;
  };
  const now = nowIso();

  // Stations from locationID; deployments.
  const stationOf = new Map<string, string>();
  const deploymentIds = new Map<string, { id: string; stationId: string }>();
  for (const [i, d] of tables.deployments.entries()) {
    const lat = Number(d['latitude']);
    const lon = Number(d['longitude']);
    const start = utc(d['deploymentStart']);
    const end = utc(d['deploymentEnd']);
    if (
      !d['deploymentID'] ||
      !Number.isFinite(lat) ||
      !Number.isFinite(lon) ||
      Math.abs(lat) > 90 ||
      Math.abs(lon) > 180 ||
      !start ||
      !end ||
      end <= start
    ) {
      skip(
        'deployments',
        i,
        d['deploymentID'] ?? null,
        'missing or invalid deploymentID, coordinates or times',
      );
      continue;
    }
    const locationKey = d['locationID'] || `${lat},${lon}`;
    let stationId = stationOf.get(locationKey);
    if (!stationId) {
      stationId = await idFor('stations', d['locationID']);
      stationOf.set(locationKey, stationId);
      const code = (d['locationName'] || d['locationID'] || `S${stationOf.size}`)
        .slice(0, 40)
        .replace(/[^A-Za-z0-9._-]/g, '_');
      await db
        .insertInto('stations')
        .values({
          id: stationId,
          project_id: projectId,
          code,
          name: '',
          lat,
          lon,
          notes: '',
          created_at: now,
        })
        .execute();
      report.counts.stations++;
    }
    const id = await idFor('deployments', d['deploymentID']);
    deploymentIds.set(d['deploymentID'], { id, stationId });
    const label = /camera:([^|]+)/.exec(d['deploymentTags'] ?? '')?.[1] ?? d['cameraID'] ?? 'A';
    const feature = FEATURE_TYPES.includes(d['featureType'] as FeatureType)
      ? d['featureType']!
      : null;
    await db
      .insertInto('deployments')
      .values({
        id,
        project_id: projectId,
        station_id: stationId,
        camera_label: label.slice(0, 40),
        camera_serial: d['cameraID'] || null,
        start,
        end,
        timezone: zoneFor(d['deploymentStart']!),
        clock_offset_seconds: 0,
        last_working: null,
        feature_type: feature,
        bait_use: bool(d['baitUse']) ? 1 : 0,
        notes: d['deploymentComments'] ?? '',
        clock_fix: null,
        camera_model: d['cameraModel'] || null,
        created_by: input.importerId,
        created_at: now,
      })
      .execute();
    report.counts.deployments++;
  }

  // Media: one card upload per deployment; files are stored afterwards when the package has them.
  const uploads = new Map<string, string>();
  const photoIds = new Map<string, string>();
  const mediaToStore: { photoId: string; filePath: string; row: number; mediaId: string }[] = [];
  const photosByDeployment = new Map<string, { id: string; time: string; favorite: boolean }[]>();
  for (const [i, m] of tables.media.entries()) {
    const dep = deploymentIds.get(m['deploymentID'] ?? '');
    const time = utc(m['timestamp']);
    if (!m['mediaID'] || !dep || !time || !m['filePath']) {
      skip(
        'media',
        i,
        m['mediaID'] ?? null,
        dep ? 'missing mediaID, timestamp or filePath' : 'unknown deploymentID',
      );
      continue;
    }
    if (
      m['filePath'].startsWith('/') ||
      m['filePath'].startsWith('.') ||
      m['filePath'].startsWith('~') ||
      m['filePath'].includes('..')
    ) {
      skip('media', i, m['mediaID'], 'filePath must be relative (no leading ., / or ~, no ..)');
      continue;
    }
    let uploadId = uploads.get(dep.id);
    if (!uploadId) {
      uploadId = newId();
      uploads.set(dep.id, uploadId);
      await db
        .insertInto('card_uploads')
        .values({
          id: uploadId,
          project_id: projectId,
          deployment_id: dep.id,
          uploader_id: input.importerId,
          accepted: 0,
          duplicate: 0,
          rejected: 0,
          created_at: now,
        })
        .execute();
    }
    const id = await idFor('photos', m['mediaID']);
    photoIds.set(m['mediaID'], id);
    const flags = (m['mediaComments'] ?? '')
      .split('|')
      .filter((f): f is PhotoFlag => PHOTO_FLAGS.includes(f as PhotoFlag));
    await db
      .insertInto('photos')
      .values({
        id,
        project_id: projectId,
        deployment_id: dep.id,
        upload_id: uploadId,
        sha256: `reference:${id}`,
        original_name: (m['fileName'] || `${id}.jpg`).slice(0, 255),
        stored_path: '',
        bytes: 0,
        width: 0,
        height: 0,
        taken_at_exif: null,
        taken_at: time,
        gps_lat: null,
        gps_lon: null,
        make: null,
        model: null,
        serial: null,
        status: 'external',
        error: null,
        flags: JSON.stringify(flags),
        exif_thumb: 0,
        event_id: null,
        created_at: now,
      })
      .execute();
    await db
      .updateTable('card_uploads')
      .set((eb) => ({ accepted: eb('accepted', '+', 1) }))
      .where('id', '=', uploadId)
      .execute();
    mediaToStore.push({ photoId: id, filePath: m['filePath'], row: i + 2, mediaId: m['mediaID'] });
    photosByDeployment.set(dep.id, [
      ...(photosByDeployment.get(dep.id) ?? []),
      { id, time, favorite: bool(m['favorite']) },
    ]);
    report.counts.media++;
  }

  const individuals = await importObservations(db, {
    ...input,
    deploymentIds,
    photoIds,
    photosByDeployment,
    idFor,
    skip,
    report,
    now,
  });
  if (tables.references) {
    const position = new Map<string, number>();
    for (const [i, r] of tables.references.entries()) {
      const code = r['individualID'] ?? '';
      // An individual known only from its reference photos (no confirmed sighting yet).
      if (code && !individuals.has(code) && photoIds.has(r['mediaID'] ?? '')) {
        individuals.set(code, await insertIndividual(db, projectId, code, now));
        report.counts.individuals++;
      }
      const individualId = individuals.get(code);
      const photoId = photoIds.get(r['mediaID'] ?? '');
      const flank = r['flank'] === 'left' || r['flank'] === 'right' ? r['flank'] : 'other';
      if (!individualId || !photoId) {
        skip(
          'individual-references',
          i,
          r['mediaID'] ?? null,
          individualId ? 'unknown mediaID' : 'unknown or unconfirmed individualID',
        );
        continue;
      }
      const key = `${individualId}/${flank}`;
      const at = position.get(key) ?? 0;
      position.set(key, at + 1);
      await db
        .insertInto('reference_photos')
        .values({
          individual_id: individualId,
          flank,
          photo_id: photoId,
          position: at,
          chosen_by: null,
          created_at: now,
        })
        .onConflict((oc) => oc.doNothing())
        .execute();
    }
  }
  // New individuals continue after the highest imported number.
  const numbers = [...individuals.keys()].map((c) => Number(/-(\d+)$/.exec(c)?.[1] ?? 0));
  await db
    .updateTable('projects')
    .set({ code_next: Math.max(0, ...numbers) + 1 })
    .where('id', '=', projectId)
    .execute();
  return { ...report, mediaToStore };
}

async function importObservations(
  db: Db,
  ctx: {
    projectId: string;
    tables: Tables;
    target: string;
    deploymentIds: Map<string, { id: string; stationId: string }>;
    photoIds: Map<string, string>;
    photosByDeployment: Map<string, { id: string; time: string; favorite: boolean }[]>;
    idFor: (table: IdTable, given: string | undefined) => Promise<string>;
    skip: (table: string, row: number, id: string | null, reason: string) => void;
    report: ImportReport;
    now: string;
  },
): Promise<Map<string, string>> {
  const extra = new Map(ctx.tables.sightings.map((s) => [s['observationID'] ?? '', s]));
  const groups = new Map<string, { row: CsvRow; index: number }[]>();
  ctx.tables.observations.forEach((o, index) => {
    const key = o['eventID'] || o['observationID'] || `row${index}`;
    groups.set(key, [...(groups.get(key) ?? []), { row: o, index }]);
  });
  const individuals = new Map<string, string>();
  for (const [key, rows] of groups) {
    const first = rows[0]!.row;
    const dep = ctx.deploymentIds.get(first['deploymentID'] ?? '');
    const start = utc(first['eventStart']);
    const end = utc(first['eventEnd']);
    if (!dep || !start || !end) {
      for (const r of rows)
        ctx.skip(
          'observations',
          r.index,
          r.row['observationID'] ?? null,
          dep ? 'invalid eventStart or eventEnd' : 'unknown deploymentID',
        );
      continue;
    }
    const type = first['observationType'] ?? 'unclassified';
    const label = ['animal', 'human', 'vehicle', 'blank', 'unknown'].includes(type) ? type : null;
    const eventId = await ctx.idFor('events', first['eventID'] || key);
    const stationDeployments = [...ctx.deploymentIds.values()]
      .filter((d) => d.stationId === dep.stationId)
      .map((d) => d.id);
    const photos = stationDeployments
      .flatMap((d) => ctx.photosByDeployment.get(d) ?? [])
      .filter((p) => p.time >= start && p.time <= end);
    const individualRows = rows.filter(
      (r) =>
        r.row['scientificName'] === ctx.target &&
        (r.row['individualID'] || extra.has(r.row['observationID'] ?? '')),
    );
    await db
      .insertInto('events')
      .values({
        id: eventId,
        project_id: ctx.projectId,
        station_id: dep.stationId,
        start,
        end,
        photo_count: photos.length,
        created_at: ctx.now,
        label,
        species: first['scientificName'] || null,
        animal_count:
          label === 'animal' ? individualRows.length || Number(first['count']) || 1 : null,
        sorted_by: null,
        sorted_at: utc(first['classificationTimestamp']),
        label_version: label ? 1 : 0,
        lease_holder: null,
        lease_until: null,
      })
      .execute();
    for (const p of photos)
      await db.updateTable('photos').set({ event_id: eventId }).where('id', '=', p.id).execute();
    ctx.report.counts.events++;
    ctx.report.counts.observations += rows.length;
    for (const r of individualRows) {
      const more = extra.get(r.row['observationID'] ?? '');
      const best = ctx.photoIds.get(more?.['bestMediaID'] ?? '') ?? photos[0]?.id;
      if (!best) {
        ctx.skip(
          'observations',
          r.index,
          r.row['observationID'] ?? null,
          'no media of this event to show the animal',
        );
        continue;
      }
      const code = r.row['individualID'] || null;
      let individualId: string | null = null;
      if (code) {
        individualId = individuals.get(code) ?? null;
        if (!individualId) {
          individualId = newId();
          individuals.set(code, individualId);
          await insertIndividual(db, ctx.projectId, code, ctx.now, individualId);
          ctx.report.counts.individuals++;
        }
      }
      const state = more?.['reviewState'] || (code ? 'confirmed' : 'open');
      await db
        .insertInto('sightings')
        .values({
          id: await ctx.idFor('sightings', r.row['observationID']),
          project_id: ctx.projectId,
          event_id: eventId,
          flank: more?.['flank'] || 'unknown',
          quality: more?.['photoQuality'] || 'fair',
          best_photo_id: best,
          crop: more?.['crop'] || null,
          sex: r.row['sex'] || null,
          age_class: r.row['lifeStage'] || null,
          state,
          individual_id: state === 'confirmed' ? individualId : null,
          created_by: null,
          created_at: ctx.now,
          updated_at: ctx.now,
          imported_review: more
            ? JSON.stringify({
                agreement: more['reviewAgreement'] ?? 'not-reviewed',
                calls: Number(more['calls'] ?? 0),
              })
            : null,
        })
        .execute();
      // Packages without our reference table: the favourite photos of an identified animal's
      // event stand in as its references.
      for (const p of ctx.tables.references ? [] : photos.filter((x) => x.favorite)) {
        if (!individualId) continue;
        const flank =
          p.id === best && (more?.['flank'] === 'left' || more?.['flank'] === 'right')
            ? more['flank']
            : 'other';
        await db
          .insertInto('reference_photos')
          .values({
            individual_id: individualId,
            flank,
            photo_id: p.id,
            position: 0,
            chosen_by: null,
            created_at: ctx.now,
          })
          .onConflict((oc) => oc.doNothing())
          .execute();
      }
      ctx.report.counts.sightings++;
    }
  }
  return individuals;
}

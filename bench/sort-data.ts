/**
 * A large Sort project written straight into SQLite through the app's Kysely module and migrations:
 * stations with two cameras each, one card upload per camera, events at every station spread over
 * a year (always more than the 30-minute interval apart) and their photos (rows only — the Sort
 * queue hands out thumbnail URLs, never bytes). Bulk inserts of 500 rows per transaction. Synthetic.
 */
import { randomBytes } from 'node:crypto';
import type { Database, Db } from '../server/db/database';
import type { EventsTable, PhotosTable } from '../server/db/schema/ingest.table';
import type { ProjectsTable } from '../server/db/schema/projects.table';
import { newId } from '../server/services/ids';
import { Rng } from '../seeds/photos/random';
import { createBenchProject, createMembers, openBenchDb, type BenchUser } from './fixtures';

/** Size of the project to build. */
export interface SortProjectSize {
  photos: number;
  events: number;
  stations: number;
  reviewers: number;
  /** Share of each station's events already labelled (oldest first), 0–1. */
  sorted: number;
}

/** What was built. */
export interface SortProject {
  slug: string;
  projectId: string;
  reviewers: BenchUser[];
  stationIds: string[];
  seconds: number;
}

const CHUNK = 500;
const SEASON_START = Date.parse('2026-01-01T00:00:00Z');
const YEAR_MS = 365 * 86_400_000;

/** Inserts rows into a table in transactions of 500. */
export async function insertChunked<T extends keyof Database>(
  db: Db,
  table: T,
  rows: readonly Database[T][],
): Promise<void> {
  for (let i = 0; i < rows.length; i += CHUNK) {
    const part = rows.slice(i, i + CHUNK);
    await db.transaction().execute(async (trx) => {
      await trx
        .insertInto(table)
        .values(part as never)
        .execute();
    });
  }
}

/** Photos per event: at least one each, the rest spread unevenly (some events are long bursts). */
function photoCounts(size: SortProjectSize, rng: Rng): Int32Array {
  const counts = new Int32Array(size.events).fill(1);
  const weights = Float64Array.from({ length: size.events }, () => -Math.log(1 - rng.next()));
  const cumulative = new Float64Array(size.events);
  let total = 0;
  for (let i = 0; i < size.events; i++) cumulative[i] = total += weights[i]!;
  for (let extra = size.photos - size.events; extra > 0; extra--) {
    const u = rng.next() * total;
    let lo = 0;
    let hi = size.events - 1;
    while (lo < hi) {
      const mid = (lo + hi) >> 1;
      if (cumulative[mid]! < u) lo = mid + 1;
      else hi = mid;
    }
    counts[lo]!++;
  }
  return counts;
}

async function addStations(db: Db, projectId: string, count: number) {
  const stations = [];
  const now = new Date().toISOString();
  for (let s = 0; s < count; s++) {
    const station = {
      id: newId(),
      project_id: projectId,
      code: `BS${String(s + 1).padStart(2, '0')}`,
      name: `Bench station ${s + 1}`,
      lat: -1.2 - 0.02 * Math.floor(s / 5),
      lon: 36.6 + 0.02 * (s % 5),
      notes: '',
      created_at: now,
    };
    await db.insertInto('stations').values(station).execute();
    const cameras = [];
    for (const label of ['A', 'B']) {
      const deployment = {
        id: newId(),
        project_id: projectId,
        station_id: station.id,
        camera_label: label,
        camera_serial: `BS${s + 1}-${label}`,
        start: new Date(SEASON_START).toISOString(),
        end: new Date(SEASON_START + YEAR_MS).toISOString(),
        timezone: 'Africa/Nairobi',
        clock_offset_seconds: 0,
        last_working: null,
        feature_type: null,
        bait_use: 0,
        notes: '',
        clock_fix: null,
        created_by: null,
        created_at: now,
      };
      await db.insertInto('deployments').values(deployment).execute();
      const uploadId = newId();
      await db
        .insertInto('card_uploads')
        .values({
          id: uploadId,
          project_id: projectId,
          deployment_id: deployment.id,
          uploader_id: null,
          accepted: 0,
          duplicate: 0,
          rejected: 0,
          created_at: now,
        })
        .execute();
      cameras.push({ deploymentId: deployment.id, uploadId });
    }
    stations.push({ id: station.id, cameras });
  }
  return stations;
}

function photoRow(
  projectId: string,
  camera: { deploymentId: string; uploadId: string },
  eventId: string,
  takenAt: Date,
  seq: number,
): PhotosTable {
  const sha256 = randomBytes(32).toString('hex');
  return {
    id: newId(),
    project_id: projectId,
    deployment_id: camera.deploymentId,
    upload_id: camera.uploadId,
    sha256,
    original_name: `IMG_${String(seq % 10000).padStart(4, '0')}.JPG`,
    stored_path: `originals/${sha256.slice(0, 2)}/${sha256}.jpg`,
    bytes: 2_200_000,
    width: 3000,
    height: 2000,
    taken_at_exif: takenAt.toISOString().slice(0, 19),
    taken_at: takenAt.toISOString(),
    gps_lat: null,
    gps_lon: null,
    make: 'Synthetic Trailcam',
    model: 'ST-1',
    serial: null,
    status: 'ready',
    error: null,
    flags: '[]',
    exif_thumb: 1,
    event_id: eventId,
    created_at: takenAt.toISOString(),
  };
}

/**
 * Builds the project in a new database under `dataDir`; returns ids and the reviewer accounts.
 * `extend` may add more to the same database before it is closed (another benchmark's rows).
 */
export async function buildSortProject<T = object>(
  dataDir: string,
  size: SortProjectSize,
  slug = 'bench-sort',
  extend?: (db: Db, project: ProjectsTable, lead: BenchUser) => Promise<T>,
): Promise<SortProject & T> {
  const started = performance.now();
  const { db } = await openBenchDb(dataDir);
  try {
    const { project, lead } = await createBenchProject(db, slug);
    const reviewers = await createMembers(
      db,
      project,
      lead,
      'reviewer',
      size.reviewers,
      'reviewer',
    );
    const stations = await addStations(db, project.id, size.stations);
    const rng = new Rng(2026).fork('bench-sort');
    const counts = photoCounts(size, rng);
    const perStation = Math.ceil(size.events / size.stations);
    const spacing = YEAR_MS / perStation;
    let events: EventsTable[] = [];
    let photos: PhotosTable[] = [];
    for (let e = 0; e < size.events; e++) {
      const s = e % size.stations;
      const k = Math.floor(e / size.stations);
      const station = stations[s]!;
      // Event k of a station starts in its own slot, jittered by up to a third of the spacing.
      const start = SEASON_START + k * spacing + rng.range(0, spacing / 3);
      const n = counts[e]!;
      const eventId = newId();
      const sorted = k < perStation * size.sorted;
      const times = Array.from({ length: n }, (_, i) => new Date(start + i * 4000));
      events.push({
        id: eventId,
        project_id: project.id,
        station_id: station.id,
        start: times[0]!.toISOString(),
        end: times[n - 1]!.toISOString(),
        photo_count: n,
        created_at: times[0]!.toISOString(),
        label: sorted ? 'blank' : null,
        species: null,
        animal_count: null,
        sorted_by: sorted ? lead.id : null,
        sorted_at: sorted ? times[0]!.toISOString() : null,
        label_version: sorted ? 1 : 0,
        lease_holder: null,
        lease_until: null,
      });
      for (const [i, t] of times.entries()) {
        photos.push(photoRow(project.id, rng.pick(station.cameras), eventId, t, e * 7 + i));
      }
      if (events.length >= CHUNK * 10) {
        await insertChunked(db, 'events', events);
        events = [];
      }
      if (photos.length >= CHUNK * 10) {
        await insertChunked(db, 'photos', photos);
        photos = [];
      }
    }
    await insertChunked(db, 'events', events);
    await insertChunked(db, 'photos', photos);
    const extra = (extend ? await extend(db, project, lead) : {}) as T;
    return {
      ...extra,
      slug: project.slug,
      projectId: project.id,
      reviewers,
      stationIds: stations.map((s) => s.id),
      seconds: (performance.now() - started) / 1000,
    };
  } finally {
    await db.destroy();
  }
}

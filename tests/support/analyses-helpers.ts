import type { Db } from '../../server/db/database';
import { newId } from '../../server/services/ids';

/**
 * A small synthetic survey written straight into the database, so every time is known to the
 * minute and the effort grid can be counted by hand. Session: 2026-07-01T00:00Z to 07-05T00:00Z.
 *
 *   P  paired station: camera A from 07-01 06:00, stopped working 07-02 18:00 (end 07-10);
 *      camera B from 07-02 12:00 to 07-04 12:00.
 *   D  one camera from 07-01 00:00, dead from 07-03 06:00 (last_working; end 07-10).
 *   L  one camera from 07-03 00:00 to 07-20.
 *   Z  one camera from 06-01 to 06-20 only (idle during the session).
 *
 * Individuals (all synthetic) and their sightings (UTC, quality good unless stated):
 *   I1  P 07-01 20:00 left; D 07-02 03:00 left (fair); D 07-04 02:00 left (D is dead then);
 *       P 07-06 10:00 left (after the session).
 *   I2  P 07-02 22:00 right; L 07-03 10:00 right; P 07-01 12:00 right (only proposed).
 *   I3  P 07-03 14:00 both, plus a left sighting in that same event; L 07-04 05:00 left.
 *   I4  D 07-01 09:00 left; P 07-04 08:00 right.
 *   I5  L 07-03 20:00 left (poor).
 *   I6  P 07-02 15:00 front.
 */
export interface SyntheticSurvey {
  stations: Record<'P' | 'D' | 'L' | 'Z', string>;
  individuals: Record<'I1' | 'I2' | 'I3' | 'I4' | 'I5' | 'I6', { id: string; code: string }>;
  sightings: Record<string, string>;
}

const NOW = '2026-06-01T00:00:00Z';

interface SightingSpec {
  key: string;
  individual: keyof SyntheticSurvey['individuals'];
  station: keyof SyntheticSurvey['stations'];
  time: string;
  flank: string;
  quality?: string;
  state?: string;
  sameEventAs?: string;
}

const SIGHTINGS: SightingSpec[] = [
  { key: 'I1-P1', individual: 'I1', station: 'P', time: '2026-07-01T20:00:00Z', flank: 'left' },
  {
    key: 'I1-D2',
    individual: 'I1',
    station: 'D',
    time: '2026-07-02T03:00:00Z',
    flank: 'left',
    quality: 'fair',
  },
  { key: 'I1-D4', individual: 'I1', station: 'D', time: '2026-07-04T02:00:00Z', flank: 'left' },
  { key: 'I1-late', individual: 'I1', station: 'P', time: '2026-07-06T10:00:00Z', flank: 'left' },
  { key: 'I2-P2', individual: 'I2', station: 'P', time: '2026-07-02T22:00:00Z', flank: 'right' },
  { key: 'I2-L3', individual: 'I2', station: 'L', time: '2026-07-03T10:00:00Z', flank: 'right' },
  {
    key: 'I2-proposed',
    individual: 'I2',
    station: 'P',
    time: '2026-07-01T12:00:00Z',
    flank: 'right',
    state: 'proposed',
  },
  { key: 'I3-P3', individual: 'I3', station: 'P', time: '2026-07-03T14:00:00Z', flank: 'both' },
  {
    key: 'I3-P3-left',
    individual: 'I3',
    station: 'P',
    time: '2026-07-03T14:00:00Z',
    flank: 'left',
    sameEventAs: 'I3-P3',
  },
  { key: 'I3-L4', individual: 'I3', station: 'L', time: '2026-07-04T05:00:00Z', flank: 'left' },
  { key: 'I4-D1', individual: 'I4', station: 'D', time: '2026-07-01T09:00:00Z', flank: 'left' },
  { key: 'I4-P4', individual: 'I4', station: 'P', time: '2026-07-04T08:00:00Z', flank: 'right' },
  {
    key: 'I5-L3',
    individual: 'I5',
    station: 'L',
    time: '2026-07-03T20:00:00Z',
    flank: 'left',
    quality: 'poor',
  },
  { key: 'I6-P2', individual: 'I6', station: 'P', time: '2026-07-02T15:00:00Z', flank: 'front' },
];

async function addStation(db: Db, projectId: string, code: string, lat: number, lon: number) {
  const id = newId();
  await db
    .insertInto('stations')
    .values({ id, project_id: projectId, code, name: code, lat, lon, notes: '', created_at: NOW })
    .execute();
  return id;
}

async function addDeployment(
  db: Db,
  projectId: string,
  stationId: string,
  label: string,
  start: string,
  end: string,
  lastWorking: string | null = null,
) {
  const id = newId();
  await db
    .insertInto('deployments')
    .values({
      id,
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
      created_at: NOW,
    })
    .execute();
  const upload = newId();
  await db
    .insertInto('card_uploads')
    .values({
      id: upload,
      project_id: projectId,
      deployment_id: id,
      uploader_id: null,
      accepted: 0,
      duplicate: 0,
      rejected: 0,
      created_at: NOW,
    })
    .execute();
  return { id, upload };
}

/** Writes the synthetic survey above into a project (stations about 1 km apart). */
export async function seedSyntheticSurvey(db: Db, projectId: string): Promise<SyntheticSurvey> {
  const stations = {
    P: await addStation(db, projectId, 'P', -1.2, 36.6),
    D: await addStation(db, projectId, 'D', -1.2, 36.609),
    L: await addStation(db, projectId, 'L', -1.191, 36.6),
    Z: await addStation(db, projectId, 'Z', -1.191, 36.609),
  };
  const camera = {
    P: await addDeployment(
      db,
      projectId,
      stations.P,
      'A',
      '2026-07-01T06:00:00Z',
      '2026-07-10T00:00:00Z',
      '2026-07-02T18:00:00Z',
    ),
    D: await addDeployment(
      db,
      projectId,
      stations.D,
      'A',
      '2026-07-01T00:00:00Z',
      '2026-07-10T00:00:00Z',
      '2026-07-03T06:00:00Z',
    ),
    L: await addDeployment(
      db,
      projectId,
      stations.L,
      'A',
      '2026-07-03T00:00:00Z',
      '2026-07-20T00:00:00Z',
    ),
    Z: await addDeployment(
      db,
      projectId,
      stations.Z,
      'A',
      '2026-06-01T00:00:00Z',
      '2026-06-20T00:00:00Z',
    ),
  };
  await addDeployment(
    db,
    projectId,
    stations.P,
    'B',
    '2026-07-02T12:00:00Z',
    '2026-07-04T12:00:00Z',
  );
  const individuals = {} as SyntheticSurvey['individuals'];
  for (const [n, key] of (['I1', 'I2', 'I3', 'I4', 'I5', 'I6'] as const).entries()) {
    const id = newId();
    const code = `SYN-${n + 1}`;
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
        created_at: NOW,
        updated_at: NOW,
      })
      .execute();
    individuals[key] = { id, code };
  }
  const sightings: Record<string, string> = {};
  const events: Record<string, string> = {};
  for (const spec of SIGHTINGS) {
    const cam = camera[spec.station];
    let eventId = spec.sameEventAs ? events[spec.sameEventAs] : undefined;
    if (!eventId) {
      eventId = newId();
      await db
        .insertInto('events')
        .values({
          id: eventId,
          project_id: projectId,
          station_id: stations[spec.station],
          start: spec.time,
          end: spec.time,
          photo_count: 1,
          created_at: NOW,
          label: 'animal',
          species: 'Panthera pardus',
          animal_count: 1,
          sorted_by: null,
          sorted_at: NOW,
          label_version: 1,
          lease_holder: null,
          lease_until: null,
        })
        .execute();
    }
    events[spec.key] = eventId;
    const photo = newId();
    await db
      .insertInto('photos')
      .values({
        id: photo,
        project_id: projectId,
        deployment_id: cam.id,
        upload_id: cam.upload,
        sha256: photo.padEnd(64, '0'),
        original_name: `${spec.key}.jpg`,
        stored_path: `synthetic/${spec.key}.jpg`,
        bytes: 1,
        width: 1,
        height: 1,
        taken_at_exif: null,
        taken_at: spec.time,
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
        created_at: NOW,
      })
      .execute();
    const id = newId();
    await db
      .insertInto('sightings')
      .values({
        id,
        project_id: projectId,
        event_id: eventId,
        flank: spec.flank,
        quality: spec.quality ?? 'good',
        best_photo_id: photo,
        crop: null,
        sex: null,
        age_class: null,
        state: spec.state ?? 'confirmed',
        individual_id: individuals[spec.individual].id,
        created_by: null,
        created_at: NOW,
        updated_at: NOW,
        lease_holder: null,
        lease_until: null,
      })
      .execute();
    sightings[spec.key] = id;
  }
  return { stations, individuals, sightings };
}

/** The session every synthetic test uses (parameters as the API takes them). */
export const SYNTHETIC_SESSION = {
  start: '2026-07-01T00:00:00Z',
  end: '2026-07-05T00:00:00Z',
  occasionHours: 24,
};

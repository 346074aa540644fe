import {
  SENSITIVE_FEATURES,
  type CreateDeploymentBody,
  type DeploymentView,
  type FeatureType,
  type UpdateDeploymentBody,
} from '../../shared/stations';
import type { Db } from '../db/database';
import type { DeploymentsTable, PhotosTable, StationsTable } from '../db/schema/ingest.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { correctedFromWall, wallToUtcMs } from './camera-time';
import { cameraDays, roundDays } from './effort';
import { eligible, regroupStation } from './events.service';
import { newId, nowIso } from './ids';
import { photoFlags } from './photo-flags';

interface ClockFixRecord {
  photoId: string;
  exifTime: string;
  trueTime: string;
  by: string;
  at: string;
}

/** The API view of a deployment. */
export function toDeploymentView(
  row: DeploymentsTable,
  stationCode: string,
  photos: number,
): DeploymentView {
  const feature = row.feature_type as FeatureType | null;
  return {
    id: row.id,
    stationId: row.station_id,
    stationCode,
    cameraLabel: row.camera_label,
    cameraSerial: row.camera_serial,
    start: row.start,
    end: row.end,
    timezone: row.timezone,
    clockOffsetSeconds: row.clock_offset_seconds,
    lastWorking: row.last_working,
    featureType: feature,
    featureSensitive: feature !== null && SENSITIVE_FEATURES.includes(feature),
    baitUse: row.bait_use === 1,
    notes: row.notes,
    cameraDays: roundDays(cameraDays(row)),
    photos,
    clockFix: row.clock_fix ? (JSON.parse(row.clock_fix) as ClockFixRecord) : null,
  };
}

/** Deployments of a project (optionally one station), newest first. */
export async function listDeployments(
  db: Db,
  projectId: string,
  stationId?: string,
): Promise<DeploymentView[]> {
  let q = db
    .selectFrom('deployments')
    .innerJoin('stations', 'stations.id', 'deployments.station_id')
    .selectAll('deployments')
    .select(['stations.code as stationCode'])
    .select((eb) =>
      eb
        .selectFrom('photos')
        .select(eb.fn.countAll<number>().as('n'))
        .whereRef('photos.deployment_id', '=', 'deployments.id')
        .as('photoCount'),
    )
    .where('deployments.project_id', '=', projectId);
  if (stationId) q = q.where('deployments.station_id', '=', stationId);
  const rows = await q.orderBy('deployments.start', 'desc').orderBy('stations.code').execute();
  return rows.map((r) => toDeploymentView(r, r.stationCode, Number(r.photoCount ?? 0)));
}

/** One deployment with its station, or 404. */
export async function getDeployment(db: Db, projectId: string, deploymentId: string) {
  const deployment = await db
    .selectFrom('deployments')
    .selectAll()
    .where('id', '=', deploymentId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!deployment) throw new ApiError('not_found', 'This deployment was not found.');
  const station = await db
    .selectFrom('stations')
    .selectAll()
    .where('id', '=', deployment.station_id)
    .executeTakeFirstOrThrow();
  return { deployment, station };
}

/** Records a deployment (one camera at one station for one period). */
export async function createDeployment(
  db: Db,
  projectId: string,
  body: CreateDeploymentBody,
  actorId: string,
): Promise<DeploymentsTable> {
  const station = await db
    .selectFrom('stations')
    .select('id')
    .where('id', '=', body.stationId)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!station)
    throw new ApiError('validation_failed', 'stationId: there is no such station in this project.');
  const row: DeploymentsTable = {
    id: newId(),
    project_id: projectId,
    station_id: body.stationId,
    camera_label: body.cameraLabel,
    camera_serial: body.cameraSerial,
    start: body.start,
    end: body.end,
    timezone: body.timezone,
    clock_offset_seconds: body.clockOffsetSeconds,
    last_working: body.lastWorking,
    feature_type: body.featureType,
    bait_use: body.baitUse ? 1 : 0,
    notes: body.notes,
    clock_fix: null,
    created_by: actorId,
    created_at: nowIso(),
  };
  await db.transaction().execute(async (trx) => {
    await trx.insertInto('deployments').values(row).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId,
      action: 'create',
      entity: 'deployment',
      entityId: row.id,
      after: body,
    });
  });
  return row;
}

type StoredPhoto = Pick<PhotosTable, 'taken_at_exif' | 'flags' | 'gps_lat' | 'gps_lon' | 'serial'>;

/** A photo's corrected time and flags (JSON) under a deployment's times, zone and clock offset. */
function retimed(
  p: StoredPhoto,
  project: ProjectsTable,
  deployment: DeploymentsTable,
  station: StationsTable,
): { takenAt: string | null; flags: string } {
  const takenAt = correctedFromWall(
    p.taken_at_exif,
    deployment.timezone,
    deployment.clock_offset_seconds,
  );
  const flags = photoFlags(
    {
      takenAtExif: p.taken_at_exif,
      takenAt,
      exifReadable: !p.flags.includes('exif_unreadable'),
      lat: p.gps_lat,
      lon: p.gps_lon,
      serial: p.serial,
    },
    { deployment, station, gpsToleranceM: project.gps_tolerance_m },
  );
  return { takenAt, flags: JSON.stringify(flags) };
}

const STORED_PHOTO = ['taken_at_exif', 'flags', 'gps_lat', 'gps_lon', 'serial'] as const;

/**
 * Refuses a change of a deployment's times, zone or clock that would take the best photo of a
 * recorded sighting out of every event (before the start, after the end, or otherwise kept out):
 * its event would go, and the sighting and the calls on it with it. Checked before anything is
 * written, so a refused change leaves everything as it was.
 */
async function assertSightingsKeepTheirPhotos(
  db: Db,
  project: ProjectsTable,
  after: DeploymentsTable,
  station: StationsTable,
): Promise<void> {
  const photos = await db
    .selectFrom('photos')
    .select(STORED_PHOTO.map((c) => `photos.${c}` as const))
    .where('photos.deployment_id', '=', after.id)
    .where((eb) =>
      eb.exists(
        eb
          .selectFrom('sightings')
          .select('sightings.id')
          .whereRef('sightings.best_photo_id', '=', 'photos.id'),
      ),
    )
    .execute();
  const stranded = photos.filter((p) => {
    const { takenAt, flags } = retimed(p, project, after, station);
    return takenAt === null || !eligible(flags);
  }).length;
  if (stranded > 0)
    throw new ApiError(
      'conflict',
      `This change would put ${stranded} photo${stranded === 1 ? '' : 's'} with recorded ` +
        `sightings outside the deployment (before its start, after its end or otherwise kept out ` +
        `of events), which would remove those sightings and their calls. Nothing was changed: ` +
        `correct the deployment's start and end first.`,
    );
}

/** Recomputes corrected times and flags of a deployment's photos, then regroups its station's events. */
export async function refreshDeploymentPhotos(
  db: Db,
  project: ProjectsTable,
  deployment: DeploymentsTable,
  station: StationsTable,
): Promise<void> {
  const photos = await db
    .selectFrom('photos')
    .select(['id', 'taken_at', ...STORED_PHOTO])
    .where('deployment_id', '=', deployment.id)
    .execute();
  await db.transaction().execute(async (trx) => {
    for (const p of photos) {
      const { takenAt, flags } = retimed(p, project, deployment, station);
      if (takenAt !== p.taken_at || flags !== p.flags) {
        await trx
          .updateTable('photos')
          .set({ taken_at: takenAt, flags })
          .where('id', '=', p.id)
          .execute();
      }
    }
  });
  await regroupStation(db, project.id, station.id, project.independence_minutes);
}

/** Changes a deployment; times, zone or offset changes re-time its photos and regroup events. */
export async function updateDeployment(
  db: Db,
  project: ProjectsTable,
  deploymentId: string,
  patch: UpdateDeploymentBody,
  actorId: string,
): Promise<DeploymentsTable> {
  const { deployment: before } = await getDeployment(db, project.id, deploymentId);
  const merged = {
    start: patch.start ?? before.start,
    end: patch.end ?? before.end,
    lastWorking: patch.lastWorking === undefined ? before.last_working : patch.lastWorking,
  };
  if (merged.end <= merged.start)
    throw new ApiError('validation_failed', 'end: The end must be after the start.');
  if (
    merged.lastWorking &&
    (merged.lastWorking < merged.start || merged.lastWorking > merged.end)
  ) {
    throw new ApiError(
      'validation_failed',
      'lastWorking: The last working time must lie between the start and the end.',
    );
  }
  if (patch.stationId && patch.stationId !== before.station_id) {
    throw new ApiError(
      'conflict',
      'A deployment cannot move to another station; record a new deployment instead.',
    );
  }
  const set: Partial<DeploymentsTable> = {};
  if (patch.cameraLabel !== undefined) set.camera_label = patch.cameraLabel;
  if (patch.cameraSerial !== undefined) set.camera_serial = patch.cameraSerial;
  if (patch.start !== undefined) set.start = patch.start;
  if (patch.end !== undefined) set.end = patch.end;
  if (patch.timezone !== undefined) set.timezone = patch.timezone;
  if (patch.clockOffsetSeconds !== undefined) set.clock_offset_seconds = patch.clockOffsetSeconds;
  if (patch.lastWorking !== undefined) set.last_working = patch.lastWorking;
  if (patch.featureType !== undefined) set.feature_type = patch.featureType;
  if (patch.baitUse !== undefined) set.bait_use = patch.baitUse ? 1 : 0;
  if (patch.notes !== undefined) set.notes = patch.notes;
  const retime = [
    'start',
    'end',
    'timezone',
    'clockOffsetSeconds',
    'lastWorking',
    'cameraSerial',
  ].some((k) => k in patch);
  if (retime) {
    const { station } = await getDeployment(db, project.id, deploymentId);
    await assertSightingsKeepTheirPhotos(db, project, { ...before, ...set }, station);
  }
  await db.transaction().execute(async (trx) => {
    await trx.updateTable('deployments').set(set).where('id', '=', deploymentId).execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'update',
      entity: 'deployment',
      entityId: deploymentId,
      before,
      after: patch,
    });
  });
  const { deployment, station } = await getDeployment(db, project.id, deploymentId);
  if (retime) await refreshDeploymentPhotos(db, project, deployment, station);
  return deployment;
}

/**
 * Clock fix: the person reads the true time off a reference photo (setup sheet or a clock). The
 * offset true − EXIF applies to every photo of the deployment; EXIF times stay as they were.
 */
export async function applyClockFix(
  db: Db,
  project: ProjectsTable,
  deploymentId: string,
  input: { photoId: string; trueTime: string },
  actor: { id: string; name: string },
): Promise<DeploymentsTable> {
  const { deployment } = await getDeployment(db, project.id, deploymentId);
  const photo = await db
    .selectFrom('photos')
    .select(['id', 'taken_at_exif'])
    .where('id', '=', input.photoId)
    .where('deployment_id', '=', deploymentId)
    .executeTakeFirst();
  if (!photo)
    throw new ApiError(
      'validation_failed',
      'photoId: the reference photo must be a photo of this deployment.',
    );
  if (!photo.taken_at_exif)
    throw new ApiError(
      'validation_failed',
      'photoId: this photo has no camera time to correct from.',
    );
  const exifUtc = wallToUtcMs(photo.taken_at_exif, deployment.timezone);
  const trueUtc = wallToUtcMs(input.trueTime, deployment.timezone);
  if (exifUtc === null || trueUtc === null)
    throw new ApiError('validation_failed', 'trueTime: this is not a valid date and time.');
  const offset = Math.round((trueUtc - exifUtc) / 1000);
  const record: ClockFixRecord = {
    photoId: photo.id,
    exifTime: photo.taken_at_exif,
    trueTime: input.trueTime,
    by: actor.name,
    at: nowIso(),
  };
  return updateDeploymentWithFix(db, project, deployment, offset, record, actor.id);
}

async function updateDeploymentWithFix(
  db: Db,
  project: ProjectsTable,
  deployment: DeploymentsTable,
  offset: number,
  record: ClockFixRecord,
  actorId: string,
): Promise<DeploymentsTable> {
  const { station } = await getDeployment(db, project.id, deployment.id);
  await assertSightingsKeepTheirPhotos(
    db,
    project,
    { ...deployment, clock_offset_seconds: offset },
    station,
  );
  await db.transaction().execute(async (trx) => {
    await trx
      .updateTable('deployments')
      .set({ clock_offset_seconds: offset, clock_fix: JSON.stringify(record) })
      .where('id', '=', deployment.id)
      .execute();
    await recordAudit(trx, {
      userId: actorId,
      projectId: project.id,
      action: 'clock-fix',
      entity: 'deployment',
      entityId: deployment.id,
      before: { clockOffsetSeconds: deployment.clock_offset_seconds },
      after: { clockOffsetSeconds: offset, ...record },
    });
  });
  const fresh = await getDeployment(db, project.id, deployment.id);
  await refreshDeploymentPhotos(db, project, fresh.deployment, fresh.station);
  return fresh.deployment;
}

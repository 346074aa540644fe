import { sql } from 'kysely';
import type { Candidate, PatternStatus, SightingToIdentify } from '../../shared/identify';
import type { AgeClass, Crop, Flank, Quality, Sex, SightingState } from '../../shared/sort';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { candidatePool } from './catalogue-cache';
import { rankCandidates, type RankingContext } from './candidates.service';
import { localPlane } from './geo';
import { PatternError, type PatternPool } from '../pattern/pool';
import { patternSignal, patternStatus, type PatternSignal } from './pattern.service';

/** How long a reviewer holds a sighting on the Identify screen. */
export const IDENTIFY_LEASE_MS = 5 * 60 * 1000;

/**
 * Leases the next sighting this reviewer may call: second reviews first (to finish them), then
 * open ones, oldest first. Never one the reviewer already called, never one leased to someone else.
 */
export async function leaseNextSighting(
  db: Db,
  projectId: string,
  userId: string,
  skipped: string[],
): Promise<string | null> {
  const now = new Date();
  const until = new Date(now.getTime() + IDENTIFY_LEASE_MS).toISOString();
  const skip = skipped.length ? sql`and s.id not in (${sql.join(skipped)})` : sql``;
  const takeable = sql`s.project_id = ${projectId}
        and not exists (select 1 from calls c where c.sighting_id = s.id and c.reviewer_id = ${userId})
        ${skip}`;
  const free = sql`(s.lease_holder is null or s.lease_until < ${now.toISOString()} or s.lease_holder = ${userId})`;
  // The reviewer's own lease first (a reload gets the same sighting), then second reviews, then
  // first calls, each oldest event first: every step walks an index and stops at its first row.
  const result = await sql<{ id: string }>`
    update sightings set lease_holder = ${userId}, lease_until = ${until}
    where id = coalesce(
      (select s.id from sightings s
        where s.lease_holder = ${userId} and s.state in ('open', 'proposed') and ${takeable}
        order by s.queue_start, s.id limit 1),
      (select s.id from sightings s
        where s.state = 'proposed' and ${free} and ${takeable}
        order by s.queue_start, s.id limit 1),
      (select s.id from sightings s
        where s.state = 'open' and ${free} and ${takeable}
        order by s.queue_start, s.id limit 1))
    returning id`.execute(db);
  return result.rows[0]?.id ?? null;
}

/** Gives a sighting back to the queue. */
export async function releaseSighting(db: Db, sightingId: string, userId: string): Promise<void> {
  await db
    .updateTable('sightings')
    .set({ lease_holder: null, lease_until: null })
    .where('id', '=', sightingId)
    .where('lease_holder', '=', userId)
    .execute();
}

/** What the Identify screen shows of a sighting; never the first call or who made it. */
export async function sightingToIdentify(
  db: Db,
  projectId: string,
  sightingId: string,
): Promise<SightingToIdentify> {
  const s = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .selectAll('sightings')
    .select(['events.start', 'events.station_id', 'stations.code as stationCode'])
    .where('sightings.id', '=', sightingId)
    .where('sightings.project_id', '=', projectId)
    .executeTakeFirst();
  if (!s) throw new ApiError('not_found', 'This sighting was not found.');
  const photos = await db
    .selectFrom('photos')
    .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
    .select(['photos.id', 'photos.taken_at', 'deployments.camera_label'])
    .where('photos.event_id', '=', s.event_id)
    .orderBy('photos.taken_at')
    .execute();
  const calls = await db
    .selectFrom('calls')
    .select('id')
    .where('sighting_id', '=', sightingId)
    .execute();
  const view = (p: { id: string; camera_label: string }) => ({
    id: p.id,
    previewUrl: `/api/photos/${p.id}/preview`,
    thumbUrl: `/api/photos/${p.id}/thumb`,
    cameraLabel: p.camera_label,
  });
  const best = photos.find((p) => p.id === s.best_photo_id) ?? photos[0];
  if (!best)
    throw new ApiError('conflict', 'This sighting has no photos left (its event was regrouped).');
  return {
    id: s.id,
    eventId: s.event_id,
    flank: s.flank as Flank,
    quality: s.quality as Quality,
    sex: s.sex as Sex | null,
    ageClass: s.age_class as AgeClass | null,
    crop: s.crop ? (JSON.parse(s.crop) as Crop) : null,
    bestPhoto: view(best),
    photos: photos.map((p) => ({ ...view(p), takenAt: p.taken_at })),
    stationId: s.station_id,
    stationCode: s.stationCode,
    start: s.start,
    state: s.state as SightingState,
    round: calls.length >= 1 ? 2 : 1,
    leaseUntil: s.lease_until ?? new Date().toISOString(),
  };
}

/** Ranked candidates for a sighting, with the reasons behind each rank. */
export async function candidatesFor(
  db: Db,
  project: ProjectsTable,
  sighting: Pick<SightingToIdentify, 'stationId' | 'start' | 'flank' | 'sex'>,
  query?: string,
  pattern?: RankingContext['pattern'],
) {
  const pool = await candidatePool(db, project.id);
  const stations = await db
    .selectFrom('stations')
    .select(['id', 'lat', 'lon', 'code'])
    .where('project_id', '=', project.id)
    .execute();
  return rankCandidates(pool, {
    stationId: sighting.stationId,
    time: Date.parse(sighting.start),
    flank: sighting.flank,
    sex: sighting.sex,
    stations: localPlane(stations),
    query,
    pattern,
  });
}

/**
 * Ranked candidates with the coat pattern as one more signal when the sighting's features are
 * ready, and what the reviewer should be told about it. A failure of the pattern engine never
 * stops the ranking: it is ranked without the pattern and says so.
 */
export async function candidatesWithPattern(
  db: Db,
  pattern: PatternPool,
  project: ProjectsTable,
  sighting: Pick<
    SightingToIdentify,
    'id' | 'stationId' | 'start' | 'flank' | 'sex' | 'crop' | 'bestPhoto'
  >,
  query?: string,
): Promise<{ candidates: Candidate[]; pattern: PatternStatus }> {
  let signal: PatternSignal | null = null;
  let error: string | undefined;
  try {
    signal = await patternSignal(db, pattern, project.id, {
      id: sighting.id,
      bestPhotoId: sighting.bestPhoto.id,
      crop: sighting.crop,
      flank: sighting.flank,
    });
  } catch (err) {
    if (!(err instanceof PatternError)) throw err;
    error = err.message;
  }
  const scores = signal?.status === 'ready' && signal.references > 0 ? signal.scores : undefined;
  return {
    candidates: await candidatesFor(db, project, sighting, query, scores),
    pattern: patternStatus(signal, error),
  };
}

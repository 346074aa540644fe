import type { ProjectRole } from '../../shared/roles';
import type { Db } from '../db/database';
import type { IndividualsTable } from '../db/schema/identify.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { generalise } from './geo';
import { catalogueEntries } from './individuals.service';
import { precisionFor } from './stations.service';

/**
 * An individual's page: its record, reference photos per flank, every confirmed sighting in time
 * order, the stations where it was detected (coordinates generalised for roles that must not see
 * exact ones), and the history of changes to it.
 */
export async function individualDetail(
  db: Db,
  project: ProjectsTable,
  individual: IndividualsTable,
  role: ProjectRole | null,
  requestedAs: string,
) {
  const entry = (await catalogueEntries(db, project, 'all')).find((e) => e.id === individual.id);
  const sightings = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .select([
      'sightings.id',
      'sightings.flank',
      'sightings.quality',
      'sightings.best_photo_id',
      'events.id as eventId',
      'events.start',
      'stations.id as stationId',
      'stations.code as stationCode',
      'stations.lat',
      'stations.lon',
    ])
    .where('sightings.individual_id', '=', individual.id)
    .where('sightings.state', '=', 'confirmed')
    .orderBy('events.start')
    .execute();
  const precision = precisionFor(project, role);
  const stations = new Map<
    string,
    {
      stationId: string;
      code: string;
      lat: number | null;
      lon: number | null;
      detections: number;
      withheld: boolean;
    }
  >();
  for (const s of sightings) {
    const at = generalise(s.lat, s.lon, precision);
    const current = stations.get(s.stationId) ?? {
      stationId: s.stationId,
      code: s.stationCode,
      lat: at.lat,
      lon: at.lon,
      detections: 0,
      withheld: at.withheld,
    };
    current.detections++;
    stations.set(s.stationId, current);
  }
  const history = await db
    .selectFrom('audit_log')
    .leftJoin('users', 'users.id', 'audit_log.user_id')
    .select([
      'audit_log.action',
      'audit_log.at',
      'audit_log.before',
      'audit_log.after',
      'users.name',
    ])
    .where('audit_log.entity', '=', 'individual')
    .where('audit_log.entity_id', '=', individual.id)
    .orderBy('audit_log.at', 'desc')
    .limit(200)
    .execute();
  return {
    ...entry,
    requestedAs,
    resolvedFromAlias:
      requestedAs.toUpperCase() !== (individual.code ?? '') && requestedAs !== individual.id,
    timeline: sightings.map((s) => ({
      sightingId: s.id,
      eventId: s.eventId,
      start: s.start,
      stationCode: s.stationCode,
      flank: s.flank,
      quality: s.quality,
      thumbUrl: `/api/photos/${s.best_photo_id}/thumb`,
      photoId: s.best_photo_id,
    })),
    stationsDetected: [...stations.values()],
    coordinatePrecision: precision === undefined ? null : precision,
    history: history.map((h) => ({
      action: h.action,
      at: h.at,
      by: h.name ?? 'Maculo',
      before: h.before ? (JSON.parse(h.before) as unknown) : null,
      after: h.after ? (JSON.parse(h.after) as unknown) : null,
    })),
  };
}

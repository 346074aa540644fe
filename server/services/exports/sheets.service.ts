import type { SessionInputs } from '../../../shared/analyses';
import { utcToWall } from '../../../shared/zoned-time';
import type { Db } from '../../db/database';
import { ApiError } from '../../errors/api-error';
import type { ProjectsTable } from '../../db/schema/projects.table';
import { generalise } from '../geo';
import { catalogueEntries } from '../individuals.service';
import { isoWithOffset } from './time-zones';
import type { Sheet } from './spreadsheets';

/** The catalogue as a sheet: one row per active individual (merged codes listed as aliases). */
export async function catalogueSheet(db: Db, project: ProjectsTable): Promise<Sheet> {
  const entries = await catalogueEntries(db, project, 'active');
  return {
    name: 'Catalogue',
    header: [
      'Code',
      'Nickname',
      'Sex',
      'Confirmed sightings',
      'Stations where seen',
      'First seen',
      'Last seen',
      'Last station',
      'Left flank on file',
      'Right flank on file',
      'Former codes',
      'Tags',
      'Notes',
    ],
    rows: entries.map((e) => [
      e.code,
      e.nickname,
      e.sex,
      e.sightings,
      e.stations.join(' '),
      e.firstSeen ? isoWithOffset(e.firstSeen, project.timezone) : null,
      e.lastSeen ? isoWithOffset(e.lastSeen, project.timezone) : null,
      e.lastStation,
      e.coverage.left ? 'yes' : 'no',
      e.coverage.right ? 'yes' : 'no',
      e.aliases.join(' '),
      e.tags.join(', '),
      e.notes,
    ]),
  };
}

/**
 * Every sighting of the target species as a sheet, with the station position as the caller may see
 * it (`precision`: undefined exact, a number generalised to that grid, null withheld).
 */
export async function sightingsSheet(
  db: Db,
  project: ProjectsTable,
  precision: number | null | undefined,
): Promise<Sheet> {
  const rows = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .innerJoin('photos', 'photos.id', 'sightings.best_photo_id')
    .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
    .leftJoin('individuals', 'individuals.id', 'sightings.individual_id')
    .select([
      'sightings.id',
      'sightings.state',
      'sightings.flank',
      'sightings.quality',
      'sightings.sex',
      'sightings.age_class',
      'events.id as eventId',
      'events.start',
      'events.end',
      'stations.code as station',
      'stations.lat',
      'stations.lon',
      'deployments.camera_label as camera',
      'deployments.timezone',
      'individuals.code',
      'photos.original_name as photo',
    ])
    .where('sightings.project_id', '=', project.id)
    .orderBy('events.start')
    .orderBy('sightings.id')
    .execute();
  const calls = await db
    .selectFrom('calls')
    .select(['sighting_id'])
    .select((eb) => eb.fn.countAll<number>().as('n'))
    .where('project_id', '=', project.id)
    .groupBy('sighting_id')
    .execute();
  const callCount = new Map(calls.map((c) => [c.sighting_id, Number(c.n)]));
  const positionNote =
    precision === undefined
      ? 'exact'
      : precision === null
        ? 'withheld'
        : `rounded to ${precision} degrees`;
  return {
    name: 'Sightings',
    header: [
      'Sighting',
      'Event',
      'Event start (local time)',
      'Event end (local time)',
      'Station',
      'Camera',
      'Latitude',
      'Longitude',
      'Position',
      'Individual',
      'Review state',
      'Reviewers who called it',
      'Flank',
      'Photo quality',
      'Sex',
      'Age class',
      'Best photo file',
    ],
    rows: rows.map((r) => {
      const at = generalise(r.lat, r.lon, precision);
      return [
        r.id,
        r.eventId,
        isoWithOffset(r.start, r.timezone),
        isoWithOffset(r.end, r.timezone),
        r.station,
        r.camera,
        at.lat,
        at.lon,
        positionNote,
        r.state === 'confirmed' ? r.code : null,
        r.state,
        callCount.get(r.id) ?? 0,
        r.flank,
        r.quality,
        r.sex,
        r.age_class,
        r.photo,
      ];
    }),
  };
}

/** The frozen inputs of a saved analysis, or a clear error. */
async function frozenInputs(db: Db, project: ProjectsTable, analysisId: string | undefined) {
  if (!analysisId) {
    throw new ApiError(
      'validation_failed',
      'Capture histories and effort grids come from a saved analysis: add ?analysisId=…',
    );
  }
  const row = await db
    .selectFrom('analyses')
    .select(['name', 'inputs'])
    .where('id', '=', analysisId)
    .where('project_id', '=', project.id)
    .executeTakeFirst();
  if (!row) throw new ApiError('not_found', 'There is no such saved analysis in this project.');
  return { name: row.name, inputs: JSON.parse(row.inputs) as SessionInputs };
}

function occasionHeaders(inputs: SessionInputs, timezone: string): string[] {
  return inputs.occasions.map(
    (o, s) => `Occasion ${s + 1} (${utcToWall(o.start, timezone).slice(0, 16).replace('T', ' ')})`,
  );
}

/** Capture histories of a saved analysis: one row per individual, one 0/1 column per occasion. */
export async function historiesSheet(
  db: Db,
  project: ProjectsTable,
  analysisId: string | undefined,
): Promise<Sheet> {
  const { name, inputs } = await frozenInputs(db, project, analysisId);
  return {
    name: `Histories ${name}`,
    header: [
      'Individual',
      'Capture history',
      'Occasions detected',
      ...occasionHeaders(inputs, project.timezone),
    ],
    rows: inputs.individuals.map((individual, i) => {
      const history = inputs.histories[i] ?? '';
      return [
        individual.code,
        history,
        [...history].filter((c) => c === '1').length,
        ...[...history].map(Number),
      ];
    }),
  };
}

/** Effort grid of a saved analysis: one row per station, days with a working camera per occasion. */
export async function effortSheet(
  db: Db,
  project: ProjectsTable,
  analysisId: string | undefined,
): Promise<Sheet> {
  const { name, inputs } = await frozenInputs(db, project, analysisId);
  return {
    name: `Effort ${name}`,
    header: ['Station', 'Days active in total', ...occasionHeaders(inputs, project.timezone)],
    rows: inputs.stations.map((station, k) => {
      const days = inputs.effort[k] ?? [];
      return [station.code, Math.round(days.reduce((a, b) => a + b, 0) * 1000) / 1000, ...days];
    }),
  };
}

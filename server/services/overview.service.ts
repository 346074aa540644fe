import { sql } from 'kysely';
import type { Db } from '../db/database';
import type { ProjectsTable } from '../db/schema/projects.table';
import { relativeAbundanceIndex } from '../estimation';
import { cameraDays, roundDays, stationDays } from './effort';

/** Counts for the project Overview, by station and deployment; photos of people are left out for volunteers. */
export interface ProjectProgress {
  photos: { total: number; ready: number; failed: number; waiting: number };
  events: { total: number; sorted: number; byLabel: Record<string, number> };
  sightings: Record<string, number>;
  byStation: {
    stationId: string;
    stationCode: string;
    photos: number;
    events: number;
    sorted: number;
    sightingsOpen: number;
    sightingsProposed: number;
    sightingsConfirmed: number;
  }[];
  byDeployment: {
    deploymentId: string;
    stationCode: string;
    cameraLabel: string;
    photos: number;
    ready: number;
  }[];
}

/** Photos ingested, events sorted and sightings by state, overall, per station and per deployment. */
export async function projectProgress(
  db: Db,
  project: ProjectsTable,
  hideHuman: boolean,
): Promise<ProjectProgress> {
  const notHuman = hideHuman ? sql`and coalesce(e.label, '') != 'human'` : sql``;
  const photoRows = await sql<{
    station_id: string;
    deployment_id: string;
    status: string;
    n: number;
  }>`
    select d.station_id, p.deployment_id, p.status, count(*) as n
    from photos p join deployments d on d.id = p.deployment_id left join events e on e.id = p.event_id
    where p.project_id = ${project.id} ${notHuman}
    group by d.station_id, p.deployment_id, p.status`.execute(db);
  const eventRows = await sql<{ station_id: string; label: string | null; n: number }>`
    select e.station_id, e.label, count(*) as n from events e
    where e.project_id = ${project.id} ${notHuman}
    group by e.station_id, e.label`.execute(db);
  const sightingRows = await sql<{ station_id: string; state: string; n: number }>`
    select e.station_id, s.state, count(*) as n from sightings s join events e on e.id = s.event_id
    where s.project_id = ${project.id} group by e.station_id, s.state`.execute(db);
  const stations = await db
    .selectFrom('stations')
    .select(['id', 'code'])
    .where('project_id', '=', project.id)
    .orderBy('code')
    .execute();
  const deployments = await db
    .selectFrom('deployments')
    .innerJoin('stations', 'stations.id', 'deployments.station_id')
    .select(['deployments.id', 'stations.code', 'deployments.camera_label'])
    .where('deployments.project_id', '=', project.id)
    .orderBy('stations.code')
    .orderBy('deployments.camera_label')
    .execute();

  const sum = <T extends { n: number }>(rows: T[], keep: (r: T) => boolean) =>
    rows.filter(keep).reduce((a, r) => a + Number(r.n), 0);
  const byLabel: Record<string, number> = {};
  for (const r of eventRows.rows)
    byLabel[r.label ?? 'unclassified'] = (byLabel[r.label ?? 'unclassified'] ?? 0) + Number(r.n);
  const sightings: Record<string, number> = {
    open: 0,
    proposed: 0,
    confirmed: 0,
    disputed: 0,
    unidentifiable: 0,
  };
  for (const r of sightingRows.rows) sightings[r.state] = (sightings[r.state] ?? 0) + Number(r.n);
  const p = photoRows.rows;
  return {
    photos: {
      total: sum(p, () => true),
      ready: sum(p, (r) => r.status === 'ready'),
      failed: sum(p, (r) => r.status === 'failed'),
      waiting: sum(p, (r) => r.status === 'queued' || r.status === 'processing'),
    },
    events: {
      total: sum(eventRows.rows, () => true),
      sorted: sum(eventRows.rows, (r) => r.label !== null),
      byLabel,
    },
    sightings,
    byStation: stations.map((s) => ({
      stationId: s.id,
      stationCode: s.code,
      photos: sum(p, (r) => r.station_id === s.id),
      events: sum(eventRows.rows, (r) => r.station_id === s.id),
      sorted: sum(eventRows.rows, (r) => r.station_id === s.id && r.label !== null),
      sightingsOpen: sum(sightingRows.rows, (r) => r.station_id === s.id && r.state === 'open'),
      sightingsProposed: sum(
        sightingRows.rows,
        (r) => r.station_id === s.id && r.state === 'proposed',
      ),
      sightingsConfirmed: sum(
        sightingRows.rows,
        (r) => r.station_id === s.id && r.state === 'confirmed',
      ),
    })),
    byDeployment: deployments.map((d) => ({
      deploymentId: d.id,
      stationCode: d.code,
      cameraLabel: d.camera_label,
      photos: sum(p, (r) => r.deployment_id === d.id),
      ready: sum(p, (r) => r.deployment_id === d.id && r.status === 'ready'),
    })),
  };
}

/** The relative abundance index of one species. */
export interface SpeciesIndex {
  species: string;
  events: number;
  overall: number | null;
  stations: {
    stationCode: string;
    events: number;
    effortDays: number;
    per100Days: number | null;
  }[];
}

/**
 * Independent events per 100 days of effort, per species, per station and overall. Effort is the
 * days a station had at least one working camera (a paired station counts a day once, because its
 * two cameras' photos form one event). An index of relative activity, not abundance.
 */
export async function relativeAbundance(db: Db, project: ProjectsTable, withStations: boolean) {
  const stations = await db
    .selectFrom('stations')
    .select(['id', 'code'])
    .where('project_id', '=', project.id)
    .orderBy('code')
    .execute();
  const deployments = await db
    .selectFrom('deployments')
    .select(['station_id', 'start', 'end', 'last_working'])
    .where('project_id', '=', project.id)
    .execute();
  const counts = await db
    .selectFrom('events')
    .select(['station_id', 'species', (eb) => eb.fn.countAll<number>().as('n')])
    .where('project_id', '=', project.id)
    .where('label', '=', 'animal')
    .groupBy(['station_id', 'species'])
    .execute();
  const effort = new Map(
    stations.map((s) => [s.id, stationDays(deployments.filter((d) => d.station_id === s.id))]),
  );
  const totalCameraDays = deployments.reduce((a, d) => a + cameraDays(d), 0);
  const species = [...new Set(counts.map((c) => c.species ?? 'unknown'))].sort();
  const indices: SpeciesIndex[] = species.map((name) => {
    const rows = stations.map((s) => ({
      id: s.id,
      stationCode: s.code,
      events: Number(
        counts.find((c) => c.station_id === s.id && (c.species ?? 'unknown') === name)?.n ?? 0,
      ),
      cameraDays: effort.get(s.id) ?? 0,
    }));
    const index = relativeAbundanceIndex(rows);
    return {
      species: name,
      events: rows.reduce((a, r) => a + r.events, 0),
      overall: index.overall,
      stations: withStations
        ? index.stations.map((r, i) => ({
            stationCode: rows[i]!.stationCode,
            events: r.events,
            effortDays: roundDays(r.cameraDays),
            per100Days: r.per100CameraDays,
          }))
        : [],
    };
  });
  return {
    label:
      'Independent events per 100 station-days: an index of relative activity, not an estimate of abundance or density.',
    effortDays: roundDays([...effort.values()].reduce((a, b) => a + b, 0)),
    cameraDays: roundDays(totalCameraDays),
    species: indices,
  };
}

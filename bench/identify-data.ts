/**
 * The Identify benchmark's project: the Sort benchmark's photos, events and stations (every event
 * already sorted), then leopard events with sightings in every state the Identify queue meets — a
 * catalogue of active individuals (display codes, nicknames, marking notes, trait tags, reference
 * photos per flank) built from confirmed sightings with two agreeing calls each (blind double
 * review), sightings proposed by one reviewer and waiting for a second, and open ones. Rows only,
 * written through the app's Kysely module in transactions of 500. Synthetic.
 */
import { sql } from 'kysely';
import type { Db } from '../server/db/database';
import type {
  CallsTable,
  IndividualsTable,
  ReferencePhotosTable,
} from '../server/db/schema/identify.table';
import type { ProjectsTable } from '../server/db/schema/projects.table';
import type { SightingsTable } from '../server/db/schema/sort.table';
import { newId } from '../server/services/ids';
import { referenceFlank } from '../server/services/individuals.service';
import { Rng } from '../seeds/photos/random';
import type { BenchUser } from './fixtures';
import { syntheticDescription } from './identify-text';
import {
  buildSortProject,
  insertChunked,
  type SortProject,
  type SortProjectSize,
} from './sort-data';

/** Size of the project to build. */
export interface IdentifySize extends SortProjectSize {
  individuals: number;
  /** Mean confirmed sightings per individual (each has at least one). */
  detections: number;
  open: number;
  proposed: number;
}

/** What the identify step added. */
export interface IdentifyRows {
  individuals: number;
  confirmed: number;
  proposed: number;
  open: number;
  calls: number;
  references: number;
}

export type IdentifyProject = SortProject & IdentifyRows;

interface LeopardEvent {
  id: string;
  station_id: string;
  start: string;
  photo_id: string;
}

const TARGET = 'Panthera pardus';
const FLANK_HABITS = ['left', 'right', 'both'] as const;

/** Shuffles in place (Fisher–Yates). */
function shuffle<T>(items: T[], rng: Rng): T[] {
  for (let i = items.length - 1; i > 0; i--) {
    const j = rng.int(0, i);
    [items[i], items[j]] = [items[j]!, items[i]!];
  }
  return items;
}

/** Events by station, each list shuffled; `take` hands out an unused one near a station. */
async function eventPools(db: Db, projectId: string, stationIds: string[], rng: Rng) {
  const rows = await sql<LeopardEvent>`
    select e.id, e.station_id, e.start,
      (select p.id from photos p where p.event_id = e.id order by p.taken_at limit 1) as photo_id
    from events e where e.project_id = ${projectId}`.execute(db);
  const byStation = new Map<string, LeopardEvent[]>(stationIds.map((id) => [id, []]));
  for (const e of rows.rows) byStation.get(e.station_id)?.push(e);
  for (const list of byStation.values()) shuffle(list, rng);
  // Stations lie on a grid five wide (see sort-data): neighbours are one step away.
  const neighbours = stationIds.map((_, s) =>
    stationIds.filter(
      (_id, t) =>
        Math.abs((t % 5) - (s % 5)) <= 1 && Math.abs(Math.floor(t / 5) - Math.floor(s / 5)) <= 1,
    ),
  );
  const used: LeopardEvent[] = [];
  return {
    used,
    take(home: number): LeopardEvent {
      const near = rng.chance(0.6) ? stationIds[home]! : rng.pick(neighbours[home]!);
      const event =
        byStation.get(near)!.pop() ?? [...byStation.values()].find((l) => l.length)?.pop();
      if (!event) throw new Error('not enough events for the sightings asked for');
      used.push(event);
      return event;
    },
  };
}

function sightingRow(
  projectId: string,
  event: LeopardEvent,
  flank: string,
  state: 'open' | 'proposed' | 'confirmed',
  individualId: string | null,
  sex: string | null,
  rng: Rng,
): SightingsTable {
  return {
    id: newId(),
    project_id: projectId,
    event_id: event.id,
    flank,
    quality: rng.pick(['good', 'good', 'fair', 'poor']),
    best_photo_id: event.photo_id,
    crop: null,
    sex,
    age_class: rng.pick(['adult', 'adult', 'subadult', 'unknown']),
    state,
    individual_id: individualId,
    created_by: null,
    created_at: event.start,
    updated_at: event.start,
    lease_holder: null,
    lease_until: null,
  };
}

function callRow(
  sighting: SightingsTable,
  reviewer: BenchUser,
  individualId: string | null,
): CallsTable {
  return {
    id: newId(),
    project_id: sighting.project_id,
    sighting_id: sighting.id,
    reviewer_id: reviewer.id,
    verdict: 'match',
    individual_id: individualId,
    note: '',
    created_at: sighting.created_at,
  };
}

/** Adds the catalogue and the sightings to the sorted project. */
async function addIdentifyRows(
  db: Db,
  project: ProjectsTable,
  lead: BenchUser,
  size: IdentifySize,
): Promise<IdentifyRows> {
  const rng = new Rng(2026).fork('bench-identify');
  const reviewers = await db
    .selectFrom('users')
    .select(['id', 'email'])
    .where('email', 'like', `reviewer%@${project.slug}.test`)
    .orderBy('email')
    .execute();
  const stationIds = (
    await db
      .selectFrom('stations')
      .select('id')
      .where('project_id', '=', project.id)
      .orderBy('code')
      .execute()
  ).map((s) => s.id);
  const pools = await eventPools(db, project.id, stationIds, rng);
  const now = new Date().toISOString();
  const individuals: IndividualsTable[] = [];
  const sightings: SightingsTable[] = [];
  const calls: CallsTable[] = [];
  const references: ReferencePhotosTable[] = [];

  for (let i = 0; i < size.individuals; i++) {
    const d = syntheticDescription(rng);
    const id = newId();
    individuals.push({
      id,
      project_id: project.id,
      code: `${project.code_prefix}-${String(i + 1).padStart(3, '0')}`,
      nickname: d.nickname,
      sex: d.sex,
      notes: d.notes,
      tags: JSON.stringify(d.tags),
      status: 'active',
      merged_into: null,
      created_by: lead.id,
      created_at: now,
      updated_at: now,
    });
    const home = rng.int(0, stationIds.length - 1);
    const habit = rng.pick(FLANK_HABITS);
    const perFlank = new Map<string, number>();
    for (let k = rng.int(1, Math.max(1, 2 * size.detections - 1)); k > 0; k--) {
      const flank = habit === 'both' ? rng.pick(['left', 'right', 'both']) : habit;
      const s = sightingRow(
        project.id,
        pools.take(home),
        flank,
        'confirmed',
        id,
        d.sex === 'unknown' ? null : d.sex,
        rng,
      );
      sightings.push(s);
      const first = rng.int(0, reviewers.length - 1);
      const second = (first + rng.int(1, reviewers.length - 1)) % reviewers.length;
      calls.push(callRow(s, reviewers[first]!, id), callRow(s, reviewers[second]!, id));
      const refFlank = referenceFlank(flank);
      const position = perFlank.get(refFlank) ?? 0;
      if (position < 3) {
        references.push({
          individual_id: id,
          flank: refFlank,
          photo_id: s.best_photo_id,
          position,
          chosen_by: reviewers[second]!.id,
          created_at: now,
        });
        perFlank.set(refFlank, position + 1);
      }
    }
  }
  const confirmed = sightings.length;
  const anyFlank = ['left', 'left', 'right', 'right', 'both', 'front', 'unknown'];
  for (let i = 0; i < size.proposed + size.open; i++) {
    const state = i < size.proposed ? 'proposed' : 'open';
    const s = sightingRow(
      project.id,
      pools.take(rng.int(0, stationIds.length - 1)),
      rng.pick(anyFlank),
      state,
      null,
      rng.pick([null, null, 'female', 'male']),
      rng,
    );
    sightings.push(s);
    // The first call of a proposed sighting, by one of the benchmark's reviewers in turn.
    if (state === 'proposed')
      calls.push(callRow(s, reviewers[i % reviewers.length]!, rng.pick(individuals).id));
  }

  await insertChunked(db, 'individuals', individuals);
  await insertChunked(db, 'sightings', sightings);
  await insertChunked(db, 'calls', calls);
  await insertChunked(db, 'reference_photos', references);
  const eventIds = pools.used.map((e) => e.id);
  for (let i = 0; i < eventIds.length; i += 500) {
    await db
      .updateTable('events')
      .set({ label: 'animal', species: TARGET, animal_count: 1 })
      .where('id', 'in', eventIds.slice(i, i + 500))
      .execute();
  }
  await db
    .updateTable('projects')
    .set({ code_next: size.individuals + 1 })
    .where('id', '=', project.id)
    .execute();
  return {
    individuals: individuals.length,
    confirmed,
    proposed: size.proposed,
    open: size.open,
    calls: calls.length,
    references: references.length,
  };
}

/** Builds the whole project in a new database under `dataDir`. */
export function buildIdentifyProject(
  dataDir: string,
  size: IdentifySize,
): Promise<IdentifyProject> {
  return buildSortProject(dataDir, { ...size, sorted: 1 }, 'bench-identify', (db, project, lead) =>
    addIdentifyRows(db, project, lead, size),
  );
}

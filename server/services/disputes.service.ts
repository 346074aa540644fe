import type { Db } from '../db/database';
import type { IdentityChangesTable } from '../db/schema/curate.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordChange } from './identity-changes.service';
import { snapshotRefs, type RefSnapshot } from './identity-snapshots';
import {
  activateIndividual,
  addFirstReference,
  createIndividual,
  referenceFlank,
  resolveIndividual,
} from './individuals.service';

/** What a curator's decision on a dispute changed, exactly. */
export interface ResolvePayload {
  sighting: string;
  before: { state: string; individualId: string | null };
  after: { state: string; individualId: string | null };
  individuals: { id: string; statusBefore: string; statusAfter: string }[];
  refsBefore: RefSnapshot;
}

/** The two calls of a disputed sighting, side by side, for the curator. */
export async function disputedSightings(db: Db, projectId: string) {
  const rows = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .innerJoin('stations', 'stations.id', 'events.station_id')
    .select([
      'sightings.id',
      'sightings.flank',
      'sightings.quality',
      'sightings.best_photo_id',
      'events.start',
      'stations.code as stationCode',
    ])
    .where('sightings.project_id', '=', projectId)
    .where('sightings.state', '=', 'disputed')
    .orderBy('events.start')
    .execute();
  const calls = await db
    .selectFrom('calls')
    .innerJoin('users', 'users.id', 'calls.reviewer_id')
    .leftJoin('individuals', 'individuals.id', 'calls.individual_id')
    .select([
      'calls.id',
      'calls.sighting_id',
      'calls.verdict',
      'calls.individual_id',
      'calls.note',
      'calls.created_at',
      'users.name',
      'individuals.code',
      'individuals.status',
    ])
    .where('calls.sighting_id', 'in', rows.length ? rows.map((r) => r.id) : [''])
    .orderBy('calls.created_at')
    .execute();
  return rows.map((r) => ({
    sightingId: r.id,
    flank: r.flank,
    quality: r.quality,
    start: r.start,
    stationCode: r.stationCode,
    bestPhoto: {
      id: r.best_photo_id,
      previewUrl: `/api/photos/${r.best_photo_id}/preview`,
      thumbUrl: `/api/photos/${r.best_photo_id}/thumb`,
    },
    calls: calls
      .filter((c) => c.sighting_id === r.id)
      .map((c) => ({
        id: c.id,
        reviewer: c.name,
        verdict: c.verdict,
        individualId: c.individual_id,
        code: c.code,
        individualStatus: c.status,
        note: c.note,
        at: c.created_at,
      })),
  }));
}

/**
 * The curator decides a disputed sighting. A "new" decision makes a reviewer's provisional
 * individual real (or a fresh one); provisional individuals the decision leaves out are discarded.
 */
export async function resolveDispute(
  db: Db,
  project: ProjectsTable,
  sightingId: string,
  body: { verdict: 'match' | 'new' | 'unidentifiable'; individualId?: string; reason: string },
  actorId: string,
): Promise<IdentityChangesTable> {
  return db.transaction().execute(async (trx) => {
    const s = await trx
      .selectFrom('sightings')
      .selectAll()
      .where('id', '=', sightingId)
      .where('project_id', '=', project.id)
      .executeTakeFirst();
    if (!s) throw new ApiError('not_found', 'This sighting was not found.');
    if (s.state !== 'disputed')
      throw new ApiError('conflict', `This sighting is ${s.state}, not disputed.`);
    const calls = await trx
      .selectFrom('calls')
      .selectAll()
      .where('sighting_id', '=', sightingId)
      .orderBy('created_at')
      .execute();
    const provisional = await trx
      .selectFrom('individuals')
      .select(['id', 'status'])
      .where(
        'id',
        'in',
        calls
          .map((c) => c.individual_id ?? '')
          .filter(Boolean)
          .concat(['']),
      )
      .where('status', '=', 'provisional')
      .execute();
    let individualId: string | null = null;
    if (body.verdict === 'match') {
      const target = await resolveIndividual(trx, project.id, body.individualId!);
      if (target.status !== 'active')
        throw new ApiError(
          'validation_failed',
          'individualId: this individual is not in the catalogue.',
        );
      individualId = target.id;
    }
    const refsTargets = [...provisional.map((p) => p.id), ...(individualId ? [individualId] : [])];
    const statuses: ResolvePayload['individuals'] = [];
    if (body.verdict === 'new') {
      const chosen = provisional[0];
      if (chosen) {
        await activateIndividual(trx, chosen.id, actorId);
        individualId = chosen.id;
      } else {
        const created = await createIndividual(
          trx,
          project.id,
          { nickname: null, sex: 'unknown', notes: '', tags: [] },
          'active',
          actorId,
        );
        individualId = created.id;
        statuses.push({ id: created.id, statusBefore: 'discarded', statusAfter: 'active' });
      }
    }
    const refsBefore = await snapshotRefs(trx, [
      ...new Set([...refsTargets, ...(individualId ? [individualId] : [])]),
    ]);
    for (const p of provisional) {
      const after = p.id === individualId ? 'active' : 'discarded';
      if (after === 'discarded')
        await trx
          .updateTable('individuals')
          .set({ status: 'discarded' })
          .where('id', '=', p.id)
          .execute();
      statuses.push({ id: p.id, statusBefore: 'provisional', statusAfter: after });
    }
    const state = body.verdict === 'unidentifiable' ? 'unidentifiable' : 'confirmed';
    await trx
      .updateTable('sightings')
      .set({ state, individual_id: individualId })
      .where('id', '=', sightingId)
      .execute();
    if (individualId)
      await addFirstReference(trx, individualId, referenceFlank(s.flank), s.best_photo_id, actorId);
    const payload: ResolvePayload = {
      sighting: sightingId,
      before: { state: s.state, individualId: s.individual_id },
      after: { state, individualId },
      individuals: statuses,
      refsBefore,
    };
    return recordChange(trx, {
      projectId: project.id,
      kind: 'resolve',
      by: actorId,
      reason: body.reason,
      individuals: [
        ...new Set([...statuses.map((x) => x.id), ...(individualId ? [individualId] : [])]),
      ],
      payload,
    });
  });
}

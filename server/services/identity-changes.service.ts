import type { Db } from '../db/database';
import type { IdentityChangesTable } from '../db/schema/curate.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import { recordAudit } from './audit.service';
import { bumpCatalogue } from './catalogue-cache';
import { newId, nowIso } from './ids';
import { moveSightings, snapshotRefs, type RefSnapshot } from './identity-snapshots';
import { createIndividual, type IndividualDescription } from './individuals.service';

/** What a merge moved, exactly (enough to undo it). */
export interface MergePayload {
  from: string;
  into: string;
  fromCode: string | null;
  sightings: string[];
  calls: string[];
  aliasAdded: string | null;
  aliasesMoved: string[];
  refsBefore: RefSnapshot;
}

/** What a split moved, exactly. */
export interface SplitPayload {
  from: string;
  into: string;
  created: boolean;
  sightings: string[];
  calls: string[];
  refsBefore: RefSnapshot;
}

/** Records an identity change and its audit line; returns the change row. */
export async function recordChange(
  db: Db,
  input: {
    projectId: string;
    kind: string;
    by: string;
    reason: string;
    individuals: string[];
    payload: unknown;
    undoes?: string;
  },
): Promise<IdentityChangesTable> {
  const row: IdentityChangesTable = {
    id: newId(),
    project_id: input.projectId,
    kind: input.kind,
    by: input.by,
    at: new Date().toISOString(),
    reason: input.reason,
    individuals: JSON.stringify(input.individuals),
    payload: JSON.stringify(input.payload),
    undoes: input.undoes ?? null,
    undone_by: null,
  };
  await db.insertInto('identity_changes').values(row).execute();
  for (const individual of input.individuals) {
    await recordAudit(db, {
      userId: input.by,
      projectId: input.projectId,
      action: input.kind,
      entity: 'individual',
      entityId: individual,
      after: { change: row.id, reason: input.reason },
    });
  }
  bumpCatalogue(input.projectId);
  return row;
}

async function activeIndividual(db: Db, projectId: string, id: string, what: string) {
  const row = await db
    .selectFrom('individuals')
    .selectAll()
    .where('id', '=', id)
    .where('project_id', '=', projectId)
    .executeTakeFirst();
  if (!row)
    throw new ApiError('not_found', `${what}: there is no such individual in this project.`);
  if (row.status !== 'active')
    throw new ApiError(
      'conflict',
      `${what} (${row.code ?? row.id}) is ${row.status}, not an active individual.`,
    );
  return row;
}

/**
 * Merges individual A into B: every sighting and call moves to B, A's code (and A's own aliases)
 * lead to B, reference photos are combined (or chosen per flank), and A is kept as `merged`.
 */
export async function mergeIndividuals(
  db: Db,
  project: ProjectsTable,
  fromId: string,
  body: {
    into: string;
    reason: string;
    references?: Partial<Record<'left' | 'right' | 'other', string[]>>;
  },
  actorId: string,
): Promise<IdentityChangesTable> {
  if (fromId === body.into)
    throw new ApiError('validation_failed', 'into: an individual cannot be merged into itself.');
  return db.transaction().execute(async (trx) => {
    const a = await activeIndividual(trx, project.id, fromId, 'The individual to merge');
    const b = await activeIndividual(trx, project.id, body.into, 'into');
    const refsBefore = await snapshotRefs(trx, [a.id, b.id]);
    const aSightings = await trx
      .selectFrom('sightings')
      .select('id')
      .where('individual_id', '=', a.id)
      .execute();
    const moved = await moveSightings(
      trx,
      aSightings.map((s) => s.id),
      a.id,
      b.id,
    );
    const extraCalls = await trx
      .updateTable('calls')
      .set({ individual_id: b.id })
      .where('individual_id', '=', a.id)
      .returning('id')
      .execute();
    moved.calls.push(...extraCalls.map((c) => c.id));
    const aliasesMoved = (
      await trx
        .updateTable('aliases')
        .set({ individual_id: b.id })
        .where('individual_id', '=', a.id)
        .returning('code')
        .execute()
    ).map((r) => r.code);
    let aliasAdded: string | null = null;
    if (a.code) {
      await trx
        .insertInto('aliases')
        .values({
          project_id: project.id,
          code: a.code,
          individual_id: b.id,
          change_id: null,
          created_at: nowIso(),
        })
        .execute();
      aliasAdded = a.code;
    }
    await trx
      .updateTable('individuals')
      .set({ status: 'merged', merged_into: b.id, updated_at: nowIso() })
      .where('id', '=', a.id)
      .execute();
    for (const flank of ['left', 'right', 'other'] as const) {
      const chosen = body.references?.[flank];
      const pool = [...(refsBefore[b.id] ?? []), ...(refsBefore[a.id] ?? [])].filter(
        (r) => r.flank === flank,
      );
      const photos = chosen ?? [...new Set(pool.map((r) => r.photo_id))];
      const allowed = new Set(pool.map((r) => r.photo_id));
      if (chosen && chosen.some((p) => !allowed.has(p))) {
        throw new ApiError(
          'validation_failed',
          `references.${flank}: choose among the two individuals' own ${flank} reference photos.`,
        );
      }
      await trx
        .deleteFrom('reference_photos')
        .where('individual_id', '=', b.id)
        .where('flank', '=', flank)
        .execute();
      for (const [position, photoId] of photos.entries()) {
        await trx
          .insertInto('reference_photos')
          .values({
            individual_id: b.id,
            flank,
            photo_id: photoId,
            position,
            chosen_by: actorId,
            created_at: nowIso(),
          })
          .execute();
      }
    }
    const payload: MergePayload = {
      from: a.id,
      into: b.id,
      fromCode: a.code,
      ...moved,
      aliasAdded,
      aliasesMoved,
      refsBefore,
    };
    const change = await recordChange(trx, {
      projectId: project.id,
      kind: 'merge',
      by: actorId,
      reason: body.reason,
      individuals: [a.id, b.id],
      payload,
    });
    if (aliasAdded)
      await trx
        .updateTable('aliases')
        .set({ change_id: change.id })
        .where('project_id', '=', project.id)
        .where('code', '=', aliasAdded)
        .execute();
    return change;
  });
}

/** Moves chosen confirmed sightings of an individual to a new individual (or an existing one). */
export async function splitIndividual(
  db: Db,
  project: ProjectsTable,
  fromId: string,
  body: {
    sightingIds: string[];
    into?: string;
    reason: string;
    individual?: IndividualDescription;
  },
  actorId: string,
): Promise<IdentityChangesTable> {
  return db.transaction().execute(async (trx) => {
    const a = await activeIndividual(trx, project.id, fromId, 'The individual to split');
    const own = await trx
      .selectFrom('sightings')
      .select(['id', 'event_id'])
      .where('individual_id', '=', a.id)
      .where('id', 'in', body.sightingIds)
      .execute();
    const foreign = body.sightingIds.filter((id) => !own.some((o) => o.id === id));
    if (foreign.length)
      throw new ApiError(
        'validation_failed',
        `sightingIds: ${foreign.length} of these sightings are not ${a.code}'s.`,
        { sightingIds: foreign },
      );
    const total = await trx
      .selectFrom('sightings')
      .select((eb) => eb.fn.countAll<number>().as('n'))
      .where('individual_id', '=', a.id)
      .executeTakeFirstOrThrow();
    if (Number(total.n) === own.length)
      throw new ApiError(
        'conflict',
        'A split must leave at least one sighting with the original individual; to move them all, merge instead.',
      );
    let target;
    let created = false;
    if (body.into) {
      if (body.into === a.id)
        throw new ApiError('validation_failed', 'into: choose another individual.');
      target = await activeIndividual(trx, project.id, body.into, 'into');
    } else {
      target = await createIndividual(
        trx,
        project.id,
        body.individual ?? { nickname: null, sex: 'unknown', notes: '', tags: [] },
        'active',
        actorId,
      );
      created = true;
    }
    const refsBefore = await snapshotRefs(trx, [a.id, target.id]);
    const moved = await moveSightings(
      trx,
      own.map((o) => o.id),
      a.id,
      target.id,
    );
    // Reference photos taken from the moved sightings' events go with them.
    const photos = await trx
      .selectFrom('photos')
      .select('id')
      .where(
        'event_id',
        'in',
        own.map((o) => o.event_id),
      )
      .execute();
    const photoIds = new Set(photos.map((p) => p.id));
    for (const ref of refsBefore[a.id] ?? []) {
      if (!photoIds.has(ref.photo_id)) continue;
      await trx
        .deleteFrom('reference_photos')
        .where('individual_id', '=', a.id)
        .where('flank', '=', ref.flank)
        .where('photo_id', '=', ref.photo_id)
        .execute();
      await trx
        .insertInto('reference_photos')
        .values({ ...ref, individual_id: target.id })
        .onConflict((oc) => oc.doNothing())
        .execute();
    }
    const payload: SplitPayload = { from: a.id, into: target.id, created, ...moved, refsBefore };
    return recordChange(trx, {
      projectId: project.id,
      kind: 'split',
      by: actorId,
      reason: body.reason,
      individuals: [a.id, target.id],
      payload,
    });
  });
}

import type { Db } from '../db/database';
import type { IdentityChangesTable } from '../db/schema/curate.table';
import type { ProjectsTable } from '../db/schema/projects.table';
import { ApiError } from '../errors/api-error';
import type { MergePayload, SplitPayload } from './identity-changes.service';
import { recordChange } from './identity-changes.service';
import { moveBack, restoreRefs } from './identity-snapshots';
import type { ResolvePayload } from './disputes.service';

function conflict(message: string, details: unknown): never {
  throw new ApiError('conflict', message, details);
}

/** Later changes that touched any of these individuals and still stand. */
async function laterChanges(db: Db, change: IdentityChangesTable): Promise<IdentityChangesTable[]> {
  const touched: string[] = JSON.parse(change.individuals) as string[];
  const later = await db
    .selectFrom('identity_changes')
    .selectAll()
    .where('project_id', '=', change.project_id)
    .where('at', '>=', change.at)
    .where('id', '!=', change.id)
    .where('undone_by', 'is', null)
    .where('kind', '!=', 'undo')
    .execute();
  return later
    .filter((c) => c.at > change.at || c.id > change.id)
    .filter((c) => (JSON.parse(c.individuals) as string[]).some((i) => touched.includes(i)));
}

async function stillOn(
  db: Db,
  table: 'sightings' | 'calls',
  ids: string[],
  individualId: string,
): Promise<string[]> {
  const off: string[] = [];
  for (let i = 0; i < ids.length; i += 500) {
    const rows = await db
      .selectFrom(table)
      .select(['id', 'individual_id'])
      .where('id', 'in', ids.slice(i, i + 500))
      .execute();
    for (const r of rows) if (r.individual_id !== individualId) off.push(r.id);
    off.push(...ids.slice(i, i + 500).filter((id) => !rows.some((r) => r.id === id)));
  }
  return off;
}

async function undoMerge(db: Db, p: MergePayload): Promise<void> {
  const [off, offCalls] = [
    await stillOn(db, 'sightings', p.sightings, p.into),
    await stillOn(db, 'calls', p.calls, p.into),
  ];
  if (off.length || offCalls.length) {
    conflict(
      'Some sightings or calls moved by this merge have changed since, so it cannot be undone exactly.',
      { sightings: off, calls: offCalls },
    );
  }
  await moveBack(db, { sightings: p.sightings, calls: p.calls }, p.from);
  if (p.aliasAdded)
    await db
      .deleteFrom('aliases')
      .where('code', '=', p.aliasAdded)
      .where('individual_id', '=', p.into)
      .execute();
  for (const code of p.aliasesMoved)
    await db
      .updateTable('aliases')
      .set({ individual_id: p.from })
      .where('code', '=', code)
      .execute();
  await db
    .updateTable('individuals')
    .set({ status: 'active', merged_into: null })
    .where('id', '=', p.from)
    .execute();
  await restoreRefs(db, p.refsBefore);
}

async function undoSplit(db: Db, p: SplitPayload): Promise<void> {
  const off = await stillOn(db, 'sightings', p.sightings, p.into);
  if (off.length)
    conflict(
      'Some sightings moved by this split have changed since, so it cannot be undone exactly.',
      { sightings: off },
    );
  if (p.created) {
    const others = await db
      .selectFrom('sightings')
      .select('id')
      .where('individual_id', '=', p.into)
      .where('id', 'not in', p.sightings)
      .execute();
    const calls = await db
      .selectFrom('calls')
      .select('id')
      .where('individual_id', '=', p.into)
      .where('id', 'not in', p.calls.length ? p.calls : [''])
      .execute();
    if (others.length || calls.length) {
      conflict(
        'The individual made by this split has been used since (other sightings or calls name it); undo those first.',
        { sightings: others.map((o) => o.id) },
      );
    }
  }
  await moveBack(db, { sightings: p.sightings, calls: p.calls }, p.from);
  await restoreRefs(db, p.refsBefore);
  if (p.created)
    await db
      .updateTable('individuals')
      .set({ status: 'discarded' })
      .where('id', '=', p.into)
      .execute();
}

async function undoResolve(db: Db, p: ResolvePayload): Promise<void> {
  const now = await db
    .selectFrom('sightings')
    .select(['state', 'individual_id'])
    .where('id', '=', p.sighting)
    .executeTakeFirst();
  if (!now || now.state !== p.after.state || now.individual_id !== p.after.individualId) {
    conflict('The sighting has changed since this decision, so it cannot be undone exactly.', {
      sighting: p.sighting,
    });
  }
  await db
    .updateTable('sightings')
    .set({ state: p.before.state, individual_id: p.before.individualId })
    .where('id', '=', p.sighting)
    .execute();
  for (const i of p.individuals)
    await db
      .updateTable('individuals')
      .set({ status: i.statusBefore })
      .where('id', '=', i.id)
      .execute();
  await restoreRefs(db, p.refsBefore);
}

/**
 * Undoes one identity change exactly. Later unrelated changes do not matter; a later change that
 * touched the same individuals (or moved the same sightings) is a conflict: nothing changes and the
 * answer explains which change stands in the way.
 */
export async function undoChange(
  db: Db,
  project: ProjectsTable,
  changeId: string,
  actorId: string,
  reason: string,
): Promise<IdentityChangesTable> {
  return db.transaction().execute(async (trx) => {
    const change = await trx
      .selectFrom('identity_changes')
      .selectAll()
      .where('id', '=', changeId)
      .where('project_id', '=', project.id)
      .executeTakeFirst();
    if (!change) throw new ApiError('not_found', 'This identity change was not found.');
    if (change.kind === 'undo')
      throw new ApiError(
        'conflict',
        'An undo cannot itself be undone; make the change again instead.',
      );
    if (change.undone_by) throw new ApiError('conflict', 'This change has already been undone.');
    const blocking = await laterChanges(trx, change);
    if (blocking.length) {
      conflict(
        `A later change (${blocking.map((b) => b.kind).join(', ')}) involves the same individuals; undo it first, newest first.`,
        { changes: blocking.map((b) => ({ id: b.id, kind: b.kind, at: b.at })) },
      );
    }
    const payload: unknown = JSON.parse(change.payload);
    if (change.kind === 'merge') await undoMerge(trx, payload as MergePayload);
    else if (change.kind === 'split') await undoSplit(trx, payload as SplitPayload);
    else if (change.kind === 'resolve') await undoResolve(trx, payload as ResolvePayload);
    const undo = await recordChange(trx, {
      projectId: project.id,
      kind: 'undo',
      by: actorId,
      reason,
      individuals: JSON.parse(change.individuals) as string[],
      payload: { undid: change.id, kind: change.kind },
      undoes: change.id,
    });
    await trx
      .updateTable('identity_changes')
      .set({ undone_by: undo.id })
      .where('id', '=', change.id)
      .execute();
    return undo;
  });
}

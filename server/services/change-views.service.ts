import type { IdentityChangeView, ChangeKind } from '../../shared/curate';
import type { Db } from '../db/database';
import type { IdentityChangesTable } from '../db/schema/curate.table';

function summary(
  row: IdentityChangesTable,
  codes: Map<string, string | null>,
  payload: Record<string, unknown>,
): string {
  const code = (id: unknown) => (typeof id === 'string' ? (codes.get(id) ?? id) : '?');
  const count = (key: string) =>
    Array.isArray(payload[key]) ? (payload[key] as unknown[]).length : 0;
  switch (row.kind) {
    case 'merge':
      return `${code(payload['from'])} merged into ${code(payload['into'])}: ${count('sightings')} sightings and ${count('calls')} calls moved`;
    case 'split':
      return `${count('sightings')} sightings of ${code(payload['from'])} moved to ${payload['created'] ? 'new individual ' : ''}${code(payload['into'])}`;
    case 'resolve': {
      const after = payload['after'] as { state: string; individualId: string | null };
      return `Dispute decided: ${after.state}${after.individualId ? ` as ${code(after.individualId)}` : ''}`;
    }
    default:
      return `Undid a ${String(payload['kind'])}`;
  }
}

/** Identity changes as the history shows them, newest first. */
export async function changeViews(
  db: Db,
  projectId: string,
  ids?: string[],
): Promise<IdentityChangeView[]> {
  let q = db
    .selectFrom('identity_changes')
    .leftJoin('users', 'users.id', 'identity_changes.by')
    .selectAll('identity_changes')
    .select('users.name')
    .where('identity_changes.project_id', '=', projectId);
  if (ids) q = q.where('identity_changes.id', 'in', ids.length ? ids : ['']);
  const rows = await q
    .orderBy('identity_changes.at', 'desc')
    .orderBy('identity_changes.id', 'desc')
    .limit(500)
    .execute();
  const individualIds = [...new Set(rows.flatMap((r) => JSON.parse(r.individuals) as string[]))];
  const codes = new Map(
    (
      await db
        .selectFrom('individuals')
        .select(['id', 'code'])
        .where('id', 'in', individualIds.length ? individualIds : [''])
        .execute()
    ).map((i) => [i.id, i.code]),
  );
  return rows.map((r) => {
    const payload = JSON.parse(r.payload) as Record<string, unknown>;
    return {
      id: r.id,
      kind: r.kind as ChangeKind,
      by: r.name ?? 'a former member',
      at: r.at,
      reason: r.reason,
      summary: summary(r, codes, payload),
      individuals: (JSON.parse(r.individuals) as string[]).map((id) => ({
        id,
        code: codes.get(id) ?? null,
      })),
      moved: {
        sightings: Array.isArray(payload['sightings'])
          ? (payload['sightings'] as unknown[]).length
          : 0,
        calls: Array.isArray(payload['calls']) ? (payload['calls'] as unknown[]).length : 0,
      },
      undoes: r.undoes,
      undoneBy: r.undone_by,
    };
  });
}

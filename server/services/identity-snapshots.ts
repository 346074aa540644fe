import type { Db } from '../db/database';
import type { ReferencePhotosTable } from '../db/schema/identify.table';

/** Reference photo rows of some individuals, keyed by individual. */
export type RefSnapshot = Record<string, ReferencePhotosTable[]>;

/** The reference photos of each individual exactly as stored. */
export async function snapshotRefs(db: Db, ids: string[]): Promise<RefSnapshot> {
  const rows = await db
    .selectFrom('reference_photos')
    .selectAll()
    .where('individual_id', 'in', ids)
    .orderBy('flank')
    .orderBy('position')
    .execute();
  const out: RefSnapshot = {};
  for (const id of ids) out[id] = rows.filter((r) => r.individual_id === id);
  return out;
}

/** Puts back reference photos exactly as a snapshot had them. */
export async function restoreRefs(db: Db, snapshot: RefSnapshot): Promise<void> {
  for (const [id, rows] of Object.entries(snapshot)) {
    await db.deleteFrom('reference_photos').where('individual_id', '=', id).execute();
    for (const r of rows) await db.insertInto('reference_photos').values(r).execute();
  }
}

/** Moves sightings and the calls naming `from` on them to another individual; returns what moved. */
export async function moveSightings(
  db: Db,
  sightingIds: string[],
  from: string,
  to: string,
): Promise<{ sightings: string[]; calls: string[] }> {
  const sightings: string[] = [];
  const calls: string[] = [];
  for (let i = 0; i < sightingIds.length; i += 500) {
    const chunk = sightingIds.slice(i, i + 500);
    const moved = await db
      .updateTable('sightings')
      .set({ individual_id: to })
      .where('id', 'in', chunk)
      .where('individual_id', '=', from)
      .returning('id')
      .execute();
    sightings.push(...moved.map((m) => m.id));
    const movedCalls = await db
      .updateTable('calls')
      .set({ individual_id: to })
      .where('sighting_id', 'in', chunk)
      .where('individual_id', '=', from)
      .returning('id')
      .execute();
    calls.push(...movedCalls.map((m) => m.id));
  }
  return { sightings, calls };
}

/** Moves exactly these sightings and calls back to an individual. */
export async function moveBack(
  db: Db,
  moved: { sightings: string[]; calls: string[] },
  to: string,
): Promise<void> {
  for (let i = 0; i < moved.sightings.length; i += 500) {
    await db
      .updateTable('sightings')
      .set({ individual_id: to })
      .where('id', 'in', moved.sightings.slice(i, i + 500))
      .execute();
  }
  for (let i = 0; i < moved.calls.length; i += 500) {
    await db
      .updateTable('calls')
      .set({ individual_id: to })
      .where('id', 'in', moved.calls.slice(i, i + 500))
      .execute();
  }
}

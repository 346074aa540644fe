import type { Db } from '../../server/db/database';
import { leopardSightings } from './identify-helpers';
import type { TestClient } from './test-app';

/** Every row that says who is who, in a stable order (for exact before/after comparisons). */
export async function identityDump(db: Db) {
  return {
    sightings: await db.selectFrom('sightings').selectAll().orderBy('id').execute(),
    calls: await db.selectFrom('calls').selectAll().orderBy('id').execute(),
    references: await db
      .selectFrom('reference_photos')
      .selectAll()
      .orderBy('individual_id')
      .orderBy('flank')
      .orderBy('photo_id')
      .execute(),
    aliases: await db.selectFrom('aliases').selectAll().orderBy('code').execute(),
    individuals: await db
      .selectFrom('individuals')
      .select(['id', 'code', 'status', 'merged_into'])
      .orderBy('id')
      .execute(),
  };
}

/**
 * Catalogues `count` sightings at a new station as one new individual (single-reviewer project):
 * the first call creates it, the rest match it. Returns the individual's id and the sighting ids.
 */
export async function individualWithSightings(
  ecologist: TestClient,
  reviewer: TestClient,
  slug: string,
  station: string,
  count: number,
  flank: 'left' | 'right' | 'both' = 'left',
  day = 2,
  description: object = {},
): Promise<{ id: string; code: string; sightings: string[] }> {
  const sightings = await leopardSightings(ecologist, reviewer, slug, station, count, flank, day);
  const first = await reviewer.post(`/api/projects/${slug}/sightings/${sightings[0]}/calls`, {
    verdict: 'new',
    individual: description,
  });
  if (first.status !== 200) throw new Error(JSON.stringify(first.body));
  const id = first.body.individual.id as string;
  for (const s of sightings.slice(1)) {
    const res = await reviewer.post(`/api/projects/${slug}/sightings/${s}/calls`, {
      verdict: 'match',
      individualId: id,
    });
    if (res.status !== 200) throw new Error(JSON.stringify(res.body));
  }
  return { id, code: first.body.individual.code as string, sightings };
}

import type { Db } from '../server/db/database';
import { makeCall } from '../server/services/calls.service';
import { describeIndividual, makeIndividual } from './photos/index';
import { setReferences } from '../server/services/individuals.service';
import type { SeededPhoto } from './demo-photos';
import type { SortedDemo } from './demo-sorting';

/**
 * Identifies part of the demo's sightings the way two reviewers would, so every screen has work:
 * most early sightings confirmed (both reviewers agree), a few disputed, a few waiting for their
 * second review, one ghost (a right-flank-only sighting catalogued as a new animal), the rest open.
 */
export async function seedDemoIdentities(
  db: Db,
  input: { projectId: string; firstReviewer: string; secondReviewer: string; sorted: SortedDemo },
): Promise<void> {
  const project = await db
    .selectFrom('projects')
    .selectAll()
    .where('id', '=', input.projectId)
    .executeTakeFirstOrThrow();
  const sightings = [...input.sorted.sightings].sort((a, b) => a.start.localeCompare(b.start));
  const identified = Math.floor(sightings.length * 0.8);
  const known = new Map<string, string>();
  let ghostMade = false;
  let disputes = 0;
  let matches = 0;
  for (const [n, s] of sightings.slice(0, identified).entries()) {
    const d = describeIndividual(makeIndividual(s.individual));
    const description = { nickname: null, sex: d.sex, notes: d.note, tags: [...d.tags] };
    const first = { id: input.firstReviewer };
    const second = { id: input.secondReviewer };
    const existing = known.get(s.individual);
    const ghost = !ghostMade && existing && s.flank === 'right';
    if (!existing || ghost) {
      // A new animal (or, once, a right-flank-only sighting nobody linked to its left flank).
      await makeCall(db, project, first, s.id, {
        verdict: 'new',
        individual: description,
        note: '',
      });
      const result = await makeCall(db, project, second, s.id, { verdict: 'new', note: '' });
      if (!existing && result.sighting.individualId)
        known.set(s.individual, result.sighting.individualId);
      if (ghost) ghostMade = true;
      continue;
    }
    await makeCall(db, project, first, s.id, {
      verdict: 'match',
      individualId: existing,
      note: '',
    });
    if (n >= identified - 3) continue; // the last few wait for their second review
    const wrong = [...known.values()].find((id) => id !== existing);
    if (disputes < 3 && ++matches % 4 === 2 && wrong) {
      disputes++;
      await makeCall(db, project, second, s.id, {
        verdict: 'match',
        individualId: wrong,
        note: 'rosettes on the shoulder look different to me',
      });
    } else {
      await makeCall(db, project, second, s.id, {
        verdict: 'match',
        individualId: existing,
        note: '',
      });
    }
  }
}

/**
 * The curator's choice of reference photos: for every catalogued leopard, its clearest left-flank
 * and right-flank photos from its confirmed sightings (what the photos show is known from the
 * generator's ground truth).
 */
export async function seedDemoReferences(
  db: Db,
  input: { projectId: string; curatorId: string; photos: SeededPhoto[] },
): Promise<void> {
  const truth = new Map(input.photos.map((p) => [p.photoId, p.truth]));
  const individuals = await db
    .selectFrom('individuals')
    .select('id')
    .where('project_id', '=', input.projectId)
    .where('status', '=', 'active')
    .execute();
  for (const { id } of individuals) {
    const photos = await db
      .selectFrom('photos')
      .innerJoin('sightings', 'sightings.event_id', 'photos.event_id')
      .select('photos.id')
      .where('sightings.individual_id', '=', id)
      .where('sightings.state', '=', 'confirmed')
      .execute();
    for (const flank of ['left', 'right'] as const) {
      const candidates = photos
        .map((p) => ({ id: p.id, t: truth.get(p.id) }))
        .filter((p) => p.t?.kind === 'target' && p.t.flank === flank)
        .sort((a, b) => (a.t!.occludedFraction ?? 0) - (b.t!.occludedFraction ?? 0));
      if (candidates.length)
        await setReferences(
          db,
          input.projectId,
          id,
          flank,
          candidates.slice(0, 2).map((c) => c.id),
          input.curatorId,
        );
    }
    const flanked = await db
      .selectFrom('reference_photos')
      .select('flank')
      .where('individual_id', '=', id)
      .where('flank', '!=', 'other')
      .execute();
    if (flanked.length) await setReferences(db, input.projectId, id, 'other', [], input.curatorId);
  }
}

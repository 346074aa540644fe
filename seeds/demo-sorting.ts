import type { Db } from '../server/db/database';
import { newId, nowIso } from '../server/services/ids';
import { recordAudit } from '../server/services/audit.service';
import { enqueueJob } from '../server/services/jobs.service';
import type { SeededPhoto } from './demo-photos';

/** What the demo's sorting left behind: events labelled and the sightings made. */
export interface SortedDemo {
  sightings: {
    id: string;
    eventId: string;
    individual: string;
    flank: string;
    stationCode: string;
    start: string;
  }[];
}

/**
 * The box a reviewer would draw around the animal: the painter's ground-truth box with a tenth of
 * its size as margin, in fractions of the photo (stored as JSON, as the API stores crops).
 */
function cropAround(photo: SeededPhoto): string | null {
  const box = photo.truth.bbox;
  if (!box) return null;
  const { width, height } = photo.plan.spec;
  const mx = box.width * 0.1;
  const my = box.height * 0.1;
  const x0 = Math.max(0, box.x - mx) / width;
  const y0 = Math.max(0, box.y - my) / height;
  const x1 = Math.min(width, box.x + box.width + mx) / width;
  const y1 = Math.min(height, box.y + box.height + my) / height;
  if (x1 - x0 <= 0 || y1 - y0 <= 0) return null;
  const r = (v: number) => Math.round(v * 10000) / 10000;
  return JSON.stringify({ x: r(x0), y: r(y0), w: r(x1 - x0), h: r(y1 - y0) });
}

function labelOf(kinds: SeededPhoto['truth'][]): { label: string; species: string | null } {
  const count = new Map<string, number>();
  for (const t of kinds) {
    const key =
      t.kind === 'target' || t.kind === 'animal'
        ? `animal:${t.species}`
        : t.kind === 'setup'
          ? 'blank'
          : t.kind;
    count.set(key, (count.get(key) ?? 0) + 1);
  }
  const top = [...count.entries()].sort((a, b) => b[1] - a[1])[0]![0];
  return top.startsWith('animal:')
    ? { label: 'animal', species: top.slice(7) }
    : { label: top, species: null };
}

/**
 * Sorts the first part of the season as two reviewers would have (labels from what the photos show),
 * and records a sighting for every leopard in the sorted leopard events; the rest stays to do.
 */
export async function seedDemoSorting(
  db: Db,
  input: { projectId: string; reviewerIds: string[]; photos: SeededPhoto[]; sortedShare: number },
): Promise<SortedDemo> {
  const byPhoto = new Map(input.photos.map((p) => [p.photoId, p]));
  const events = await db
    .selectFrom('events')
    .selectAll()
    .where('project_id', '=', input.projectId)
    .orderBy('start')
    .execute();
  const cut = Math.floor(events.length * input.sortedShare);
  const out: SortedDemo = { sightings: [] };
  const stations = new Map(
    (await db.selectFrom('stations').select(['id', 'code']).execute()).map((s) => [s.id, s.code]),
  );
  for (const [n, event] of events.slice(0, cut).entries()) {
    const photos = await db
      .selectFrom('photos')
      .innerJoin('deployments', 'deployments.id', 'photos.deployment_id')
      .select(['photos.id', 'deployments.camera_label'])
      .where('photos.event_id', '=', event.id)
      .orderBy('photos.taken_at')
      .execute();
    const truths = photos
      .map((p) => byPhoto.get(p.id)?.truth)
      .filter((t): t is SeededPhoto['truth'] => Boolean(t));
    if (truths.length === 0) continue;
    const { label, species } = labelOf(truths);
    const individuals = [
      ...new Set(truths.map((t) => t.individualId).filter((i): i is string => Boolean(i))),
    ];
    const reviewer = input.reviewerIds[n % input.reviewerIds.length]!;
    const at = nowIso();
    await db.transaction().execute(async (trx) => {
      await trx
        .updateTable('events')
        .set({
          label,
          species,
          animal_count: label === 'animal' ? Math.max(1, individuals.length) : null,
          sorted_by: reviewer,
          sorted_at: at,
          label_version: 1,
        })
        .where('id', '=', event.id)
        .execute();
      await recordAudit(trx, {
        userId: reviewer,
        projectId: input.projectId,
        action: 'label',
        entity: 'event',
        entityId: event.id,
        after: { label, species },
      });
      if (label === 'human')
        for (const p of photos) await enqueueJob(trx, 'blur', { photoId: p.id });
      for (const individual of individuals) {
        const own = photos.filter((p) => byPhoto.get(p.id)?.truth.individualId === individual);
        const cameras = new Set(own.map((p) => p.camera_label));
        const best = own[0]!;
        const bestTruth = byPhoto.get(best.id)!.truth;
        const flank = cameras.size > 1 ? 'both' : (bestTruth.flank ?? 'unknown');
        const quality = (bestTruth.occludedFraction ?? 0) > 0.15 ? 'fair' : 'good';
        const id = newId();
        await trx
          .insertInto('sightings')
          .values({
            id,
            project_id: input.projectId,
            event_id: event.id,
            flank,
            quality,
            best_photo_id: best.id,
            crop: cropAround(byPhoto.get(best.id)!),
            sex: null,
            age_class: null,
            state: 'open',
            individual_id: null,
            created_by: reviewer,
            created_at: at,
            updated_at: at,
          })
          .execute();
        out.sightings.push({
          id,
          eventId: event.id,
          individual,
          flank,
          stationCode: stations.get(event.station_id) ?? '',
          start: event.start,
        });
      }
    });
  }
  return out;
}

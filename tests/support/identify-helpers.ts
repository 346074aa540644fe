import { hourly, stationWithEvents } from './sort-helpers';
import type { TestClient } from './test-app';

/**
 * Makes `count` leopard sightings (one per event, synthetic photos) at a new station, labelled and
 * described through the real API. Returns the sighting ids in event order.
 */
export async function leopardSightings(
  ecologist: TestClient,
  reviewer: TestClient,
  slug: string,
  code: string,
  count: number,
  flank: 'left' | 'right' | 'both' = 'left',
  day = 2,
): Promise<string[]> {
  const { stationId } = await stationWithEvents(
    ecologist,
    reviewer,
    slug,
    code,
    hourly(count, day),
  );
  const events = await reviewer.get(
    `/api/projects/${slug}/events?stationId=${stationId}&limit=200`,
  );
  const ids: string[] = [];
  for (const event of events.body.items as { id: string; photos: { id: string }[] }[]) {
    const label = await reviewer.post(`/api/projects/${slug}/events/${event.id}/label`, {
      label: 'animal',
      species: 'Panthera pardus',
    });
    if (label.status !== 200) throw new Error(`label: ${JSON.stringify(label.body)}`);
    const s = await reviewer.post(`/api/projects/${slug}/events/${event.id}/sightings`, {
      flank,
      quality: 'good',
      bestPhotoId: event.photos[0]!.id,
    });
    if (s.status !== 201) throw new Error(`sighting: ${JSON.stringify(s.body)}`);
    ids.push(s.body.id as string);
  }
  return ids;
}

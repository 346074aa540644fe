import type { DuplicateEvidence, DuplicateSuggestion } from '../../shared/curate';
import type { Db } from '../db/database';
import { CATALOGUE_SEARCH, textScores } from './catalogue-cache';
import { CatalogueSearch } from './catalogue-search';
import { coverageOf, referencesOf } from './individuals.service';

/** Minutes within which two single-flank records at one station suggest the same pass. */
const SAME_PASS_MINUTES = 10;

interface Profile {
  id: string;
  code: string;
  nickname: string | null;
  notes: string;
  tags: string[];
  flanks: Set<string>;
  detections: { eventId: string; stationId: string; time: number }[];
}

function flankText(flanks: Set<string>): string {
  const c = coverageOf(flanks);
  return c.left && c.right
    ? 'both flanks'
    : c.left
      ? 'left flank only'
      : c.right
        ? 'right flank only'
        : 'no flank yet';
}

/** Alternations between two time-sorted detection lists (A B A B … counts 3). */
function alternations(a: number[], b: number[]): number {
  const merged = [...a.map((t) => ({ t, who: 0 })), ...b.map((t) => ({ t, who: 1 }))].sort(
    (x, y) => x.t - y.t,
  );
  let switches = 0;
  for (let i = 1; i < merged.length; i++) if (merged[i]!.who !== merged[i - 1]!.who) switches++;
  return switches;
}

function evidenceFor(a: Profile, b: Profile, notesAlike: number): DuplicateEvidence[] {
  const evidence: DuplicateEvidence[] = [];
  const ca = coverageOf(a.flanks);
  const cb = coverageOf(b.flanks);
  const together = a.detections.some((x) => b.detections.some((y) => y.eventId === x.eventId));
  const opposite = ca.partial && cb.partial && ca.left !== cb.left;
  if (opposite) {
    const sameEvent = a.detections.find((x) => b.detections.some((y) => y.eventId === x.eventId));
    const near = a.detections.find((x) =>
      b.detections.some(
        (y) =>
          y.stationId === x.stationId && Math.abs(y.time - x.time) <= SAME_PASS_MINUTES * 60_000,
      ),
    );
    if (sameEvent)
      evidence.push({
        kind: 'opposite-flanks',
        text: `${a.code} is known from one flank and ${b.code} from the other, and both were photographed in the same event`,
      });
    else if (near)
      evidence.push({
        kind: 'opposite-flanks',
        text: `${a.code} and ${b.code} are known from opposite flanks and passed the same station within ${SAME_PASS_MINUTES} minutes`,
      });
  }
  if (notesAlike >= 0.8)
    evidence.push({
      kind: 'similar-marks',
      text: `marking notes and tags are alike (${Math.round(notesAlike * 100)} %)`,
    });
  if (!together && a.detections.length >= 2 && b.detections.length >= 2) {
    const shared = a.detections.some((x) => b.detections.some((y) => y.stationId === x.stationId));
    const switches = alternations(
      a.detections.map((d) => d.time),
      b.detections.map((d) => d.time),
    );
    if (shared && switches >= 3) {
      evidence.push({
        kind: 'interleaved',
        text: `never seen together, yet their detections at the same stations alternate in time (${switches} turns)`,
      });
    }
  }
  return evidence;
}

/**
 * Pairs of active individuals that may be one animal, each with its evidence: opposite-flank
 * partial identities seen in one event or one pass; alike marking notes and tags; detections that
 * interleave at shared stations without ever coinciding. Dismissed pairs are never suggested again.
 */
export async function suggestDuplicates(db: Db, projectId: string): Promise<DuplicateSuggestion[]> {
  const individuals = await db
    .selectFrom('individuals')
    .select(['id', 'code', 'nickname', 'notes', 'tags'])
    .where('project_id', '=', projectId)
    .where('status', '=', 'active')
    .execute();
  const seen = await db
    .selectFrom('sightings')
    .innerJoin('events', 'events.id', 'sightings.event_id')
    .select([
      'sightings.individual_id',
      'sightings.flank',
      'events.id as eventId',
      'events.station_id',
      'events.start',
    ])
    .where('sightings.project_id', '=', projectId)
    .where('sightings.state', '=', 'confirmed')
    .execute();
  const dismissed = new Set(
    (
      await db
        .selectFrom('duplicate_dismissals')
        .select(['first_id', 'second_id'])
        .where('project_id', '=', projectId)
        .execute()
    ).map((d) => `${d.first_id}|${d.second_id}`),
  );
  const profiles: Profile[] = individuals.map((i) => ({
    id: i.id,
    code: i.code ?? i.id,
    nickname: i.nickname,
    notes: i.notes,
    tags: JSON.parse(i.tags) as string[],
    flanks: new Set(seen.filter((s) => s.individual_id === i.id).map((s) => s.flank)),
    detections: seen
      .filter((s) => s.individual_id === i.id)
      .map((s) => ({ eventId: s.eventId, stationId: s.station_id, time: Date.parse(s.start) })),
  }));
  const search = new CatalogueSearch(profiles, CATALOGUE_SEARCH);
  const refs = await referencesOf(
    db,
    profiles.map((p) => p.id),
  );
  const out: DuplicateSuggestion[] = [];
  for (const [i, a] of profiles.entries()) {
    const alike = a.notes.trim()
      ? textScores(search, [a.notes, ...a.tags].join(', '))
      : new Map<string, number>();
    for (const b of profiles.slice(i + 1)) {
      const key = a.id < b.id ? `${a.id}|${b.id}` : `${b.id}|${a.id}`;
      if (dismissed.has(key)) continue;
      const evidence = evidenceFor(a, b, b.notes.trim() ? (alike.get(b.id) ?? 0) : 0);
      if (!evidence.length) continue;
      const weight = { 'opposite-flanks': 0.6, 'similar-marks': 0.25, interleaved: 0.3 };
      const view = (p: Profile) => ({
        id: p.id,
        code: p.code,
        nickname: p.nickname,
        flanks: flankText(p.flanks),
        references: (refs.get(p.id) ?? []).map((r) => ({
          photoId: r.photoId,
          flank: r.flank,
          thumbUrl: r.thumbUrl,
        })),
      });
      out.push({
        first: view(a),
        second: view(b),
        score: Math.min(
          1,
          evidence.reduce((s, e) => s + weight[e.kind], 0),
        ),
        evidence,
      });
    }
  }
  return out.sort((x, y) => y.score - x.score || x.first.code.localeCompare(y.first.code));
}

/** Remembers that two individuals are not the same animal. */
export async function dismissDuplicate(
  db: Db,
  projectId: string,
  a: string,
  b: string,
  actorId: string,
  reason: string,
): Promise<void> {
  const [first, second] = a < b ? [a, b] : [b, a];
  await db
    .insertInto('duplicate_dismissals')
    .values({
      project_id: projectId,
      first_id: first,
      second_id: second,
      by: actorId,
      at: new Date().toISOString(),
      reason,
    })
    .onConflict((oc) => oc.doNothing())
    .execute();
}

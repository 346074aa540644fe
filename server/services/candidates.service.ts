import type { Candidate, CandidateReason } from '../../shared/identify';
import { textScores, type CandidatePool, type PoolEntry } from './catalogue-cache';
import { SHORTLIST_SIZE } from './catalogue-search';

/** The sighting as ranking sees it. */
export interface RankingContext {
  stationId: string;
  time: number;
  flank: string;
  sex: string | null;
  /** Station positions in metres (a local plane). */
  stations: Map<string, { x: number; y: number; code: string }>;
  query?: string;
  /**
   * Coat-pattern similarity per individual, 0..1, with the number of matching points and whether
   * the photo matched flipped (the flank photographed from the other side). Absent while the
   * sighting's features are not ready: the ranking then leaves the pattern out.
   */
  pattern?: Map<string, { score: number; inliers: number; mirrored?: boolean }>;
}

/** Tuning of the space-time signal: typical movement scale, how long memories last, top speed. */
const SPACE_SCALE_M = 3000;
const RECENCY_DAYS = 30;
const MAX_SPEED_M_PER_H = 4000;

interface Away {
  at: { x: number; y: number; code: string };
  metres: number;
  near: number;
}

/** Each station's distance from the sighting's station and its nearness weight, once per ranking. */
const distanceCache = new WeakMap<RankingContext, Map<string, Away>>();
function distancesFrom(ctx: RankingContext, here: { x: number; y: number }): Map<string, Away> {
  let out = distanceCache.get(ctx);
  if (out) return out;
  out = new Map();
  for (const [id, at] of ctx.stations) {
    const metres = Math.hypot(at.x - here.x, at.y - here.y);
    const near = Math.exp(-(metres * metres) / (2 * SPACE_SCALE_M * SPACE_SCALE_M));
    out.set(id, { at, metres, near });
  }
  distanceCache.set(ctx, out);
  return out;
}

/**
 * Nearness in space and time to the animal's earlier detections, and a penalty for an impossible
 * journey; the reasons' wording only when `explain` (ranking scores thousands of animals and words
 * only the ones it shows).
 */
function spaceTime(
  entry: PoolEntry,
  ctx: RankingContext,
  explain: boolean,
): { score: number; reasons: CandidateReason[]; penalty: number } {
  const here = ctx.stations.get(ctx.stationId);
  if (!here || entry.detections.length === 0) return { score: 0, reasons: [], penalty: 1 };
  const distances = distancesFrom(ctx, here);
  let best = 0;
  let bestText = '';
  let penalty = 1;
  let penaltyText = '';
  for (const d of entry.detections) {
    const away = distances.get(d.stationId);
    if (!away) continue;
    const { at, metres, near } = away;
    const hours = Math.abs(ctx.time - d.time) / 3_600_000;
    const days = hours / 24;
    const recent = Math.exp(-days / RECENCY_DAYS);
    const score = near * (0.5 + 0.5 * recent);
    if (score > best) {
      best = score;
      if (!explain) continue;
      const where =
        metres < 1
          ? `at this station (${at.code})`
          : `at ${at.code}, ${(metres / 1000).toFixed(1)} km away`;
      bestText = `seen ${where} ${days < 1 ? `${hours.toFixed(0)} h` : `${days.toFixed(0)} days`} ${d.time <= ctx.time ? 'before' : 'after'}`;
    }
    if (hours > 0 && metres / hours > MAX_SPEED_M_PER_H && metres > 2000 && penalty > 0.35) {
      penalty = 0.35;
      if (explain)
        penaltyText = `seen at ${at.code} ${hours.toFixed(1)} h apart, ${(metres / 1000).toFixed(1)} km away: an unlikely journey`;
    }
  }
  const reasons: CandidateReason[] = [];
  if (!explain) return { score: best, reasons, penalty };
  if (best > 0.05) reasons.push({ signal: 'space-time', weight: best, text: bestText });
  if (penaltyText)
    reasons.push({ signal: 'space-time', weight: -(1 - penalty), text: penaltyText });
  return { score: best, reasons, penalty };
}

/** Whether the catalogue holds this flank of the animal (a reference photo or a sighting). */
function knowsFlank(entry: PoolEntry, flank: string): boolean {
  if (entry.flanks.has(flank) || entry.flanks.has('both')) return true;
  for (const r of entry.references) if (r.flank === flank) return true;
  return false;
}

function flankSignal(
  entry: PoolEntry,
  flank: string,
): { score: number; reason: CandidateReason | null } {
  if (flank === 'left' || flank === 'right') {
    if (knowsFlank(entry, flank))
      return {
        score: 1,
        reason: { signal: 'flank', weight: 0.2, text: `${flank} flank on file to compare` },
      };
    return {
      score: 0,
      reason: {
        signal: 'flank',
        weight: 0,
        text: `known from the other flank only: cannot be compared on this photo`,
      },
    };
  }
  if (flank === 'both')
    return {
      score: knowsFlank(entry, 'left') || knowsFlank(entry, 'right') ? 1 : 0,
      reason: null,
    };
  return { score: 0.5, reason: null };
}

/** A pool's detections and flanks as flat arrays, built once per pool for the numeric pass. */
interface PackedPool {
  stations: string[];
  /** Detections of entry i are at first[i] ≤ j < first[i + 1]. */
  first: Int32Array;
  station: Int32Array;
  time: Float64Array;
  /** Bit 1: left flank on file; bit 2: right flank on file. */
  flanks: Uint8Array;
}

const packedPools = new WeakMap<CandidatePool, PackedPool>();

function packed(pool: CandidatePool): PackedPool {
  let p = packedPools.get(pool);
  if (p) return p;
  const index = new Map<string, number>();
  const n = pool.entries.length;
  const total = pool.entries.reduce((sum, e) => sum + e.detections.length, 0);
  p = {
    stations: [],
    first: new Int32Array(n + 1),
    station: new Int32Array(total),
    time: new Float64Array(total),
    flanks: new Uint8Array(n),
  };
  let j = 0;
  pool.entries.forEach((entry, i) => {
    p!.first[i] = j;
    for (const d of entry.detections) {
      let k = index.get(d.stationId);
      if (k === undefined) {
        k = p!.stations.length;
        index.set(d.stationId, k);
        p!.stations.push(d.stationId);
      }
      p!.station[j] = k;
      p!.time[j] = d.time;
      j++;
    }
    p!.flanks[i] = (knowsFlank(entry, 'left') ? 1 : 0) | (knowsFlank(entry, 'right') ? 2 : 0);
  });
  p.first[n] = j;
  packedPools.set(pool, p);
  return p;
}

/**
 * Every entry's ranking score without any wording: the same signals and weights as `assess` in
 * rankCandidates (a test holds the two to the same numbers), on flat arrays.
 */
export function quickScores(
  pool: CandidatePool,
  ctx: RankingContext,
  text: Map<string, number>,
  withText: boolean,
): Float64Array {
  const p = packed(pool);
  const here = ctx.stations.get(ctx.stationId);
  const near = new Float64Array(p.stations.length).fill(NaN);
  const metres = new Float64Array(p.stations.length);
  if (here)
    p.stations.forEach((id, k) => {
      const at = ctx.stations.get(id);
      if (!at) return;
      metres[k] = Math.hypot(at.x - here.x, at.y - here.y);
      near[k] = Math.exp(-(metres[k]! * metres[k]!) / (2 * SPACE_SCALE_M * SPACE_SCALE_M));
    });
  const flankBit = ctx.flank === 'left' ? 1 : ctx.flank === 'right' ? 2 : 0;
  const sexKnown = ctx.sex && ctx.sex !== 'unknown' ? ctx.sex : null;
  const weights = (withText ? 0.45 : 0) + 0.35 + 0.2 + (ctx.pattern ? 0.6 : 0);
  const out = new Float64Array(pool.entries.length);
  for (let i = 0; i < out.length; i++) {
    const entry = pool.entries[i]!;
    let score = withText ? 0.45 * (text.get(entry.id) ?? 0) : 0;
    let best = 0;
    let penalty = 1;
    if (here)
      for (let j = p.first[i]!; j < p.first[i + 1]!; j++) {
        const k = p.station[j]!;
        const n = near[k]!;
        if (Number.isNaN(n)) continue;
        const hours = Math.abs(ctx.time - p.time[j]!) / 3_600_000;
        const m = metres[k]!;
        if (hours > 0 && m / hours > MAX_SPEED_M_PER_H && m > 2000) penalty = 0.35;
        if (n <= best) continue;
        const st = n * (0.5 + 0.5 * Math.exp(-hours / 24 / RECENCY_DAYS));
        if (st > best) best = st;
      }
    score += 0.35 * best;
    const f = p.flanks[i]!;
    score += 0.2 * (flankBit ? (f & flankBit ? 1 : 0) : ctx.flank === 'both' ? (f ? 1 : 0) : 0.5);
    if (ctx.pattern) score += 0.6 * (ctx.pattern.get(entry.id)?.score ?? 0);
    let factor = penalty;
    if (sexKnown && entry.sex !== 'unknown' && sexKnown !== entry.sex) factor *= 0.3;
    out[i] = (score / weights) * factor;
  }
  return out;
}

/**
 * Ranks the catalogue for a sighting. Signals, each with its reason shown to the reviewer: text the
 * reviewer typed (fuse.js over code, nickname, tags and marking notes), space and time of earlier
 * detections (near and recent ranks higher, an impossible journey lower), sex compatibility, the
 * flank on file, and coat-pattern similarity when available.
 */
export function rankCandidates(pool: CandidatePool, ctx: RankingContext, limit = 20): Candidate[] {
  const query = ctx.query?.trim();
  const text = query ? textScores(pool.search, query, SHORTLIST_SIZE) : new Map<string, number>();
  const assess = (entry: PoolEntry, explain: boolean) => {
    const reasons: CandidateReason[] = [];
    let score = 0;
    let weights = 0;
    if (query) {
      const t = text.get(entry.id) ?? 0;
      score += 0.45 * t;
      weights += 0.45;
      if (explain && t > 0.05)
        reasons.push({
          signal: 'text',
          weight: t,
          text: `description matches “${query}” (${Math.round(t * 100)} %)`,
        });
    }
    const st = spaceTime(entry, ctx, explain);
    score += 0.35 * st.score;
    weights += 0.35;
    reasons.push(...st.reasons);
    const fl = flankSignal(entry, ctx.flank);
    score += 0.2 * fl.score;
    weights += 0.2;
    if (fl.reason) reasons.push(fl.reason);
    const pattern = ctx.pattern?.get(entry.id);
    if (ctx.pattern) {
      score += 0.6 * (pattern?.score ?? 0);
      weights += 0.6;
      if (explain && pattern && pattern.inliers > 0) {
        reasons.push({
          signal: 'pattern',
          weight: pattern.score,
          text: `pattern: ${pattern.inliers} matching points${pattern.mirrored ? ' (photo flipped)' : ''}`,
        });
      }
    }
    let factor = st.penalty;
    if (ctx.sex && ctx.sex !== 'unknown' && entry.sex !== 'unknown' && ctx.sex !== entry.sex) {
      factor *= 0.3;
      reasons.push({
        signal: 'sex',
        weight: -0.7,
        text: `recorded as ${entry.sex}, this animal looks ${ctx.sex}`,
      });
    } else if (ctx.sex && ctx.sex !== 'unknown' && ctx.sex === entry.sex) {
      reasons.push({ signal: 'sex', weight: 0.1, text: `also ${entry.sex}` });
    }
    return { entry, score: (score / weights) * factor, reasons };
  };
  // Score every animal in a lean numeric pass, then word the reasons of those shown.
  const scores = quickScores(pool, ctx, text, query !== undefined && query !== '');
  const better = (a: number, b: number) =>
    scores[a]! > scores[b]! ||
    (scores[a] === scores[b] && pool.entries[a]!.code < pool.entries[b]!.code);
  const top: number[] = [];
  for (let i = 0; i < scores.length; i++) {
    if (top.length === limit && !better(i, top[top.length - 1]!)) continue;
    let at = top.length;
    while (at > 0 && better(i, top[at - 1]!)) at--;
    top.splice(at, 0, i);
    if (top.length > limit) top.pop();
  }
  const ranked = top.map((i) => ({ entry: pool.entries[i]! }));
  return ranked
    .slice(0, limit)
    .map(({ entry }) => assess(entry, true))
    .map(({ entry, score, reasons }) => ({
      individualId: entry.id,
      code: entry.code,
      nickname: entry.nickname,
      score: Math.round(score * 1000) / 1000,
      reasons: reasons.sort((a, b) => Math.abs(b.weight) - Math.abs(a.weight)),
      references: relevantReferences(entry, ctx.flank),
      sex: entry.sex,
      notes: entry.notes,
      tags: entry.tags,
    }));
}

/** Reference photos of the sighting's flank first (both flanks for a both-flank sighting). */
function relevantReferences(entry: PoolEntry, flank: string) {
  if (flank === 'left' || flank === 'right') {
    const same = entry.references.filter((r) => r.flank === flank);
    return same.length ? same : entry.references.filter((r) => r.flank === 'other');
  }
  return entry.references;
}

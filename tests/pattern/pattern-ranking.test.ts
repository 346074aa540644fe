/**
 * Held-out evaluation of the pattern ranking on synthetic photos painted by seeds/photos (no real
 * animals): 15 individuals "TEST-…" never used for the vocabulary or any parameter choice, a
 * catalogue of 2 flanks × 3 clean day photos each, and 60 query photos (9 to 11 per condition: day,
 * infrared, mirrored, blurred, occluded, turned and far), plus individuals never catalogued.
 * Accuracy bounds are set a little under what was measured; the synthetic coats are easier than
 * real fur, so these numbers say the engine works, not how it will do in the field.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createPatternPool, type PatternPool } from '../../server/pattern/pool';
import {
  PATTERN_PARAMS,
  type RankedCandidate,
  type ReferenceFeatures,
} from '../../server/pattern/types';
import { rankCandidates as rankWithSignals } from '../../server/services/candidates.service';
import { accuracyTable, outcomeOf, summarise, type QueryOutcome } from './evaluation';
import {
  ids,
  planCatalogue,
  planPhoto,
  QUERY_CONDITIONS,
  renderPlanned,
  type PlannedPhoto,
  type RenderedSetPhoto,
  type SetShape,
} from './photo-set';
import { queryContext, syntheticSurvey } from './survey-context';

const SHAPE: SetShape = { width: 800, height: 600, stations: 8 };
const INDIVIDUALS = ids('TEST', 15);
const UNKNOWN = ids('UNK-T', 3);

/** Four of the six conditions per individual, rotating, so each condition gets 10 queries. */
function queryPlans(): PlannedPhoto[] {
  return INDIVIDUALS.flatMap((id, i) =>
    QUERY_CONDITIONS.filter((_, k) => (((k - i) % 6) + 6) % 6 < 4).map((c, k) =>
      planPhoto(id, (i + k) % 2 === 0 ? 'left' : 'right', c, 0, SHAPE),
    ),
  );
}

interface Judged {
  readonly photo: RenderedSetPhoto;
  readonly ranked: RankedCandidate[];
  readonly outcome: QueryOutcome;
}

let pool: PatternPool;
const references: ReferenceFeatures[] = [];
const referencePhotos = new Map<string, RenderedSetPhoto>();
const judged: Judged[] = [];
/** One photo per individual under every difficulty at once (judged only with all signals). */
const hard: Judged[] = [];
const unknown: QueryOutcome[] = [];

async function judge(plan: PlannedPhoto): Promise<Judged> {
  const photo = await renderPlanned(plan);
  const features = await pool.extract(photo.jpeg, photo.crop);
  const ranked = await pool.rank(features, references);
  return { photo, ranked, outcome: outcomeOf(plan, ranked) };
}

beforeAll(async () => {
  pool = createPatternPool(1);
  for (const plan of planCatalogue(INDIVIDUALS, SHAPE)) {
    const photo = await renderPlanned(plan);
    const features = await pool.extract(photo.jpeg, photo.crop, { mirror: false });
    references.push({
      individualId: plan.individualId,
      photoId: plan.photoId,
      flank: plan.flank,
      features,
    });
    referencePhotos.set(plan.photoId, photo);
  }
  for (const plan of queryPlans()) judged.push(await judge(plan));
  for (const [i, id] of INDIVIDUALS.entries()) {
    hard.push(await judge(planPhoto(id, i % 2 === 0 ? 'right' : 'left', 'hard', 0, SHAPE)));
  }
  for (const id of UNKNOWN) {
    for (const c of ['day', 'infrared'] as const)
      unknown.push((await judge(planPhoto(id, 'left', c, 0, SHAPE))).outcome);
  }
}, 240_000);

afterAll(async () => {
  await pool?.close();
});

function of(condition: string): Judged[] {
  return judged.filter((j) => j.photo.plan.condition === condition);
}

/** Row-major 3×3 homography applied to a point. */
function project(h: readonly number[], x: number, y: number): [number, number] {
  const w = h[6] * x + h[7] * y + h[8];
  return [(h[0] * x + h[1] * y + h[2]) / w, (h[3] * x + h[4] * y + h[5]) / w];
}

/** Inverse of a row-major 3×3 matrix (adjugate over determinant). */
function invert(m: readonly number[]): number[] {
  const [a, b, c, d, e, f, g, h, i] = m;
  const det = a * (e * i - f * h) - b * (d * i - f * g) + c * (d * h - e * g);
  const adj = [
    e * i - f * h,
    c * h - b * i,
    b * f - c * e,
    f * g - d * i,
    a * i - c * g,
    c * d - a * f,
    d * h - e * g,
    b * g - a * h,
    a * e - b * d,
  ];
  return adj.map((v) => v / det);
}

/**
 * Distance (in reference-crop widths) between where a matched reference point is and where the
 * painter's ground truth puts the same body point, for each drawn match.
 */
function matchErrors(j: Judged): number[] {
  const best = j.ranked[0];
  const ref = referencePhotos.get(best.photoId);
  const qh = j.photo.truth.bodyToImage;
  const rh = ref?.truth.bodyToImage;
  if (!ref || !qh || !rh) throw new Error('missing ground truth');
  const toBody = invert(qh);
  return best.matches.map(([qx, qy, rx, ry]) => {
    const q = j.photo.crop;
    const [u, v] = project(toBody, q.x + qx * q.width, q.y + qy * q.height);
    const [ex, ey] = project(rh, u, v);
    const r = ref.crop;
    return Math.hypot(r.x + rx * r.width - ex, r.y + ry * r.height - ey) / r.width;
  });
}

describe('pattern ranking on held-out synthetic photos', () => {
  it('should rank the right individual first for most queries and in the top five for nearly all', () => {
    const all = accuracyTable(judged.map((j) => j.outcome)).at(-1);
    expect(all?.queries).toBe(60);
    expect(all?.top1).toBeGreaterThanOrEqual(0.95);
    expect(all?.top5).toBeGreaterThanOrEqual(0.95);
  });

  it('should find flanks photographed mirrored by matching the flipped query', () => {
    const mirrored = of('mirrored');
    expect(mirrored.length).toBeGreaterThanOrEqual(9);
    for (const j of mirrored) {
      expect(j.outcome.rank).toBe(1);
      expect(j.ranked[0].mirrored).toBe(true);
    }
    expect(of('day').every((j) => j.ranked[0].mirrored === false)).toBe(true);
  });

  it('should draw matches that join the same spot of the coat in both photos', () => {
    for (const j of [...of('mirrored'), ...of('day')]) {
      const errors = matchErrors(j).sort((a, b) => a - b);
      expect(errors.length).toBeGreaterThanOrEqual(10);
      // Most verified pairs sit on the rigid trunk, within 2 % of the crop width of the truth.
      expect(errors[Math.floor(errors.length / 2)]).toBeLessThan(0.02);
    }
  });

  it('should match infrared night queries against day references', () => {
    const infrared = of('infrared');
    expect(infrared.length).toBeGreaterThanOrEqual(9);
    expect(infrared.filter((j) => j.outcome.rank === 1).length).toBeGreaterThanOrEqual(9);
    expect(infrared.every((j) => j.photo.truth.lighting === 'infrared')).toBe(true);
  });

  it('should score true pairs above the threshold and wrong individuals below it', () => {
    const t = PATTERN_PARAMS.matchThreshold;
    const outcomes = judged.map((j) => j.outcome);
    const above = outcomes.filter((o) => o.trueScore >= t).length / outcomes.length;
    expect(above).toBeGreaterThanOrEqual(0.95);
    expect(Math.max(...outcomes.flatMap((o) => o.falseScores))).toBeLessThan(t);
  });

  it('should give no individual a high score for an animal that is not in the catalogue', () => {
    expect(unknown).toHaveLength(6);
    for (const o of unknown) {
      expect(o.rank).toBeNull();
      expect(Math.max(0, ...o.falseScores)).toBeLessThan(PATTERN_PARAMS.matchThreshold);
    }
  });
});

/** 1-based rank of an individual in a list of ids (null when absent). */
function rankOf(ids: readonly string[], id: string): number | null {
  const at = ids.indexOf(id);
  return at >= 0 ? at + 1 : null;
}

function topK(ranks: readonly (number | null)[], k: number): number {
  return ranks.filter((r) => r !== null && r <= k).length / ranks.length;
}

describe('pattern combined with the text and space-time signals', () => {
  const survey = () => syntheticSurvey(INDIVIDUALS);

  /** The three rankings of one query: pattern alone, text and space alone, all signals. */
  function rankings(j: Judged) {
    const s = survey();
    const plan = j.photo.plan;
    const ctx = queryContext(s, plan.photoId, plan.individualId, plan.flank);
    const pattern = new Map(
      j.ranked.map((c) => [
        c.individualId,
        { score: c.score, inliers: c.inliers, mirrored: c.mirrored },
      ]),
    );
    return {
      pattern: j.ranked.map((c) => c.individualId),
      textSpace: rankWithSignals(s.pool, ctx).map((c) => c.individualId),
      combined: rankWithSignals(s.pool, { ...ctx, pattern }).map((c) => c.individualId),
      reasons: rankWithSignals(s.pool, { ...ctx, pattern }).flatMap((c) => c.reasons),
    };
  }

  it('should rank better with all signals than with the pattern or text and space alone', () => {
    const rows = [...judged, ...hard].map((j) => ({ j, r: rankings(j) }));
    const id = (x: (typeof rows)[number]) => x.j.photo.plan.individualId;
    const table = (['pattern', 'textSpace', 'combined'] as const).map((k) => {
      const ranks = rows.map((x) => rankOf(x.r[k], id(x)));
      return { ranking: k, top1: topK(ranks, 1), top5: topK(ranks, 5) };
    });
    console.log(
      `\nHeld-out queries (synthetic: ${judged.length} single-condition, ${hard.length} hard), top-1 / top-5 by ranking`,
    );
    console.table(table);
    const [pattern, textSpace, combined] = table;
    // Space and text alone cannot tell apart neighbours with similar notes; the pattern can.
    expect(combined!.top1).toBeGreaterThan(textSpace!.top1);
    expect(combined!.top5).toBeGreaterThan(textSpace!.top5);
    // Where the pattern finds little (the hard photos), space and text still place the animal.
    expect(combined!.top1).toBeGreaterThanOrEqual(pattern!.top1);
    expect(combined!.top5).toBeGreaterThan(pattern!.top5);
    const hardPattern = hard.filter((j) => j.outcome.rank === 1).length;
    console.log(`hard photos: pattern alone ranks ${hardPattern} of ${hard.length} first`);
    expect(
      rows.some((x) => x.r.reasons.some((r) => /^pattern: \d+ matching points/.test(r.text))),
    ).toBe(true);
  });

  it('should print the score distributions of true and false pairs', () => {
    const trueScores = judged.map((j) => j.outcome.trueScore);
    const falseScores = judged.flatMap((j) => j.outcome.falseScores);
    const unknownScores = unknown.map((o) => Math.max(0, ...o.falseScores));
    const rows = {
      'true individual': summarise(trueScores),
      'wrong individuals': summarise(falseScores),
      'best, not catalogued': summarise(unknownScores),
    };
    console.log('\nPattern scores (synthetic held-out photos)');
    console.table(rows);
    expect(rows['true individual'].median).toBeGreaterThan(PATTERN_PARAMS.matchThreshold);
    expect(rows['wrong individuals'].p95).toBeLessThan(PATTERN_PARAMS.matchThreshold);
    expect(rows['best, not catalogued'].max).toBeLessThan(PATTERN_PARAMS.matchThreshold);
  });
});

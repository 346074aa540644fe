/**
 * Scoring a ranking against ground truth: top-1 / top-5 per condition and the scores given to the
 * true individual versus every other individual. Used by the tests and the benchmark (synthetic
 * photos only).
 */
import type { RankedCandidate } from '../../server/pattern/types';
import type { Condition, PlannedPhoto } from './photo-set';

/** What one query's ranking showed. */
export interface QueryOutcome {
  readonly plan: PlannedPhoto;
  /** 1-based rank of the true individual; null when it is not in the ranking. */
  readonly rank: number | null;
  /** Score of the true individual (0 when absent). */
  readonly trueScore: number;
  /** Scores given to every other individual in the ranking. */
  readonly falseScores: readonly number[];
  readonly trueInliers: number;
  readonly bestFalseInliers: number;
  /** Whether the true individual's best match used the flipped query. */
  readonly mirrored: boolean | null;
}

/** Judges one ranking (for an individual not in the catalogue every score is a false score). */
export function outcomeOf(plan: PlannedPhoto, ranked: readonly RankedCandidate[]): QueryOutcome {
  const at = ranked.findIndex((c) => c.individualId === plan.individualId);
  const others = ranked.filter((c) => c.individualId !== plan.individualId);
  return {
    plan,
    rank: at >= 0 ? at + 1 : null,
    trueScore: at >= 0 ? ranked[at].score : 0,
    falseScores: others.map((c) => c.score),
    trueInliers: at >= 0 ? ranked[at].inliers : 0,
    bestFalseInliers: Math.max(0, ...others.map((c) => c.inliers)),
    mirrored: at >= 0 ? ranked[at].mirrored : null,
  };
}

/** Accuracy of one group of queries. */
export interface AccuracyRow {
  readonly condition: Condition | 'all';
  readonly queries: number;
  readonly top1: number;
  readonly top5: number;
}

function row(condition: Condition | 'all', outcomes: readonly QueryOutcome[]): AccuracyRow {
  const n = outcomes.length;
  const within = (k: number) => outcomes.filter((o) => o.rank !== null && o.rank <= k).length;
  return {
    condition,
    queries: n,
    top1: n ? within(1) / n : NaN,
    top5: n ? within(5) / n : NaN,
  };
}

/** Accuracy per condition, then over all queries. */
export function accuracyTable(outcomes: readonly QueryOutcome[]): AccuracyRow[] {
  const conditions = [...new Set(outcomes.map((o) => o.plan.condition))];
  return [
    ...conditions.map((c) =>
      row(
        c,
        outcomes.filter((o) => o.plan.condition === c),
      ),
    ),
    row('all', outcomes),
  ];
}

/** Quantile of a sample (linear interpolation); NaN for an empty one. */
export function quantile(values: readonly number[], q: number): number {
  if (values.length === 0) return NaN;
  const s = [...values].sort((a, b) => a - b);
  const pos = (s.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return s[lo] + (s[hi] - s[lo]) * (pos - lo);
}

/** Summary of a score sample. */
export interface ScoreSummary {
  readonly n: number;
  readonly min: number;
  readonly p05: number;
  readonly median: number;
  readonly p95: number;
  readonly max: number;
}

/** Five-number-style summary of scores. */
export function summarise(values: readonly number[]): ScoreSummary {
  return {
    n: values.length,
    min: values.length ? Math.min(...values) : NaN,
    p05: quantile(values, 0.05),
    median: quantile(values, 0.5),
    p95: quantile(values, 0.95),
    max: values.length ? Math.max(...values) : NaN,
  };
}

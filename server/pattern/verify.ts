/**
 * Geometric verification of one query view against one reference view: brute-force Hamming
 * matching (k = 2) with Lowe's ratio test, the best match per reference keypoint, then a RANSAC
 * homography with guards against degenerate fits. Needs OpenCV (worker threads).
 */
import { DESCRIPTOR_BYTES } from './hamming';
import { type BfMatcher, type Cv, type Mat, release } from './opencv';
import type { SceneryTest } from './scenery';
import { PATTERN_PARAMS, type FeatureView, type MatchedPair } from './types';

/** Outcome of one verification; pairs are in fractions of each view's own frame. */
export interface Verification {
  readonly inliers: number;
  readonly pairs: MatchedPair[];
  /** Why the geometry was refused, when it was. */
  readonly rejected: string | null;
}

/** A view and the pixel size of the working image it came from. */
export interface SizedView {
  readonly view: FeatureView;
  readonly width: number;
  readonly height: number;
}

/** Fewest tentative matches worth a RANSAC run (a homography needs 4; noise fits 4–7 easily). */
const MIN_TENTATIVE = 8;

const none = (rejected: string | null): Verification => ({ inliers: 0, pairs: [], rejected });

function descriptorMat(cv: Cv, view: FeatureView): Mat {
  const n = view.descriptors.length / DESCRIPTOR_BYTES;
  const mat = new cv.Mat(n, DESCRIPTOR_BYTES, cv.CV_8UC1);
  mat.data.set(view.descriptors);
  return mat;
}

/** Ratio-test matches, keeping only the closest query keypoint for each reference keypoint. */
function tentativeMatches(cv: Cv, matcher: BfMatcher, q: Mat, r: Mat): [number, number][] {
  const knn = new cv.DMatchVectorVector();
  const best = new Map<number, { q: number; d: number }>();
  try {
    matcher.knnMatch(q, r, knn, 2);
    for (let i = 0; i < knn.size(); i++) {
      const pair = knn.get(i);
      try {
        if (pair.size() < 2) continue;
        const a = pair.get(0);
        const b = pair.get(1);
        if (a.distance >= PATTERN_PARAMS.ratio * b.distance) continue;
        const seen = best.get(a.trainIdx);
        if (!seen || a.distance < seen.d) best.set(a.trainIdx, { q: a.queryIdx, d: a.distance });
      } finally {
        pair.delete();
      }
    }
  } finally {
    knn.delete();
  }
  return [...best].map(([r, m]) => [m.q, r]);
}

/** Refuses homographies that collapse, explode, mirror or fold the query crop. */
function homographyProblem(h: Float64Array, qw: number, qh: number): string | null {
  const det = (h[0] * h[4] - h[1] * h[3]) / (h[8] * h[8]);
  // A plain-to-plain (or mirrored-to-plain) match of a flank never needs a reflection.
  if (!(det >= PATTERN_PARAMS.minDet && det <= PATTERN_PARAMS.maxDet)) return `det ${det}`;
  for (const [x, y] of [
    [0, 0],
    [qw, 0],
    [0, qh],
    [qw, qh],
  ]) {
    // The projective divisor must keep its sign over the crop, or the fit folds through infinity.
    if ((h[6] * x + h[7] * y + h[8]) * h[8] <= 0) return 'folded';
  }
  return null;
}

function spreadOk(pairs: MatchedPair[]): boolean {
  const min = [1, 1, 1, 1];
  const max = [0, 0, 0, 0];
  for (const p of pairs) {
    for (let k = 0; k < 4; k++) {
      min[k] = Math.min(min[k], p[k]);
      max[k] = Math.max(max[k], p[k]);
    }
  }
  return max.every((m, k) => m - min[k] >= PATTERN_PARAMS.minSpread);
}

/** Reusable verifier for one query view (its descriptor matrix is built once). */
export class Verifier {
  private readonly queryMat: Mat;
  private readonly matcher: BfMatcher;

  constructor(
    private readonly cv: Cv,
    private readonly query: SizedView,
  ) {
    this.queryMat = descriptorMat(cv, query.view);
    this.matcher = new cv.BFMatcher(cv.NORM_HAMMING, false);
  }

  /** Verifies the query against one reference view, leaving out matches on fixed scenery. */
  verify(ref: SizedView, scenery: SceneryTest | null = null): Verification {
    const nq = this.queryMat.rows;
    const nr = ref.view.descriptors.length / DESCRIPTOR_BYTES;
    if (nq < MIN_TENTATIVE || nr < MIN_TENTATIVE) return none('too few keypoints');
    const refMat = descriptorMat(this.cv, ref.view);
    let matches: [number, number][];
    try {
      matches = tentativeMatches(this.cv, this.matcher, this.queryMat, refMat);
    } finally {
      refMat.delete();
    }
    if (scenery) {
      const qp = this.query.view.points;
      const rp = ref.view.points;
      matches = matches.filter(
        ([i, j]) => !scenery(qp[i * 2], qp[i * 2 + 1], rp[j * 2], rp[j * 2 + 1]),
      );
    }
    if (matches.length < MIN_TENTATIVE) return none('too few tentative matches');
    return this.fit(matches, ref);
  }

  private fit(matches: [number, number][], ref: SizedView): Verification {
    const { cv, query } = this;
    const qp = query.view.points;
    const rp = ref.view.points;
    const src: number[] = [];
    const dst: number[] = [];
    for (const [i, j] of matches) {
      src.push(qp[i * 2] * query.width, qp[i * 2 + 1] * query.height);
      dst.push(rp[j * 2] * ref.width, rp[j * 2 + 1] * ref.height);
    }
    const srcMat = cv.matFromArray(matches.length, 1, cv.CV_32FC2, src);
    const dstMat = cv.matFromArray(matches.length, 1, cv.CV_32FC2, dst);
    const mask = new cv.Mat();
    let h: Mat | null = null;
    try {
      const p = PATTERN_PARAMS;
      h = cv.findHomography(
        srcMat,
        dstMat,
        cv.RANSAC,
        p.ransacPx,
        mask,
        p.ransacIters,
        p.ransacConfidence,
      );
      if (h.empty()) return none('no homography');
      const problem = homographyProblem(h.data64F, query.width, query.height);
      if (problem) return none(problem);
      const pairs: MatchedPair[] = [];
      matches.forEach(([i, j], k) => {
        if (mask.data[k]) pairs.push([qp[i * 2], qp[i * 2 + 1], rp[j * 2], rp[j * 2 + 1]]);
      });
      if (!spreadOk(pairs)) return none('inliers bunched together');
      return { inliers: pairs.length, pairs, rejected: null };
    } finally {
      release(srcMat, dstMat, mask, h);
    }
  }

  /** Frees the WebAssembly memory held for the query. */
  delete(): void {
    release(this.queryMat, this.matcher);
  }
}

/**
 * Fixed scenery: a camera trap sees the same rocks, grass and trunks in every photo, and crops of
 * different animals at one station share some of that background. Matches whose two points sit
 * at the same place of the photo frame are that scenery, not coat; on the training set they were
 * the cause of nearly every wrong individual scoring above the threshold (up to 26 "inliers").
 * An animal standing exactly where another photo showed it would also be dropped: rare for an
 * animal on the move, and why the test compares whole-frame positions, not crop positions.
 */
import { PATTERN_PARAMS, type FeatureSet } from './types';

/** Says whether a matched pair (fractions of each crop; query in its view's frame) is scenery. */
export type SceneryTest = (qx: number, qy: number, rx: number, ry: number) => boolean;

/**
 * The scenery test for a query view and a reference, or null when the photos differ in size
 * (different cameras: their frames cannot be compared). The flipped frame position is tested too,
 * because a mirrored photo shows its camera's scenery flipped.
 */
export function sceneryTest(
  query: FeatureSet,
  mirroredView: boolean,
  ref: FeatureSet,
): SceneryTest | null {
  if (query.photoWidth !== ref.photoWidth || query.photoHeight !== ref.photoHeight) return null;
  const tol = PATTERN_PARAMS.sceneryTolerance * query.photoWidth;
  const q = query.crop;
  const r = ref.crop;
  const w = query.photoWidth;
  return (qx, qy, rx, ry) => {
    const ax = q.x + (mirroredView ? 1 - qx : qx) * q.width;
    const ay = q.y + qy * q.height;
    const bx = r.x + rx * r.width;
    const by = r.y + ry * r.height;
    if (Math.abs(ay - by) >= tol) return false;
    return Math.abs(ax - bx) < tol || Math.abs(w - ax - bx) < tol;
  };
}

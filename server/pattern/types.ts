/**
 * Types and tuned constants of the coat-pattern engine. The constants were chosen on a training
 * set of synthetic photos (individuals "TRAIN-*", see bench/pattern-vocabulary.ts) that the
 * evaluation and the tests never use.
 */
import type { Crop } from '../../shared/sort';

/** A crop in fractions of the photo (as sightings store it). */
export type FractionCrop = Crop;

/** A crop in source pixels (top-left corner and size). */
export interface PixelCrop {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Either kind of crop box. */
export type CropBox = FractionCrop | PixelCrop;

/** RGBA pixels, as the image codec returns them. */
export interface RgbaPixels {
  readonly data: Uint8Array | Uint8ClampedArray;
  readonly width: number;
  readonly height: number;
}

/** Local features of one orientation of the crop. */
export interface FeatureView {
  /** x, y per keypoint, in fractions of the working image (of this view's own orientation). */
  readonly points: Float32Array;
  /** 32-byte ORB descriptors, one row per keypoint. */
  readonly descriptors: Uint8Array;
  /** Visual word of each keypoint (index into the vocabulary). */
  readonly words: Uint16Array;
}

/** Everything the shortlist and the verification need about one photo's crop. */
export interface FeatureSet {
  /** Vocabulary the words refer to (features with another vocabulary must be re-extracted). */
  readonly vocabulary: string;
  /** Working image size in pixels (the crop resized to WORKING_SIZE on its long side). */
  readonly width: number;
  readonly height: number;
  /** Where the crop lies in the photo (source pixels) and the photo's size. */
  readonly crop: PixelCrop;
  readonly photoWidth: number;
  readonly photoHeight: number;
  /** The crop as seen. */
  readonly plain: FeatureView;
  /**
   * The crop flipped left to right (points in the flipped image's frame), for queries whose flank
   * may have been photographed mirrored; null when not computed (references need only `plain`).
   */
  readonly mirrored: FeatureView | null;
}

/** A reference photo of an individual in the catalogue. */
export interface ReferenceFeatures {
  readonly individualId: string;
  readonly photoId: string;
  readonly flank: string;
  readonly features: FeatureSet;
}

/** One matched point pair: query x, y and reference x, y, in fractions of each crop. */
export type MatchedPair = readonly [number, number, number, number];

/** One individual in a ranking, judged by its best reference photo. */
export interface RankedCandidate {
  readonly individualId: string;
  /** 0..1: inliers / (inliers + SCORE_HALF_INLIERS); 0 when the geometry was rejected. */
  readonly score: number;
  readonly inliers: number;
  readonly photoId: string;
  /** True when the query matched after being flipped left to right. */
  readonly mirrored: boolean;
  /** IDF-weighted shared spatial words (shortlist evidence). */
  readonly votes: number;
  /** Word matches agreeing with one similarity transform (the cheap pre-verification). */
  readonly prematchInliers: number;
  /** Verified point pairs (query in the unflipped query crop), for drawing. */
  readonly matches: readonly MatchedPair[];
}

/** Tuned constants (chosen on the training set only). */
export const PATTERN_PARAMS = {
  /** Long side of the working image, pixels. */
  workingSize: 800,
  /** ORB keypoints per view. */
  orbFeatures: 700,
  orbScaleFactor: 1.2,
  orbLevels: 8,
  orbEdge: 31,
  /** CLAHE clip limit and tiles: evens out infrared flash fall-off against daylight. */
  claheClip: 2.5,
  claheTiles: 8,
  /** Lowe's ratio test (Lowe 2004, IJCV 60:91). */
  ratio: 0.75,
  /** RANSAC reprojection threshold, pixels of the working image. */
  ransacPx: 6,
  ransacIters: 2000,
  ransacConfidence: 0.995,
  /**
   * Matches whose two points sit at the same place of the photo frame (within this fraction of
   * the photo width) are fixed scenery seen by the same camera, not coat: they are dropped.
   */
  sceneryTolerance: 0.006,
  /** Bounds on |det| of the homography's 2×2 part: outside means a collapsed or exploded fit. */
  minDet: 0.05,
  maxDet: 20,
  /** Inliers must spread over at least this fraction of the reference crop's width and height. */
  minSpread: 0.08,
  /** Inliers at which the normalised score reaches 0.5. */
  scoreHalfInliers: 20,
  /**
   * Scores at or above this are worth showing as a likely match (0.3 ≈ 9 verified inliers). On
   * the training set no wrong individual reached it; see bench/pattern.ts --set train.
   */
  matchThreshold: 0.3,
  /** Shortlist cells, fractions of the crop: a spatial word is a visual word in one cell. */
  cellWidth: 0.05,
  cellHeight: 0.08,
  /** Reference-orientation pairs the shortlist passes to the pre-verification. */
  shortlistPairs: 800,
  /** Window (fractions of the crop) in which two keypoints with the same word may match. */
  gateWidth: 0.15,
  gateHeight: 0.25,
  /** Pre-verification: agreement tolerance (fraction of crop height) and RANSAC samples. */
  prematchTolerance: 0.015,
  prematchIterations: 100,
  /** Pre-verification: word matches farther apart than this many bits (of 256) are dropped. */
  prematchMaxDistance: 64,
  /** Individuals whose best pair goes on to full verification with OpenCV. */
  verifyIndividuals: 8,
} as const;

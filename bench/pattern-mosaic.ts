/**
 * Stand-in reference features for catalogues too large to paint (5,000 individuals would need
 * 30,000 painted photos, ~3 hours here). A stand-in is a mosaic: the crop is cut into 3 × 2 cells
 * and each cell's keypoints (positions, descriptors and words) are copied from a different painted
 * distractor photo of the same flank. Mosaics therefore have real coat statistics in every part
 * of the crop but belong to nobody: no query individual ever donates to one. They are synthetic
 * data made from synthetic data, and they are easier to tell apart from a true match than a
 * real look-alike might be; the benchmark says so where it prints results.
 */
import { Rng, hashString } from '../seeds/photos/random';
import type { ReferenceFeatures } from '../server/pattern/types';

const COLS = 3;
const ROWS = 2;

function cellOf(x: number, y: number): number {
  return Math.min(COLS - 1, Math.floor(x * COLS)) + COLS * Math.min(ROWS - 1, Math.floor(y * ROWS));
}

/** A mosaic reference for a made-up individual, deterministic for its photo id. */
export function mosaicReference(
  individualId: string,
  photoId: string,
  flank: 'left' | 'right',
  donors: readonly ReferenceFeatures[],
): ReferenceFeatures {
  const pool = donors.filter((d) => d.flank === flank);
  if (pool.length === 0) throw new Error(`no ${flank}-flank donors for mosaics`);
  const rng = new Rng(hashString(photoId));
  const chosen = Array.from(
    { length: COLS * ROWS },
    () => pool[rng.int(0, pool.length - 1)].features,
  );
  const points: number[] = [];
  const descriptors: Uint8Array[] = [];
  const words: number[] = [];
  chosen.forEach((donor, cell) => {
    const view = donor.plain;
    for (let i = 0; i < view.words.length; i++) {
      if (cellOf(view.points[i * 2], view.points[i * 2 + 1]) !== cell) continue;
      points.push(view.points[i * 2], view.points[i * 2 + 1]);
      descriptors.push(view.descriptors.subarray(i * 32, i * 32 + 32));
      words.push(view.words[i]);
    }
  });
  const bytes = new Uint8Array(descriptors.length * 32);
  descriptors.forEach((d, i) => bytes.set(d, i * 32));
  return {
    individualId,
    photoId,
    flank,
    features: {
      vocabulary: chosen[0].vocabulary,
      width: chosen[0].width,
      height: chosen[0].height,
      // The first donor's frame: the scenery test then only knows that cell's background, which
      // leaves mosaics a little more likely to match a query's scenery (a pessimistic choice).
      crop: chosen[0].crop,
      photoWidth: chosen[0].photoWidth,
      photoHeight: chosen[0].photoHeight,
      plain: {
        points: Float32Array.from(points),
        descriptors: bytes,
        words: Uint16Array.from(words),
      },
      mirrored: null,
    },
  };
}

/** Ids of the mosaic individuals and their reference photos (2 flanks × `perFlank`). */
export function mosaicPlan(count: number, perFlank = 3) {
  return Array.from({ length: count }, (_, i) => {
    const individualId = `MOSAIC-${String(i).padStart(5, '0')}`;
    return (['left', 'right'] as const).flatMap((flank) =>
      Array.from({ length: perFlank }, (_, k) => ({
        individualId,
        flank,
        photoId: `${individualId}/${flank}/${k}`,
      })),
    );
  }).flat();
}

/**
 * Synthetic evaluation and training photos for the coat-pattern engine, painted by the demo photo
 * generator (seeds/photos). All data here are synthetic. Individuals are named by the set they
 * belong to, so a training individual ("TRAIN-…", used for the vocabulary and every parameter
 * choice) can never appear in an evaluation ("EVAL-…", "TEST-…") or as an unknown ("UNK-…").
 */
import { renderPhoto } from '../../seeds/photos/index';
import { hashString, Rng } from '../../seeds/photos/random';
import type { Flank, PhotoSpec, PhotoTruth, Variation } from '../../seeds/photos/types';
import { decodeJpeg } from '../../server/images/codec';
import type { PixelCrop, RgbaPixels } from '../../server/pattern/types';

/** How a photo was taken: references are clean day photos; queries vary one condition each. */
export type Condition =
  | 'reference'
  | 'day'
  | 'infrared'
  | 'mirrored'
  | 'blurred'
  | 'occluded'
  | 'pose'
  /** Infrared, far, turned, blurred and half hidden at once: where the pattern alone struggles. */
  | 'hard';

/** Query conditions, in the order they are reported. */
export const QUERY_CONDITIONS: readonly Condition[] = [
  'day',
  'infrared',
  'mirrored',
  'blurred',
  'occluded',
  'pose',
];

/** One planned photo and what it shows. */
export interface PlannedPhoto {
  readonly photoId: string;
  readonly individualId: string;
  readonly flank: Flank;
  readonly condition: Condition;
  readonly spec: PhotoSpec;
}

/** Photo size and the number of stations the set spreads over. */
export interface SetShape {
  readonly width: number;
  readonly height: number;
  /** Photos of different individuals share backgrounds when they share a station camera. */
  readonly stations: number;
}

/** Individual ids of a set: e.g. ids('EVAL', 40) → EVAL-000 … EVAL-039. */
export function ids(prefix: string, n: number, first = 0): string[] {
  return Array.from({ length: n }, (_, i) => `${prefix}-${String(first + i).padStart(3, '0')}`);
}

function variationFor(condition: Condition, rng: Rng): Partial<Variation> {
  const base: { -readonly [K in keyof Variation]?: Variation[K] } = {
    position: rng.range(-0.5, 0.5),
    yawDeg: rng.normal(6),
    rollDeg: rng.normal(1.5),
    gait: rng.next(),
    distanceM: rng.range(3, 5),
    wind: rng.range(0, 0.6),
    exposure: 1 + rng.normal(0.08),
  };
  if (condition === 'reference')
    return { ...base, yawDeg: rng.normal(4), distanceM: rng.range(3, 4.5) };
  if (condition === 'mirrored') return { ...base, mirror: true };
  if (condition === 'blurred') return { ...base, motionBlur: rng.range(0.01, 0.025) };
  if (condition === 'occluded') return { ...base, occlusion: rng.range(0.15, 0.25) };
  if (condition === 'hard') {
    return {
      ...base,
      yawDeg: rng.pick([-1, 1]) * rng.range(20, 30),
      distanceM: rng.range(6, 8),
      motionBlur: rng.range(0.025, 0.04),
      occlusion: rng.range(0.3, 0.45),
    };
  }
  if (condition === 'pose') {
    return { ...base, yawDeg: rng.pick([-1, 1]) * rng.range(20, 30), distanceM: rng.range(5, 7.5) };
  }
  return base;
}

/** Plans one photo; the same arguments always give the same spec. */
export function planPhoto(
  individualId: string,
  flank: Flank,
  condition: Condition,
  index: number,
  shape: SetShape,
): PlannedPhoto {
  const photoId = `${individualId}/${flank}/${condition}/${index}`;
  const rng = new Rng(hashString(photoId));
  const station = `PS${String(rng.int(1, shape.stations)).padStart(2, '0')}`;
  const spec: PhotoSpec = {
    width: shape.width,
    height: shape.height,
    seed: hashString(`${photoId}#seed`),
    station,
    camera: rng.pick(['A', 'B']),
    lighting: condition === 'infrared' || condition === 'hard' ? 'infrared' : 'day',
    subject: { kind: 'target', individual: individualId, flank },
    variation: variationFor(condition, rng),
  };
  return { photoId, individualId, flank, condition, spec };
}

/** Reference photos: both flanks × `perFlank` clean day photos of each individual. */
export function planCatalogue(individuals: readonly string[], shape: SetShape, perFlank = 3) {
  return individuals.flatMap((id) =>
    (['left', 'right'] as const).flatMap((flank) =>
      Array.from({ length: perFlank }, (_, i) => planPhoto(id, flank, 'reference', i, shape)),
    ),
  );
}

/** Queries: one photo per condition per individual, flanks alternating between individuals. */
export function planQueries(
  individuals: readonly string[],
  shape: SetShape,
  conditions: readonly Condition[] = QUERY_CONDITIONS,
): PlannedPhoto[] {
  return individuals.flatMap((id, i) =>
    conditions.map((c, k) => planPhoto(id, (i + k) % 2 === 0 ? 'left' : 'right', c, 0, shape)),
  );
}

/** A rendered photo: JPEG bytes, decoded pixels, the crop a reviewer would draw, the truth. */
export interface RenderedSetPhoto {
  readonly plan: PlannedPhoto;
  readonly jpeg: Buffer;
  readonly pixels: RgbaPixels;
  readonly crop: PixelCrop;
  readonly truth: PhotoTruth;
}

/** Largest margin a reviewer adds on any side of the box, as a fraction of the box size. */
export const MAX_CROP_MARGIN = 0.1;

/**
 * The crop a reviewer would draw: the subject's box grown by a different margin on each side
 * (0–10 % of the box, drawn from the photo id), clipped to the frame.
 */
export function reviewerCrop(plan: PlannedPhoto, truth: PhotoTruth): PixelCrop {
  const box = truth.bbox;
  if (!box) throw new Error('target photo without a box');
  const rng = new Rng(hashString(`${plan.photoId}#crop`));
  const m = () => rng.range(0, MAX_CROP_MARGIN);
  const x = Math.max(0, Math.round(box.x - box.width * m()));
  const y = Math.max(0, Math.round(box.y - box.height * m()));
  const right = Math.min(truth.width, Math.round(box.x + box.width * (1 + m())));
  const bottom = Math.min(truth.height, Math.round(box.y + box.height * (1 + m())));
  return { x, y, width: right - x, height: bottom - y };
}

/** Paints and decodes one planned photo. */
export async function renderPlanned(plan: PlannedPhoto): Promise<RenderedSetPhoto> {
  const { jpeg, truth } = await renderPhoto(plan.spec);
  const pixels = await decodeJpeg(jpeg);
  return { plan, jpeg, pixels, crop: reviewerCrop(plan, truth), truth };
}

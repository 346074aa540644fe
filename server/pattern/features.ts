/**
 * Local features of a coat crop: grey, resized to a working size, contrast-normalised with CLAHE
 * (so infrared night photos look like day photos to the detector), then ORB keypoints and binary
 * descriptors (Rublee et al. 2011, ICCV), each quantised to a visual word. Runs where OpenCV is
 * loaded (a worker thread); every Mat and vector is deleted before returning.
 */
import { type Clahe, type Cv, type Mat, type Orb, cvError, loadOpenCv, release } from './opencv';
import { DESCRIPTOR_BYTES } from './hamming';
import {
  PATTERN_PARAMS,
  type CropBox,
  type FeatureSet,
  type FeatureView,
  type PixelCrop,
  type RgbaPixels,
} from './types';
import { type Vocabulary, assignWords, defaultVocabulary } from './vocabulary';

/** Options for extraction. */
export interface ExtractOptions {
  /** Also describe the crop flipped left to right (for queries); default true. */
  readonly mirror?: boolean;
  /** Vocabulary for the words; null leaves words empty (when training a vocabulary). */
  readonly vocabulary?: Vocabulary | null;
}

/** Crops smaller than this (pixels, either side) carry too little pattern to match. */
const MIN_CROP_PX = 16;

/** The crop in whole source pixels, clamped to the photo; the whole photo when none is given. */
export function cropToPixels(crop: CropBox | undefined, width: number, height: number): PixelCrop {
  if (!crop) return { x: 0, y: 0, width, height };
  const [fx, fy, fw, fh] =
    'w' in crop
      ? [crop.x * width, crop.y * height, crop.w * width, crop.h * height]
      : [crop.x, crop.y, crop.width, crop.height];
  const x0 = Math.max(0, Math.min(width, Math.round(fx)));
  const y0 = Math.max(0, Math.min(height, Math.round(fy)));
  const x1 = Math.max(x0, Math.min(width, Math.round(fx + fw)));
  const y1 = Math.max(y0, Math.min(height, Math.round(fy + fh)));
  if (x1 - x0 < MIN_CROP_PX || y1 - y0 < MIN_CROP_PX) {
    throw new RangeError(`crop box ${x1 - x0}×${y1 - y0} px is too small to match a pattern`);
  }
  return { x: x0, y: y0, width: x1 - x0, height: y1 - y0 };
}

/** Working-image size: the crop scaled so its long side is the working size. */
export function workingSize(box: PixelCrop): { width: number; height: number } {
  const s = PATTERN_PARAMS.workingSize / Math.max(box.width, box.height);
  return {
    width: Math.max(1, Math.round(box.width * s)),
    height: Math.max(1, Math.round(box.height * s)),
  };
}

interface Tools {
  readonly orb: Orb;
  readonly clahe: Clahe;
}

let tools: Tools | null = null;

// One detector and one equaliser per thread: both are stateless between calls.
function threadTools(cv: Cv): Tools {
  const p = PATTERN_PARAMS;
  tools ??= {
    orb: new cv.ORB(p.orbFeatures, p.orbScaleFactor, p.orbLevels, p.orbEdge),
    clahe: new cv.CLAHE(p.claheClip, new cv.Size(p.claheTiles, p.claheTiles)),
  };
  return tools;
}

function rgbaCrop(cv: Cv, pixels: RgbaPixels, box: PixelCrop): Mat {
  if (pixels.data.length !== pixels.width * pixels.height * 4) {
    throw new RangeError('pixel data does not match width × height × 4');
  }
  const mat = new cv.Mat(box.height, box.width, cv.CV_8UC4);
  const rowBytes = box.width * 4;
  for (let y = 0; y < box.height; y++) {
    const from = ((box.y + y) * pixels.width + box.x) * 4;
    mat.data.set(pixels.data.subarray(from, from + rowBytes), y * rowBytes);
  }
  return mat;
}

/** Grey, resized, CLAHE-equalised working image of the crop (caller deletes it). */
function workingGrey(cv: Cv, pixels: RgbaPixels, box: PixelCrop): Mat {
  const size = workingSize(box);
  let rgba: Mat | null = null;
  let grey: Mat | null = null;
  let resized: Mat | null = null;
  try {
    rgba = rgbaCrop(cv, pixels, box);
    grey = new cv.Mat();
    cv.cvtColor(rgba, grey, cv.COLOR_RGBA2GRAY);
    resized = new cv.Mat();
    const shrinking = size.width < box.width;
    const method = shrinking ? cv.INTER_AREA : cv.INTER_LINEAR;
    cv.resize(grey, resized, new cv.Size(size.width, size.height), 0, 0, method);
    const out = new cv.Mat();
    threadTools(cv).clahe.apply(resized, out);
    return out;
  } finally {
    release(rgba, grey, resized);
  }
}

/** ORB keypoints and descriptors of a working image, as plain typed arrays. */
function describe(cv: Cv, img: Mat, vocab: Vocabulary | null): FeatureView {
  const kp = new cv.KeyPointVector();
  const desc = new cv.Mat();
  const noMask = new cv.Mat();
  try {
    threadTools(cv).orb.detectAndCompute(img, noMask, kp, desc);
    const n = desc.empty() ? 0 : desc.rows;
    const points = new Float32Array(n * 2);
    for (let i = 0; i < n; i++) {
      const { pt } = kp.get(i);
      points[i * 2] = pt.x / img.cols;
      points[i * 2 + 1] = pt.y / img.rows;
    }
    const descriptors = n > 0 ? desc.data.slice(0, n * DESCRIPTOR_BYTES) : new Uint8Array(0);
    const words = vocab ? assignWords(vocab, descriptors) : new Uint16Array(0);
    return { points, descriptors, words };
  } finally {
    release(kp, desc, noMask);
  }
}

/** Extracts features with an already loaded OpenCV (synchronous; for worker tasks). */
export function extractFeaturesWith(
  cv: Cv,
  pixels: RgbaPixels,
  crop?: CropBox,
  options: ExtractOptions = {},
): FeatureSet {
  const box = cropToPixels(crop, pixels.width, pixels.height);
  const vocab = options.vocabulary === undefined ? defaultVocabulary() : options.vocabulary;
  let grey: Mat | null = null;
  let flipped: Mat | null = null;
  try {
    grey = workingGrey(cv, pixels, box);
    const plain = describe(cv, grey, vocab);
    let mirrored: FeatureView | null = null;
    if (options.mirror ?? true) {
      flipped = new cv.Mat();
      cv.flip(grey, flipped, 1);
      mirrored = describe(cv, flipped, vocab);
    }
    return {
      vocabulary: vocab?.id ?? '',
      width: grey.cols,
      height: grey.rows,
      crop: box,
      photoWidth: pixels.width,
      photoHeight: pixels.height,
      plain,
      mirrored,
    };
  } catch (err) {
    throw cvError(cv, err);
  } finally {
    release(grey, flipped);
  }
}

/** Extracts the features of a photo's crop (whole photo when no crop); loads OpenCV on first use. */
export async function extractFeatures(
  pixels: RgbaPixels,
  crop?: CropBox,
  options: ExtractOptions = {},
): Promise<FeatureSet> {
  const cv = await loadOpenCv();
  return extractFeaturesWith(cv, pixels, crop, options);
}

/**
 * Loads OpenCV's WebAssembly build (@techstark/opencv-js 4.12, pinned) once per thread and
 * describes the few parts of it the pattern engine uses. Meant for worker threads only: the
 * library installs process-wide crash handlers and can be left corrupt by a C++ assertion.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';

/** Memory owned by the WebAssembly heap: must be released with delete(). */
export interface CvObject {
  delete(): void;
}

/** An OpenCV matrix (only the members used here). */
export interface Mat extends CvObject {
  readonly rows: number;
  readonly cols: number;
  readonly data: Uint8Array;
  readonly data64F: Float64Array;
  empty(): boolean;
}

/** A keypoint as embind returns it. */
export interface KeyPoint {
  readonly pt: { readonly x: number; readonly y: number };
  readonly size: number;
  readonly angle: number;
  readonly response: number;
  readonly octave: number;
}

/** A descriptor match as embind returns it. */
export interface DMatch {
  readonly queryIdx: number;
  readonly trainIdx: number;
  readonly distance: number;
}

/** A std::vector exposed by embind. */
export interface CvVector<T> extends CvObject {
  size(): number;
  get(i: number): T;
}

/** The ORB detector. */
export interface Orb extends CvObject {
  detectAndCompute(img: Mat, mask: Mat, kp: CvVector<KeyPoint>, desc: Mat): void;
}

/** Brute-force matcher. */
export interface BfMatcher extends CvObject {
  knnMatch(query: Mat, train: Mat, out: CvVector<CvVector<DMatch>>, k: number): void;
  match(query: Mat, train: Mat, out: CvVector<DMatch>): void;
}

/** Contrast-limited adaptive histogram equalisation. */
export interface Clahe extends CvObject {
  apply(src: Mat, dst: Mat): void;
}

/** A size as embind expects it. */
export interface CvSize {
  readonly width: number;
  readonly height: number;
}

/** The subset of the OpenCV module used by the pattern engine. */
export interface Cv {
  readonly CV_8UC1: number;
  readonly CV_8UC4: number;
  readonly CV_32FC2: number;
  readonly COLOR_RGBA2GRAY: number;
  readonly INTER_AREA: number;
  readonly INTER_LINEAR: number;
  readonly NORM_HAMMING: number;
  readonly RANSAC: number;
  Mat: { new (): Mat; new (rows: number, cols: number, type: number): Mat };
  Size: new (width: number, height: number) => CvSize;
  KeyPointVector: new () => CvVector<KeyPoint>;
  DMatchVector: new () => CvVector<DMatch>;
  DMatchVectorVector: new () => CvVector<CvVector<DMatch>>;
  ORB: new (nfeatures: number, scaleFactor: number, nlevels: number, edgeThreshold: number) => Orb;
  BFMatcher: new (normType: number, crossCheck: boolean) => BfMatcher;
  CLAHE: new (clipLimit: number, tileGridSize: CvSize) => Clahe;
  matFromArray(rows: number, cols: number, type: number, data: ArrayLike<number>): Mat;
  cvtColor(src: Mat, dst: Mat, code: number): void;
  resize(src: Mat, dst: Mat, size: CvSize, fx: number, fy: number, interpolation: number): void;
  flip(src: Mat, dst: Mat, code: number): void;
  findHomography(
    src: Mat,
    dst: Mat,
    method: number,
    threshold: number,
    mask: Mat,
    maxIters: number,
    confidence: number,
  ): Mat;
  exceptionFromPtr(ptr: number): { msg?: string };
}

let loading: Promise<Cv> | null = null;
let loaded: Cv | null = null;

function isCvModule(
  value: unknown,
): value is Cv & { then?: unknown; onRuntimeInitialized?: unknown } {
  return typeof value === 'object' && value !== null && ('Mat' in value || 'then' in value);
}

async function load(): Promise<Cv> {
  const mod: unknown = createRequire(import.meta.url)('@techstark/opencv-js');
  if (!isCvModule(mod)) throw new Error('OpenCV module has an unexpected shape');
  await new Promise<void>((resolve) => {
    if (typeof mod.Mat === 'function') resolve();
    else mod.onRuntimeInitialized = () => resolve();
  });
  // The module's own then() returns the module itself: awaiting it would loop forever.
  delete mod.then;
  return mod;
}

/** Loads OpenCV in this thread (≈ 0.3–0.5 s and ~125 MB the first time). */
export async function loadOpenCv(): Promise<Cv> {
  loading ??= load().then((cv) => (loaded = cv));
  return loading;
}

/** The loaded module; throws when loadOpenCv() has not finished in this thread. */
export function openCv(): Cv {
  if (!loaded) throw new Error('OpenCV is not loaded in this thread: await loadOpenCv() first');
  return loaded;
}

let breakPointer: number | null = null;

/**
 * The top of OpenCV's malloc arena (Emscripten's program break), in bytes. It rises when memory
 * is allocated and not freed, so it stays flat across repeated calls unless something leaks.
 */
export function wasmHeapTop(cv: Cv): number {
  if (breakPointer === null) {
    // The address of the break is a constant of this build, written into its JavaScript glue.
    const glue = readFileSync(
      createRequire(import.meta.url).resolve('@techstark/opencv-js'),
      'utf8',
    );
    const found = /DYNAMICTOP_PTR=(\d+)/.exec(glue);
    if (!found) throw new Error('cannot find the heap break in this OpenCV build');
    breakPointer = Number(found[1]);
  }
  const heap = (cv as Cv & { HEAP32?: Int32Array }).HEAP32;
  if (!heap) throw new Error('this OpenCV build does not expose its heap');
  return heap[breakPointer >> 2];
}

/** Turns whatever OpenCV threw (a C++ exception pointer is a bare number) into an Error. */
export function cvError(cv: Cv, err: unknown): Error {
  if (err instanceof Error) return err;
  if (typeof err === 'number') {
    let msg: string | undefined;
    try {
      msg = cv.exceptionFromPtr(err).msg;
    } catch {
      msg = undefined;
    }
    return new OpenCvError(msg ?? `OpenCV exception at ${err}`);
  }
  return new Error(`OpenCV failed: ${String(err)}`);
}

/** A C++ exception from OpenCV: the thread's instance may be corrupt and should be replaced. */
export class OpenCvError extends Error {
  override readonly name = 'OpenCvError';
}

/** Deletes every object given, ignoring ones already deleted. */
export function release(...objects: (CvObject | null | undefined)[]): void {
  for (const o of objects) {
    try {
      o?.delete();
    } catch {
      // Deleting twice throws a BindingError; the memory is already free.
    }
  }
}

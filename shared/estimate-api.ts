/**
 * Response bodies of the stateless estimation API (`/api/estimate/...`), read by the client.
 *
 * An estimate that does not exist (R = 0, Mb not estimable, σ not identifiable, ...) is never a
 * number: the API answers 200 with that estimate set to null and a plain-language `reason`.
 * Input the estimators cannot use (ragged histories, R > C, unknown traps, a mask too large for
 * memory, ...) is refused with 400 in the one error shape.
 */
import type {
  AiccTable,
  ClosureTest,
  Interval,
  ModelEstimate,
  PlotsResult,
  TwoSampleResult,
} from './estimate';

/** `POST /api/estimate/two-sample`: Lincoln–Petersen and Chapman; `reason` when N does not exist. */
export type TwoSampleResponse = TwoSampleResult;

/** `POST /api/estimate/plots`. */
export type PlotsResponse = PlotsResult;

/** Models the closed-population `models` list holds (other likelihood models go in `otherModels`). */
export const CLOSED_CONTRACT_MODELS = [
  'M0',
  'Mt',
  'Mb',
  'Mh-jackknife',
  'Mh-chao',
  'Mth-chao',
  'Schnabel',
  'Schumacher-Eschmeyer',
] as const;

/** One of {@link CLOSED_CONTRACT_MODELS}. */
export type ClosedContractModel = (typeof CLOSED_CONTRACT_MODELS)[number];

/** Capture summaries for charts: per occasion (n_j, u_j, m_j) and f_k for k = 1..t. */
export interface CaptureSummaryView {
  caught: number[];
  firstCaptures: number[];
  recaptures: number[];
  /** frequencies[k − 1] = animals caught exactly k times. */
  frequencies: number[];
}

/** `POST /api/estimate/closed`. */
export interface ClosedResponse {
  S: number;
  t: number;
  models: (ModelEstimate & { model: ClosedContractModel })[];
  /** Further estimates (the two-class mixture Mh, Pledger 2000), shown beside the main list. */
  otherModels: ModelEstimate[];
  aiccTable: AiccTable;
  closureTest: ClosureTest | null;
  summary: CaptureSummaryView;
  warnings: string[];
  assumptions: string[];
}

/** `POST /api/estimate/secr`: density per km² (coordinates in metres); null with `reason` if none. */
export interface SecrResponse {
  detector: 'proximity' | 'count';
  /** Animals per km². */
  D: number | null;
  se: number | null;
  ci: Interval | null;
  /** Animals per 100 km². */
  densityPer100km2: number | null;
  ciPer100km2: Interval | null;
  /** Present for proximity detectors: detection probability at distance 0 per occasion. */
  g0?: number | null;
  /** Present for count detectors: expected detections at distance 0 per occasion. */
  lambda0?: number | null;
  /** Movement scale of the half-normal detection function, in metres. */
  sigma: number | null;
  logLik: number | null;
  /** Effective sampling area a(θ̂) in km² (so D = n / esa). */
  esa: number | null;
  n: number;
  detections: number;
  reason?: string;
  /** Refit with a 1.5 × wider buffer: buffer in metres, D per km². */
  bufferCheck: { buffer: number; D: number; relativeChange: number } | null;
  mask: { spacing: number; buffer: number; points: number };
  units: { D: 'animals per km²'; sigma: 'm'; esa: 'km²'; mask: 'm' };
  warnings: string[];
  assumptions: string[];
}

/** Progress of a density fit. */
export interface SecrProgressView {
  stage: string;
  /** 0..1 */
  fraction: number;
}

/** `GET /api/estimate/secr/jobs/:id`. */
export interface SecrJobView {
  id: string;
  status: 'running' | 'done' | 'failed';
  progress: SecrProgressView;
  result?: SecrResponse;
  error?: { code: string; message: string };
  createdAt: string;
  finishedAt?: string;
}

/** `POST /api/estimate/secr/jobs`. */
export interface SecrJobCreated {
  id: string;
}

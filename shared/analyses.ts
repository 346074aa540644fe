/**
 * Sessions built from a project's own catalogue, and saved analyses with their data freeze.
 * Request schemas are shared by the server (validation) and the client (types).
 */
import { z } from 'zod';
import type { TwoSampleResult } from './estimate';
import type { SecrProgressView, ClosedResponse, SecrResponse } from './estimate-api';
import { QUALITIES, type Quality } from './sort';

const id = (what: string) =>
  z.string().regex(/^[0-9a-f]{20}$/, { message: `${what} is not a valid id.` });

/** Which sightings make capture histories (see {@link FLANK_POLICY_RULES}). */
export const FLANK_POLICIES = ['left', 'right', 'both-linked', 'all'] as const;
export type FlankPolicy = (typeof FLANK_POLICIES)[number];

/** Short names of the flank policies, for forms and reports. */
export const FLANK_POLICY_LABELS: Record<FlankPolicy, string> = {
  left: 'Left-flank histories',
  right: 'Right-flank histories',
  'both-linked': 'Both-flank-linked individuals only',
  all: 'All confirmed sightings',
};

/** What each flank policy keeps, in plain words (shown beside every result). */
export const FLANK_POLICY_RULES: Record<FlankPolicy, string> = {
  left: 'Only sightings showing the left flank (flank left or both) count; each individual is one history.',
  right:
    'Only sightings showing the right flank (flank right or both) count; each individual is one history.',
  'both-linked':
    'Only individuals known from both flanks (confirmed left and right sightings, a both-flank sighting, or reference photos of each flank) count, with all their confirmed sightings.',
  all: 'Every confirmed sighting counts, whatever flank it shows; this is safe only when left and right identities are linked.',
};

/** Photo grades, best first; a minimum quality keeps that grade and the better ones. */
export const QUALITY_ORDER: readonly Quality[] = ['good', 'fair', 'poor'];

/** Grades a minimum quality admits. */
export function qualitiesAtLeast(min: Quality): Quality[] {
  return QUALITY_ORDER.slice(0, QUALITY_ORDER.indexOf(min) + 1);
}

/** Longest session accepted (days). */
export const MAX_SESSION_DAYS = 366;
/** Most occasions a session may have. */
export const MAX_OCCASIONS = 1000;
/** Common practice for large carnivores such as tigers and leopards: closed for up to ~90 days. */
export const DEFAULT_CLOSURE_DAYS = 90;

const isoTime = (what: string) =>
  z.iso.datetime({ offset: true, message: `${what} must be a date and time (ISO 8601).` });

/** Body of `POST /api/projects/:slug/sessions/preview` (and the session part of an analysis). */
export const sessionParamsSchema = z
  .object({
    start: isoTime('start'),
    end: isoTime('end'),
    /** Stations in the session; omitted or null means every station of the project. */
    stationIds: z.array(id('stationId')).min(1).max(2000).nullable().default(null),
    /** Occasion length; defaults to the project's occasion length. Pooled days are multiples of 24. */
    occasionHours: z
      .number()
      .int({ message: 'occasionHours must be a whole number of hours.' })
      .min(1)
      .max(24 * 30)
      .optional(),
    flankPolicy: z.enum(FLANK_POLICIES).default('left'),
    minQuality: z.enum(QUALITIES).default('fair'),
    /** Days over which the species can be treated as closed; longer sessions are warned about. */
    closurePeriodDays: z.number().positive().max(MAX_SESSION_DAYS).default(DEFAULT_CLOSURE_DAYS),
  })
  .strict()
  .superRefine((v, ctx) => {
    const days = (Date.parse(v.end) - Date.parse(v.start)) / 86_400_000;
    if (!(days > 0)) {
      ctx.addIssue({
        code: 'custom',
        path: ['end'],
        message: 'The session must end after it starts.',
      });
    } else if (days > MAX_SESSION_DAYS) {
      ctx.addIssue({
        code: 'custom',
        path: ['end'],
        message: `A session lasts at most ${MAX_SESSION_DAYS} days; this one lasts ${Math.round(days)}.`,
      });
    }
  });

/** Session parameters as sent. */
export type SessionParamsInput = z.input<typeof sessionParamsSchema>;

/** Session parameters after defaults, as stored with an analysis (times in UTC). */
export interface SessionParameters {
  start: string;
  end: string;
  stationIds: string[] | null;
  occasionHours: number;
  flankPolicy: FlankPolicy;
  minQuality: Quality;
  closurePeriodDays: number;
}

/** SECR settings for a session: detector type and an optional habitat mask (metres). */
export const secrOptionsSchema = z
  .object({
    detector: z.enum(['proximity', 'count']).default('proximity'),
    mask: z
      .object({ spacing: z.number().positive(), buffer: z.number().positive() })
      .strict()
      .optional(),
  })
  .strict();

/** Parsed SECR settings. */
export type SecrOptions = z.infer<typeof secrOptionsSchema>;

/** Body of `POST …/sessions/estimate` and `POST …/sessions/secr-jobs`. */
export const sessionRunSchema = z
  .object({ session: sessionParamsSchema, secr: secrOptionsSchema.nullable().default(null) })
  .strict();

/** Body of `POST /api/projects/:slug/analyses`: run and save. */
export const createAnalysisSchema = z
  .object({
    name: z.string().trim().min(1, { message: 'Give the analysis a name.' }).max(120),
    session: sessionParamsSchema,
    secr: secrOptionsSchema.nullable().default(null),
  })
  .strict();

/** Parsed analysis body. */
export type CreateAnalysisBody = z.infer<typeof createAnalysisSchema>;

/** What an analysis was run with. */
export interface AnalysisParameters {
  session: SessionParameters;
  secr: SecrOptions | null;
}

/** Tables of a session that can be downloaded as CSV. */
export const SESSION_TABLES = ['effort', 'histories', 'detections', 'stations'] as const;
export type SessionTable = (typeof SESSION_TABLES)[number];

/** A station of a session: exact position and metres on a local plane. */
export interface SessionStation {
  id: string;
  code: string;
  lat: number;
  lon: number;
  x: number;
  y: number;
}

/**
 * The inputs of a session, exactly what the estimators read: the data freeze of an analysis.
 * `detections` is sparse: [individual index, occasion index, station index, count].
 */
export interface SessionInputs {
  parameters: SessionParameters;
  occasions: { start: string; end: string }[];
  stations: SessionStation[];
  individuals: { id: string; code: string }[];
  /** effort[k][s]: days station k was active during occasion s (0 = off, not "not seen"). */
  effort: number[][];
  /** One 0/1 string per individual. */
  histories: string[];
  detections: [number, number, number, number][];
  /** Confirmed sightings that became detections. */
  sightingIds: string[];
}

/** Counts that explain a session. */
export interface SessionSummary {
  occasions: number;
  stations: number;
  activeStations: number;
  individuals: number;
  /** Detections: independent events in which an individual was confirmed. */
  detections: number;
  sightings: number;
  effortDays: number;
  leftOut: { flank: number; quality: number; offEffort: number };
}

/** `POST …/sessions/preview`. */
export interface SessionPreview {
  inputs: SessionInputs;
  hash: string;
  summary: SessionSummary;
  warnings: string[];
}

/** The older two-step density at one buffer width. */
export interface TwoStepView {
  width: 'half-mmdm' | 'mmdm';
  mmdm: number | null;
  W: number | null;
  areaKm2: number | null;
  densityPer100km2: number | null;
  se: number | null;
  reason?: string;
}

/** Two-step densities from a closed-population N̂, for comparison with SECR only. */
export interface TwoStepComparison {
  basis: { model: string; N: number; se: number | null };
  halfMmdm: TwoStepView;
  mmdm: TwoStepView;
  critique: string;
}

/** Everything an analysis (or an unsaved run) estimated. */
export interface AnalysisResults {
  summary: SessionSummary;
  warnings: string[];
  closed: ClosedResponse | null;
  closedReason: string | null;
  /** Lincoln–Petersen and Chapman, when the session has exactly two occasions. */
  twoSample: TwoSampleResult | null;
  twoStep: TwoStepComparison | null;
  twoStepReason: string | null;
  secrRequested: boolean;
  secr: SecrResponse | null;
  secrReason: string | null;
}

/** Status of a saved analysis: SECR fits finish after the save. */
export type AnalysisStatus = 'running' | 'done' | 'failed';

/** One line of the saved analyses list. */
export interface AnalysisListItem {
  id: string;
  name: string;
  status: AnalysisStatus;
  createdAt: string;
  createdBy: string | null;
  hash: string;
  start: string;
  end: string;
  flankPolicy: FlankPolicy;
  individuals: number;
  occasions: number;
  best: { model: string; N: number } | null;
  densityPer100km2: number | null;
}

/** An identity change that touched individuals of an analysis after it was saved. */
export interface ChangeSince {
  id: string;
  kind: string;
  at: string;
  reason: string;
  individuals: string[];
}

/** Whether the catalogue still gives the inputs an analysis froze. */
export interface FreezeStatus {
  hash: string;
  currentHash: string | null;
  matches: boolean;
  /** Why the inputs could not be rebuilt (e.g. a station was removed). */
  problem: string | null;
  changesSince: ChangeSince[];
  checkedAt: string;
}

/** `GET …/analyses/:id`. */
export interface AnalysisDetail {
  id: string;
  name: string;
  status: AnalysisStatus;
  error: string | null;
  parameters: AnalysisParameters;
  hash: string;
  inputs: SessionInputs;
  results: AnalysisResults;
  createdAt: string;
  createdBy: string | null;
  finishedAt: string | null;
  progress: SecrProgressView | null;
  freeze: FreezeStatus;
}

/** A before/after pair; change is after − before when both exist. */
export interface Difference {
  before: number | null;
  after: number | null;
  change: number | null;
}

/** `POST …/analyses/:id/rerun`: the saved results beside the same parameters on today's catalogue. */
export interface RerunComparison {
  savedHash: string;
  currentHash: string;
  changed: boolean;
  saved: AnalysisResults;
  current: AnalysisResults;
  currentInputs: SessionInputs;
  differences: {
    S: Difference;
    detections: Difference;
    sightings: Difference;
    occasions: Difference;
    densityPer100km2: Difference;
    models: (Difference & { model: string })[];
    individualsAppeared: { id: string; code: string }[];
    individualsDisappeared: { id: string; code: string }[];
    sightingsAppeared: string[];
    sightingsDisappeared: string[];
  };
}

/** `GET …/analyses`: newest first, keyset pages. */
export interface AnalysisPage {
  items: AnalysisListItem[];
  next: string | null;
}

/** `GET …/sessions/defaults`: what the session form starts from. */
export interface SessionDefaults {
  timezone: string;
  occasionHours: number;
  /** First and last day with a deployment, in the project's time zone (YYYY-MM-DD), if any. */
  firstDay: string | null;
  lastDay: string | null;
  stations: { id: string; code: string; name: string }[];
}

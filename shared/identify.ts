import { z } from 'zod';
import { hasSomeField } from './patch';
import type { AgeClass, Crop, Flank, Quality, Sex, SightingState } from './sort';

const id = (what: string) =>
  z.string().regex(/^[0-9a-f]{20}$/, { message: `${what} is not a valid id.` });

/** Verdicts of a reviewer's call. */
export const VERDICTS = ['match', 'new', 'unidentifiable'] as const;
export type Verdict = (typeof VERDICTS)[number];

const tag = z.string().trim().min(1).max(60);

/** What a reviewer says about a new individual. */
export const newIndividualSchema = z
  .object({
    nickname: z.string().trim().max(60).nullable().default(null),
    sex: z.enum(['female', 'male', 'unknown']).default('unknown'),
    notes: z.string().trim().max(2000).default(''),
    tags: z.array(tag).max(30).default([]),
  })
  .strict();

/** Body of `POST /api/projects/:slug/sightings/:id/calls`. */
export const callBodySchema = z
  .object({
    verdict: z.enum(VERDICTS, { message: 'verdict must be match, new or unidentifiable.' }),
    individualId: id('individualId').optional(),
    individual: newIndividualSchema.optional(),
    note: z.string().trim().max(500).default(''),
  })
  .strict()
  .superRefine((v, ctx) => {
    if (v.verdict === 'match' && !v.individualId) {
      ctx.addIssue({
        code: 'custom',
        path: ['individualId'],
        message: 'A match needs the individual it matches.',
      });
    }
    if (v.verdict !== 'match' && v.individualId) {
      ctx.addIssue({
        code: 'custom',
        path: ['individualId'],
        message: 'Only a match names an individual.',
      });
    }
    if (v.verdict !== 'new' && v.individual) {
      ctx.addIssue({
        code: 'custom',
        path: ['individual'],
        message: 'Only a new individual takes a description.',
      });
    }
  });
export type CallBody = z.infer<typeof callBodySchema>;

/** Body of `PATCH /api/projects/:slug/individuals/:id`. */
export const updateIndividualBodySchema = z
  .object({
    nickname: z.string().trim().max(60).nullable(),
    sex: z.enum(['female', 'male', 'unknown']),
    notes: z.string().trim().max(2000),
    tags: z.array(tag).max(30),
  })
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' });

/** Body of `PUT /api/projects/:slug/individuals/:id/references`. */
export const referencesBodySchema = z
  .object({
    flank: z.enum(['left', 'right', 'other']),
    photoIds: z.array(id('photoId')).max(12),
  })
  .strict();

/** Query of the catalogue list. */
export const catalogueQuerySchema = z
  .object({
    query: z.string().max(200).optional(),
    sex: z.enum(['female', 'male', 'unknown']).optional(),
    coverage: z.enum(['both', 'left', 'right', 'partial', 'none']).optional(),
    stationId: id('stationId').optional(),
    seenAfter: z.iso.date().optional(),
    status: z.enum(['active', 'merged', 'all']).default('active'),
    limit: z.coerce.number().int().min(1).max(5000).default(5000),
  })
  .strict();

/** The flanks an individual is known from. */
export interface FlankCoverage {
  left: boolean;
  right: boolean;
  /** Known from one flank only (not yet linked by a both-flank sighting). */
  partial: boolean;
}

/** A reference photo as shown. */
export interface ReferencePhotoView {
  photoId: string;
  flank: 'left' | 'right' | 'other';
  thumbUrl: string;
  previewUrl: string;
}

/** One entry of the catalogue. */
export interface CatalogueEntry {
  id: string;
  code: string | null;
  nickname: string | null;
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
  status: 'provisional' | 'active' | 'merged' | 'discarded';
  mergedInto: string | null;
  aliases: string[];
  coverage: FlankCoverage;
  references: ReferencePhotoView[];
  sightings: number;
  stations: string[];
  firstSeen: string | null;
  lastSeen: string | null;
  lastStation: string | null;
}

/** One reason behind a candidate's rank, shown to the reviewer. */
export interface CandidateReason {
  signal: 'text' | 'space-time' | 'sex' | 'flank' | 'pattern';
  weight: number;
  text: string;
}

/** A ranked candidate for a sighting. */
export interface Candidate {
  individualId: string;
  code: string;
  nickname: string | null;
  score: number;
  reasons: CandidateReason[];
  references: ReferencePhotoView[];
  sex: 'female' | 'male' | 'unknown';
  notes: string;
  tags: string[];
}

/** The sighting to identify, with what the reviewer needs to see. */
export interface SightingToIdentify {
  id: string;
  eventId: string;
  flank: Flank;
  quality: Quality;
  sex: Sex | null;
  ageClass: AgeClass | null;
  crop: Crop | null;
  bestPhoto: { id: string; previewUrl: string; thumbUrl: string; cameraLabel: string };
  photos: {
    id: string;
    previewUrl: string;
    thumbUrl: string;
    cameraLabel: string;
    takenAt: string | null;
  }[];
  stationId: string;
  stationCode: string;
  start: string;
  state: SightingState;
  /** Which review this is (1 or 2); never who made the first or what they called. */
  round: 1 | 2;
  leaseUntil: string;
}

/** Whether the coat pattern took part in a ranking, and why not when it did not. */
export interface PatternStatus {
  /** ready: compared; pending: features still being computed; unavailable: comparison failed. */
  state: 'ready' | 'pending' | 'unavailable';
  /** Reference photos with features the sighting was compared with. */
  references: number;
  text: string;
}

/** Answer of `GET /api/projects/:slug/identify/next`. */
export interface IdentifyNext {
  sighting: SightingToIdentify;
  candidates: Candidate[];
  pattern: PatternStatus;
}

/**
 * Answer of `GET /api/projects/:slug/sightings/:id/pattern-matches/:photoId`: verified point pairs
 * between the sighting's best photo and a reference photo, in fractions of each whole photo.
 */
export interface PatternMatchesView {
  referencePhotoId: string;
  inliers: number;
  score: number;
  /** True when the sighting's photo matched after being flipped left to right. */
  mirrored: boolean;
  /** [sighting x, y, reference x, y] per pair. */
  pairs: [number, number, number, number][];
  /** Pixel sizes of the two photos (for drawing them side by side at their own aspect ratios). */
  sightingPhoto: { width: number; height: number };
  referencePhoto: { width: number; height: number };
}

/** Answer of `POST /api/projects/:slug/sightings/:id/calls`. */
export interface CallResult {
  sighting: { id: string; state: SightingState; individualId: string | null };
  call: { id: string; verdict: Verdict; individualId: string | null };
  individual?: { id: string; code: string | null; status: string };
}

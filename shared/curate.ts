import { z } from 'zod';

const id = (what: string) =>
  z.string().regex(/^[0-9a-f]{20}$/, { message: `${what} is not a valid id.` });
const reason = z
  .string()
  .trim()
  .min(3, { message: 'Say why, in a few words (at least 3 characters).' })
  .max(1000);
const photoList = z.array(id('photoId')).max(12);

/** Body of `POST /api/projects/:slug/individuals/:id/merge`. */
export const mergeBodySchema = z
  .object({
    into: id('into'),
    reason,
    /** Reference photos the survivor keeps per flank; omitted flanks combine both animals' photos. */
    references: z
      .object({ left: photoList, right: photoList, other: photoList })
      .partial()
      .strict()
      .optional(),
  })
  .strict();

/** Body of `POST /api/projects/:slug/individuals/:id/split`. */
export const splitBodySchema = z
  .object({
    sightingIds: z
      .array(id('sightingId'))
      .min(1, { message: 'Choose at least one sighting to move.' })
      .max(5000),
    into: id('into').optional(),
    reason,
    individual: z
      .object({
        nickname: z.string().trim().max(60).nullable().default(null),
        sex: z.enum(['female', 'male', 'unknown']).default('unknown'),
        notes: z.string().trim().max(2000).default(''),
        tags: z.array(z.string().trim().min(1).max(60)).max(30).default([]),
      })
      .strict()
      .optional(),
  })
  .strict();

/** Body of `POST /api/projects/:slug/sightings/:id/resolve`: the curator's decision on a dispute. */
export const resolveBodySchema = z
  .object({
    verdict: z.enum(['match', 'new', 'unidentifiable']),
    individualId: id('individualId').optional(),
    reason,
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
  });

/** Body of `POST /api/projects/:slug/duplicates/dismiss`. */
export const dismissBodySchema = z
  .object({ first: id('first'), second: id('second'), reason: reason.optional() })
  .strict();

/** Kinds of identity change. */
export type ChangeKind = 'merge' | 'split' | 'resolve' | 'undo';

/** An identity change as the history shows it. */
export interface IdentityChangeView {
  id: string;
  kind: ChangeKind;
  by: string;
  at: string;
  reason: string;
  summary: string;
  individuals: { id: string; code: string | null }[];
  moved: { sightings: number; calls: number };
  undoes: string | null;
  undoneBy: string | null;
}

/** One piece of evidence that two individuals may be the same animal. */
export interface DuplicateEvidence {
  kind: 'opposite-flanks' | 'similar-marks' | 'interleaved';
  text: string;
}

/** A suggested duplicate pair. */
export interface DuplicateSuggestion {
  first: {
    id: string;
    code: string;
    nickname: string | null;
    flanks: string;
    references: { photoId: string; flank: string; thumbUrl: string }[];
  };
  second: {
    id: string;
    code: string;
    nickname: string | null;
    flanks: string;
    references: { photoId: string; flank: string; thumbUrl: string }[];
  };
  score: number;
  evidence: DuplicateEvidence[];
}

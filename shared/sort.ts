import { z } from 'zod';
import { hasSomeField } from './patch';
import type { PhotoFlag } from './ingest';

const id = (what: string) =>
  z.string().regex(/^[0-9a-f]{20}$/, { message: `${what} is not a valid id.` });

/** Camtrap DP observation types a reviewer can give an event ('unclassified' clears a label). */
export const SORT_LABELS = ['blank', 'human', 'vehicle', 'animal', 'unknown'] as const;
export type SortLabel = (typeof SORT_LABELS)[number];

/** Flanks as recorded per sighting. */
export const FLANKS = ['left', 'right', 'both', 'front', 'back', 'unknown'] as const;
export type Flank = (typeof FLANKS)[number];

/** Photo quality grades (higher grades only are recommended for capture–recapture). */
export const QUALITIES = ['good', 'fair', 'poor'] as const;
export type Quality = (typeof QUALITIES)[number];

export const SEXES = ['female', 'male', 'unknown'] as const;
export type Sex = (typeof SEXES)[number];

/** Camtrap DP life stages, plus unknown. */
export const AGE_CLASSES = ['adult', 'subadult', 'juvenile', 'unknown'] as const;
export type AgeClass = (typeof AGE_CLASSES)[number];

/** Sighting states. */
export const SIGHTING_STATES = [
  'open',
  'proposed',
  'confirmed',
  'disputed',
  'unidentifiable',
] as const;
export type SightingState = (typeof SIGHTING_STATES)[number];

/** Query of `GET /api/projects/:slug/sort/next`. */
export const sortNextQuerySchema = z
  .object({
    limit: z.coerce.number().int().min(1).max(50).default(10),
    order: z.enum(['oldest', 'station']).default('oldest'),
    stationId: id('stationId').optional(),
    deploymentId: id('deploymentId').optional(),
    from: z.iso.datetime({ offset: true }).optional(),
    to: z.iso.datetime({ offset: true }).optional(),
    flag: z.string().max(40).optional(),
  })
  .strict();
export type SortNextQuery = z.infer<typeof sortNextQuerySchema>;

const labelShape = {
  label: z.enum([...SORT_LABELS, 'unclassified'], {
    message:
      'label must be one of blank, human, vehicle, animal, unknown (or unclassified to clear).',
  }),
  species: z.string().trim().min(2).max(120).optional(),
  count: z.number().int().min(1).max(500).optional(),
};

function speciesRule(v: { label: string; species?: string }, ctx: z.RefinementCtx): void {
  if (v.label === 'animal' && !v.species) {
    ctx.addIssue({
      code: 'custom',
      path: ['species'],
      message: 'Say which species for an animal label.',
    });
  }
  if (v.label !== 'animal' && v.species) {
    ctx.addIssue({
      code: 'custom',
      path: ['species'],
      message: 'Only animal labels take a species.',
    });
  }
}

/** Body of `POST /api/projects/:slug/events/:id/label`. */
export const labelBodySchema = z
  .object({ ...labelShape, expectedVersion: z.number().int().min(0).optional() })
  .strict()
  .superRefine(speciesRule);
export type LabelBody = z.infer<typeof labelBodySchema>;

/** Body of `POST /api/projects/:slug/events/label-batch`. */
export const batchLabelBodySchema = z
  .object({ ...labelShape, eventIds: z.array(id('eventId')).min(1).max(500) })
  .strict()
  .superRefine(speciesRule);

const fraction = z.number().min(0).max(1);

/** A crop box in fractions of the photo (x, y of the top-left corner, width, height). */
export const cropSchema = z
  .object({ x: fraction, y: fraction, w: fraction.positive(), h: fraction.positive() })
  .strict()
  .refine((c) => c.x + c.w <= 1.0001 && c.y + c.h <= 1.0001, {
    message: 'The crop box must lie inside the photo.',
  });
export type Crop = z.infer<typeof cropSchema>;

const sightingShape = {
  flank: z.enum(FLANKS, { message: 'flank must be left, right, both, front, back or unknown.' }),
  quality: z.enum(QUALITIES, { message: 'quality must be good, fair or poor.' }),
  bestPhotoId: id('bestPhotoId'),
  crop: cropSchema.nullable(),
  sex: z.enum(SEXES).nullable(),
  ageClass: z.enum(AGE_CLASSES).nullable(),
};

/** Body of `POST /api/projects/:slug/events/:id/sightings`. */
export const createSightingBodySchema = z
  .object({
    ...sightingShape,
    crop: sightingShape.crop.optional().default(null),
    sex: sightingShape.sex.optional().default(null),
    ageClass: sightingShape.ageClass.optional().default(null),
  })
  .strict();
export type CreateSightingBody = z.infer<typeof createSightingBodySchema>;

/** Body of `PATCH /api/projects/:slug/sightings/:id`. */
export const updateSightingBodySchema = z
  .object(sightingShape)
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' });

/** Body of `PUT /api/projects/:slug/species`: the quick-pick list in order. */
export const speciesListBodySchema = z
  .object({
    species: z
      .array(
        z
          .object({
            scientific: z.string().trim().min(2).max(120),
            common: z.string().trim().min(1).max(120),
          })
          .strict(),
      )
      .max(40),
  })
  .strict();

/** A photo of an event as the Sort screen gets it. */
export interface EventPhoto {
  id: string;
  thumbUrl: string;
  previewUrl: string;
  deploymentId: string;
  cameraLabel: string;
  takenAt: string | null;
  flags: PhotoFlag[];
  blurred: boolean;
}

/** A sighting as the API shows it. */
export interface SightingView {
  id: string;
  eventId: string;
  flank: Flank;
  quality: Quality;
  bestPhotoId: string;
  crop: Crop | null;
  sex: Sex | null;
  ageClass: AgeClass | null;
  state: SightingState;
  individualId: string | null;
  createdAt: string;
}

/** An event with its photos, label and sightings. */
export interface EventView {
  id: string;
  stationId: string;
  stationCode: string;
  start: string;
  end: string;
  photoCount: number;
  photos: EventPhoto[];
  label: SortLabel | null;
  species: string | null;
  count: number | null;
  sortedBy: { id: string; name: string } | null;
  sortedAt: string | null;
  version: number;
  leaseUntil: string | null;
  sightings: SightingView[];
}

/** One entry of a project's species list. */
export interface SpeciesEntry {
  scientific: string;
  common: string;
  target: boolean;
}

import { z } from 'zod';
import { hasSomeField } from './patch';
import { timeZoneSchema } from './projects';

/** Camtrap DP 1.0.2 deployments.featureType values. */
export const FEATURE_TYPES = [
  'roadPaved',
  'roadDirt',
  'trailHiking',
  'trailGame',
  'roadUnderpass',
  'roadOverpass',
  'roadBridge',
  'culvert',
  'burrow',
  'nestSite',
  'carcass',
  'waterSource',
  'fruitingTree',
] as const;
export type FeatureType = (typeof FEATURE_TYPES)[number];

/** Feature types whose locations are never public at fine resolution (dens, nests, carcasses, water). */
export const SENSITIVE_FEATURES: readonly FeatureType[] = [
  'burrow',
  'nestSite',
  'carcass',
  'waterSource',
];

const latitude = z
  .number({ message: 'Latitude must be a number of decimal degrees.' })
  .min(-90, { message: 'Latitude must be between −90 and 90.' })
  .max(90, { message: 'Latitude must be between −90 and 90.' });
const longitude = z
  .number({ message: 'Longitude must be a number of decimal degrees.' })
  .min(-180, { message: 'Longitude must be between −180 and 180.' })
  .max(180, { message: 'Longitude must be between −180 and 180.' });

export const stationCodeSchema = z
  .string({ message: 'A station code is required.' })
  .trim()
  .min(1, { message: 'A station code is required.' })
  .max(40, { message: 'A station code has at most 40 characters.' })
  .regex(/^[A-Za-z0-9][A-Za-z0-9._-]*$/, {
    message: 'A station code uses letters, digits, dots, hyphens and underscores.',
  });

/** Body of `POST /api/projects/:slug/stations`. */
export const createStationBodySchema = z
  .object({
    code: stationCodeSchema,
    name: z.string().trim().max(120).default(''),
    lat: latitude,
    lon: longitude,
    notes: z.string().max(2000).default(''),
  })
  .strict();
export type CreateStationBody = z.infer<typeof createStationBodySchema>;

/** Body of `PATCH /api/projects/:slug/stations/:id`. */
export const updateStationBodySchema = z
  .object({
    code: stationCodeSchema,
    name: z.string().trim().max(120),
    lat: latitude,
    lon: longitude,
    notes: z.string().max(2000),
  })
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' });

/** A station as the API shows it; coordinates generalised (or null) for roles that must not see them. */
export interface StationView {
  id: string;
  code: string;
  name: string;
  lat: number | null;
  lon: number | null;
  coordinatePrecision: number | null;
  coordinatesWithheld: boolean;
  notes: string;
  deployments: number;
  cameraDays: number;
  stationDays: number;
}

/** One row's problems in a station CSV import. */
export interface StationImportRowReport {
  row: number;
  code: string | null;
  problems: string[];
}

/** Result of a station CSV import (or dry run). */
export interface StationImportReport {
  imported: number;
  rows: number;
  problems: StationImportRowReport[];
  dryRun: boolean;
}

const isoInstant = z
  .string({ message: 'A date and time is required.' })
  .refine(
    (s) =>
      /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:\d{2})$/.test(s) &&
      !Number.isNaN(Date.parse(s)),
    {
      message:
        'Use an ISO 8601 date and time with a zone, e.g. 2026-07-01T08:30:00Z or 2026-07-01T11:30:00+03:00.',
    },
  )
  .transform((s) => new Date(s).toISOString().replace(/\.000Z$/, 'Z'));

const deploymentShape = {
  stationId: z.string().regex(/^[0-9a-f]{20}$/, { message: 'stationId is not a valid id.' }),
  cameraLabel: z
    .string()
    .trim()
    .min(1, { message: 'A camera label is required (e.g. A or B).' })
    .max(40),
  cameraSerial: z.string().trim().max(80).nullable(),
  start: isoInstant,
  end: isoInstant,
  timezone: timeZoneSchema,
  clockOffsetSeconds: z
    .number()
    .int()
    .min(-50 * 365 * 86400)
    .max(50 * 365 * 86400),
  lastWorking: isoInstant.nullable(),
  featureType: z.enum(FEATURE_TYPES).nullable(),
  baitUse: z.boolean(),
  notes: z.string().max(2000),
};

function checkWindow(
  d: { start?: string; end?: string; lastWorking?: string | null },
  ctx: z.RefinementCtx,
): void {
  if (d.start && d.end && d.end <= d.start) {
    ctx.addIssue({ code: 'custom', path: ['end'], message: 'The end must be after the start.' });
  }
  if (d.lastWorking && d.start && d.lastWorking < d.start) {
    ctx.addIssue({
      code: 'custom',
      path: ['lastWorking'],
      message: 'The last working time cannot be before the start.',
    });
  }
  if (d.lastWorking && d.end && d.lastWorking > d.end) {
    ctx.addIssue({
      code: 'custom',
      path: ['lastWorking'],
      message: 'The last working time cannot be after the end.',
    });
  }
}

/** Body of `POST /api/projects/:slug/deployments`. */
export const createDeploymentBodySchema = z
  .object({
    ...deploymentShape,
    cameraSerial: deploymentShape.cameraSerial.optional().default(null),
    clockOffsetSeconds: deploymentShape.clockOffsetSeconds.optional().default(0),
    lastWorking: deploymentShape.lastWorking.optional().default(null),
    featureType: deploymentShape.featureType.optional().default(null),
    baitUse: deploymentShape.baitUse.optional().default(false),
    notes: deploymentShape.notes.optional().default(''),
  })
  .strict()
  .superRefine(checkWindow);
export type CreateDeploymentBody = z.infer<typeof createDeploymentBodySchema>;

/** Body of `PATCH /api/projects/:slug/deployments/:id`. */
export const updateDeploymentBodySchema = z
  .object(deploymentShape)
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' })
  .superRefine(checkWindow);
export type UpdateDeploymentBody = z.infer<typeof updateDeploymentBodySchema>;

/** Body of `POST .../deployments/:id/clock-fix`: the true time read off the reference photo. */
export const clockFixBodySchema = z
  .object({
    photoId: z.string().regex(/^[0-9a-f]{20}$/, { message: 'photoId is not a valid id.' }),
    trueTime: z.string().regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2})?$/, {
      message: 'Type the time shown as YYYY-MM-DDTHH:MM(:SS), in the camera clock’s time zone.',
    }),
  })
  .strict();

/** A deployment as the API shows it. */
export interface DeploymentView {
  id: string;
  stationId: string;
  stationCode: string;
  cameraLabel: string;
  cameraSerial: string | null;
  start: string;
  end: string;
  timezone: string;
  clockOffsetSeconds: number;
  lastWorking: string | null;
  featureType: FeatureType | null;
  featureSensitive: boolean;
  baitUse: boolean;
  notes: string;
  cameraDays: number;
  photos: number;
  clockFix: { photoId: string; exifTime: string; trueTime: string; by: string; at: string } | null;
}

export { isoInstant as isoInstantSchema };

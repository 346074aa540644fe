import { z } from 'zod';
import { hasSomeField } from './patch';
import { slugSchema } from './ids';
import { PROJECT_ROLES, type ProjectRole } from './roles';

/** GBIF sensitivity categories (Chapman 2020) and the public precision each implies. */
export const SENSITIVITY_CATEGORIES = ['none', 'low', 'medium', 'high', 'extreme'] as const;
export type SensitivityCategory = (typeof SENSITIVITY_CATEGORIES)[number];

/** Public coordinate precision in degrees per category; null means withheld. */
export const PUBLIC_PRECISION: Record<SensitivityCategory, number | null | undefined> = {
  none: undefined,
  low: 0.001,
  medium: 0.01,
  high: 0.1,
  extreme: null,
};

function isValidTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

export const timeZoneSchema = z.string().min(1).max(64).refine(isValidTimeZone, {
  message: 'This is not a known IANA time zone (e.g. Africa/Nairobi).',
});

const position = z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]);
const ring = z.array(position).min(4, { message: 'A boundary ring needs at least 4 positions.' });

/** The study-area boundary as a GeoJSON Polygon or MultiPolygon (WGS84 longitude, latitude). */
export const boundarySchema = z.union(
  [
    z.object({ type: z.literal('Polygon'), coordinates: z.array(ring).min(1) }),
    z.object({
      type: z.literal('MultiPolygon'),
      coordinates: z.array(z.array(ring).min(1)).min(1),
    }),
  ],
  { message: 'The boundary must be a GeoJSON Polygon or MultiPolygon in longitude, latitude.' },
);
export type Boundary = z.infer<typeof boundarySchema>;

/** Map tiles for online installs: a URL template with {z}, {x} and {y}. */
export const tileUrlSchema = z
  .string()
  .max(500)
  .regex(/^https:\/\/[^\s]+\{z\}[^\s]*\{x\}[^\s]*\{y\}[^\s]*$/, {
    message: 'A tile URL starts with https:// and contains {z}, {x} and {y}.',
  });

const settingsShape = {
  name: z
    .string()
    .trim()
    .min(3, { message: 'A project name needs at least 3 characters.' })
    .max(120),
  description: z.string().trim().max(2000),
  targetSpeciesScientific: z.string().trim().min(3).max(120),
  targetSpeciesCommon: z.string().trim().min(2).max(120),
  timezone: timeZoneSchema,
  independenceMinutes: z
    .number()
    .int()
    .min(1)
    .max(24 * 60),
  occasionHours: z
    .number()
    .int()
    .min(1)
    .max(24 * 30),
  reviewersPerSighting: z.union([z.literal(1), z.literal(2)]),
  sensitivity: z.enum(SENSITIVITY_CATEGORIES),
  sensitivityReviewDate: z.string().date().nullable(),
  codePrefix: z
    .string()
    .regex(/^[A-Z]{1,6}$/, { message: 'A code prefix is 1–6 capital letters, e.g. KHL.' }),
  boundary: boundarySchema.nullable(),
  tileUrl: tileUrlSchema.nullable(),
  gpsToleranceM: z.number().int().min(10).max(100_000),
  humanRetentionDays: z.number().int().min(1).max(3650).nullable(),
};

/** Body of `POST /api/admin/projects`. */
export const createProjectBodySchema = z
  .object({
    slug: slugSchema,
    ...settingsShape,
    description: settingsShape.description.default(''),
    timezone: settingsShape.timezone.default('UTC'),
    independenceMinutes: settingsShape.independenceMinutes.default(30),
    occasionHours: settingsShape.occasionHours.default(24),
    reviewersPerSighting: settingsShape.reviewersPerSighting.default(2),
    sensitivity: settingsShape.sensitivity.default('medium'),
    sensitivityReviewDate: settingsShape.sensitivityReviewDate.default(null),
    boundary: settingsShape.boundary.default(null),
    tileUrl: settingsShape.tileUrl.default(null),
    gpsToleranceM: settingsShape.gpsToleranceM.default(250),
    humanRetentionDays: settingsShape.humanRetentionDays.default(null),
  })
  .strict();
export type CreateProjectBody = z.infer<typeof createProjectBodySchema>;

/** Body of `PATCH /api/projects/:slug`: any subset of the settings. */
export const updateProjectBodySchema = z
  .object(settingsShape)
  .partial()
  .strict()
  .refine(hasSomeField, { message: 'Send at least one field to change.' });
export type UpdateProjectBody = z.infer<typeof updateProjectBodySchema>;

/** One line of `GET /api/projects`. */
export interface ProjectListItem {
  slug: string;
  name: string;
  role: ProjectRole | null;
}

/** A project and its settings as members see them. */
export interface ProjectDetail {
  slug: string;
  name: string;
  description: string;
  targetSpeciesScientific: string;
  targetSpeciesCommon: string;
  timezone: string;
  independenceMinutes: number;
  occasionHours: number;
  reviewersPerSighting: 1 | 2;
  sensitivity: SensitivityCategory;
  publicPrecision: number | null;
  sensitivityReviewDate: string | null;
  codePrefix: string;
  boundary: Boundary | null;
  tileUrl: string | null;
  gpsToleranceM: number;
  humanRetentionDays: number | null;
  createdAt: string;
  role: ProjectRole | null;
}

export const roleSchema = z.enum(PROJECT_ROLES, {
  message: 'Role must be one of volunteer, reviewer, curator, ecologist.',
});

/** Body of `PUT /api/projects/:slug/members/:userId`. */
export const setMemberBodySchema = z.object({ role: roleSchema }).strict();

/** Body of `POST /api/projects/:slug/invitations`. */
export const inviteBodySchema = z
  .object({
    email: z
      .string()
      .trim()
      .toLowerCase()
      .max(254)
      .email({ message: 'This is not a valid e-mail address.' }),
    role: roleSchema,
  })
  .strict();

/** One project member as the team page shows them. */
export interface MemberView {
  userId: string;
  name: string;
  email: string | null;
  role: ProjectRole;
  disabled: boolean;
  since: string;
}

/** A pending invitation. */
export interface InvitationView {
  id: string;
  email: string;
  role: ProjectRole;
  invitedBy: string;
  createdAt: string;
  expiresAt: string;
  acceptedAt: string | null;
}

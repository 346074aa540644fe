import { z } from 'zod';

const flag = z
  .enum(['true', 'false', '1', '0'])
  .optional()
  .transform((v) => v === 'true' || v === '1');

/** Query of the Camtrap DP export. */
export const camtrapExportQuerySchema = z
  .object({
    profile: z.enum(['public', 'private']).default('public'),
    includeSensitiveSites: flag,
    media: z.enum(['none', 'files']).default('files'),
  })
  .strict();

/** Query of the Darwin Core export. */
export const dwcExportQuerySchema = z
  .object({
    profile: z.enum(['public', 'private']).default('public'),
    includeSensitiveSites: flag,
  })
  .strict();

/** The spreadsheets a project offers. */
export const SHEETS = ['catalogue', 'sightings', 'histories', 'effort'] as const;
export type SheetName = (typeof SHEETS)[number];

export const sheetParamsSchema = z
  .object({
    slug: z.string(),
    sheet: z.enum(SHEETS, { message: `Choose one of: ${SHEETS.join(', ')}.` }),
    format: z.enum(['csv', 'xlsx'], { message: 'Choose csv or xlsx.' }),
  })
  .strict();

/** Capture histories and effort grids come from a saved analysis (its data freeze). */
export const sheetQuerySchema = z
  .object({
    analysisId: z
      .string()
      .regex(/^[0-9a-f]{20}$/, 'analysisId is not a valid id.')
      .optional(),
  })
  .strict();

/** What an export will contain, shown before downloading. */
export interface ExportPreview {
  profile: 'public' | 'private';
  sensitivity: string;
  precision: number | null;
  withheld: boolean;
  dataGeneralizations: string;
  deployments: number;
  media: number;
  observations: number;
  identifiedObservations: number;
  sensitiveSites: { deploymentId: string; station: string; featureType: string }[];
  leftOut: {
    sensitiveSites: number;
    privateMedia: number;
    peopleAndVehicleObservations: number;
    mediaWithoutTime: number;
  };
}

/** What an import made, and what it left out and why. */
export interface ImportReportView {
  counts: {
    stations: number;
    deployments: number;
    media: number;
    mediaFiles: number;
    events: number;
    observations: number;
    sightings: number;
    individuals: number;
  };
  skipped: { table: string; row: number; id: string | null; reason: string }[];
  /** Decisions the import took for the new project (e.g. its sensitivity). */
  notes: string[];
}

export interface ImportResponse {
  project: { slug: string };
  report: ImportReportView;
}

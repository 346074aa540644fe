/** Request schemas and response types for the stateless estimation endpoints. */
import { z } from 'zod';

const count = (what: string) =>
  z
    .number({ error: `${what} must be a number` })
    .int({ error: `${what} must be a whole number` })
    .min(0, { error: `${what} cannot be negative` });

/** Two-sample (Lincoln–Petersen / Chapman) request: M marked, C caught in sample 2, R recaptured. */
export const twoSampleRequestSchema = z
  .object({
    M: count('M (animals marked in the first sample)'),
    C: count('C (animals caught in the second sample)'),
    R: count('R (marked animals in the second sample)'),
  })
  .superRefine((v, ctx) => {
    if (v.R > v.C) {
      ctx.addIssue({
        code: 'custom',
        path: ['R'],
        message: `R (${v.R}) cannot exceed C (${v.C}): the recaptured animals are part of the second sample.`,
      });
    }
    if (v.R > v.M) {
      ctx.addIssue({
        code: 'custom',
        path: ['R'],
        message: `R (${v.R}) cannot exceed M (${v.M}): only marked animals can be recaptured.`,
      });
    }
  });

/** Closed-population request: one 0/1 capture-history string per animal caught. */
export const closedRequestSchema = z
  .object({
    histories: z
      .array(z.string({ error: 'Each capture history must be a string of 0s and 1s' }), {
        error: 'histories must be a list of capture-history strings such as "010011"',
      })
      .min(2, { error: 'At least two animals are needed to estimate abundance' }),
  })
  .superRefine((v, ctx) => {
    const length = v.histories[0]?.length ?? 0;
    v.histories.forEach((h, i) => {
      const path = ['histories', i];
      if (!/^[01]*$/.test(h)) {
        ctx.addIssue({
          code: 'custom',
          path,
          message: `History ${i + 1} ("${h}") contains characters other than 0 and 1.`,
        });
      } else if (h.length !== length) {
        ctx.addIssue({
          code: 'custom',
          path,
          message: `History ${i + 1} has ${h.length} occasions but history 1 has ${length}; every history needs one character per occasion.`,
        });
      } else if (!h.includes('1')) {
        ctx.addIssue({
          code: 'custom',
          path,
          message: `History ${i + 1} is all zeros: list only animals that were caught at least once.`,
        });
      }
    });
    if (length === 1) {
      ctx.addIssue({
        code: 'custom',
        path: ['histories'],
        message: 'A single occasion cannot estimate abundance: at least two occasions are needed.',
      });
    }
  });

const trapSchema = z
  .object({
    id: z.string({ error: 'Every trap needs an id' }).min(1, { error: 'Every trap needs an id' }),
    x: z.unknown().optional(),
    y: z.unknown().optional(),
  })
  .transform((t, ctx) => {
    const bad = (['x', 'y'] as const).filter(
      (axis) => typeof t[axis] !== 'number' || !Number.isFinite(t[axis]),
    );
    for (const axis of bad) {
      ctx.addIssue({
        code: 'custom',
        path: [axis],
        message: `Trap ${t.id} has no usable ${axis} coordinate; give coordinates in metres.`,
      });
    }
    if (bad.length > 0) return z.NEVER;
    return { id: t.id, x: Number(t.x), y: Number(t.y) };
  });

/** SECR request: traps (metres), occasions, detector type, captures and optional usage and mask. */
export const secrRequestSchema = z
  .object({
    traps: z.array(trapSchema).min(2, { error: 'SECR needs at least two traps' }),
    occasions: z
      .number()
      .int({ error: 'occasions must be a whole number' })
      .min(1, { error: 'occasions must be at least 1' }),
    detector: z.enum(['proximity', 'count'], {
      error: 'detector must be "proximity" (detected or not per occasion) or "count"',
    }),
    captures: z
      .array(
        z.object({
          animal: z.string().min(1, { error: 'Every capture needs an animal id' }),
          occasion: z
            .number()
            .int({ error: 'A capture occasion must be a whole number (1 = first)' }),
          trap: z.string().min(1, { error: 'Every capture needs a trap id' }),
        }),
      )
      .min(1, { error: 'At least one capture is needed' }),
    usage: z
      .array(
        z.array(
          z
            .number({ error: 'Usage entries must be numbers (days the trap was active)' })
            .min(0, { error: 'Usage cannot be negative; use 0 for a trap that was not working' }),
        ),
      )
      .optional(),
    mask: z
      .object({
        spacing: z
          .number()
          .positive({ error: 'Mask spacing must be a positive distance in metres' }),
        buffer: z.number().positive({ error: 'Mask buffer must be a positive distance in metres' }),
      })
      .optional(),
  })
  .superRefine((v, ctx) => checkSecrConsistency(v, ctx));

function checkSecrConsistency(
  v: {
    traps: { id: string }[];
    occasions: number;
    captures: { occasion: number; trap: string; animal: string }[];
    usage?: number[][];
  },
  ctx: z.RefinementCtx,
): void {
  const ids = new Set<string>();
  v.traps.forEach((t, i) => {
    if (ids.has(t.id)) {
      ctx.addIssue({
        code: 'custom',
        path: ['traps', i, 'id'],
        message: `Trap id ${t.id} is used twice.`,
      });
    }
    ids.add(t.id);
  });
  v.captures.forEach((c, i) => {
    if (!ids.has(c.trap)) {
      ctx.addIssue({
        code: 'custom',
        path: ['captures', i, 'trap'],
        message: `Capture ${i + 1} (animal ${c.animal}) is at trap ${c.trap}, which is not in the trap list.`,
      });
    }
    if (c.occasion < 1 || c.occasion > v.occasions) {
      ctx.addIssue({
        code: 'custom',
        path: ['captures', i, 'occasion'],
        message: `Capture ${i + 1} is on occasion ${c.occasion}; occasions run from 1 to ${v.occasions}.`,
      });
    }
  });
  if (v.usage) {
    if (v.usage.length !== v.traps.length) {
      ctx.addIssue({
        code: 'custom',
        path: ['usage'],
        message: `usage has ${v.usage.length} rows but there are ${v.traps.length} traps; give one row per trap.`,
      });
    }
    v.usage.forEach((row, k) => {
      if (row.length !== v.occasions) {
        ctx.addIssue({
          code: 'custom',
          path: ['usage', k],
          message: `usage row ${k + 1} has ${row.length} entries but there are ${v.occasions} occasions.`,
        });
      }
    });
  }
}

/** Plot (quadrat) count request: counts in the sampled plots and the number of plots in the area. */
export const plotsRequestSchema = z
  .object({
    counts: z
      .array(count('Each plot count'))
      .min(2, { error: 'At least two plot counts are needed' }),
    totalPlots: z
      .number()
      .int({ error: 'totalPlots must be a whole number' })
      .positive({ error: 'totalPlots must be positive' }),
  })
  .superRefine((v, ctx) => {
    if (v.totalPlots < v.counts.length) {
      ctx.addIssue({
        code: 'custom',
        path: ['totalPlots'],
        message: `totalPlots (${v.totalPlots}) is smaller than the number of plots counted (${v.counts.length}).`,
      });
    }
  });

/** Parsed two-sample request. */
export type TwoSampleRequest = z.infer<typeof twoSampleRequestSchema>;
/** Parsed closed-population request. */
export type ClosedRequest = z.infer<typeof closedRequestSchema>;
/** Parsed SECR request. */
export type SecrRequest = z.infer<typeof secrRequestSchema>;
/** Parsed plot-count request. */
export type PlotsRequest = z.infer<typeof plotsRequestSchema>;

/** A confidence interval; an upper limit of null means no finite upper limit exists. */
export type Interval = [number, number | null];

/** Names of the closed-population estimators reported by estimateClosed. */
export type ClosedModelName =
  | 'M0'
  | 'Mt'
  | 'Mb'
  | 'Mh-jackknife'
  | 'Mh-chao'
  | 'Mth-chao'
  | 'Mh-mixture'
  | 'Schnabel'
  | 'Schumacher-Eschmeyer'
  | 'Huggins-M0'
  | 'Huggins-Mt'
  | 'Huggins-Mb';

/** Extra numbers a model reports (capture probabilities, jackknife sequence, ...). */
export type ModelParams = Record<string, number | number[] | string | null>;

/** One model's abundance estimate; N is null when the estimate does not exist (see `reason`). */
export interface ModelEstimate {
  model: ClosedModelName;
  N: number | null;
  se: number | null;
  ci: Interval | null;
  /** Why N is null, in plain language. */
  reason?: string;
  logLik?: number;
  /** Number of parameters, N included. */
  k?: number;
  aicc?: number | null;
  params?: ModelParams;
  warnings: string[];
}

/** One row of an AICc table. */
export interface AiccRow {
  model: ClosedModelName;
  logLik: number;
  k: number;
  aicc: number | null;
  deltaAicc: number | null;
  weight: number | null;
}

/** Models compared by AICc; only likelihoods of one kind share a table. */
export interface AiccTable {
  kind: 'full-likelihood' | 'conditional-likelihood';
  /** Sample size used in the AICc correction (the number of animals caught, S). */
  n: number;
  note: string;
  rows: AiccRow[];
}

/** Otis et al. (1978) closure test. */
export interface ClosureTest {
  z: number;
  /** One-sided P = Φ(z); small values suggest the population was not closed. */
  p: number;
  animalsUsed: number;
  interpretation: string;
}

/** Result of estimateClosed. */
export interface ClosedResult {
  S: number;
  t: number;
  models: ModelEstimate[];
  aiccTable: AiccTable;
  conditionalAiccTable: AiccTable | null;
  closureTest: ClosureTest | null;
  warnings: string[];
  /** Assumptions to show beside the result. */
  assumptions: string[];
}

/** Result of estimateTwoSample. */
export interface TwoSampleResult {
  lincolnPetersen: { N: number | null; se: number | null };
  chapman: {
    N: number | null;
    se: number | null;
    ci: Interval | null;
    intervals: {
      logNormal: Interval | null;
      normal: Interval | null;
      exactBinomial: Interval | null;
      exactPoisson: Interval | null;
      profileLikelihood: Interval | null;
    };
  };
  reason?: string;
  warnings: string[];
}

/** Result of estimatePlots. */
export interface PlotsResult {
  N: number;
  se: number;
  ci: Interval;
  varianceToMean: number | null;
  warnings: string[];
}

/** A density with its standard error and interval. */
export interface DensityEstimate {
  D: number;
  se: number;
  ci: Interval;
}

/** Result of fitSecr; D is per hectare (coordinates in metres) and null when not estimable. */
export interface SecrResult {
  detector: 'proximity' | 'count';
  D: number | null;
  se: number | null;
  ci: Interval | null;
  densityPerKm2: DensityEstimate | null;
  densityPer100km2: DensityEstimate | null;
  g0?: number | null;
  lambda0?: number | null;
  sigma: number | null;
  logLik: number | null;
  /** Effective sampling area a(θ̂) in hectares. */
  esa: number | null;
  n: number;
  detections: number;
  reason?: string;
  bufferCheck: { buffer: number; D: number; relativeChange: number } | null;
  warnings: string[];
  mask: { spacing: number; buffer: number; points: number };
  /** Assumptions to show beside the result. */
  assumptions: string[];
}

/** estimateClosed: every closed-population estimator on one set of capture histories. */
import type { AiccTable, ClosedResult, ModelEstimate } from '../../shared/estimate';
import { chaoMh, chaoMth, type ChaoForm } from './chao';
import { closureTest } from './closure-test';
import { logMultinomialConstant } from './full-likelihood';
import { fitHuggins, type HugginsForm } from './huggins';
import { jackknifeMh } from './jackknife';
import { fitMixtureMh } from './mixture';
import { modelM0, modelMb, modelMt } from './otis-models';
import { schnabel, schumacherEschmeyer } from './schnabel';
import {
  historyMultiplicities,
  parseHistories,
  summarise,
  type CaptureSummary,
  type HistoryInput,
} from './summary';

/** Options for {@link estimateClosed}. */
export interface ClosedOptions {
  /** Form of the Chao Mh estimator (default classic; f2 = 0 always uses the bias-corrected form). */
  chaoForm?: ChaoForm;
  /** Bootstrap resamples for the Mth SE (default 200). */
  bootstrap?: number;
  /** Seed for the bootstrap (default fixed, so results repeat). */
  seed?: number;
  /** Fit the two-class mixture Mh (default true). */
  mixture?: boolean;
  /** Fit Huggins conditional models (default false); covariates are one row of numbers per animal. */
  huggins?: boolean | { forms?: HugginsForm[]; covariates?: number[][] };
}

/** Assumptions shown beside every closed-population result. */
export const CLOSED_ASSUMPTIONS = [
  'The population was closed during the session: no births, deaths or movement in or out.',
  'Every animal was identified correctly; missed matches inflate the estimate.',
  'Captures of different animals are independent.',
  'Reporting to a wildlife authority follows that authority’s standards and a qualified analyst’s review.',
];

/** Run the closed-population model set on 0/1 capture histories (strings or number rows). */
export function estimateClosed(histories: HistoryInput, options: ClosedOptions = {}): ClosedResult {
  const rows = parseHistories(histories);
  const s = summarise(rows);
  if (s.t < 2) throw new RangeError('At least two occasions are needed to estimate abundance.');
  const logMult = logMultinomialConstant(historyMultiplicities(rows));
  const models: ModelEstimate[] = [modelM0(s, logMult), modelMt(s, logMult), modelMb(s, logMult)];
  models.push(jackknifeMh(s.f, s.t), chaoMh(s, options.chaoForm), chaoMth(rows, s, options));
  if (options.mixture !== false && s.nDot > s.S) models.push(fitMixtureMh(s, logMult));
  models.push(schnabel(s), schumacherEschmeyer(s));
  const conditional: ModelEstimate[] = [];
  if (options.huggins) {
    const config = options.huggins === true ? {} : options.huggins;
    for (const form of config.forms ?? (['M0', 'Mt', 'Mb'] as const)) {
      conditional.push(fitHuggins({ rows, form, covariates: config.covariates }));
    }
    models.push(...conditional);
  }
  const fullTable = aiccTable(
    'full-likelihood',
    s.S,
    models.filter((m) => ['M0', 'Mt', 'Mb', 'Mh-mixture'].includes(m.model)),
  );
  const closure = closureTest(s);
  return {
    S: s.S,
    t: s.t,
    models,
    aiccTable: fullTable,
    conditionalAiccTable:
      conditional.length > 0 ? aiccTable('conditional-likelihood', s.S, conditional) : null,
    closureTest: closure,
    warnings: dataWarnings(s, closure?.p ?? null),
    assumptions: CLOSED_ASSUMPTIONS,
  };
}

/** AICc table of same-kind likelihood models, ranked; models without an estimate are left out. */
export function aiccTable(
  kind: AiccTable['kind'],
  n: number,
  models: readonly ModelEstimate[],
): AiccTable {
  const usable = models.filter((m) => m.N !== null && m.logLik !== undefined && m.k !== undefined);
  const values = usable.map((m) => m.aicc ?? null).filter((v): v is number => v !== null);
  const best = values.length > 0 ? Math.min(...values) : null;
  const weightSum = values.reduce((a, v) => a + Math.exp(-0.5 * (v - (best ?? 0))), 0);
  const rows = usable
    .map((m) => {
      const a = m.aicc ?? null;
      const delta = a !== null && best !== null ? a - best : null;
      return {
        model: m.model,
        logLik: m.logLik ?? NaN,
        k: m.k ?? 0,
        aicc: a,
        deltaAicc: delta,
        weight: delta !== null ? Math.exp(-0.5 * delta) / weightSum : null,
      };
    })
    .sort((a, b) => (a.aicc ?? Infinity) - (b.aicc ?? Infinity));
  const what = kind === 'full-likelihood' ? 'full-likelihood' : 'conditional (Huggins)';
  const note = `AICc uses n = S = ${n} animals caught as the sample size and counts N as a parameter. Only ${what} models are compared here; jackknife, Chao and sample-coverage estimates have no comparable likelihood and stand beside this table.`;
  return { kind, n, note, rows };
}

/** Plain-language warnings about the data as a whole. */
function dataWarnings(s: CaptureSummary, closureP: number | null): string[] {
  const warnings: string[] = [];
  if (s.t < 5) {
    warnings.push(
      `Only ${s.t} occasions: with fewer than 5, heterogeneity and behaviour models are poorly determined and model selection is weak.`,
    );
  }
  const recaptures = s.mDot;
  const small = Math.min(s.S, recaptures);
  if (s.S < 20 || recaptures < 20) {
    const rse = small > 0 ? `${Math.round(100 / Math.sqrt(small))} %` : 'undefined';
    warnings.push(
      `Only ${s.S} animals and ${recaptures} recaptures: expect a relative standard error of about 1/√min(n, r) ≈ ${rse} (Efford & Boulanger 2019), so treat the estimate as rough.`,
    );
  }
  if (closureP !== null && closureP < 0.05) {
    warnings.push(
      'The closure test suggests animals entered or left during the session; closed-population estimates may be biased.',
    );
  }
  return warnings;
}

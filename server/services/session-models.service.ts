/**
 * Runs the estimators on a session built from the catalogue: every closed-population model, the
 * older two-step density (for comparison only), and the SECR request a density fit needs.
 */
import type {
  AnalysisResults,
  SecrOptions,
  SessionInputs,
  SessionPreview,
  TwoStepComparison,
  TwoStepView,
} from '../../shared/analyses';
import type { SecrRequest } from '../../shared/estimate';
import type { ClosedResponse } from '../../shared/estimate-api';
import type { TwoSampleResult } from '../../shared/estimate';
import {
  estimateClosed,
  estimateTwoSample,
  twoStepDensity,
  TWO_STEP_CRITIQUE,
} from '../estimation';
import { toClosedResponse } from './estimates.service';

/** Closed-population models on the session's histories, or the reason there are none. */
export function closedOnSession(inputs: SessionInputs): {
  closed: ClosedResponse | null;
  reason: string | null;
} {
  const S = inputs.individuals.length;
  const t = inputs.occasions.length;
  if (t < 2)
    return { closed: null, reason: 'The session has one occasion; at least two are needed.' };
  if (S < 2) {
    return {
      closed: null,
      reason: `Only ${S} individual(s) were detected in this session; at least two are needed to estimate abundance.`,
    };
  }
  try {
    return {
      closed: toClosedResponse(inputs.histories, estimateClosed(inputs.histories)),
      reason: null,
    };
  } catch (err) {
    if (err instanceof RangeError) return { closed: null, reason: err.message };
    throw err;
  }
}

/** Two occasions are two samples: M caught first, C caught second, R of them caught in both. */
export function twoSampleOnSession(inputs: SessionInputs): TwoSampleResult | null {
  if (inputs.occasions.length !== 2 || inputs.histories.length === 0) return null;
  const count = (h: string) => inputs.histories.filter((x) => x === h).length;
  const R = count('11');
  return estimateTwoSample({ M: count('10') + R, C: count('01') + R, R });
}

/** The model whose N̂ the two-step density divides: lowest AICc among full-likelihood models. */
function twoStepBasis(closed: ClosedResponse): TwoStepComparison['basis'] | null {
  const all = [...closed.models, ...closed.otherModels];
  for (const row of closed.aiccTable.rows) {
    const m = all.find((x) => x.model === row.model);
    if (m && m.N !== null) return { model: m.model, N: m.N, se: m.se };
  }
  return null;
}

/** Captures (animal, trap) of a session, one per detection count. */
function sessionCaptures(
  inputs: SessionInputs,
): { animal: string; occasion: number; trap: string }[] {
  const out: { animal: string; occasion: number; trap: string }[] = [];
  for (const [i, s, k, count] of inputs.detections) {
    const animal = inputs.individuals[i]?.code ?? String(i);
    const trap = inputs.stations[k]?.code ?? String(k);
    for (let c = 0; c < count; c++) out.push({ animal, occasion: s + 1, trap });
  }
  return out;
}

/** Two-step densities at ½MMDM and MMDM from the best closed model, with the critique. */
export function twoStepOnSession(
  inputs: SessionInputs,
  closed: ClosedResponse | null,
): { twoStep: TwoStepComparison | null; reason: string | null } {
  if (!closed) return { twoStep: null, reason: 'There is no abundance estimate to divide.' };
  const basis = twoStepBasis(closed);
  if (!basis) {
    return {
      twoStep: null,
      reason: 'No likelihood model gave an abundance estimate, so there is no N̂ to divide.',
    };
  }
  if (inputs.stations.length < 3) {
    return { twoStep: null, reason: 'At least three stations are needed to draw a sampled area.' };
  }
  const traps = inputs.stations.map((s) => ({ id: s.code, x: s.x, y: s.y }));
  const captures = sessionCaptures(inputs);
  const view = (width: TwoStepView['width']): TwoStepView => {
    const r = twoStepDensity({ N: basis.N, seN: basis.se ?? undefined, traps, captures, width });
    return {
      width,
      mmdm: r.mmdm,
      W: r.W,
      areaKm2: r.areaKm2,
      densityPer100km2: r.densityPer100km2,
      se: r.se,
      ...(r.reason ? { reason: r.reason } : {}),
    };
  };
  return {
    twoStep: {
      basis,
      halfMmdm: view('half-mmdm'),
      mmdm: view('mmdm'),
      critique: TWO_STEP_CRITIQUE,
    },
    reason: null,
  };
}

/** The SECR request for a session: stations in metres as traps, effort as usage. */
export function secrRequestOf(inputs: SessionInputs, options: SecrOptions): SecrRequest {
  return {
    traps: inputs.stations.map((s) => ({ id: s.code, x: s.x, y: s.y })),
    occasions: inputs.occasions.length,
    detector: options.detector,
    captures: sessionCaptures(inputs),
    usage: inputs.effort,
    ...(options.mask ? { mask: options.mask } : {}),
  };
}

/** Why an SECR fit cannot start on this session, or null when it can. */
export function secrBlocker(inputs: SessionInputs): string | null {
  if (inputs.stations.length < 2) return 'SECR needs at least two stations.';
  if (inputs.detections.length === 0)
    return 'No animal was detected, so density cannot be estimated.';
  return null;
}

/** Closed models and the two-step comparison; SECR is filled in when its fit finishes. */
export function estimateSession(session: SessionPreview, secrRequested: boolean): AnalysisResults {
  const { closed, reason } = closedOnSession(session.inputs);
  const two = twoStepOnSession(session.inputs, closed);
  return {
    summary: session.summary,
    warnings: session.warnings,
    closed,
    closedReason: reason,
    twoSample: twoSampleOnSession(session.inputs),
    twoStep: two.twoStep,
    twoStepReason: two.reason,
    secrRequested,
    secr: null,
    secrReason: secrRequested ? secrBlocker(session.inputs) : null,
  };
}

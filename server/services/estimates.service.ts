/** Turns the estimation library's results into the API's response bodies, and its input errors into 400s. */
import type { ClosedResult, SecrResult } from '../../shared/estimate';
import {
  CLOSED_CONTRACT_MODELS,
  type ClosedContractModel,
  type ClosedResponse,
  type SecrResponse,
} from '../../shared/estimate-api';
import type { Interval, ModelEstimate } from '../../shared/estimate';
import { ApiError } from '../errors/api-error';
import { parseHistories, summarise } from '../estimation/summary';

/** Runs a library call; a RangeError (input it cannot use) becomes a 400 with its message. */
export function withInputErrorsAs400<T>(run: () => T): T {
  try {
    return run();
  } catch (err) {
    if (err instanceof RangeError) throw new ApiError('validation_failed', err.message);
    throw err;
  }
}

function isContractModel(m: ModelEstimate): m is ModelEstimate & { model: ClosedContractModel } {
  return (CLOSED_CONTRACT_MODELS as readonly string[]).includes(m.model);
}

/** The closed-population body: contract models first, the rest beside them, plus chart summaries. */
export function toClosedResponse(
  histories: readonly string[],
  result: ClosedResult,
): ClosedResponse {
  const s = summarise(parseHistories(histories));
  return {
    S: result.S,
    t: result.t,
    models: result.models.filter(isContractModel),
    otherModels: result.models.filter((m) => !isContractModel(m)),
    aiccTable: result.aiccTable,
    closureTest: result.closureTest,
    summary: {
      caught: s.n,
      firstCaptures: s.u,
      recaptures: s.m,
      frequencies: s.f.slice(1),
    },
    warnings: result.warnings,
    assumptions: result.assumptions,
  };
}

/** Hectares per km². */
const HA_PER_KM2 = 100;

function scaleInterval(ci: Interval | null, factor: number): Interval | null {
  return ci ? [ci[0] * factor, ci[1] === null ? null : ci[1] * factor] : null;
}

/** The SECR body: the library reports D per hectare and esa in hectares; the API uses km². */
export function toSecrResponse(r: SecrResult): SecrResponse {
  const perKm2 = (v: number | null) => (v === null ? null : v * HA_PER_KM2);
  const scale = r.detector === 'proximity' ? { g0: r.g0 ?? null } : { lambda0: r.lambda0 ?? null };
  return {
    detector: r.detector,
    D: perKm2(r.D),
    se: perKm2(r.se),
    ci: scaleInterval(r.ci, HA_PER_KM2),
    densityPer100km2: r.D === null ? null : r.D * HA_PER_KM2 * 100,
    ciPer100km2: scaleInterval(r.ci, HA_PER_KM2 * 100),
    ...scale,
    sigma: r.sigma,
    logLik: r.logLik,
    esa: r.esa === null ? null : r.esa / HA_PER_KM2,
    n: r.n,
    detections: r.detections,
    ...(r.reason ? { reason: r.reason } : {}),
    bufferCheck: r.bufferCheck ? { ...r.bufferCheck, D: r.bufferCheck.D * HA_PER_KM2 } : null,
    mask: r.mask,
    units: { D: 'animals per km²', sigma: 'm', esa: 'km²', mask: 'm' },
    warnings: r.warnings,
    assumptions: r.assumptions,
  };
}

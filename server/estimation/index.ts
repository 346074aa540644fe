/** Public entry points of the pure estimation library (no Express, no database). */
export { estimateClosed, type ClosedOptions } from './closed';
export { estimateTwoSample } from './two-sample';
export { estimatePlots, relativeAbundanceIndex } from './plots';
export { fitSecr, type SecrProgress } from './secr/fit';
export type { SecrInput } from './secr/data';
export { effectiveArea } from './secr/esa';
export { assertSecrFitsInMemory, estimateSecrMemory } from './secr/memory';
export { twoStepDensity, densityPer100km2, TWO_STEP_CRITIQUE } from './secr/two-step';
export {
  buildSessionData,
  secrInputFromSession,
  type SessionInput,
  type SessionData,
} from './session-data';

/** Effective sampling area a(θ) = ∫ p·(X) dX for given detection parameters, by mask integration. */
import { prepareSecr, type SecrInput } from './data';
import { SecrLikelihood } from './likelihood';
import type { HabitatMask } from './mask';

/** Effective sampling area in square metres for half-normal detection on the given mask. */
export function effectiveArea(
  design: Pick<SecrInput, 'traps' | 'occasions' | 'detector' | 'usage'>,
  g0OrLambda0: number,
  sigma: number,
  mask: HabitatMask,
): number {
  const data = prepareSecr({ ...design, captures: [] });
  const lik = new SecrLikelihood(data, mask, design.traps);
  const link =
    design.detector === 'proximity'
      ? Math.log(g0OrLambda0 / (1 - g0OrLambda0))
      : Math.log(g0OrLambda0);
  return lik.evaluate([0, link, Math.log(sigma)]).esa * 1e4;
}

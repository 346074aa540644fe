/** Exact confidence limits for a Poisson count and a binomial proportion. */
import { betaQuantile, chiSquareQuantile } from './distributions';

/** Exact (Garwood) limits for a Poisson mean given an observed count x. */
export function poissonExactLimits(x: number, level = 0.95): [number, number] {
  const alpha = 1 - level;
  const lower = x === 0 ? 0 : chiSquareQuantile(alpha / 2, 2 * x) / 2;
  const upper = chiSquareQuantile(1 - alpha / 2, 2 * x + 2) / 2;
  return [lower, upper];
}

/** Clopper–Pearson exact limits for a binomial proportion, x successes in n trials. */
export function binomialExactLimits(x: number, n: number, level = 0.95): [number, number] {
  if (n <= 0 || x < 0 || x > n) throw new RangeError('binomialExactLimits needs 0 ≤ x ≤ n, n > 0');
  const alpha = 1 - level;
  const lower = x === 0 ? 0 : betaQuantile(alpha / 2, x, n - x + 1);
  const upper = x === n ? 1 : betaQuantile(1 - alpha / 2, x + 1, n - x);
  return [lower, upper];
}

/** Confidence-interval constructions shared by the abundance estimators. */
import type { Interval } from '../../shared/estimate';
import { Z95 } from './numeric/distributions';

/**
 * Log-normal interval on f0 = N − S (Chao 1987; Burnham et al. 1987): the lower limit never
 * falls below the number of animals actually caught.
 */
export function logNormalInterval(N: number, variance: number, S: number, z = Z95): Interval {
  const f0 = N - S;
  if (!(f0 > 0) || !(variance > 0)) return [S, Math.max(N, S)];
  const c = Math.exp(z * Math.sqrt(Math.log(1 + variance / (f0 * f0))));
  return [S + f0 / c, S + f0 * c];
}

/** Symmetric normal interval N ± z·se, truncated below at S. */
export function normalInterval(N: number, se: number, S: number, z = Z95): Interval {
  return [Math.max(S, N - z * se), N + z * se];
}

/** Invert an interval on 1/N (Schnabel-type methods); an upper limit ≤ 0 means no finite bound. */
export function invertReciprocalInterval(lowerInv: number, upperInv: number): Interval {
  const lo = upperInv > 0 ? 1 / upperInv : Infinity;
  const hi = lowerInv > 0 ? 1 / lowerInv : null;
  return [lo, hi];
}

/** Standard error from a variance, null when the variance is not a finite non-negative number. */
export function seFromVariance(variance: number): number | null {
  return Number.isFinite(variance) && variance >= 0 ? Math.sqrt(variance) : null;
}

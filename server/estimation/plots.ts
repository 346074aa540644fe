/** Plot (quadrat) counts under simple random sampling (Cochran 1977) and the camera-trap index. */
import type { PlotsResult } from '../../shared/estimate';
import { chiSquareCdf, tQuantile } from './numeric/distributions';

/** N̂ = N·ȳ, var = N²(1 − n/N)s²/n, interval with t_{n−1}; warns when counts are clumped. */
export function estimatePlots({
  counts,
  totalPlots,
}: {
  counts: number[];
  totalPlots: number;
}): PlotsResult {
  const n = counts.length;
  if (n < 2) throw new RangeError('At least two plot counts are needed.');
  if (totalPlots < n)
    throw new RangeError('totalPlots cannot be smaller than the number of plots counted.');
  if (counts.some((c) => !Number.isInteger(c) || c < 0))
    throw new RangeError('Plot counts must be whole numbers, not negative.');
  const total = counts.reduce((a, c) => a + c, 0);
  const mean = total / n;
  const s2 = counts.reduce((a, c) => a + (c - mean) ** 2, 0) / (n - 1);
  const N = totalPlots * mean;
  const variance = (totalPlots * totalPlots * (1 - n / totalPlots) * s2) / n;
  const se = Math.sqrt(variance);
  const half = tQuantile(0.975, n - 1) * se;
  const warnings: string[] = [];
  const varianceToMean = mean > 0 ? s2 / mean : null;
  if (varianceToMean !== null) {
    // Under a random (Poisson) pattern (n − 1)s²/ȳ follows χ²_{n−1}.
    const p = 1 - chiSquareCdf(((n - 1) * s2) / mean, n - 1);
    if (p < 0.05 && varianceToMean > 1) {
      warnings.push(
        `The plot counts are clumped (variance-to-mean ratio ${varianceToMean.toFixed(2)}, well above 1): animals are not spread at random, so the plot estimate is unreliable and its interval too narrow in practice. Count more plots or stratify.`,
      );
    }
  } else {
    warnings.push(
      'No animal was counted in any plot, so the estimate is zero and says nothing about rarer animals.',
    );
  }
  if (n < 10) warnings.push(`Only ${n} plots were counted; the interval rests on few plots.`);
  return { N, se, ci: [Math.max(total, N - half), N + half], varianceToMean, warnings };
}

/** One station's events and camera-days. */
export interface IndexStation {
  id: string;
  events: number;
  cameraDays: number;
}

/** Relative abundance index: independent events per 100 camera-days, per station and overall. */
export function relativeAbundanceIndex(stations: readonly IndexStation[]): {
  label: string;
  overall: number | null;
  stations: (IndexStation & { per100CameraDays: number | null })[];
} {
  const rate = (events: number, days: number): number | null =>
    days > 0 ? (100 * events) / days : null;
  const events = stations.reduce((a, s) => a + s.events, 0);
  const days = stations.reduce((a, s) => a + s.cameraDays, 0);
  return {
    label:
      'Independent events per 100 camera-days: an index of relative activity, not an estimate of abundance or density.',
    overall: rate(events, days),
    stations: stations.map((s) => ({ ...s, per100CameraDays: rate(s.events, s.cameraDays) })),
  };
}

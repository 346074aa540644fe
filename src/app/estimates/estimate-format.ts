/** How estimates are written on screen: fixed decimals, intervals, and estimates that do not exist. */
import type { Interval } from '../../../shared/estimate';

/** A number with `digits` decimals (thousands separated), or a dash when there is none. */
export function formatNumber(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '—';
  return value.toLocaleString('en', {
    minimumFractionDigits: digits,
    maximumFractionDigits: digits,
  });
}

/** "lo – hi"; an interval without a finite upper limit says so instead of inventing one. */
export function formatInterval(ci: Interval | null | undefined, digits = 1): string {
  if (!ci) return '—';
  const [lo, hi] = ci;
  if (hi === null || !Number.isFinite(hi))
    return `${formatNumber(lo, digits)} – no finite upper limit`;
  return `${formatNumber(lo, digits)} – ${formatNumber(hi, digits)}`;
}

/** Plain names for the closed-population models, with what each allows for. */
export const MODEL_LABELS: Record<string, string> = {
  M0: 'M0 — same capture probability throughout',
  Mt: 'Mt — capture probability varies by occasion',
  Mb: 'Mb — trap response after first capture',
  'Mh-jackknife': 'Mh jackknife — animals differ (Burnham & Overton)',
  'Mh-chao': 'Mh Chao — animals differ (Chao 1987)',
  'Mth-chao': 'Mth — occasions and animals differ (Chao, Lee & Jeng 1992)',
  'Mh-mixture': 'Mh two-class mixture (Pledger 2000)',
  Schnabel: 'Schnabel (1938)',
  'Schumacher-Eschmeyer': 'Schumacher–Eschmeyer (1943)',
};

/** A model's plain name (its code when unknown). */
export function modelLabel(model: string): string {
  return MODEL_LABELS[model] ?? model;
}

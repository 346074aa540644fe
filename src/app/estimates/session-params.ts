/**
 * The session form's logic: local days in the project's time zone become UTC session bounds, the
 * closure-period warning, and the problems to fix before anything is sent.
 */
import type { FlankPolicy, SessionParamsInput } from '../../../shared/analyses';
import type { Quality } from '../../../shared/sort';
import { isoUtc, wallToUtcMs } from '../../../shared/zoned-time';

/** What the session form holds. Days are local dates (YYYY-MM-DD); the last day is included. */
export interface SessionFormValue {
  firstDay: string;
  lastDay: string;
  allStations: boolean;
  stationIds: string[];
  occasionHours: number;
  flankPolicy: FlankPolicy;
  minQuality: Quality;
  closurePeriodDays: number;
}

const DAY = /^\d{4}-\d{2}-\d{2}$/;

/** The day after a YYYY-MM-DD date. */
export function nextDay(day: string): string {
  const [y, m, d] = day.split('-').map(Number);
  return new Date(Date.UTC(y!, m! - 1, d! + 1)).toISOString().slice(0, 10);
}

/** Days from the first to the last day, both included (0 when the dates are not usable). */
export function sessionDays(v: Pick<SessionFormValue, 'firstDay' | 'lastDay'>): number {
  if (!DAY.test(v.firstDay) || !DAY.test(v.lastDay)) return 0;
  return Math.round((Date.parse(nextDay(v.lastDay)) - Date.parse(v.firstDay)) / 86_400_000);
}

/** Sentences naming what must be fixed before the session can be built. */
export function sessionProblems(v: SessionFormValue): string[] {
  const out: string[] = [];
  if (!DAY.test(v.firstDay) || !DAY.test(v.lastDay)) out.push('Choose the first and last day.');
  else if (sessionDays(v) < 1) out.push('The last day cannot be before the first day.');
  if (!v.allStations && v.stationIds.length === 0) out.push('Choose at least one station.');
  if (!Number.isInteger(v.occasionHours) || v.occasionHours < 1 || v.occasionHours > 720)
    out.push('The occasion length is a whole number of hours from 1 to 720 (30 days).');
  if (!(v.closurePeriodDays > 0)) out.push('The closure period is a positive number of days.');
  return out;
}

/** A warning when the session is longer than the species can be treated as closed, else null. */
export function closureWarning(v: SessionFormValue): string | null {
  const days = sessionDays(v);
  if (days <= v.closurePeriodDays) return null;
  return `This session lasts ${days} days, longer than the ${v.closurePeriodDays}-day closure period. For large carnivores such as tigers and leopards, sessions of up to about 90 days are usually treated as closed; longer ones risk births, deaths and movement biasing the estimate.`;
}

/** The request body: local midnights in the project's zone, converted to UTC. */
export function toSessionParams(v: SessionFormValue, zone: string): SessionParamsInput {
  const at = (day: string) => isoUtc(wallToUtcMs(`${day}T00:00`, zone) ?? Date.parse(day));
  return {
    start: at(v.firstDay),
    end: at(nextDay(v.lastDay)),
    stationIds: v.allStations ? null : [...v.stationIds],
    occasionHours: v.occasionHours,
    flankPolicy: v.flankPolicy,
    minQuality: v.minQuality,
    closurePeriodDays: v.closurePeriodDays,
  };
}

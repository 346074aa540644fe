/** How sessions and analyses are described on screen and in the printed report. */
import {
  FLANK_POLICY_LABELS,
  FLANK_POLICY_RULES,
  qualitiesAtLeast,
  type FreezeStatus,
  type SessionParameters,
} from '../../../shared/analyses';
import { utcToWall } from '../../../shared/zoned-time';

/** A labelled line of a parameter list. */
export interface ParameterLine {
  label: string;
  value: string;
}

/** The local calendar day (YYYY-MM-DD) of a UTC instant in a zone. */
export function localDay(iso: string, zone: string): string {
  return utcToWall(iso, zone).slice(0, 10);
}

/** A UTC instant as local date and time ("2026-07-01 00:00"). */
export function localTime(iso: string, zone: string): string {
  return utcToWall(iso, zone).replace('T', ' ');
}

/** Occasion length in words: "24 h (1 day)", "72 h (3 days pooled)". */
export function occasionLength(hours: number): string {
  if (hours % 24 !== 0) return `${hours} h`;
  const days = hours / 24;
  return days === 1 ? '24 h (1 day)' : `${hours} h (${days} days pooled)`;
}

/** The parameters of a session as labelled lines (times in the project's zone). */
export function describeSession(
  p: SessionParameters,
  zone: string,
  stationCount: number,
): ParameterLine[] {
  const days = Math.round((Date.parse(p.end) - Date.parse(p.start)) / 86_400_000);
  return [
    {
      label: 'Session',
      value: `${localTime(p.start, zone)} to ${localTime(p.end, zone)} (${zone}), ${days} days`,
    },
    { label: 'Occasions', value: occasionLength(p.occasionHours) },
    {
      label: 'Stations',
      value:
        p.stationIds === null
          ? `all stations of the project (${stationCount})`
          : `${stationCount} chosen station${stationCount === 1 ? '' : 's'}`,
    },
    {
      label: 'Flank policy',
      value: `${FLANK_POLICY_LABELS[p.flankPolicy]}. ${FLANK_POLICY_RULES[p.flankPolicy]}`,
    },
    {
      label: 'Photo quality',
      value: `${p.minQuality} or better (${qualitiesAtLeast(p.minQuality).join(', ')})`,
    },
    { label: 'Closure period', value: `${p.closurePeriodDays} days` },
  ];
}

/** What the analysis page says about its data freeze, or null when nothing has changed. */
export function freezeMessage(
  f: FreezeStatus,
): { changed: boolean; title: string; text: string } | null {
  const n = f.changesSince.length;
  const changes = `${n} identity change${n === 1 ? '' : 's'} (merge, split or undo) touched its individuals since it was saved`;
  if (f.problem)
    return { changed: true, title: 'The catalogue has changed since', text: f.problem };
  if (!f.matches) {
    return {
      changed: true,
      title: 'The catalogue has changed since this analysis was saved',
      text: `Rebuilt today with the same parameters, the inputs differ from the data freeze${n > 0 ? `; ${changes}` : ''}. Re-run to see what changed. The saved results still describe the frozen data.`,
    };
  }
  if (n > 0) {
    return {
      changed: false,
      title: 'The data freeze still matches',
      text: `${changes}, but rebuilt today the inputs are identical to the data freeze.`,
    };
  }
  return null;
}

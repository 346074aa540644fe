import { zoneOffsetMs } from '../../../shared/zoned-time';

/** ISO 8601 with the zone's offset (`2026-07-01T09:00:00+03:00`), as Camtrap DP requires. */
export function isoWithOffset(utcIso: string, zone: string): string {
  const ms = Date.parse(utcIso);
  const offset = zoneOffsetMs(zone, ms);
  const local = new Date(ms + offset).toISOString().slice(0, 19);
  const sign = offset < 0 ? '-' : '+';
  const minutes = Math.abs(offset) / 60_000;
  return `${local}${sign}${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

import { isoUtc, wallToUtcMs } from '../../shared/zoned-time';

export { isoUtc, wallToUtcMs, zoneOffsetMs } from '../../shared/zoned-time';

/**
 * Camera clocks have no zone: EXIF gives wall-clock time ("2026:07:01 08:15:00"). These helpers turn
 * a wall-clock time in a deployment's IANA zone into UTC, and apply the deployment's clock offset.
 */

/** EXIF date text plus sub-seconds as one wall-clock string ("2026-07-01T08:15:00.25"). */
export function exifWallClock(dateTimeOriginal: string, subSec: string | null): string {
  const base = dateTimeOriginal.replace(/^(\d{4}):(\d{2}):(\d{2}) /, '$1-$2-$3T');
  return subSec ? `${base}.${subSec.slice(0, 6)}` : base;
}

/** Corrected capture time from a stored wall-clock reading, the camera's zone and its clock offset. */
export function correctedFromWall(
  wall: string | null,
  zone: string,
  offsetSeconds: number,
): string | null {
  if (!wall) return null;
  const utc = wallToUtcMs(wall, zone);
  return utc === null ? null : isoUtc(utc + offsetSeconds * 1000);
}

/** Corrected capture time: EXIF wall clock in the deployment's zone, plus the clock offset. */
export function correctedTime(
  exif: { dateTimeOriginal: string | null; subSec: string | null },
  zone: string,
  offsetSeconds: number,
): string | null {
  if (!exif.dateTimeOriginal) return null;
  return correctedFromWall(exifWallClock(exif.dateTimeOriginal, exif.subSec), zone, offsetSeconds);
}

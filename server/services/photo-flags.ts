import type { PhotoFlag } from '../../shared/ingest';
import { activeWindow } from './effort';
import { distanceMetres } from './geo';

/** What flagging needs to know about a photo. */
export interface FlagInput {
  takenAtExif: string | null;
  takenAt: string | null;
  exifReadable: boolean;
  lat: number | null;
  lon: number | null;
  serial: string | null;
}

/** What flagging needs to know about where the photo came from. */
export interface FlagContext {
  deployment: {
    start: string;
    end: string;
    last_working: string | null;
    camera_serial: string | null;
  };
  station: { lat: number; lon: number };
  gpsToleranceM: number;
}

function normaliseSerial(serial: string): string {
  return serial.replace(/[\s-]/g, '').toUpperCase();
}

/** The flags of one photo; flagged photos are kept and shown, never dropped. */
export function photoFlags(photo: FlagInput, ctx: FlagContext): PhotoFlag[] {
  const flags: PhotoFlag[] = [];
  if (!photo.exifReadable) flags.push('exif_unreadable');
  if (!photo.takenAt) flags.push('no_exif_time');
  if (photo.takenAtExif && Number(photo.takenAtExif.slice(0, 4)) < 2010)
    flags.push('clock_reset_suspected');
  if (photo.takenAt) {
    const t = Date.parse(photo.takenAt);
    const [start, end] = activeWindow(ctx.deployment);
    if (t < start || t > end) flags.push('outside_deployment');
  }
  if (photo.lat !== null && photo.lon !== null) {
    const d = distanceMetres(photo.lat, photo.lon, ctx.station.lat, ctx.station.lon);
    if (d > ctx.gpsToleranceM) flags.push('gps_far_from_station');
  }
  if (
    photo.serial &&
    ctx.deployment.camera_serial &&
    normaliseSerial(photo.serial) !== normaliseSerial(ctx.deployment.camera_serial)
  ) {
    flags.push('serial_mismatch');
  }
  return flags;
}

/** Flags that keep a photo out of events until someone fixes the cause. */
export const KEEP_OUT_OF_EVENTS: readonly PhotoFlag[] = ['no_exif_time', 'outside_deployment'];

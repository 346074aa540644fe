import exifr from 'exifr';

/** The EXIF fields ingest uses, as written in the file (times without a zone). */
export interface ExifFacts {
  dateTimeOriginal: string | null;
  subSec: string | null;
  offsetTime: string | null;
  lat: number | null;
  lon: number | null;
  make: string | null;
  model: string | null;
  serial: string | null;
  readable: boolean;
}

const EMPTY: ExifFacts = {
  dateTimeOriginal: null,
  subSec: null,
  offsetTime: null,
  lat: null,
  lon: null,
  make: null,
  model: null,
  serial: null,
  readable: true,
};

function text(value: unknown): string | null {
  if (typeof value === 'string') {
    // eslint-disable-next-line no-control-regex
    const clean = value.replace(/[\u0000-\u001f]/g, '').trim();
    return clean ? clean.slice(0, 200) : null;
  }
  if (typeof value === 'number') return String(value);
  return null;
}

function coordinate(value: unknown, limit: number): number | null {
  return typeof value === 'number' &&
    Number.isFinite(value) &&
    Math.abs(value) <= limit &&
    value !== 0
    ? value
    : null;
}

/**
 * Reads capture time, GPS, make, model and serial. `reviveValues: false` keeps the time exactly as
 * written ("2026:07:01 08:15:00"); the deployment's zone and clock offset are applied later.
 */
export async function readExif(buffer: Buffer): Promise<ExifFacts> {
  let raw: Record<string, unknown> | undefined;
  try {
    raw = (await exifr.parse(buffer, {
      reviveValues: false,
      gps: true,
      tiff: true,
      exif: true,
      ifd1: false,
    })) as Record<string, unknown> | undefined;
  } catch {
    return { ...EMPTY, readable: false };
  }
  if (!raw) return EMPTY;
  const time = text(raw['DateTimeOriginal']) ?? text(raw['CreateDate']) ?? text(raw['DateTime']);
  return {
    dateTimeOriginal:
      time && /^\d{4}:\d{2}:\d{2} \d{2}:\d{2}:\d{2}/.test(time) ? time.slice(0, 19) : null,
    subSec: text(raw['SubSecTimeOriginal'])?.replace(/\D/g, '') || null,
    offsetTime: text(raw['OffsetTimeOriginal']),
    lat: coordinate(raw['latitude'], 90),
    lon: coordinate(raw['longitude'], 180),
    make: text(raw['Make']),
    model: text(raw['Model']),
    serial:
      text(raw['SerialNumber']) ?? text(raw['BodySerialNumber']) ?? text(raw['CameraSerialNumber']),
    readable: true,
  };
}

/** The embedded EXIF thumbnail, if the file has a JPEG one. */
export async function readExifThumbnail(buffer: Buffer): Promise<Buffer | null> {
  try {
    const thumb = await exifr.thumbnail(buffer);
    if (!thumb || thumb.length < 100) return null;
    const bytes = Buffer.from(thumb);
    return bytes[0] === 0xff && bytes[1] === 0xd8 ? bytes : null;
  } catch {
    return null;
  }
}

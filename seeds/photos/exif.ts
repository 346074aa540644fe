/**
 * Real EXIF written with piexifjs: capture time (camera local, no zone), sub-seconds, make, model,
 * body serial, optional GPS and an IFD1 thumbnail, placed in an APP1 segment right after SOI as
 * cameras do (the encoder's JFIF APP0 segment is dropped).
 */
import piexif from 'piexifjs';
import type { ExifFields } from './types';

const EXIF_TIME = /^\d{4}:\d{2}:\d{2} \d{2}:\d{2}:\d{2}$/;

/** Formats wall-clock fields as an EXIF time ("YYYY:MM:DD HH:MM:SS"). */
export function exifTime(
  y: number,
  mo: number,
  d: number,
  h: number,
  mi: number,
  s: number,
): string {
  const p = (n: number, w = 2) => String(n).padStart(w, '0');
  return `${p(y, 4)}:${p(mo)}:${p(d)} ${p(h)}:${p(mi)}:${p(s)}`;
}

/** EXIF time of a Date read as a wall clock through its UTC fields. */
export function exifTimeOfWallClock(wall: Date): string {
  return exifTime(
    wall.getUTCFullYear(),
    wall.getUTCMonth() + 1,
    wall.getUTCDate(),
    wall.getUTCHours(),
    wall.getUTCMinutes(),
    wall.getUTCSeconds(),
  );
}

function dms(deg: number): [number, number][] {
  const a = Math.abs(deg);
  const d = Math.floor(a);
  const m = Math.floor((a - d) * 60);
  const s = Math.round(((a - d) * 60 - m) * 60 * 10000);
  return [
    [d, 1],
    [m, 1],
    [s, 10000],
  ];
}

/** The APP1 payload ("Exif\0\0" + TIFF) for the fields, with an optional JPEG thumbnail. */
export function buildExif(
  fields: ExifFields,
  width: number,
  height: number,
  thumbnail?: Buffer,
): Buffer {
  if (!EXIF_TIME.test(fields.dateTimeOriginal)) {
    throw new Error(
      `dateTimeOriginal must look like "YYYY:MM:DD HH:MM:SS", got "${fields.dateTimeOriginal}"`,
    );
  }
  if (fields.subSecTimeOriginal !== undefined && !/^\d{1,9}$/.test(fields.subSecTimeOriginal)) {
    throw new Error(`subSecTimeOriginal must be digits, got "${fields.subSecTimeOriginal}"`);
  }
  const zeroth: Record<number, unknown> = {
    [piexif.ImageIFD.Make]: fields.make ?? 'Synthetic Trailcam',
    [piexif.ImageIFD.Model]: fields.model ?? 'ST-1',
    [piexif.ImageIFD.Orientation]: 1,
    [piexif.ImageIFD.XResolution]: [72, 1],
    [piexif.ImageIFD.YResolution]: [72, 1],
    [piexif.ImageIFD.ResolutionUnit]: 2,
    [piexif.ImageIFD.DateTime]: fields.dateTimeOriginal,
  };
  const exif: Record<number, unknown> = {
    [piexif.ExifIFD.DateTimeOriginal]: fields.dateTimeOriginal,
    [piexif.ExifIFD.DateTimeDigitized]: fields.dateTimeOriginal,
    [piexif.ExifIFD.PixelXDimension]: width,
    [piexif.ExifIFD.PixelYDimension]: height,
  };
  if (fields.subSecTimeOriginal)
    exif[piexif.ExifIFD.SubSecTimeOriginal] = fields.subSecTimeOriginal;
  if (fields.serial) exif[piexif.ExifIFD.BodySerialNumber] = fields.serial;
  const gps: Record<number, unknown> = {};
  if (fields.gps) {
    const { lat, lon, altitudeM } = fields.gps;
    if (Math.abs(lat) > 90 || Math.abs(lon) > 180)
      throw new Error(`GPS out of range: ${lat}, ${lon}`);
    gps[piexif.GPSIFD.GPSVersionID] = [2, 3, 0, 0];
    gps[piexif.GPSIFD.GPSLatitudeRef] = lat < 0 ? 'S' : 'N';
    gps[piexif.GPSIFD.GPSLatitude] = dms(lat);
    gps[piexif.GPSIFD.GPSLongitudeRef] = lon < 0 ? 'W' : 'E';
    gps[piexif.GPSIFD.GPSLongitude] = dms(lon);
    if (altitudeM !== undefined) {
      gps[piexif.GPSIFD.GPSAltitudeRef] = altitudeM < 0 ? 1 : 0;
      gps[piexif.GPSIFD.GPSAltitude] = [Math.round(Math.abs(altitudeM) * 10), 10];
    }
  }
  const dict: piexif.ExifDict = { '0th': zeroth, Exif: exif, GPS: gps };
  if (thumbnail) {
    dict['1st'] = {
      [piexif.ImageIFD.Compression]: 6,
      [piexif.ImageIFD.XResolution]: [72, 1],
      [piexif.ImageIFD.YResolution]: [72, 1],
      [piexif.ImageIFD.ResolutionUnit]: 2,
    };
    dict.thumbnail = thumbnail.toString('binary');
  }
  return Buffer.from(piexif.dump(dict), 'binary');
}

/** Replaces the JPEG's APP0/APP1 header segments with one EXIF APP1 segment after SOI. */
export function insertExif(jpeg: Buffer, app1: Buffer): Buffer {
  if (jpeg[0] !== 0xff || jpeg[1] !== 0xd8) throw new Error('not a JPEG');
  if (app1.length + 2 > 0xffff) throw new Error('EXIF segment too large');
  let pos = 2;
  // Skip the encoder's own APP0 (JFIF) and any APP1 segments; keep everything from the first other marker.
  while (
    pos + 4 <= jpeg.length &&
    jpeg[pos] === 0xff &&
    (jpeg[pos + 1] === 0xe0 || jpeg[pos + 1] === 0xe1)
  ) {
    pos += 2 + jpeg.readUInt16BE(pos + 2);
  }
  const header = Buffer.alloc(4);
  header[0] = 0xff;
  header[1] = 0xe1;
  header.writeUInt16BE(app1.length + 2, 2);
  return Buffer.concat([jpeg.subarray(0, 2), header, app1, jpeg.subarray(pos)]);
}

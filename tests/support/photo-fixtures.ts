import { Jimp } from 'jimp';
import piexif from 'piexifjs';

/** EXIF fields a test photo can carry (times as written by a camera: no zone). */
export interface FixtureExif {
  dateTimeOriginal?: string;
  subSec?: string;
  lat?: number;
  lon?: number;
  make?: string;
  model?: string;
  serial?: string;
  thumbnail?: boolean;
}

function dms(value: number): [number, number][] {
  const abs = Math.abs(value);
  const d = Math.floor(abs);
  const m = Math.floor((abs - d) * 60);
  const s = Math.round(((abs - d) * 60 - m) * 60 * 1000);
  return [
    [d, 1],
    [m, 1],
    [s, 1000],
  ];
}

const cache = new Map<string, Buffer>();

/** A plain JPEG of a given size and colour (synthetic test data). */
export async function plainJpeg(width = 64, height = 48, color = 0x557799ff): Promise<Buffer> {
  const key = `${width}x${height}:${color}`;
  let jpeg = cache.get(key);
  if (!jpeg) {
    const img = new Jimp({ width, height, color });
    for (let x = 0; x < width; x += 7) img.setPixelColor(0xffffffff, x, (x * 3) % height);
    jpeg = await img.getBuffer('image/jpeg', { quality: 80 });
    cache.set(key, jpeg);
  }
  return jpeg;
}

/** A JPEG with EXIF written by piexifjs: time, sub-seconds, GPS, make, model, serial, thumbnail. */
export async function exifJpeg(
  exif: FixtureExif,
  options: { width?: number; height?: number; color?: number } = {},
): Promise<Buffer> {
  const base = await plainJpeg(options.width, options.height, options.color);
  const zeroth: Record<number, string> = {};
  const exifIfd: Record<number, string> = {};
  const gps: Record<number, unknown> = {};
  if (exif.make) zeroth[piexif.ImageIFD.Make] = exif.make;
  if (exif.model) zeroth[piexif.ImageIFD.Model] = exif.model;
  if (exif.dateTimeOriginal) exifIfd[piexif.ExifIFD.DateTimeOriginal] = exif.dateTimeOriginal;
  if (exif.subSec) exifIfd[piexif.ExifIFD.SubSecTimeOriginal] = exif.subSec;
  if (exif.serial) exifIfd[piexif.ExifIFD.BodySerialNumber] = exif.serial;
  if (exif.lat !== undefined && exif.lon !== undefined) {
    gps[piexif.GPSIFD.GPSLatitudeRef] = exif.lat < 0 ? 'S' : 'N';
    gps[piexif.GPSIFD.GPSLatitude] = dms(exif.lat);
    gps[piexif.GPSIFD.GPSLongitudeRef] = exif.lon < 0 ? 'W' : 'E';
    gps[piexif.GPSIFD.GPSLongitude] = dms(exif.lon);
  }
  const data: Record<string, unknown> = { '0th': zeroth, Exif: exifIfd, GPS: gps };
  if (exif.thumbnail !== false) {
    data['1st'] = {};
    data['thumbnail'] = (await plainJpeg(16, 12, 0xcc3333ff)).toString('binary');
  }
  const bytes = piexif.dump(data as Parameters<typeof piexif.dump>[0]);
  return Buffer.from(piexif.insert(bytes, base.toString('binary')), 'binary');
}

/** A PNG header that claims enormous dimensions (a decompression bomb's calling card). */
export function pngBombHeader(width = 20_000, height = 20_000): Buffer {
  const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const ihdr = Buffer.alloc(25);
  ihdr.writeUInt32BE(13, 0);
  ihdr.write('IHDR', 4, 'latin1');
  ihdr.writeUInt32BE(width, 8);
  ihdr.writeUInt32BE(height, 12);
  ihdr.writeUInt8(8, 16);
  ihdr.writeUInt8(6, 17);
  return Buffer.concat([signature, ihdr, Buffer.alloc(64)]);
}

/** A JPEG whose frame header claims `width`×`height` (the rest of the file is the small original). */
export async function jpegClaiming(width: number, height: number): Promise<Buffer> {
  const jpeg = Buffer.from(await plainJpeg());
  for (let i = 2; i < jpeg.length - 9; i++) {
    if (jpeg[i] === 0xff && (jpeg[i + 1] === 0xc0 || jpeg[i + 1] === 0xc2)) {
      jpeg.writeUInt16BE(height, i + 5);
      jpeg.writeUInt16BE(width, i + 7);
      return jpeg;
    }
  }
  throw new Error('no frame header found');
}

/** A JPEG with a damaged EXIF block (the APP1 segment length points past its content). */
export async function corruptExifJpeg(): Promise<Buffer> {
  const good = await exifJpeg({ dateTimeOriginal: '2026:07:03 10:00:00' });
  const copy = Buffer.from(good);
  const app1 = copy.indexOf(Buffer.from('Exif\0\0', 'latin1'));
  // Scramble the TIFF header and first IFD so no reader can follow the offsets.
  for (let i = app1 + 6; i < app1 + 40; i++) copy[i] = 0xee;
  return copy;
}

/** Builds a multipart body by hand so file names can carry any bytes (including invalid UTF-8). */
export function multipart(
  files: { field?: string; filename: Buffer | string; filenameStar?: string; body: Buffer }[],
): {
  body: Buffer;
  contentType: string;
} {
  const boundary = `----maculo${Date.now().toString(16)}`;
  const parts: Buffer[] = [];
  for (const f of files) {
    const name = typeof f.filename === 'string' ? Buffer.from(f.filename, 'utf8') : f.filename;
    parts.push(
      Buffer.from(
        `--${boundary}\r\nContent-Disposition: form-data; name="${f.field ?? 'photos'}"; filename="`,
        'latin1',
      ),
    );
    parts.push(name);
    // RFC 5987 form: percent-encoded UTF-8, so any character can travel in a valid header.
    const star = f.filenameStar ? `; filename*=UTF-8''${encodeURIComponent(f.filenameStar)}` : '';
    parts.push(Buffer.from(`"${star}\r\nContent-Type: image/jpeg\r\n\r\n`, 'latin1'));
    parts.push(f.body);
    parts.push(Buffer.from('\r\n', 'latin1'));
  }
  parts.push(Buffer.from(`--${boundary}--\r\n`, 'latin1'));
  return { body: Buffer.concat(parts), contentType: `multipart/form-data; boundary=${boundary}` };
}

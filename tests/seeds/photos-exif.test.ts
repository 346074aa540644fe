/**
 * EXIF written by the generator, read back with independent readers (exifr 7.1.3, image-size,
 * Jimp's decoder). Expected values are the ones the spec wrote: a round trip [D].
 */
import exifr from 'exifr';
import { imageSize } from 'image-size';
import { beforeAll, describe, expect, it } from 'vitest';
import { exifTimeOfWallClock, renderPhoto } from '../../seeds/photos/index';
import type { PhotoSpec } from '../../seeds/photos/types';
import { decode } from './decoded';

const spec: PhotoSpec = {
  width: 480,
  height: 360,
  seed: 11,
  station: 'KH03',
  camera: 'B',
  lighting: 'infrared',
  subject: { kind: 'animal', species: 'genet' },
  exif: {
    dateTimeOriginal: '2025:03:14 04:32:10',
    subSecTimeOriginal: '042',
    make: 'Synthetic Trailcam',
    model: 'ST-1',
    serial: 'ST1-0032',
    gps: { lat: -2.512345, lon: 37.201234 },
  },
};

describe('EXIF of generated photos', () => {
  let jpeg: Buffer;
  beforeAll(async () => {
    jpeg = (await renderPhoto(spec)).jpeg;
  });

  it('should carry the camera-local capture time and sub-seconds exactly as written', async () => {
    const tags = await exifr.parse(jpeg, { reviveValues: false });
    expect(tags.DateTimeOriginal).toBe('2025:03:14 04:32:10');
    expect(tags.SubSecTimeOriginal).toBe('042');
  });

  it('should carry make, model and the body serial number', async () => {
    const tags = await exifr.parse(jpeg, { reviveValues: false });
    expect(tags.Make).toBe('Synthetic Trailcam');
    expect(tags.Model).toBe('ST-1');
    // exifr names tag 0xA431 (BodySerialNumber) "SerialNumber".
    expect(tags.SerialNumber).toBe('ST1-0032');
  });

  it('should carry GPS coordinates to better than a metre, with the southern hemisphere sign', async () => {
    const gps = await exifr.gps(jpeg);
    expect(gps.latitude).toBeCloseTo(-2.512345, 5);
    expect(gps.longitude).toBeCloseTo(37.201234, 5);
  });

  it('should embed a decodable thumbnail of about 160×120 in IFD1', async () => {
    const thumb = await exifr.thumbnail(jpeg);
    expect(thumb).toBeDefined();
    const img = await decode(Buffer.from(thumb ?? new Uint8Array()));
    expect(img.width).toBe(160);
    expect(img.height).toBe(120);
  });

  it('should report the true pixel size to a header reader and a decoder', async () => {
    expect(imageSize(jpeg)).toMatchObject({ width: 480, height: 360, type: 'jpg' });
    const img = await decode(jpeg);
    expect([img.width, img.height]).toEqual([480, 360]);
  });

  it('should write no EXIF at all when the spec has none', async () => {
    const { jpeg } = await renderPhoto({ ...spec, exif: undefined });
    expect(await exifr.parse(jpeg)).toBeUndefined();
    expect(imageSize(jpeg).width).toBe(480);
  });

  it('should format a wall-clock Date through its UTC fields', () => {
    expect(exifTimeOfWallClock(new Date(Date.UTC(2000, 0, 1, 0, 0, 7)))).toBe(
      '2000:01:01 00:00:07',
    );
  });

  it('should refuse a capture time in another format', async () => {
    const bad = { ...spec, exif: { dateTimeOriginal: '2025-03-14T04:32:10' } };
    await expect(renderPhoto(bad)).rejects.toThrow(/YYYY:MM:DD HH:MM:SS/);
  });
});

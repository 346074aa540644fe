import { describe, expect, it } from 'vitest';
import {
  exportPolicy,
  generalizationText,
  placeUnder,
} from '../../server/services/exports/coordinates';
import { boundaryFor } from '../../server/services/projects.service';
import { stripJpegMetadata } from '../../server/images/strip-metadata';

// GBIF's generalisation categories (Chapman 2020 [S29]): extreme → withheld (region / 1° only),
// high → 0.1°, medium → 0.01°, low → 0.001°; snapped to the grid, never randomised. Expected values
// below are worked by hand from those grid sizes.

const station = { lat: -1.182034, lon: 36.617964 };
const project = (sensitivity: string) => ({ sensitivity, sensitivity_review_date: '2027-06-30' });

describe('coordinates in exports', () => {
  it('should snap to each category’s grid and keep exact positions in a private backup', () => {
    expect(
      placeUnder(exportPolicy(project('high'), 'public'), station.lat, station.lon),
    ).toMatchObject({ lat: -1.2, lon: 36.6 });
    expect(
      placeUnder(exportPolicy(project('medium'), 'public'), station.lat, station.lon),
    ).toMatchObject({ lat: -1.18, lon: 36.62 });
    expect(
      placeUnder(exportPolicy(project('low'), 'public'), station.lat, station.lon),
    ).toMatchObject({ lat: -1.182, lon: 36.618 });
    expect(
      placeUnder(exportPolicy(project('none'), 'public'), station.lat, station.lon),
    ).toMatchObject(station);
    expect(
      placeUnder(exportPolicy(project('high'), 'private'), station.lat, station.lon),
    ).toMatchObject(station);
  });

  it('should give only the 1° region for the extreme category and say the coordinates are withheld', () => {
    const policy = exportPolicy(project('extreme'), 'public');
    expect(policy.withheld).toBe(true);
    expect(placeUnder(policy, station.lat, station.lon)).toMatchObject({ lat: -1, lon: 37 });
    expect(generalizationText(policy)).toBe(
      'coordinates withheld (sensitivity category extreme); only the 1 degree region is given; sensitivity to be reviewed by 2027-06-30',
    );
  });

  it('should widen the uncertainty by half the grid cell’s diagonal plus GPS error and detection distance', () => {
    // 0.01° ≈ 1113.2 m; half the diagonal = 1113.2 · √2 / 2 ≈ 787.2 m; + 30 m GPS + 30 m detection.
    expect(placeUnder(exportPolicy(project('medium'), 'public'), 0, 0).uncertainty).toBe(848);
    expect(placeUnder(exportPolicy(project('high'), 'private'), 0, 0).uncertainty).toBe(60);
  });

  it('should be the same point whatever side of the cell the station is on (no noise)', () => {
    const policy = exportPolicy(project('high'), 'public');
    const a = placeUnder(policy, -1.151, 36.649);
    const b = placeUnder(policy, -1.249, 36.551);
    expect([a.lat, a.lon]).toEqual([b.lat, b.lon]);
    expect(placeUnder(policy, -1.151, 36.649)).toEqual(a);
  });
});

describe('boundaries for roles below ecologist', () => {
  const ring = [
    [36.6012, -1.2034],
    [36.6611, -1.2034],
    [36.6611, -1.1122],
    [36.6012, -1.1122],
    [36.6012, -1.2034],
  ];
  const geojson = JSON.stringify({ type: 'Polygon', coordinates: [ring] });

  it('should snap every vertex and drop repeats, keeping a closed ring', () => {
    expect(boundaryFor(geojson, 0.01)).toEqual({
      type: 'Polygon',
      coordinates: [
        [
          [36.6, -1.2],
          [36.66, -1.2],
          [36.66, -1.11],
          [36.6, -1.11],
          [36.6, -1.2],
        ],
      ],
    });
    // At 0.1° the corners land on the four nearest grid points.
    expect(boundaryFor(geojson, 0.1)).toEqual({
      type: 'Polygon',
      coordinates: [
        [
          [36.6, -1.2],
          [36.7, -1.2],
          [36.7, -1.1],
          [36.6, -1.1],
          [36.6, -1.2],
        ],
      ],
    });
    // A boundary smaller than one cell collapses to one point, repeated to stay a valid ring.
    const small = JSON.stringify({
      type: 'Polygon',
      coordinates: [
        [
          [36.61, -1.21],
          [36.62, -1.21],
          [36.62, -1.22],
          [36.61, -1.21],
        ],
      ],
    });
    expect(boundaryFor(small, 0.1)).toEqual({
      type: 'Polygon',
      coordinates: [
        [
          [36.6, -1.2],
          [36.6, -1.2],
          [36.6, -1.2],
          [36.6, -1.2],
        ],
      ],
    });
    expect(boundaryFor(geojson, null)).toBeNull();
    expect(boundaryFor(geojson, undefined)).toEqual(JSON.parse(geojson));
  });
});

describe('stripping photo metadata', () => {
  it('should drop APP1, APP13 and comment segments and keep every other byte', () => {
    const segment = (marker: number, body: string) => {
      const data = Buffer.from(body, 'latin1');
      const head = Buffer.from([0xff, marker, 0, 0]);
      head.writeUInt16BE(data.length + 2, 2);
      return Buffer.concat([head, data]);
    };
    const jfif = segment(0xe0, 'JFIF\0kept');
    const quant = segment(0xdb, 'quantisation tables');
    const scan = Buffer.from([0xff, 0xda, 0x00, 0x02, 0x12, 0x34, 0xff, 0xd9]);
    const jpeg = Buffer.concat([
      Buffer.from([0xff, 0xd8]),
      jfif,
      segment(0xe1, 'Exif\0\0GPS -1.182034 36.617964'),
      segment(0xed, 'Photoshop 3.0 IPTC'),
      segment(0xfe, 'a comment'),
      quant,
      scan,
    ]);
    expect(stripJpegMetadata(jpeg)).toEqual(
      Buffer.concat([Buffer.from([0xff, 0xd8]), jfif, quant, scan]),
    );
    expect(stripJpegMetadata(Buffer.from('not a jpeg'))).toEqual(Buffer.from('not a jpeg'));
  });
});

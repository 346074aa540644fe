import type { SessionInputs } from '../../../shared/analyses';
import { detectionPoints } from './detection-map';

// A made-up session of three stations and two animals (synthetic, for the shaping only).
const INPUTS: SessionInputs = {
  parameters: {
    start: '2026-07-01T00:00:00Z',
    end: '2026-07-03T00:00:00Z',
    stationIds: null,
    occasionHours: 24,
    flankPolicy: 'left',
    minQuality: 'fair',
    closurePeriodDays: 90,
  },
  occasions: [
    { start: '2026-07-01T00:00:00Z', end: '2026-07-02T00:00:00Z' },
    { start: '2026-07-02T00:00:00Z', end: '2026-07-03T00:00:00Z' },
  ],
  stations: [
    { id: 's1', code: 'A', lat: -1.2, lon: 36.6, x: 0, y: 0 },
    { id: 's2', code: 'B', lat: -1.2, lon: 36.61, x: 1000, y: 0 },
    { id: 's3', code: 'C', lat: -1.19, lon: 36.6, x: 0, y: 1000 },
  ],
  individuals: [
    { id: 'i1', code: 'L1' },
    { id: 'i2', code: 'L2' },
  ],
  effort: [
    [1, 1],
    [1, 1],
    [1, 0],
  ],
  histories: ['11', '10'],
  detections: [
    [0, 0, 0, 1],
    [0, 1, 0, 2],
    [1, 0, 1, 1],
  ],
  sightingIds: ['x', 'y', 'z', 'w'],
};

describe('detectionPoints', () => {
  it('should size stations by their detections and count the individuals seen there', () => {
    const points = detectionPoints(INPUTS);
    expect(points.map((p) => [p.label, p.weight, p.highlight])).toEqual([
      ['A: 3 detections of 1 individual', 1, true],
      ['B: 1 detection of 1 individual', 1 / 3, true],
      ['C: 0 detections of 0 individuals', 0, false],
    ]);
    expect(points[1]).toMatchObject({ id: 's2', lat: -1.2, lon: 36.61 });
  });
});

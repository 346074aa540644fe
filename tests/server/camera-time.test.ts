import { describe, expect, it } from 'vitest';
import {
  correctedTime,
  exifWallClock,
  wallToUtcMs,
  zoneOffsetMs,
} from '../../server/services/camera-time';
import { cameraDays, stationDays } from '../../server/services/effort';
import { snapToGrid, generalise } from '../../server/services/geo';
import { groupByInterval } from '../../server/services/events.service';
import { checkFileName } from '../../server/services/file-names';

describe('camera clock arithmetic', () => {
  it('should read EXIF wall-clock time in the deployment zone (East Africa, UTC+3, no DST)', () => {
    expect(zoneOffsetMs('Africa/Nairobi', Date.UTC(2026, 6, 1))).toBe(3 * 3600_000);
    expect(new Date(wallToUtcMs('2026-07-01T08:15:00', 'Africa/Nairobi')!).toISOString()).toBe(
      '2026-07-01T05:15:00.000Z',
    );
  });

  it('should follow daylight saving in a zone that has it (Europe/Berlin: +1 in January, +2 in July)', () => {
    expect(new Date(wallToUtcMs('2026-01-15T12:00:00', 'Europe/Berlin')!).toISOString()).toBe(
      '2026-01-15T11:00:00.000Z',
    );
    expect(new Date(wallToUtcMs('2026-07-15T12:00:00', 'Europe/Berlin')!).toISOString()).toBe(
      '2026-07-15T10:00:00.000Z',
    );
  });

  it('should keep sub-seconds and apply the clock offset', () => {
    expect(exifWallClock('2026:07:02 06:30:15', '5')).toBe('2026-07-02T06:30:15.5');
    expect(
      correctedTime({ dateTimeOriginal: '2026:07:02 06:30:15', subSec: '5' }, 'Africa/Nairobi', 0),
    ).toBe('2026-07-02T03:30:15.500Z');
    expect(
      correctedTime(
        { dateTimeOriginal: '2026:07:02 06:30:15', subSec: null },
        'Africa/Nairobi',
        -125,
      ),
    ).toBe('2026-07-02T03:28:10Z');
    expect(correctedTime({ dateTimeOriginal: null, subSec: null }, 'UTC', 0)).toBeNull();
  });

  it('should reject impossible wall-clock times', () => {
    expect(wallToUtcMs('2026-13-01T00:00:00', 'UTC')).toBeNull();
    expect(wallToUtcMs('yesterday', 'UTC')).toBeNull();
  });
});

describe('effort', () => {
  const d = (start: string, end: string, last_working: string | null = null) => ({
    start,
    end,
    last_working,
  });

  it('should count camera-days until the end, or until the camera stopped working', () => {
    expect(cameraDays(d('2026-07-01T00:00:00Z', '2026-07-31T00:00:00Z'))).toBe(30);
    expect(
      cameraDays(d('2026-07-01T00:00:00Z', '2026-07-31T00:00:00Z', '2026-07-11T12:00:00Z')),
    ).toBe(10.5);
  });

  it('should count a station active when at least one of its cameras works (union, not sum)', () => {
    // A: 1–21 July; B: 11–31 July → union 1–31 July = 30 days; sum = 40 camera-days.
    const a = d('2026-07-01T00:00:00Z', '2026-07-21T00:00:00Z');
    const b = d('2026-07-11T00:00:00Z', '2026-07-31T00:00:00Z');
    expect(stationDays([a, b])).toBe(30);
    expect(cameraDays(a) + cameraDays(b)).toBe(40);
    // A gap: 1–5 and 10–12 July → 4 + 2 = 6 days.
    expect(
      stationDays([
        d('2026-07-01T00:00:00Z', '2026-07-05T00:00:00Z'),
        d('2026-07-10T00:00:00Z', '2026-07-12T00:00:00Z'),
      ]),
    ).toBe(6);
  });
});

describe('coordinate generalisation (GBIF guidance: snap to the grid, never add noise)', () => {
  it('should snap to 0.1°, 0.01° and 0.001° grids and withhold for extreme sensitivity', () => {
    expect(snapToGrid(-1.18204, 0.1)).toBe(-1.2);
    expect(snapToGrid(36.61796, 0.01)).toBe(36.62);
    expect(snapToGrid(36.61796, 0.001)).toBe(36.618);
    expect(generalise(-1.18, 36.6, null)).toEqual({
      lat: null,
      lon: null,
      precision: null,
      withheld: true,
    });
    expect(generalise(-1.18204, 36.61796, undefined)).toEqual({
      lat: -1.18204,
      lon: 36.61796,
      precision: null,
      withheld: false,
    });
  });

  it('should give the same generalised point every time (no randomisation)', () => {
    const a = generalise(-1.23456, 36.65432, 0.1);
    const b = generalise(-1.23456, 36.65432, 0.1);
    expect(a).toEqual(b);
  });
});

describe('independent events', () => {
  const at = (iso: string) => ({ taken_at: iso });

  it('should keep a gap of exactly the interval in one event and split one second later', () => {
    const groups = groupByInterval(
      [
        at('2026-07-01T00:00:00Z'),
        at('2026-07-01T00:30:00Z'),
        at('2026-07-01T01:00:01Z'),
        at('2026-07-01T01:10:00Z'),
      ],
      30,
    );
    expect(groups.map((g) => g.length)).toEqual([2, 2]);
  });

  it('should chain bursts: each photo within the interval of the previous one stays in the event', () => {
    const groups = groupByInterval(
      [at('2026-07-01T00:00:00Z'), at('2026-07-01T00:25:00Z'), at('2026-07-01T00:50:00Z')],
      30,
    );
    expect(groups).toHaveLength(1);
  });
});

describe('file names', () => {
  it('should accept ordinary camera names and refuse paths, dot-dot, control characters and non-UTF-8', () => {
    expect(checkFileName('IMG_0001.JPG')).toEqual({ ok: true, name: 'IMG_0001.JPG' });
    expect(checkFileName(Buffer.from('Löwe.jpg', 'utf8').toString('latin1'))).toEqual({
      ok: true,
      name: 'Löwe.jpg',
    });
    expect(checkFileName('DCIM/100MEDIA/IMG_0001.JPG').ok).toBe(false);
    expect(checkFileName('..\\evil.jpg').ok).toBe(false);
    expect(checkFileName('a..b.jpg').ok).toBe(false);
    expect(checkFileName('bell\u0007.jpg').ok).toBe(false);
    expect(checkFileName(Buffer.from([0x49, 0xff, 0xfe, 0x2e, 0x6a]).toString('latin1')).ok).toBe(
      false,
    );
  });
});

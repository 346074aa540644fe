/** The synthetic demo season plan (no rendering): times, clock errors, paired flanks, names. */
import { describe, expect, it } from 'vitest';
import { demoPhotos, demoStations } from '../../seeds/photos/demo-set';

const plan = demoPhotos({ count: 600, width: 320, height: 240, seed: 7 });

describe('demo season plan', () => {
  it('should place 20 stations 2 km apart', () => {
    const st = demoStations();
    expect(st).toHaveLength(20);
    // Neighbours in a row: 2 km east-west [D] (equirectangular distance, exact enough at 2 km).
    const [a, b] = st;
    const km = Math.hypot(
      (b.lat - a.lat) * 111.32,
      (b.lon - a.lon) * 111.32 * Math.cos((a.lat * Math.PI) / 180),
    );
    expect(km).toBeCloseTo(2, 6);
  });

  it('should give every photo a well-formed EXIF time', () => {
    for (const p of plan)
      expect(p.spec.exif?.dateTimeOriginal).toMatch(/^\d{4}:\d\d:\d\d \d\d:\d\d:\d\d$/);
  });

  it('should keep true times inside the 60-day season and show camera clock errors', () => {
    for (const p of plan) {
      const t = Date.parse(`${p.trueLocalTime}Z`);
      expect(t).toBeGreaterThanOrEqual(Date.UTC(2025, 2, 1));
      expect(t).toBeLessThan(Date.UTC(2025, 2, 1) + 60 * 86400e3);
    }
    const reset = plan.filter((p) => p.file.startsWith('KH07-B/'));
    const right = plan.filter(
      (p) => !p.file.startsWith('KH07-B/') && !p.file.startsWith('KH13-A/'),
    );
    expect(reset.length).toBeGreaterThan(0);
    for (const p of reset) expect(p.spec.exif?.dateTimeOriginal.slice(0, 4)).toBe('2000');
    for (const p of right) {
      expect(p.spec.exif?.dateTimeOriginal).toBe(
        p.trueLocalTime.replaceAll('-', ':').replace('T', ' '),
      );
    }
  });

  it('should show opposite flanks on the two cameras of a station in the same second', () => {
    let pairs = 0;
    for (const p of plan) {
      const s = p.spec.subject;
      if (s.kind !== 'target' || p.spec.camera !== 'A') continue;
      const twin = plan.find(
        (q) =>
          q.spec.station === p.spec.station &&
          q.spec.camera === 'B' &&
          q.trueLocalTime === p.trueLocalTime &&
          q.spec.subject.kind === 'target',
      );
      if (!twin || twin.spec.subject.kind !== 'target') continue;
      expect(twin.spec.subject.individual).toBe(s.individual);
      expect(twin.spec.subject.flank).not.toBe(s.flank);
      pairs++;
    }
    expect(pairs).toBeGreaterThan(0);
  });

  it('should number files per camera from IMG_0001 in capture order without gaps', () => {
    const byCamera = new Map<string, { n: number; t: string }[]>();
    for (const p of plan) {
      const [dir, name] = p.file.split('/');
      const list = byCamera.get(dir) ?? [];
      list.push({ n: Number(name.slice(4, 8)), t: p.trueLocalTime });
      byCamera.set(dir, list);
    }
    for (const list of byCamera.values()) {
      const byNumber = [...list].sort((a, b) => a.n - b.n);
      expect(byNumber.map((e) => e.n)).toEqual(list.map((_, i) => i + 1));
      const times = byNumber.map((e) => e.t);
      expect(times).toEqual([...times].sort());
    }
  });
});

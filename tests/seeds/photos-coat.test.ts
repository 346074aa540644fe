/**
 * Coat identity checks on synthetic photos (all data here are synthetic). The photos are decoded
 * with an independent decoder and sampled at body coordinates through the returned homography.
 * Thresholds are our own engineering choices, not published values.
 */
import { describe, expect, it } from 'vitest';
import { describeIndividual, makeIndividual, renderPhoto } from '../../seeds/photos/index';
import { trunkInk } from '../../seeds/photos/coat';
import type { Flank, PhotoSpec, Variation } from '../../seeds/photos/types';
import { correlation, decode, flankPoints, lumaAt, project } from './decoded';

const pts = flankPoints();

async function flankSamples(
  id: string,
  flank: Flank,
  v: Partial<Variation>,
  seed: number,
  lighting: 'day' | 'infrared' = 'day',
) {
  const spec: PhotoSpec = {
    width: 640,
    height: 480,
    seed,
    station: 'TEST-COAT',
    camera: 'A',
    lighting,
    subject: { kind: 'target', individual: id, flank },
    variation: { wind: 0, ...v },
    band: false,
    foreground: false,
  };
  const { jpeg, truth } = await renderPhoto(spec);
  const img = await decode(jpeg);
  const h = truth.bodyToImage;
  if (!h) throw new Error('target photo without homography');
  return pts.map(([u, w]) => {
    const [x, y] = project(h, u, w);
    return lumaAt(img, x, y);
  });
}

describe('coat identity in rendered photos', () => {
  const near = { distanceM: 3.2, position: -0.1, yawDeg: 0, gait: 0.1 };
  const turned = {
    distanceM: 4.2,
    position: 0.25,
    yawDeg: 18,
    rollDeg: 4,
    gait: 0.6,
    exposure: 0.9,
  };

  it('should show the same flank pattern of one individual across pose, distance and light', async () => {
    const a = await flankSamples('T-A', 'right', near, 1);
    const b = await flankSamples('T-A', 'right', turned, 2);
    expect(a.every(Number.isFinite) && b.every(Number.isFinite)).toBe(true);
    expect(correlation(a, b)).toBeGreaterThan(0.6);
  });

  it('should show the same flank pattern under the infrared night look', async () => {
    const day = await flankSamples('T-A', 'right', near, 1);
    const night = await flankSamples('T-A', 'right', turned, 3, 'infrared');
    expect(correlation(day, night)).toBeGreaterThan(0.6);
  });

  it('should keep the body-to-image homography right when the photo is mirrored', async () => {
    const plain = await flankSamples('T-A', 'right', near, 1);
    const mirrored = await flankSamples('T-A', 'right', { ...near, mirror: true }, 1);
    expect(correlation(plain, mirrored)).toBeGreaterThan(0.9);
  });

  it('should give the left and right flanks of one individual different patterns', async () => {
    const right = await flankSamples('T-A', 'right', near, 1);
    const left = await flankSamples('T-A', 'left', near, 1);
    expect(Math.abs(correlation(right, left))).toBeLessThan(0.3);
  });

  it('should give two individuals different patterns on the same flank', async () => {
    const a = await flankSamples('T-A', 'right', near, 1);
    const b = await flankSamples('T-B', 'right', near, 1);
    expect(Math.abs(correlation(a, b))).toBeLessThan(0.3);
  });

  it('should paint the coat model where the homography says: dark on marks, light between', async () => {
    const ind = makeIndividual('T-C');
    const { jpeg, truth } = await renderPhoto({
      width: 800,
      height: 600,
      seed: 5,
      station: 'TEST-COAT',
      camera: 'A',
      lighting: 'day',
      subject: { kind: 'target', individual: ind, flank: 'left' },
      variation: { distanceM: 2.6, wind: 0 },
      band: false,
      foreground: false,
    });
    const img = await decode(jpeg);
    const h = truth.bodyToImage ?? [];
    const dark: number[] = [];
    const light: number[] = [];
    const r = 0.006;
    for (const [u, v] of flankPoints(0.004)) {
      // Keep points whose whole neighbourhood agrees, so edge anti-aliasing cannot decide.
      const around = [
        [0, 0],
        [r, 0],
        [-r, 0],
        [0, r],
        [0, -r],
      ].map(([du, dv]) => trunkInk(ind, 'left', u + du, v + dv));
      const [x, y] = project(h, u, v);
      if (around.every((k) => k.black === 1)) dark.push(lumaAt(img, x, y));
      if (around.every((k) => k.black === 0 && k.centre === 0 && k.scar === 0))
        light.push(lumaAt(img, x, y));
    }
    const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
    expect(dark.length).toBeGreaterThan(30);
    expect(light.length).toBeGreaterThan(30);
    expect(mean(dark)).toBeLessThan(mean(light) * 0.45);
  });
});

describe('individual traits', () => {
  it('should describe pinned traits as tags and a one-line note', () => {
    const ind = makeIndividual('T-D', {
      earNotch: 'left',
      tailKink: true,
      scar: null,
      shoulderCluster: 'right',
    });
    const d = describeIndividual(ind);
    expect(d.tags).toEqual([
      'notched left ear',
      'kinked tail tip',
      'broken rosette cluster on right shoulder',
    ]);
    expect(d.note).toBe(
      'notched left ear, kinked tail tip, broken rosette cluster on right shoulder',
    );
  });

  it('should rebuild the same individual from the same id', () => {
    expect(makeIndividual('P05')).toEqual(makeIndividual('P05'));
    expect(describeIndividual(makeIndividual(42)).id).toBe('seed-42');
  });

  it('should give every drawn individual at least one typed-in mark', () => {
    for (let i = 0; i < 40; i++)
      expect(describeIndividual(makeIndividual(`X${i}`)).tags.length).toBeGreaterThan(0);
  });

  it('should draw the scar only on its own flank', () => {
    const ind = makeIndividual('T-E', {
      scar: 'right',
      earNotch: null,
      tailKink: false,
      shoulderCluster: null,
    });
    const scarCount = (flank: Flank) => {
      let n = 0;
      for (let u = 0.2; u < 0.7; u += 0.003)
        for (let v = 0.3; v < 0.48; v += 0.003) n += trunkInk(ind, flank, u, v).scar;
      return n;
    };
    expect(scarCount('right')).toBeGreaterThan(10);
    expect(scarCount('left')).toBe(0);
  });
});

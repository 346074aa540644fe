/**
 * Scene-level checks on synthetic photos: determinism, the infrared look, subject boxes, the flank
 * convention, mirroring and occlusion. Pixels are read back with an independent JPEG decoder.
 */
import { describe, expect, it } from 'vitest';
import { renderPhoto } from '../../seeds/photos/index';
import type { PhotoSpec, PixelBox, Subject } from '../../seeds/photos/types';
import { decode, luma, project, type Decoded } from './decoded';

const base: PhotoSpec = {
  width: 400,
  height: 300,
  seed: 3,
  station: 'TEST-SCENE',
  camera: 'A',
  lighting: 'day',
  subject: { kind: 'target', individual: 'T-S', flank: 'right' },
};

function chroma(img: Decoded): { mean: number; max: number } {
  let sum = 0;
  let max = 0;
  for (let i = 0; i < img.data.length; i += 4) {
    const d = Math.abs(img.data[i] - img.data[i + 1]) + Math.abs(img.data[i + 1] - img.data[i + 2]);
    sum += d;
    max = Math.max(max, d);
  }
  return { mean: sum / (img.data.length / 4), max };
}

/** Pixels that change strongly when the subject is added to the same scene. */
async function subjectPixels(
  spec: PhotoSpec,
): Promise<{ box: PixelBox | null; changed: [number, number][] }> {
  const withSubject = await renderPhoto(spec);
  const without = await renderPhoto({ ...spec, subject: { kind: 'blank' } });
  const a = await decode(withSubject.jpeg);
  const b = await decode(without.jpeg);
  const changed: [number, number][] = [];
  for (let y = 0; y < a.height; y++) {
    for (let x = 0; x < a.width; x++)
      if (Math.abs(luma(a, x, y) - luma(b, x, y)) > 40) changed.push([x, y]);
  }
  return { box: withSubject.truth.bbox, changed };
}

describe('determinism', () => {
  it('should give identical bytes for an identical spec', async () => {
    const spec: PhotoSpec = {
      ...base,
      variation: { occlusion: 0.15, motionBlur: 0.01, yawDeg: 10 },
    };
    const a = await renderPhoto(spec);
    const b = await renderPhoto(spec);
    expect(a.jpeg.equals(b.jpeg)).toBe(true);
    expect(a.truth).toEqual(b.truth);
  });

  it('should give different photos for a different seed', async () => {
    const a = await renderPhoto(base);
    const b = await renderPhoto({ ...base, seed: 4 });
    expect(a.jpeg.equals(b.jpeg)).toBe(false);
  });
});

describe('lighting', () => {
  it('should make infrared photos grey (R = G = B up to JPEG rounding)', async () => {
    const img = await decode((await renderPhoto({ ...base, lighting: 'infrared' })).jpeg);
    const c = chroma(img);
    expect(c.mean).toBeLessThan(1.5);
    expect(c.max).toBeLessThan(16);
  });

  it('should keep daylight photos in colour', async () => {
    const img = await decode((await renderPhoto(base)).jpeg);
    expect(chroma(img).mean).toBeGreaterThan(15);
  });
});

describe('subject box', () => {
  const subjects: Subject[] = [
    { kind: 'target', individual: 'T-S', flank: 'left' },
    { kind: 'animal', species: 'bushbuck' },
    { kind: 'animal', species: 'honeyBadger' },
    { kind: 'human' },
  ];
  for (const subject of subjects) {
    it(`should box the whole ${subject.kind === 'animal' ? subject.species : subject.kind} inside the frame`, async () => {
      const { box, changed } = await subjectPixels({
        ...base,
        subject,
        foreground: false,
        band: false,
      });
      expect(box).not.toBeNull();
      if (!box) return;
      expect(box.x).toBeGreaterThanOrEqual(0);
      expect(box.y).toBeGreaterThanOrEqual(0);
      expect(box.x + box.width).toBeLessThanOrEqual(base.width);
      expect(box.y + box.height).toBeLessThanOrEqual(base.height);
      const inside = changed.filter(
        ([x, y]) =>
          x >= box.x - 2 &&
          x < box.x + box.width + 2 &&
          y >= box.y - 2 &&
          y < box.y + box.height + 2,
      );
      expect(changed.length).toBeGreaterThan(200);
      expect(inside.length / changed.length).toBeGreaterThan(0.98);
      const xs = changed.map(([x]) => x);
      const ys = changed.map(([, y]) => y);
      expect(Math.max(...xs) - Math.min(...xs) + 1).toBeGreaterThan(box.width * 0.85);
      expect(Math.max(...ys) - Math.min(...ys) + 1).toBeGreaterThan(box.height * 0.85);
    });
  }

  it('should clip the box of an animal half out of the frame to the frame', async () => {
    const { truth } = await renderPhoto({ ...base, variation: { position: 1.25 } });
    expect(truth.bbox).not.toBeNull();
    expect((truth.bbox?.x ?? 0) + (truth.bbox?.width ?? 0)).toBe(base.width);
  });

  it('should keep the box above the data band', async () => {
    const { truth } = await renderPhoto({ ...base, variation: { distanceM: 1.6 } });
    expect((truth.bbox?.y ?? 0) + (truth.bbox?.height ?? 0)).toBeLessThanOrEqual(
      base.height - truth.bandHeight,
    );
  });
});

describe('flank convention and mirroring', () => {
  it('should show the right flank head-right and the left flank head-left', async () => {
    for (const flank of ['right', 'left'] as const) {
      const { truth } = await renderPhoto({
        ...base,
        subject: { kind: 'target', individual: 'T-S', flank },
      });
      const h = truth.bodyToImage ?? [];
      const nose = project(h, 1.0, 0.46)[0];
      const rump = project(h, 0.0, 0.4)[0];
      expect(truth.headDirection).toBe(flank);
      expect(nose > rump).toBe(flank === 'right');
    }
  });

  it('should flip the whole photo, its box and its head direction when mirrored', async () => {
    const plain = await renderPhoto(base);
    const flipped = await renderPhoto({ ...base, variation: { mirror: true } });
    const a = await decode(plain.jpeg);
    const b = await decode(flipped.jpeg);
    let diff = 0;
    for (let y = 0; y < a.height; y += 3)
      for (let x = 0; x < a.width; x += 3)
        diff += Math.abs(luma(a, x, y) - luma(b, a.width - 1 - x, y));
    expect(diff / ((a.width / 3) * (a.height / 3))).toBeLessThan(3);
    const p = plain.truth.bbox;
    const f = flipped.truth.bbox;
    expect(f?.x).toBe(base.width - (p?.x ?? 0) - (p?.width ?? 0));
    expect(flipped.truth.headDirection).toBe('left');
    expect(flipped.truth.flank).toBe('right');
  });
});

describe('occlusion', () => {
  it('should hide about the requested fraction of the animal', async () => {
    for (const occlusion of [0.1, 0.25]) {
      const { truth } = await renderPhoto({ ...base, seed: 21, variation: { occlusion } });
      expect(Math.abs(truth.occludedFraction - occlusion)).toBeLessThan(0.05);
    }
  });

  it('should hide nothing when no occlusion is asked for', async () => {
    expect((await renderPhoto(base)).truth.occludedFraction).toBe(0);
  });
});

describe('truth labels', () => {
  const cases: [Subject, string, string | null][] = [
    [{ kind: 'target', individual: 'T-S', flank: 'left' }, 'animal', 'Panthera pardus'],
    [{ kind: 'animal', species: 'porcupine' }, 'animal', 'Hystrix africaeaustralis'],
    [{ kind: 'animal', species: 'baboon' }, 'animal', 'Papio anubis'],
    [{ kind: 'human' }, 'human', null],
    [{ kind: 'vehicle' }, 'vehicle', null],
    [{ kind: 'blank' }, 'blank', null],
    [{ kind: 'setup', lines: ['KH01 A'] }, 'unclassified', null],
  ];
  for (const [subject, type, species] of cases) {
    it(`should label a ${subject.kind} photo as ${type}${species ? ` (${species})` : ''}`, async () => {
      const { truth } = await renderPhoto({ ...base, width: 200, height: 150, subject });
      expect(truth.observationType).toBe(type);
      expect(truth.species).toBe(species);
      expect(truth.bbox === null).toBe(subject.kind === 'blank');
      expect(truth.individualId).toBe(subject.kind === 'target' ? 'T-S' : null);
    });
  }
});

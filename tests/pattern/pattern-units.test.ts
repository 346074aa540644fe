/**
 * Unit checks of the pattern engine's plain-JavaScript parts: bit counting, the feature blob, crop
 * boxes, the vocabulary, the shortlist index and the pre-verification. Expected values come from
 * independent computations in the tests themselves ([D] derived) or from definitions; feature
 * sets here are synthetic random data, not photos.
 */
import { describe, expect, it } from 'vitest';
import { Rng } from '../../seeds/photos/random';
import { PatternCatalogue } from '../../server/pattern/catalogue';
import { cropToPixels } from '../../server/pattern/features';
import { asWords, hamming, popcount32 } from '../../server/pattern/hamming';
import { prematchInliers } from '../../server/pattern/prematch';
import { scoreOfInliers } from '../../server/pattern/rank';
import { deserializeFeatures, serializeFeatures } from '../../server/pattern/serialize';
import type { FeatureSet, FeatureView } from '../../server/pattern/types';
import { assignWords, defaultVocabulary } from '../../server/pattern/vocabulary';
import { trainVocabulary } from '../../server/pattern/vocabulary-train';
import { vocabularyFromContent } from '../../server/pattern/vocabulary';

function naiveBits(bytes: Uint8Array): number {
  return [...bytes].reduce((s, b) => s + b.toString(2).replace(/0/g, '').length, 0);
}

function randomBytes(rng: Rng, n: number): Uint8Array {
  return Uint8Array.from({ length: n }, () => rng.int(0, 255));
}

/** A synthetic view: random positions, descriptors and words (not from a photo). */
function randomView(seed: number, n = 300): FeatureView {
  const rng = new Rng(seed);
  return {
    points: Float32Array.from({ length: n * 2 }, () => rng.next()),
    descriptors: randomBytes(rng, n * 32),
    words: Uint16Array.from({ length: n }, () => rng.int(0, 1023)),
  };
}

function featureSet(plain: FeatureView, mirrored: FeatureView | null = null): FeatureSet {
  return {
    vocabulary: defaultVocabulary().id,
    width: 800,
    height: 320,
    crop: { x: 100, y: 200, width: 500, height: 200 },
    photoWidth: 1024,
    photoHeight: 768,
    plain,
    mirrored,
  };
}

describe('Hamming distances', () => {
  it('should count the differing bits of two descriptors as a bit-by-bit count does', () => {
    const rng = new Rng(11);
    for (let t = 0; t < 50; t++) {
      const a = randomBytes(rng, 32);
      const b = randomBytes(rng, 32);
      const xor = a.map((v, i) => v ^ b[i]);
      expect(hamming(asWords(a), 0, asWords(b), 0)).toBe(naiveBits(xor)); // [D] definition
    }
    expect(popcount32(0xffffffff)).toBe(32);
    expect(popcount32(0x80000001)).toBe(2);
  });
});

describe('feature blobs', () => {
  it('should read back descriptors and words exactly and positions to 1/65535 of the crop', () => {
    const set = featureSet(randomView(1, 500), randomView(2, 480));
    const blob = serializeFeatures(set);
    const back = deserializeFeatures(blob);
    // Header 7 + id + 16 bytes, then per view 2 + 38 bytes per keypoint (format in serialize.ts).
    expect(blob.length).toBe(7 + set.vocabulary.length + 16 + (2 + 500 * 38) + (2 + 480 * 38));
    expect(back.vocabulary).toBe(set.vocabulary);
    expect([back.width, back.height, back.photoWidth, back.photoHeight]).toEqual([
      800, 320, 1024, 768,
    ]);
    expect(back.crop).toEqual(set.crop);
    for (const [a, b] of [
      [set.plain, back.plain],
      [set.mirrored, back.mirrored],
    ] as const) {
      expect(b?.descriptors).toEqual(a?.descriptors);
      expect(b?.words).toEqual(a?.words);
      const worst = Math.max(...(a?.points ?? []).map((p, i) => Math.abs(p - (b?.points[i] ?? 9))));
      expect(worst).toBeLessThanOrEqual(0.5 / 65535 + 1e-7);
    }
  });

  it('should keep a reference without its flipped view and refuse damaged blobs', () => {
    const back = deserializeFeatures(serializeFeatures(featureSet(randomView(3, 10))));
    expect(back.mirrored).toBeNull();
    const blob = serializeFeatures(featureSet(randomView(4, 100)));
    expect(() => deserializeFeatures(blob.subarray(0, blob.length - 10))).toThrow(RangeError);
    expect(() => deserializeFeatures(Buffer.from('not a feature blob at all'))).toThrow(RangeError);
  });
});

describe('crop boxes', () => {
  it('should turn fraction and pixel boxes into whole pixels inside the photo', () => {
    expect(cropToPixels({ x: 0.25, y: 0.5, w: 0.5, h: 0.25 }, 800, 600)).toEqual({
      x: 200,
      y: 300,
      width: 400,
      height: 150,
    });
    expect(cropToPixels({ x: -20, y: 500, width: 300, height: 300 }, 800, 600)).toEqual({
      x: 0,
      y: 500,
      width: 280,
      height: 100,
    });
    expect(cropToPixels(undefined, 640, 480)).toEqual({ x: 0, y: 0, width: 640, height: 480 });
  });

  it('should refuse a crop too small to hold a pattern', () => {
    expect(() => cropToPixels({ x: 10, y: 10, width: 8, height: 200 }, 800, 600)).toThrow(
      RangeError,
    );
  });
});

describe('visual vocabulary', () => {
  it('should ship 1,024 words with finite non-negative IDF weights', () => {
    const v = defaultVocabulary();
    expect(v.idf.length).toBe(1024);
    expect(v.centres.length).toBe(1024 * 8);
    expect([...v.idf].every((w) => Number.isFinite(w) && w >= 0)).toBe(true);
  });

  it('should give every descriptor the word a brute-force search finds nearest', () => {
    const v = defaultVocabulary();
    const desc = randomBytes(new Rng(5), 40 * 32);
    const words = assignWords(v, desc);
    const d = asWords(desc);
    for (let i = 0; i < 40; i++) {
      let best = Infinity;
      for (let c = 0; c < 1024; c++) best = Math.min(best, hamming(d, i, v.centres, c));
      expect(hamming(d, i, v.centres, words[i])).toBe(best); // [D] exhaustive search
    }
  });

  it('should recover planted binary centres from noisy copies (k-majority training)', () => {
    const rng = new Rng(9);
    const centres = Array.from({ length: 6 }, () => randomBytes(rng, 32));
    const noisy = (c: Uint8Array) => {
      const copy = c.slice();
      for (let f = 0; f < 10; f++) copy[rng.int(0, 31)] ^= 1 << rng.int(0, 7);
      return copy;
    };
    const docs = centres.map((c) => {
      const doc = new Uint8Array(150 * 32);
      for (let m = 0; m < 150; m++) doc.set(noisy(c), m * 32);
      return doc;
    });
    const content = trainVocabulary(docs, {
      k: 6,
      iterations: 20,
      seed: 3,
      id: 't',
      trainedOn: 'test',
    });
    const learned = vocabularyFromContent(content);
    for (const c of centres) {
      const words = asWords(c);
      const nearestBits = Math.min(
        ...Array.from({ length: 6 }, (_, k) => hamming(words, 0, learned.centres, k)),
      );
      // Each bit is flipped in ~4 % of copies, so the majority restores the centre exactly.
      expect(nearestBits).toBe(0);
    }
    // A word seen in one training document of six: ln((6 + 1) / (1 + 1)).
    expect(content.idf[0]).toBeCloseTo(Math.log(7 / 2), 4);
  });
});

describe('spatial-word shortlist', () => {
  it('should put the reference a query was taken from first', () => {
    const catalogue = new PatternCatalogue();
    for (let i = 0; i < 40; i++) {
      catalogue.add(
        { individualId: `I${i}`, photoId: `p${i}`, flank: 'left' },
        featureSet(randomView(100 + i)),
      );
    }
    const query = featureSet(randomView(117), randomView(999));
    const list = catalogue.shortlist(query, { limit: 5 });
    expect(list[0]).toMatchObject({ photoId: 'p17', mirrored: false });
    expect(list[0].votes).toBeGreaterThan(2 * list[1].votes);
  });

  it('should compare the flipped query with the other flank only when a flank is given', () => {
    const catalogue = new PatternCatalogue();
    catalogue.add({ individualId: 'A', photoId: 'a', flank: 'left' }, featureSet(randomView(1)));
    catalogue.add({ individualId: 'B', photoId: 'b', flank: 'right' }, featureSet(randomView(2)));
    const query = featureSet(randomView(1), randomView(2));
    const listed = catalogue.shortlist(query, { flank: 'left' });
    expect(listed.filter((e) => !e.mirrored).every((e) => e.flank === 'left')).toBe(true);
    expect(listed.filter((e) => e.mirrored).every((e) => e.flank === 'right')).toBe(true);
    expect(listed.find((e) => e.photoId === 'b')?.mirrored).toBe(true);
  });

  it('should never shortlist a removed reference and refuse another vocabulary', () => {
    const catalogue = new PatternCatalogue();
    catalogue.add({ individualId: 'A', photoId: 'a', flank: 'left' }, featureSet(randomView(1)));
    catalogue.add({ individualId: 'B', photoId: 'b', flank: 'left' }, featureSet(randomView(2)));
    catalogue.remove('a');
    expect(catalogue.size).toBe(1);
    expect(catalogue.shortlist(featureSet(randomView(1))).map((e) => e.photoId)).not.toContain('a');
    const other = { ...featureSet(randomView(3)), vocabulary: 'another-v9' };
    expect(() =>
      catalogue.add({ individualId: 'C', photoId: 'c', flank: 'left' }, other),
    ).toThrow();
  });
});

describe('pre-verification', () => {
  it('should find every keypoint of a view consistent with a shifted copy of itself', () => {
    const view = randomView(21, 200);
    const shifted = { ...view, points: view.points.map((p, i) => (i % 2 ? p : p + 0.02)) };
    const inliers = prematchInliers({ view, aspect: 2.5 }, { view: shifted, aspect: 2.5 });
    expect(inliers).toBeGreaterThanOrEqual(190);
  });

  it('should find few consistent pairs when the same keypoints sit in other places', () => {
    const view = randomView(22, 200);
    const rng = new Rng(5);
    const moved = { ...view, points: view.points.map(() => rng.next()) };
    expect(prematchInliers({ view, aspect: 2.5 }, { view: moved, aspect: 2.5 })).toBeLessThan(10);
  });
});

describe('pattern score', () => {
  it('should map verified inliers to 0..1 with 20 inliers at one half', () => {
    expect(scoreOfInliers(0)).toBe(0);
    expect(scoreOfInliers(20)).toBe(0.5); // definition in rank.ts
    expect(scoreOfInliers(60)).toBe(0.75);
    expect(scoreOfInliers(1000)).toBeLessThan(1);
  });
});

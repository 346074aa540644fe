/**
 * The pattern worker pool: memory stays flat over repeated calls, a worker hit by an OpenCV C++
 * exception is replaced without losing the pool, and bad input is reported as such. Photos are
 * synthetic (seeds/photos).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createPatternPool, PatternError, type PatternPool } from '../../server/pattern/pool';
import { serializeFeatures } from '../../server/pattern/serialize';
import type { ReferenceFeatures } from '../../server/pattern/types';
import { planPhoto, renderPlanned, type RenderedSetPhoto } from './photo-set';

const SHAPE = { width: 640, height: 480, stations: 2 };

let pool: PatternPool;
let photo: RenderedSetPhoto;
let other: RenderedSetPhoto;

beforeAll(async () => {
  pool = createPatternPool(1);
  photo = await renderPlanned(planPhoto('POOL-000', 'left', 'day', 0, SHAPE));
  other = await renderPlanned(planPhoto('POOL-000', 'left', 'reference', 0, SHAPE));
}, 60_000);

afterAll(async () => {
  await pool?.close();
});

async function failure(p: Promise<unknown>): Promise<PatternError> {
  try {
    await p;
  } catch (err) {
    if (err instanceof PatternError) return err;
    throw err;
  }
  throw new Error('expected the call to fail');
}

describe('pattern worker pool', () => {
  it('should give the same features for JPEG bytes and for the decoded pixels', async () => {
    const fromJpeg = await pool.extract(photo.jpeg, photo.crop);
    const fromPixels = await pool.extract(photo.pixels, photo.crop);
    expect(serializeFeatures(fromJpeg).equals(serializeFeatures(fromPixels))).toBe(true);
    expect(fromJpeg.plain.words.length).toBeGreaterThan(200);
    expect(fromJpeg.mirrored?.words.length).toBeGreaterThan(200);
  });

  it('should keep the OpenCV heap flat over repeated extractions and rankings', async () => {
    const ref = await pool.extract(other.jpeg, other.crop, { mirror: false });
    const refs: ReferenceFeatures[] = [
      { individualId: 'A', photoId: 'a', flank: 'left', features: ref },
    ];
    const query = await pool.extract(photo.jpeg, photo.crop);
    for (let i = 0; i < 5; i++) await pool.rank(query, refs);
    const before = await pool.heapBytes();
    for (let i = 0; i < 40; i++) {
      await pool.extract(photo.jpeg, photo.crop);
      await pool.rank(query, refs);
    }
    const after = await pool.heapBytes();
    // One forgotten working image alone would leak ≥ 0.2 MB per call, ≥ 8 MB here.
    expect(after - before).toBeLessThan(1 << 20);
    expect((await pool.rank(query, refs))[0].inliers).toBeGreaterThan(20);
  }, 60_000);

  it('should replace a worker after an OpenCV C++ exception and keep answering', async () => {
    const before = serializeFeatures(await pool.extract(photo.jpeg, photo.crop));
    const err = await failure(pool.faultForTests());
    expect(err.kind).toBe('opencv');
    expect(err.message).toMatch(/OpenCV\(4\.12\.0\)/);
    const after = serializeFeatures(await pool.extract(photo.jpeg, photo.crop));
    expect(after.equals(before)).toBe(true);
  }, 30_000);

  it('should report input it cannot use as an input error', async () => {
    const notJpeg = await failure(pool.extract(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 1, 2])));
    expect(notJpeg.kind).toBe('input');
    const tiny = await failure(pool.extract(photo.jpeg, { x: 5, y: 5, width: 4, height: 4 }));
    expect(tiny.kind).toBe('input');
    expect(tiny.message).toMatch(/too small/);
  });
});

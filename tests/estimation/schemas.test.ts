import { describe, expect, it } from 'vitest';
import {
  closedRequestSchema,
  plotsRequestSchema,
  secrRequestSchema,
  twoSampleRequestSchema,
} from '../../shared/estimate';

const messages = (r: { success: boolean; error?: { issues: { message: string }[] } }): string =>
  (r.error?.issues ?? []).map((i) => i.message).join(' | ');

describe('two-sample request schema', () => {
  it('should accept a valid request', () => {
    expect(twoSampleRequestSchema.safeParse({ M: 50, C: 60, R: 10 }).success).toBe(true);
  });

  it('should explain R > C, negative counts and non-integers', () => {
    expect(messages(twoSampleRequestSchema.safeParse({ M: 50, C: 6, R: 10 }))).toMatch(
      /R \(10\) cannot exceed C \(6\)/,
    );
    expect(messages(twoSampleRequestSchema.safeParse({ M: -1, C: 6, R: 0 }))).toMatch(
      /cannot be negative/,
    );
    expect(messages(twoSampleRequestSchema.safeParse({ M: 5.5, C: 6, R: 0 }))).toMatch(
      /whole number/,
    );
  });
});

describe('closed request schema', () => {
  it('should accept equal-length 0/1 histories', () => {
    expect(closedRequestSchema.safeParse({ histories: ['0101', '1100', '0011'] }).success).toBe(
      true,
    );
  });

  it('should explain histories of unequal length, other characters, all-zero rows and one occasion', () => {
    expect(messages(closedRequestSchema.safeParse({ histories: ['0101', '110'] }))).toMatch(
      /History 2 has 3 occasions but history 1 has 4/,
    );
    expect(messages(closedRequestSchema.safeParse({ histories: ['0101', '1a00'] }))).toMatch(
      /characters other than 0 and 1/,
    );
    expect(messages(closedRequestSchema.safeParse({ histories: ['0101', '0000'] }))).toMatch(
      /all zeros: list only animals that were caught/,
    );
    expect(messages(closedRequestSchema.safeParse({ histories: ['1', '1'] }))).toMatch(
      /single occasion/,
    );
  });
});

describe('SECR request schema', () => {
  const valid = {
    traps: [
      { id: 'A', x: 0, y: 0 },
      { id: 'B', x: 100, y: 0 },
    ],
    occasions: 2,
    detector: 'proximity',
    captures: [{ animal: 'x', occasion: 1, trap: 'A' }],
  };

  it('should accept a valid request with usage and mask', () => {
    const r = secrRequestSchema.safeParse({
      ...valid,
      usage: [
        [1, 0.5],
        [1, 1],
      ],
      mask: { spacing: 20, buffer: 400 },
    });
    expect(r.success).toBe(true);
  });

  it('should explain traps without coordinates and captures at unknown traps', () => {
    const noXY = {
      ...valid,
      traps: [
        { id: 'A', x: 0, y: 0 },
        { id: 'B', x: 100 },
      ],
    };
    expect(messages(secrRequestSchema.safeParse(noXY))).toMatch(
      /Trap B has no usable y coordinate/,
    );
    const unknown = { ...valid, captures: [{ animal: 'x', occasion: 1, trap: 'Z' }] };
    expect(messages(secrRequestSchema.safeParse(unknown))).toMatch(
      /trap Z, which is not in the trap list/,
    );
  });

  it('should explain occasions out of range, non-integers, ragged usage and negative usage', () => {
    expect(
      messages(
        secrRequestSchema.safeParse({
          ...valid,
          captures: [{ animal: 'x', occasion: 3, trap: 'A' }],
        }),
      ),
    ).toMatch(/occasions run from 1 to 2/);
    expect(messages(secrRequestSchema.safeParse({ ...valid, occasions: 2.5 }))).toMatch(
      /whole number/,
    );
    expect(messages(secrRequestSchema.safeParse({ ...valid, usage: [[1, 1]] }))).toMatch(
      /one row per trap/,
    );
    expect(
      messages(
        secrRequestSchema.safeParse({
          ...valid,
          usage: [
            [1, -1],
            [1, 1],
          ],
        }),
      ),
    ).toMatch(/cannot be negative/);
    expect(messages(secrRequestSchema.safeParse({ ...valid, detector: 'camera' }))).toMatch(
      /proximity/,
    );
  });
});

describe('plots request schema', () => {
  it('should accept counts and explain negative counts and too few total plots', () => {
    expect(plotsRequestSchema.safeParse({ counts: [1, 2, 0], totalPlots: 50 }).success).toBe(true);
    expect(messages(plotsRequestSchema.safeParse({ counts: [1, -2], totalPlots: 50 }))).toMatch(
      /cannot be negative/,
    );
    expect(messages(plotsRequestSchema.safeParse({ counts: [1, 2, 3], totalPlots: 2 }))).toMatch(
      /smaller than the number/,
    );
  });
});

describe('schema output feeds the estimators', () => {
  it('should fit SECR directly from a parsed request', async () => {
    const { fitSecr } = await import('../../server/estimation/secr/fit');
    const parsed = secrRequestSchema.parse({
      traps: [
        { id: 'A', x: 0, y: 0 },
        { id: 'B', x: 60, y: 0 },
        { id: 'C', x: 0, y: 60 },
      ],
      occasions: 3,
      detector: 'proximity',
      captures: [
        { animal: 'x', occasion: 1, trap: 'A' },
        { animal: 'x', occasion: 2, trap: 'B' },
        { animal: 'y', occasion: 3, trap: 'C' },
      ],
      mask: { spacing: 10, buffer: 200 },
    });
    const r = fitSecr(parsed);
    expect(r.n).toBe(2);
    expect(r.mask.points).toBeGreaterThan(0);
  });
});

import { describe, expect, it } from 'vitest';
import { SeededRandom } from '../../server/estimation/numeric/random';
import { prepareSecr, type SecrInput } from '../../server/estimation/secr/data';
import { fitSecr } from '../../server/estimation/secr/fit';
import { SecrLikelihood } from '../../server/estimation/secr/likelihood';
import { buildMask } from '../../server/estimation/secr/mask';
import {
  assertSecrFitsInMemory,
  likelihoodBytes,
  maskPointsUpperEstimate,
} from '../../server/estimation/secr/memory';
import { simulateSecr, trapGrid } from '../../server/estimation/secr/simulate';

// All data here are synthetic (simulated surveys).

/** Bytes of every distinct typed array reachable within three levels of an object. */
function typedArrayBytes(root: object): number {
  const seen = new Set<unknown>();
  let total = 0;
  const visit = (value: unknown, depth: number): void => {
    if (value === null || typeof value !== 'object' || seen.has(value)) return;
    seen.add(value);
    if (ArrayBuffer.isView(value)) {
      total += value.byteLength;
      return;
    }
    if (depth === 0) return;
    for (const v of Object.values(value)) visit(v, depth - 1);
  };
  visit(root, 3);
  return total;
}

function smallSurvey(seed: number, sigma = 40): SecrInput {
  return simulateSecr(
    {
      traps: trapGrid(3, 3, 50),
      occasions: 5,
      detector: 'proximity',
      density: 2,
      g0OrLambda0: 0.3,
      sigma,
      buffer: 4 * sigma,
    },
    new SeededRandom(seed),
  );
}

describe('SECR memory estimate', () => {
  it('should match the buffers a likelihood actually allocates', () => {
    const input = smallSurvey(5);
    const data = prepareSecr(input);
    const mask = buildMask(input.traps, 8, 160);
    const lik = new SecrLikelihood(data, mask, input.traps);
    const { data: _prepared, ...ownBuffers } = lik as unknown as Record<string, unknown>;
    const ws = (ownBuffers['ws'] ?? {}) as Record<string, unknown>;
    const { data: _wsData, ...wsBuffers } = ws;
    const actual = typedArrayBytes({ lik: { ...ownBuffers, ws: wsBuffers }, mask });
    const lines = mask.columns.length + mask.rows.length;
    const predicted = likelihoodBytes(mask.points, input.traps.length, data.groups.length, lines);
    expect(Math.abs(predicted - actual) / actual).toBeLessThan(0.02);
  });

  it('should not underestimate the number of mask points by more than the boundary cells', () => {
    for (const [spacing, buffer] of [
      [10, 200],
      [25, 400],
      [5, 100],
    ]) {
      const traps = trapGrid(5, 4, 100);
      const actual = buildMask(traps, spacing, buffer).points;
      const estimate = maskPointsUpperEstimate(traps, spacing, buffer);
      expect(estimate).toBeGreaterThanOrEqual(actual * 0.98);
      expect(estimate).toBeLessThan(actual * 1.15);
    }
  });

  it('should refuse a mask above the point cap with advice', () => {
    const input = { ...smallSurvey(5), mask: { spacing: 1, buffer: 500 } };
    expect(() => assertSecrFitsInMemory(input)).toThrow(/mask is too large.*larger spacing/);
  });

  it('should refuse a fit whose buffers would exceed the memory limit', () => {
    // 100 traps, 20 occasions of different usage and a detection everywhere: 2,000 groups.
    const traps = trapGrid(10, 10, 50);
    const occasions = 20;
    const usage = traps.map(() => Array.from({ length: occasions }, (_, s) => 1 + s / 10));
    const captures = traps.flatMap((t, k) =>
      Array.from({ length: occasions }, (_, s) => ({
        animal: `A${k % 7}`,
        occasion: s + 1,
        trap: t.id,
      })),
    );
    const input: SecrInput = {
      traps,
      occasions,
      detector: 'proximity',
      captures,
      usage,
      mask: { spacing: 6, buffer: 300 },
    };
    expect(() => assertSecrFitsInMemory(input)).toThrow(/too large for the server's memory/);
    expect(() =>
      assertSecrFitsInMemory({ ...input, mask: { spacing: 60, buffer: 300 } }),
    ).not.toThrow();
  });
});

describe('fitSecr progress and the buffer check on fine masks', () => {
  it('should report progress once per start, never going backwards, and end at 1', () => {
    const seen: { stage: string; fraction: number }[] = [];
    fitSecr({ ...smallSurvey(7), mask: { spacing: 10, buffer: 160 } }, (p) => seen.push(p));
    const fractions = seen.map((p) => p.fraction);
    expect(fractions).toEqual([...fractions].sort((a, b) => a - b));
    expect(seen.filter((p) => p.stage.startsWith('fitting (start')).length).toBe(3);
    expect(fractions.at(-1)).toBe(1);
  });

  it('should skip the buffer check with a warning when the wider mask would exceed the cap', () => {
    // About 38,000 points at b = 160 m; the 240 m twin would exceed the 60,000-point cap.
    const r = fitSecr({ ...smallSurvey(7), mask: { spacing: 2, buffer: 160 } });
    expect(r.D).not.toBeNull();
    expect(r.bufferCheck).toBeNull();
    expect(r.warnings.join(' ')).toMatch(/buffer-sensitivity check was skipped/);
  });
});

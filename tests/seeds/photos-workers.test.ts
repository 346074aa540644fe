/** renderSet across worker threads (its own file, so its thread start-up runs beside the rest). */
import { describe, expect, it } from 'vitest';
import { renderSet } from '../../seeds/photos/index';
import type { PhotoSpec } from '../../seeds/photos/types';

const base: PhotoSpec = {
  width: 320,
  height: 240,
  seed: 3,
  station: 'TEST-WORKERS',
  camera: 'A',
  lighting: 'day',
  subject: { kind: 'target', individual: 'T-W', flank: 'right' },
};

describe('renderSet', () => {
  it('should give the same bytes from worker threads as in this thread', async () => {
    const specs = [base, { ...base, seed: 9, lighting: 'infrared' as const }];
    const pooled = await renderSet(specs, { concurrency: 2 });
    const inline = await renderSet(specs);
    expect(pooled.map((p) => p.jpeg.equals(inline[pooled.indexOf(p)].jpeg))).toEqual([true, true]);
  });
});

import { fileProgress, planBatches } from './upload-batches';

describe('planBatches', () => {
  const files = (sizes: number[]) => sizes.map((size, i) => ({ name: `f${i}`, size }));

  it('should cap the number of files per request', () => {
    const batches = planBatches(files(Array(60).fill(1000)), 25, 1e9);
    expect(batches.map((b) => b.files.length)).toEqual([25, 25, 10]);
  });

  it('should cap the bytes per request but still send a single large file alone', () => {
    const batches = planBatches(files([40, 30, 50, 200, 10]), 25, 100);
    expect(batches.map((b) => b.files.map((f) => f.size))).toEqual([[40, 30], [50], [200], [10]]);
    expect(batches.map((b) => b.bytes)).toEqual([70, 50, 200, 10]);
  });

  it('should keep every file exactly once and in order', () => {
    const input = files([5, 5, 5, 5, 5, 5, 5]);
    expect(planBatches(input, 3, 1e9).flatMap((b) => b.files)).toEqual(input);
    expect(planBatches([], 3, 10)).toEqual([]);
  });
});

describe('fileProgress', () => {
  it('should fill files one after another as bytes arrive', () => {
    expect(fileProgress([100, 100, 200], 150)).toEqual([1, 0.5, 0]);
    expect(fileProgress([100, 100, 200], 400)).toEqual([1, 1, 1]);
    expect(fileProgress([0, 100], 0)).toEqual([1, 0]);
  });
});

/** One request's worth of files. */
export interface Batch<T> {
  files: T[];
  bytes: number;
}

/**
 * Splits a card into requests of at most `maxFiles` files and `maxBytes` bytes (a single larger
 * file still travels alone), so a 2,000-photo card never needs one giant request.
 */
export function planBatches<T extends { size: number }>(
  files: T[],
  maxFiles = 25,
  maxBytes = 64_000_000,
): Batch<T>[] {
  const batches: Batch<T>[] = [];
  let current: Batch<T> = { files: [], bytes: 0 };
  for (const file of files) {
    const full =
      current.files.length >= maxFiles ||
      (current.files.length > 0 && current.bytes + file.size > maxBytes);
    if (full) {
      batches.push(current);
      current = { files: [], bytes: 0 };
    }
    current.files.push(file);
    current.bytes += file.size;
  }
  if (current.files.length) batches.push(current);
  return batches;
}

/** Per-file progress from a request's byte progress: files fill up in the order they were added. */
export function fileProgress(sizes: number[], loaded: number): number[] {
  let offset = 0;
  return sizes.map((size) => {
    const done =
      size === 0 ? (loaded >= offset ? 1 : 0) : Math.min(1, Math.max(0, (loaded - offset) / size));
    offset += size;
    return done;
  });
}

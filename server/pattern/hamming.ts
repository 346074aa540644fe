/** Hamming distances between 32-byte binary descriptors (ORB), in plain JavaScript. */

/** Bytes per ORB descriptor. */
export const DESCRIPTOR_BYTES = 32;
const WORDS = DESCRIPTOR_BYTES / 4;

/** Set bits of a 32-bit integer. */
export function popcount32(x: number): number {
  let v = x - ((x >>> 1) & 0x55555555);
  v = (v & 0x33333333) + ((v >>> 2) & 0x33333333);
  return (Math.imul((v + (v >>> 4)) & 0x0f0f0f0f, 0x01010101) >>> 24) & 0xff;
}

/** Descriptors as 32-bit words (copied when the bytes are not 4-aligned). */
export function asWords(bytes: Uint8Array): Uint32Array {
  if (bytes.byteLength % DESCRIPTOR_BYTES !== 0) {
    throw new Error(`descriptor bytes must be a multiple of ${DESCRIPTOR_BYTES}`);
  }
  if (bytes.byteOffset % 4 === 0) {
    return new Uint32Array(bytes.buffer, bytes.byteOffset, bytes.byteLength / 4);
  }
  return new Uint32Array(bytes.slice().buffer);
}

/** Distance between descriptor i of `a` and descriptor j of `b`. */
export function hamming(a: Uint32Array, i: number, b: Uint32Array, j: number): number {
  const p = i * WORDS;
  const q = j * WORDS;
  let d = 0;
  for (let w = 0; w < WORDS; w++) d += popcount32(a[p + w] ^ b[q + w]);
  return d;
}

/** Index of the centre nearest to descriptor i of `a` (ties go to the lower index). */
export function nearest(a: Uint32Array, i: number, centres: Uint32Array): number {
  const p = i * WORDS;
  const a0 = a[p];
  const a1 = a[p + 1];
  const a2 = a[p + 2];
  const a3 = a[p + 3];
  const a4 = a[p + 4];
  const a5 = a[p + 5];
  const a6 = a[p + 6];
  const a7 = a[p + 7];
  const k = centres.length / WORDS;
  let best = Infinity;
  let bestIndex = 0;
  // Unrolled: this loop is the cost of assigning visual words (k × descriptors per photo).
  for (let c = 0, q = 0; c < k; c++, q += WORDS) {
    const d =
      popcount32(a0 ^ centres[q]) +
      popcount32(a1 ^ centres[q + 1]) +
      popcount32(a2 ^ centres[q + 2]) +
      popcount32(a3 ^ centres[q + 3]) +
      popcount32(a4 ^ centres[q + 4]) +
      popcount32(a5 ^ centres[q + 5]) +
      popcount32(a6 ^ centres[q + 6]) +
      popcount32(a7 ^ centres[q + 7]);
    if (d < best) {
      best = d;
      bestIndex = c;
    }
  }
  return bestIndex;
}

/**
 * A small baseline JPEG encoder (ITU-T T.81): YCbCr 4:2:0, float AAN forward DCT, IJG quality
 * scaling of the Annex K quantisation tables, and Huffman tables built per image from symbol
 * counts (the Annex K.2 procedure). No trellis search: about twice as fast as mozjpeg here, for
 * files about a quarter larger, which suits generating thousands of test photos.
 */

/** Annex K.1 luminance and chrominance quantisation tables, natural (row-major) order. */
const LUMA_Q = [
  16, 11, 10, 16, 24, 40, 51, 61, 12, 12, 14, 19, 26, 58, 60, 55, 14, 13, 16, 24, 40, 57, 69, 56,
  14, 17, 22, 29, 51, 87, 80, 62, 18, 22, 37, 56, 68, 109, 103, 77, 24, 35, 55, 64, 81, 104, 113,
  92, 49, 64, 78, 87, 103, 121, 120, 101, 72, 92, 95, 98, 112, 100, 103, 99,
];
const CHROMA_Q = [
  17, 18, 24, 47, 99, 99, 99, 99, 18, 21, 26, 66, 99, 99, 99, 99, 24, 26, 56, 99, 99, 99, 99, 99,
  47, 66, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99,
  99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99, 99,
];

/** Natural index of the k-th coefficient in zig-zag order. */
const ZIGZAG = [
  0, 1, 8, 16, 9, 2, 3, 10, 17, 24, 32, 25, 18, 11, 4, 5, 12, 19, 26, 33, 40, 48, 41, 34, 27, 20,
  13, 6, 7, 14, 21, 28, 35, 42, 49, 56, 57, 50, 43, 36, 29, 22, 15, 23, 30, 37, 44, 51, 58, 59, 52,
  45, 38, 31, 39, 46, 53, 60, 61, 54, 47, 55, 62, 63,
];

const AAN = [1, 1.387039845, 1.306562965, 1.175875602, 1, 0.785694958, 0.5411961, 0.275899379];

/** IJG quality scaling of a base table, in zig-zag order. */
function scaledTable(base: readonly number[], quality: number): Uint8Array {
  const q = Math.min(100, Math.max(1, quality));
  const scale = q < 50 ? 5000 / q : 200 - q * 2;
  const out = new Uint8Array(64);
  for (let k = 0; k < 64; k++) {
    out[k] = Math.min(255, Math.max(1, Math.floor((base[ZIGZAG[k]] * scale + 50) / 100)));
  }
  return out;
}

/** Multipliers that undo the AAN output scaling and divide by the quantiser, zig-zag order. */
function divisors(table: Uint8Array): Float32Array {
  const out = new Float32Array(64);
  for (let k = 0; k < 64; k++) {
    const n = ZIGZAG[k];
    out[k] = 1 / (table[k] * AAN[n >> 3] * AAN[n & 7] * 8);
  }
  return out;
}

/** In-place float AAN forward DCT of an 8×8 block (rows, then columns). */
function fdct(d: Float32Array): void {
  for (let pass = 0; pass < 2; pass++) {
    const step = pass === 0 ? 1 : 8;
    const stride = pass === 0 ? 8 : 1;
    for (let i = 0; i < 8; i++) {
      const o = i * stride;
      const d0 = d[o];
      const d1 = d[o + step];
      const d2 = d[o + 2 * step];
      const d3 = d[o + 3 * step];
      const d4 = d[o + 4 * step];
      const d5 = d[o + 5 * step];
      const d6 = d[o + 6 * step];
      const d7 = d[o + 7 * step];
      const t0 = d0 + d7;
      const t7 = d0 - d7;
      const t1 = d1 + d6;
      const t6 = d1 - d6;
      const t2 = d2 + d5;
      const t5 = d2 - d5;
      const t3 = d3 + d4;
      const t4 = d3 - d4;
      const t10 = t0 + t3;
      const t13 = t0 - t3;
      const t11 = t1 + t2;
      const t12 = t1 - t2;
      d[o] = t10 + t11;
      d[o + 4 * step] = t10 - t11;
      const z1 = (t12 + t13) * 0.707106781;
      d[o + 2 * step] = t13 + z1;
      d[o + 6 * step] = t13 - z1;
      const s10 = t4 + t5;
      const s11 = t5 + t6;
      const s12 = t6 + t7;
      const z5 = (s10 - s12) * 0.382683433;
      const z2 = 0.5411961 * s10 + z5;
      const z4 = 1.306562965 * s12 + z5;
      const z3 = s11 * 0.707106781;
      const z11 = t7 + z3;
      const z13 = t7 - z3;
      d[o + 5 * step] = z13 + z2;
      d[o + 3 * step] = z13 - z2;
      d[o + step] = z11 + z4;
      d[o + 7 * step] = z11 - z4;
    }
  }
}

/** Code lengths per symbol from counts, limited to 16 bits (T.81 Annex K.2). */
function huffmanTable(counts: Uint32Array): { bits: Uint8Array; values: number[] } {
  const freq = new Float64Array(257);
  for (let i = 0; i < 256; i++) freq[i] = counts[i];
  freq[256] = 1; // reserved symbol: no code may be all ones
  const size = new Int32Array(257);
  const others = new Int32Array(257).fill(-1);
  for (;;) {
    let c1 = -1;
    let c2 = -1;
    let v1 = Infinity;
    let v2 = Infinity;
    for (let i = 0; i <= 256; i++) {
      const f = freq[i];
      if (f <= 0) continue;
      if (f <= v1) {
        v2 = v1;
        c2 = c1;
        v1 = f;
        c1 = i;
      } else if (f <= v2) {
        v2 = f;
        c2 = i;
      }
    }
    if (c2 < 0) break;
    freq[c1] += freq[c2];
    freq[c2] = 0;
    size[c1]++;
    while (others[c1] >= 0) {
      c1 = others[c1];
      size[c1]++;
    }
    others[c1] = c2;
    size[c2]++;
    while (others[c2] >= 0) {
      c2 = others[c2];
      size[c2]++;
    }
  }
  const bits = new Uint8Array(33);
  for (let i = 0; i <= 256; i++) if (size[i]) bits[size[i]]++;
  for (let i = 32; i > 16; i--) {
    while (bits[i] > 0) {
      let j = i - 2;
      while (bits[j] === 0) j--;
      bits[i] -= 2;
      bits[i - 1]++;
      bits[j + 1] += 2;
      bits[j]--;
    }
  }
  let i = 16;
  while (bits[i] === 0) i--;
  bits[i]--;
  const values: number[] = [];
  for (let len = 1; len <= 32; len++)
    for (let s = 0; s < 256; s++) if (size[s] === len) values.push(s);
  return { bits: bits.subarray(0, 17), values };
}

/** Canonical codes for a table: code and length per symbol. */
function codes(t: { bits: Uint8Array; values: number[] }): { code: Uint16Array; len: Uint8Array } {
  const code = new Uint16Array(256);
  const len = new Uint8Array(256);
  let c = 0;
  let k = 0;
  for (let l = 1; l <= 16; l++) {
    for (let n = 0; n < t.bits[l]; n++) {
      code[t.values[k]] = c++;
      len[t.values[k]] = l;
      k++;
    }
    c <<= 1;
  }
  return { code, len };
}

export { CHROMA_Q, codes, divisors, fdct, huffmanTable, LUMA_Q, scaledTable, ZIGZAG };

/**
 * Baseline JPEG writer: two passes over 4:2:0 MCUs (quantise and count symbols, then emit with
 * per-image Huffman tables). See jpeg-baseline.ts for the tables and transforms.
 */
import {
  CHROMA_Q as CHROMA,
  codes,
  divisors,
  fdct,
  huffmanTable,
  LUMA_Q as LUMA,
  scaledTable,
  ZIGZAG as ZZ,
} from './jpeg-baseline';
import type { Raster } from './raster';

/** Growable byte sink with JPEG bit packing and 0xFF stuffing. */
class Sink {
  buf = new Uint8Array(1 << 16);
  n = 0;
  private acc = 0;
  private nbits = 0;

  private grow(extra: number): void {
    if (this.n + extra <= this.buf.length) return;
    const next = new Uint8Array(Math.max(this.buf.length * 2, this.n + extra));
    next.set(this.buf.subarray(0, this.n));
    this.buf = next;
  }

  bytes(values: ArrayLike<number>): void {
    this.grow(values.length);
    for (let i = 0; i < values.length; i++) this.buf[this.n++] = values[i];
  }

  u16(v: number): void {
    this.bytes([v >> 8, v & 255]);
  }

  /** Appends the low `len` bits of `code`, most significant first. */
  bits(code: number, len: number): void {
    this.acc = (this.acc << len) | (code & ((1 << len) - 1));
    this.nbits += len;
    while (this.nbits >= 8) {
      const b = (this.acc >>> (this.nbits - 8)) & 255;
      this.nbits -= 8;
      if (this.n + 2 > this.buf.length) this.grow(2);
      this.buf[this.n++] = b;
      if (b === 255) this.buf[this.n++] = 0;
    }
    this.acc &= (1 << this.nbits) - 1;
  }

  /** Pads the last byte with ones. */
  flush(): void {
    if (this.nbits > 0) this.bits(0x7f, 8 - this.nbits);
  }
}

type Coded = ReturnType<typeof codes>;

interface Planes {
  blocks: Int16Array;
  /** Zig-zag index of the last non-zero coefficient of each block (0 if none). */
  last: Uint8Array;
  count: number;
}

const tmp = new Float32Array(64);

/** DCT of the 8×8 block at src[off] (row stride `stride`), quantised into out[at..at+63], zig-zag. */
function block(
  src: Float32Array,
  off: number,
  stride: number,
  q: Float32Array,
  out: Int16Array,
  at: number,
): number {
  for (let r = 0; r < 8; r++) {
    const o = off + r * stride;
    for (let c = 0; c < 8; c++) tmp[r * 8 + c] = src[o + c];
  }
  fdct(tmp);
  let last = 0;
  for (let k = 0; k < 64; k++) {
    // Round half up via an offset (the values stay far inside ±16384).
    const r = ((tmp[ZZ[k]] * q[k] + 16384.5) | 0) - 16384;
    // AC magnitudes stay within 10 bits and DC within 11, as baseline Huffman coding requires.
    const lim = k === 0 ? 2047 : 1023;
    const v = r > lim ? lim : r < -lim ? -lim : r;
    out[at + k] = v;
    if (v !== 0) last = k;
  }
  return last;
}

/** One strip of 16 image rows into luma and 2×2-averaged chroma planes, edges replicated. */
function convertStrip(
  img: Raster,
  my: number,
  pw: number,
  y: Float32Array,
  cb: Float32Array,
  cr: Float32Array,
): void {
  const { width, height, data } = img;
  const hw = pw / 2;
  // Two rows and two columns at a time: four luma samples and one averaged chroma pair.
  for (let r = 0; r < 16; r += 2) {
    const row0 = Math.min(height - 1, my * 16 + r) * width * 4;
    const row1 = Math.min(height - 1, my * 16 + r + 1) * width * 4;
    const yo = r * pw;
    const co = (r >> 1) * hw;
    for (let x = 0; x < pw; x += 2) {
      const a = (x < width ? x : width - 1) * 4;
      const b = (x + 1 < width ? x + 1 : width - 1) * 4;
      let R = data[row0 + a];
      let G = data[row0 + a + 1];
      let B = data[row0 + a + 2];
      y[yo + x] = 0.299 * R + 0.587 * G + 0.114 * B - 128;
      let sr = R;
      let sg = G;
      let sb = B;
      R = data[row0 + b];
      G = data[row0 + b + 1];
      B = data[row0 + b + 2];
      y[yo + x + 1] = 0.299 * R + 0.587 * G + 0.114 * B - 128;
      sr += R;
      sg += G;
      sb += B;
      R = data[row1 + a];
      G = data[row1 + a + 1];
      B = data[row1 + a + 2];
      y[yo + pw + x] = 0.299 * R + 0.587 * G + 0.114 * B - 128;
      sr += R;
      sg += G;
      sb += B;
      R = data[row1 + b];
      G = data[row1 + b + 1];
      B = data[row1 + b + 2];
      y[yo + pw + x + 1] = 0.299 * R + 0.587 * G + 0.114 * B - 128;
      sr += R;
      sg += G;
      sb += B;
      const k = co + (x >> 1);
      cb[k] = (-0.168736 * sr - 0.331264 * sg + 0.5 * sb) * 0.25;
      cr[k] = (0.5 * sr - 0.418688 * sg - 0.081312 * sb) * 0.25;
    }
  }
}

/** Quantised coefficients (zig-zag order) of every block, in MCU order: Y×4, Cb, Cr. */
function quantise(img: Raster, quality: number): Planes {
  const { width, height } = img;
  const mcuX = Math.ceil(width / 16);
  const mcuY = Math.ceil(height / 16);
  const pw = mcuX * 16;
  const blocks = new Int16Array(mcuX * mcuY * 6 * 64);
  const last = new Uint8Array(mcuX * mcuY * 6);
  const qy = divisors(scaledTable(LUMA, quality));
  const qc = divisors(scaledTable(CHROMA, quality));
  const y = new Float32Array(16 * pw);
  const cb = new Float32Array(8 * (pw / 2));
  const cr = new Float32Array(8 * (pw / 2));
  const hw = pw / 2;
  let at = 0;
  for (let my = 0; my < mcuY; my++) {
    convertStrip(img, my, pw, y, cb, cr);
    for (let mx = 0; mx < mcuX; mx++) {
      const x0 = mx * 16;
      const b = at / 64;
      last[b] = block(y, x0, pw, qy, blocks, at);
      last[b + 1] = block(y, x0 + 8, pw, qy, blocks, at + 64);
      last[b + 2] = block(y, 8 * pw + x0, pw, qy, blocks, at + 128);
      last[b + 3] = block(y, 8 * pw + x0 + 8, pw, qy, blocks, at + 192);
      last[b + 4] = block(cb, mx * 8, hw, qc, blocks, at + 256);
      last[b + 5] = block(cr, mx * 8, hw, qc, blocks, at + 320);
      at += 384;
    }
  }
  return { blocks, last, count: at / 64 };
}

/**
 * Runs over the scan's Huffman symbols: counts them when `out` is null, else writes them. One
 * function for both passes keeps the run-length rules in one place.
 */
function scan(p: Planes, counts: Uint32Array[], out: Sink | null, table: Coded[]): void {
  const prev = [0, 0, 0];
  const blocks = p.blocks;
  for (let b = 0; b < p.count; b++) {
    const inMcu = b % 6;
    const comp = inMcu < 4 ? 0 : inMcu - 3;
    const dc = comp === 0 ? 0 : 2;
    const ac = dc + 1;
    const o = b * 64;
    const diff = blocks[o] - prev[comp];
    prev[comp] = blocks[o];
    const a = diff < 0 ? -diff : diff;
    const s = a === 0 ? 0 : 32 - Math.clz32(a);
    if (out) {
      out.bits(table[dc].code[s], table[dc].len[s]);
      if (s) out.bits(diff < 0 ? diff - 1 : diff, s);
    } else {
      counts[dc][s]++;
    }
    let run = 0;
    const end = p.last[b];
    for (let k = 1; k <= end; k++) {
      const v = blocks[o + k];
      if (v === 0) {
        run++;
        continue;
      }
      while (run > 15) {
        if (out) out.bits(table[ac].code[0xf0], table[ac].len[0xf0]);
        else counts[ac][0xf0]++;
        run -= 16;
      }
      const av = v < 0 ? -v : v;
      const n = 32 - Math.clz32(av);
      const sym = (run << 4) | n;
      if (out) {
        out.bits(table[ac].code[sym], table[ac].len[sym]);
        out.bits(v < 0 ? v - 1 : v, n);
      } else {
        counts[ac][sym]++;
      }
      run = 0;
    }
    // End of block unless the last coefficient was non-zero.
    if (end < 63) {
      if (out) out.bits(table[ac].code[0], table[ac].len[0]);
      else counts[ac][0]++;
    }
  }
}

/** Encodes an RGBA raster as a baseline JPEG (JFIF APP0, 4:2:0, optimised Huffman tables). */
export function encodeBaseline(img: Raster, quality: number): Buffer {
  const planes = quantise(img, quality);
  const counts = [0, 1, 2, 3].map(() => new Uint32Array(256));
  scan(planes, counts, null, []);
  const tables = counts.map(huffmanTable);
  const table = tables.map(codes);
  const out = new Sink();
  out.bytes([0xff, 0xd8, 0xff, 0xe0, 0, 16, 0x4a, 0x46, 0x49, 0x46, 0, 1, 1, 0, 0, 1, 0, 1, 0, 0]);
  out.bytes([0xff, 0xdb, 0, 132, 0]);
  out.bytes(scaledTable(LUMA, quality));
  out.bytes([1]);
  out.bytes(scaledTable(CHROMA, quality));
  out.bytes([0xff, 0xc0, 0, 17, 8]);
  out.u16(img.height);
  out.u16(img.width);
  out.bytes([3, 1, 0x22, 0, 2, 0x11, 1, 3, 0x11, 1]);
  const ids = [0x00, 0x10, 0x01, 0x11];
  const dhtLength = 2 + tables.reduce((s, t) => s + 17 + t.values.length, 0);
  out.bytes([0xff, 0xc4]);
  out.u16(dhtLength);
  tables.forEach((t, i) => {
    out.bytes([ids[i]]);
    out.bytes(t.bits.subarray(1, 17));
    out.bytes(t.values);
  });
  out.bytes([0xff, 0xda, 0, 12, 3, 1, 0x00, 2, 0x11, 3, 0x11, 0, 63, 0]);
  scan(planes, counts, out, table);
  out.flush();
  out.bytes([0xff, 0xd9]);
  return Buffer.from(out.buf.buffer, 0, out.n);
}

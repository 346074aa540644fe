/**
 * Trains a binary visual vocabulary by k-majority clustering (k-means whose centres are the
 * bitwise majority of their members; Grana et al. 2013, "A fast approach for integrating ORB
 * descriptors in the bag of words model", SPIE 8667). Used offline on training photos only.
 */
import { DESCRIPTOR_BYTES, asWords, nearest } from './hamming';
import type { VocabularyFileContent } from './vocabulary';

/** Options for training. */
export interface TrainOptions {
  readonly k: number;
  readonly iterations: number;
  readonly seed: number;
  readonly id: string;
  readonly trainedOn: string;
  /** Progress callback (iteration, fraction of descriptors that changed word). */
  readonly onIteration?: (iteration: number, changed: number) => void;
}

const WORDS = DESCRIPTOR_BYTES / 4;

/** Small seeded generator (mulberry32) so a vocabulary can be rebuilt bit for bit. */
function seeded(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

function concat(docs: readonly Uint8Array[]): Uint32Array {
  const total = docs.reduce((s, d) => s + d.length, 0);
  const all = new Uint8Array(total);
  let o = 0;
  for (const d of docs) {
    all.set(d, o);
    o += d.length;
  }
  return asWords(all);
}

function copyDescriptor(from: Uint32Array, i: number, to: Uint32Array, c: number): void {
  to.set(from.subarray(i * WORDS, (i + 1) * WORDS), c * WORDS);
}

/** Recomputes each centre as the bitwise majority of its members; reseeds empty ones. */
function majority(
  data: Uint32Array,
  labels: Int32Array,
  centres: Uint32Array,
  k: number,
  random: () => number,
): void {
  const bits = new Int32Array(k * DESCRIPTOR_BYTES * 8);
  const sizes = new Int32Array(k);
  for (let i = 0; i < labels.length; i++) {
    const c = labels[i];
    sizes[c]++;
    const base = c * DESCRIPTOR_BYTES * 8;
    for (let w = 0; w < WORDS; w++) {
      const v = data[i * WORDS + w];
      for (let b = 0; b < 32; b++) if ((v >>> b) & 1) bits[base + w * 32 + b]++;
    }
  }
  for (let c = 0; c < k; c++) {
    if (sizes[c] === 0) {
      copyDescriptor(data, Math.floor(random() * labels.length), centres, c);
      continue;
    }
    const base = c * DESCRIPTOR_BYTES * 8;
    for (let w = 0; w < WORDS; w++) {
      let v = 0;
      for (let b = 0; b < 32; b++) if (bits[base + w * 32 + b] * 2 > sizes[c]) v |= 1 << b;
      centres[c * WORDS + w] = v >>> 0;
    }
  }
}

/** IDF per word over the training documents, ln((D + 1) / (n_w + 1)) so no weight is infinite. */
function inverseDocumentFrequency(docs: readonly Uint8Array[], centres: Uint32Array, k: number) {
  const seen = new Int32Array(k);
  for (const doc of docs) {
    const d = asWords(doc);
    const words = new Set<number>();
    for (let i = 0; i < doc.length / DESCRIPTOR_BYTES; i++) words.add(nearest(d, i, centres));
    for (const w of words) seen[w]++;
  }
  return Array.from(seen, (n) => Math.log((docs.length + 1) / (n + 1)));
}

/** Clusters the descriptors of the training documents (one document per photo view). */
export function trainVocabulary(
  docs: readonly Uint8Array[],
  options: TrainOptions,
): VocabularyFileContent {
  const { k, iterations } = options;
  const data = concat(docs);
  const n = data.length / WORDS;
  if (n < k) throw new Error(`need at least ${k} descriptors to train ${k} words, got ${n}`);
  const random = seeded(options.seed);
  const centres = new Uint32Array(k * WORDS);
  const order = Array.from({ length: n }, (_, i) => i);
  for (let c = 0; c < k; c++) {
    const j = c + Math.floor(random() * (n - c));
    [order[c], order[j]] = [order[j], order[c]];
    copyDescriptor(data, order[c], centres, c);
  }
  const labels = new Int32Array(n).fill(-1);
  for (let it = 0; it < iterations; it++) {
    let changed = 0;
    for (let i = 0; i < n; i++) {
      const c = nearest(data, i, centres);
      if (c !== labels[i]) changed++;
      labels[i] = c;
    }
    options.onIteration?.(it, changed / n);
    if (changed / n < 0.002) break;
    majority(data, labels, centres, k, random);
  }
  const idf = inverseDocumentFrequency(docs, centres, k);
  const bytes = new Uint8Array(centres.buffer, 0, k * DESCRIPTOR_BYTES);
  return {
    id: options.id,
    k,
    descriptorBytes: DESCRIPTOR_BYTES,
    trainedOn: options.trainedOn,
    words: Buffer.from(bytes).toString('base64'),
    idf: idf.map((v) => Math.round(v * 1e4) / 1e4),
  };
}

/**
 * The visual vocabulary: binary ORB descriptors quantised to their nearest word, and
 * bag-of-words vectors (Sivic & Zisserman 2003, ICCV) weighted by IDF, with square-rooted term
 * counts to damp repeated rosette-like structure. The words live in a versioned asset file
 * trained once on synthetic photos that the evaluation never uses.
 */
import { readFileSync } from 'node:fs';
import { DESCRIPTOR_BYTES, asWords, nearest } from './hamming';

/** File name of the vocabulary asset shipped beside this module. */
export const VOCABULARY_FILE = 'vocabulary-v1.json';

/** A trained vocabulary. */
export interface Vocabulary {
  /** Stored with every feature set; a change of id means re-extracting words. */
  readonly id: string;
  /** Words as 32-bit units (k × 8). */
  readonly centres: Uint32Array;
  /** Inverse document frequency per word, ln(N / n_w). */
  readonly idf: Float32Array;
}

/** A sparse, L2-normalised bag-of-words vector (ids ascending). */
export interface BowVector {
  readonly ids: Uint16Array;
  readonly weights: Float32Array;
}

/** The asset's JSON shape. */
export interface VocabularyFileContent {
  readonly id: string;
  readonly k: number;
  readonly descriptorBytes: number;
  /** Where the training photos came from (for people reading the file). */
  readonly trainedOn: string;
  /** Base64 of k × 32 bytes. */
  readonly words: string;
  readonly idf: readonly number[];
}

function isContent(v: unknown): v is VocabularyFileContent {
  if (typeof v !== 'object' || v === null) return false;
  const o = v as Record<string, unknown>;
  return (
    typeof o['id'] === 'string' &&
    typeof o['k'] === 'number' &&
    o['descriptorBytes'] === DESCRIPTOR_BYTES &&
    typeof o['words'] === 'string' &&
    Array.isArray(o['idf'])
  );
}

/** Builds a vocabulary from the asset's JSON content. */
export function vocabularyFromContent(content: unknown): Vocabulary {
  if (!isContent(content)) throw new Error('vocabulary file has an unexpected shape');
  const bytes = new Uint8Array(Buffer.from(content.words, 'base64'));
  if (bytes.length !== content.k * DESCRIPTOR_BYTES || content.idf.length !== content.k) {
    throw new Error(`vocabulary ${content.id}: sizes do not match k = ${content.k}`);
  }
  return { id: content.id, centres: asWords(bytes), idf: Float32Array.from(content.idf) };
}

let shipped: Vocabulary | null = null;

/** The vocabulary shipped with the server (read once per thread). */
export function defaultVocabulary(): Vocabulary {
  if (!shipped) {
    const text = readFileSync(new URL(`./${VOCABULARY_FILE}`, import.meta.url), 'utf8');
    shipped = vocabularyFromContent(JSON.parse(text));
  }
  return shipped;
}

/** Number of words. */
export function vocabularySize(vocab: Vocabulary): number {
  return vocab.idf.length;
}

/** Nearest word of every descriptor. */
export function assignWords(vocab: Vocabulary, descriptors: Uint8Array): Uint16Array {
  const d = asWords(descriptors);
  const n = descriptors.length / DESCRIPTOR_BYTES;
  const out = new Uint16Array(n);
  for (let i = 0; i < n; i++) out[i] = nearest(d, i, vocab.centres);
  return out;
}

/** Bag-of-words vector: sqrt(term count) × IDF per word, L2-normalised. */
export function bagOfWords(vocab: Vocabulary, words: Uint16Array): BowVector {
  const counts = new Map<number, number>();
  for (const w of words) counts.set(w, (counts.get(w) ?? 0) + 1);
  const ids = Uint16Array.from([...counts.keys()].sort((a, b) => a - b));
  const weights = new Float32Array(ids.length);
  let norm = 0;
  for (let i = 0; i < ids.length; i++) {
    const v = Math.sqrt(counts.get(ids[i]) ?? 0) * vocab.idf[ids[i]];
    weights[i] = v;
    norm += v * v;
  }
  if (norm > 0) {
    const inv = 1 / Math.sqrt(norm);
    for (let i = 0; i < weights.length; i++) weights[i] *= inv;
  }
  return { ids, weights };
}

/** Cosine similarity of two normalised sparse vectors. */
export function cosine(a: BowVector, b: BowVector): number {
  let i = 0;
  let j = 0;
  let s = 0;
  while (i < a.ids.length && j < b.ids.length) {
    if (a.ids[i] === b.ids[j]) s += a.weights[i++] * b.weights[j++];
    else if (a.ids[i] < b.ids[j]) i++;
    else j++;
  }
  return s;
}

/**
 * The shortlist: an inverted index over every reference photo of "spatial words" — a keypoint's
 * visual word together with the cell of the crop it sits in. Crops of a flank hug the animal from
 * nose to tail, so the same rosette lands in roughly the same cell of every crop; a plain bag of
 * words, which forgets where words are, barely separates individuals whose spots all look alike
 * (measured on the training set: 22 % top-1 against 93 % with cells). Plain JavaScript, so the
 * index can live in the main thread; it holds words and cells only, never descriptors.
 */
import { PATTERN_PARAMS, type FeatureSet, type FeatureView } from './types';
import { type Vocabulary, defaultVocabulary } from './vocabulary';

/** What the catalogue keeps about a reference photo. */
export interface CatalogueEntry {
  readonly individualId: string;
  readonly photoId: string;
  readonly flank: string;
}

/** A reference worth verifying, in the query orientation that resembled it. */
export interface ShortlistEntry extends CatalogueEntry {
  /** True when the flipped query is the one to compare with this reference. */
  readonly mirrored: boolean;
  /** IDF-weighted shared spatial words over sqrt(the reference's spatial words): evidence only. */
  readonly votes: number;
}

/** How the shortlist is drawn. */
export interface ShortlistOptions {
  /** Reference-orientation pairs to keep (default PATTERN_PARAMS.shortlistPairs). */
  readonly limit?: number;
  /**
   * The query's recorded flank: the query as seen is compared with references of this flank, the
   * flipped query with the other flank. Omitted: both orientations against every reference.
   */
  readonly flank?: string;
}

const CELLS_X = Math.ceil(1 / PATTERN_PARAMS.cellWidth);
const CELLS_Y = Math.ceil(1 / PATTERN_PARAMS.cellHeight);
/** Cell numbers fit in the low bits of a posting; the reference number takes the rest. */
const CELL_BITS = Math.ceil(Math.log2(CELLS_X * CELLS_Y));
const MAX_REFS = 2 ** (31 - CELL_BITS);

function cellOf(x: number, y: number): number {
  const cx = Math.min(CELLS_X - 1, Math.max(0, Math.floor(x / PATTERN_PARAMS.cellWidth)));
  const cy = Math.min(CELLS_Y - 1, Math.max(0, Math.floor(y / PATTERN_PARAMS.cellHeight)));
  return cx + CELLS_X * cy;
}

function rowOf(posting: number): number {
  return Math.floor((posting & ((1 << CELL_BITS) - 1)) / CELLS_X);
}

/** The 2×2 cells nearest a query point: tolerance of half to one and a half cells each way. */
function nearCells(x: number, y: number, out: Set<number>): void {
  const fx = x / PATTERN_PARAMS.cellWidth - 0.5;
  const fy = y / PATTERN_PARAMS.cellHeight - 0.5;
  for (const cx of [Math.floor(fx), Math.floor(fx) + 1]) {
    for (const cy of [Math.floor(fy), Math.floor(fy) + 1]) {
      if (cx >= 0 && cy >= 0 && cx < CELLS_X && cy < CELLS_Y) out.add(cx + CELLS_X * cy);
    }
  }
}

/** A growable list of postings (reference << CELL_BITS | cell) for one word in one cell row. */
class Postings {
  items = new Int32Array(16);
  length = 0;

  push(value: number): void {
    if (this.length === this.items.length) {
      const grown = new Int32Array(this.length * 2);
      grown.set(this.items);
      this.items = grown;
    }
    this.items[this.length++] = value;
  }
}

/** An index of reference photos for fast retrieval by coat pattern. */
export class PatternCatalogue {
  private readonly entries: CatalogueEntry[] = [];
  private readonly live: boolean[] = [];
  /** 1 / sqrt(spatial words) per reference: busy crops must not collect votes by sheer number. */
  private readonly norm: number[] = [];
  private readonly byPhoto = new Map<string, number>();
  private readonly postings: Postings[];

  constructor(readonly vocabulary: Vocabulary = defaultVocabulary()) {
    // One list per word and cell row, so a query scans only the rows its keypoints sit in.
    const lists = vocabulary.idf.length * CELLS_Y;
    this.postings = Array.from({ length: lists }, () => new Postings());
  }

  /** Reference photos indexed (removed ones excluded). */
  get size(): number {
    return this.byPhoto.size;
  }

  /** Adds (or replaces) a reference photo by the words of its plain view. */
  add(entry: CatalogueEntry, features: Pick<FeatureSet, 'vocabulary' | 'plain'>): void {
    if (features.vocabulary !== this.vocabulary.id) {
      throw new Error(
        `features use vocabulary "${features.vocabulary}", not "${this.vocabulary.id}"`,
      );
    }
    if (this.entries.length >= MAX_REFS) throw new RangeError('pattern catalogue is full');
    this.remove(entry.photoId);
    const ref = this.entries.length;
    // Copy the three fields: callers often pass a whole reference, features included.
    this.entries.push({
      individualId: entry.individualId,
      photoId: entry.photoId,
      flank: entry.flank,
    });
    this.live.push(true);
    this.byPhoto.set(entry.photoId, ref);
    const { words, points } = features.plain;
    const seen = new Set<number>();
    for (let i = 0; i < words.length; i++) {
      const posting = (ref << CELL_BITS) | cellOf(points[i * 2], points[i * 2 + 1]);
      // One posting per spatial word and photo: repeated texture must not outvote the pattern.
      const key = words[i] * 2 ** CELL_BITS + (posting & ((1 << CELL_BITS) - 1));
      if (seen.has(key)) continue;
      seen.add(key);
      this.postings[words[i] * CELLS_Y + rowOf(posting)].push(posting);
    }
    this.norm.push(seen.size > 0 ? 1 / Math.sqrt(seen.size) : 0);
  }

  /** Drops a reference photo (its postings stay in the index but no longer count). */
  remove(photoId: string): void {
    const ref = this.byPhoto.get(photoId);
    if (ref === undefined) return;
    this.live[ref] = false;
    this.byPhoto.delete(photoId);
  }

  /** IDF-weighted votes of one query view for every reference. */
  private votes(view: FeatureView, allowed: ((e: CatalogueEntry) => boolean) | null): Float32Array {
    const cellsByWord = new Map<number, Set<number>>();
    for (let i = 0; i < view.words.length; i++) {
      let cells = cellsByWord.get(view.words[i]);
      if (!cells) cellsByWord.set(view.words[i], (cells = new Set()));
      nearCells(view.points[i * 2], view.points[i * 2 + 1], cells);
    }
    const acc = new Float32Array(this.entries.length);
    const wanted = new Uint8Array(1 << CELL_BITS);
    const cellMask = (1 << CELL_BITS) - 1;
    const rows = new Set<number>();
    for (const [word, cells] of cellsByWord) {
      const weight = this.vocabulary.idf[word];
      if (weight <= 0) continue;
      rows.clear();
      for (const c of cells) {
        wanted[c] = 1;
        rows.add(Math.floor(c / CELLS_X));
      }
      for (const row of rows) {
        const list = this.postings[word * CELLS_Y + row];
        for (let k = 0; k < list.length; k++) {
          const p = list.items[k];
          if (wanted[p & cellMask]) acc[p >> CELL_BITS] += weight;
        }
      }
      for (const c of cells) wanted[c] = 0;
    }
    for (let ref = 0; ref < acc.length; ref++) {
      acc[ref] =
        this.live[ref] && (!allowed || allowed(this.entries[ref])) ? acc[ref] * this.norm[ref] : 0;
    }
    return acc;
  }

  /** The reference-orientation pairs most like the query, most votes first. */
  shortlist(query: FeatureSet, options: ShortlistOptions = {}): ShortlistEntry[] {
    const limit = options.limit ?? PATTERN_PARAMS.shortlistPairs;
    const { flank } = options;
    const best = new TopScores(limit);
    best.addAll(this.votes(query.plain, flank ? (e) => e.flank === flank : null), false);
    if (query.mirrored) {
      best.addAll(this.votes(query.mirrored, flank ? (e) => e.flank !== flank : null), true);
    }
    return best
      .sorted()
      .map((s) => ({ ...this.entries[s.ref], mirrored: s.mirrored, votes: s.score }));
  }
}

interface Scored {
  readonly ref: number;
  readonly mirrored: boolean;
  readonly score: number;
}

/** Keeps the `size` highest scores seen (a binary min-heap). */
class TopScores {
  private readonly heap: Scored[] = [];

  constructor(private readonly size: number) {}

  addAll(scores: Float32Array, mirrored: boolean): void {
    const h = this.heap;
    for (let ref = 0; ref < scores.length; ref++) {
      const score = scores[ref];
      if (score <= 0 || (h.length === this.size && score <= h[0].score)) continue;
      if (h.length < this.size) {
        h.push({ ref, mirrored, score });
        this.up(h.length - 1);
      } else {
        h[0] = { ref, mirrored, score };
        this.down(0);
      }
    }
  }

  sorted(): Scored[] {
    return [...this.heap].sort((a, b) => b.score - a.score);
  }

  private up(i: number): void {
    const h = this.heap;
    while (i > 0 && h[(i - 1) >> 1].score > h[i].score) {
      const p = (i - 1) >> 1;
      [h[p], h[i]] = [h[i], h[p]];
      i = p;
    }
  }

  private down(i: number): void {
    const h = this.heap;
    for (;;) {
      const l = 2 * i + 1;
      let m = i;
      if (l < h.length && h[l].score < h[m].score) m = l;
      if (l + 1 < h.length && h[l + 1].score < h[m].score) m = l + 1;
      if (m === i) return;
      [h[m], h[i]] = [h[i], h[m]];
      i = m;
    }
  }
}

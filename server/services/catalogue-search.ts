import Fuse, { type FuseResult, type IFuseOptions } from 'fuse.js';

/** A searched field and how much a match in it counts. */
export interface SearchKey {
  name: string;
  weight: number;
}

/** fuse.js options with named, weighted keys (the only form the catalogue uses). */
export type CatalogueSearchOptions<T> = Omit<IFuseOptions<T>, 'keys'> & { keys: SearchKey[] };

/**
 * Below this many individuals fuse.js searches the whole catalogue directly; above it, a trigram
 * index first picks the individuals whose text shares the most three-letter pieces with the
 * phrase, and fuse.js scores only those.
 */
export const DIRECT_SEARCH_LIMIT = 300;

/**
 * How many individuals candidate ranking asks for per phrase: the trigram index hands this many to
 * fuse.js. A caller asking for more (the catalogue page lists every match) gets a longer shortlist.
 */
export const SHORTLIST_SIZE = 40;

/** The texts of one field: a string, or each string of a list (fuse.js matches each on its own). */
function fieldTexts(value: unknown): string[] {
  if (typeof value === 'string') return value ? [value] : [];
  if (Array.isArray(value)) return value.filter((v): v is string => typeof v === 'string' && !!v);
  return [];
}

/** The distinct three-character pieces of a text, lower-cased, spaces collapsed. */
export function trigramsOf(text: string): Set<string> {
  const t = ` ${text.toLowerCase().replace(/\s+/g, ' ').trim()} `;
  const out = new Set<string>();
  for (let i = 0; i + 3 <= t.length; i++) out.add(t.slice(i, i + 3));
  return out;
}

/**
 * The same pieces as numbers (three UTF-16 code units in 48 bits), which index much faster than
 * short strings; `text` must already be lower-cased with spaces collapsed.
 */
function trigramCodes(text: string): Set<number> {
  const t = ` ${text.trim()} `;
  const out = new Set<number>();
  for (let i = 0; i + 3 <= t.length; i++)
    out.add(t.charCodeAt(i) * 4294967296 + t.charCodeAt(i + 1) * 65536 + t.charCodeAt(i + 2));
  return out;
}

/** log(1 + 2): the weight of a piece held by half the catalogue. */
const COMMON_PIECE_WEIGHT = Math.log(3);

function normalised(text: string): string {
  return text.toLowerCase().replace(/\s+/g, ' ');
}

/**
 * Catalogue text search with fuse.js's scores at any catalogue size.
 *
 * fuse.js scores an individual by approximate matching of the phrase over each field, which costs
 * time in proportion to all the text searched: about 0.1 ms per individual with a paragraph of
 * marking notes, so over a second per phrase for 10,000 individuals. Larger catalogues therefore
 * go through a trigram index first (q-gram filtering: a text holding the phrase with few typing
 * errors shares most of its three-letter pieces), and fuse.js scores the shortlist of individuals
 * sharing the most pieces, with the same options as a full search. Every score returned is exactly
 * the one fuse.js gives that individual over the whole catalogue; only individuals sharing few
 * pieces with the phrase, which fuse.js scores poorly anyway, can be left out.
 */
export class CatalogueSearch<T extends { id: string }> {
  private readonly fuse: Fuse<T> | null;
  private readonly postings = new Map<
    number,
    { items: Uint32Array; keyWeights: Float32Array; weight: number }
  >();
  private readonly scores: Float64Array;
  private readonly lengths: Uint32Array;
  private indexed = false;
  private whole: Fuse<T> | null = null;
  /** Each individual's texts (one per field, or per list element), lower-cased, with key weights. */
  private readonly texts: { text: string; weight: number }[][] = [];

  constructor(
    private readonly items: readonly T[],
    private readonly options: CatalogueSearchOptions<T>,
  ) {
    this.scores = new Float64Array(items.length);
    this.lengths = new Uint32Array(items.length);
    if (items.length <= DIRECT_SEARCH_LIMIT) {
      this.fuse = new Fuse(items, options);
      return;
    }
    this.fuse = null;
  }

  /** Builds the trigram index; the first search does it (a catalogue may change before anyone types). */
  prepare(): void {
    if (this.indexed) return;
    this.indexed = true;
    const { items, options } = this;
    const lists = new Map<number, { items: number[]; keyWeights: number[]; holders: number }>();
    items.forEach((item, i) => {
      const own: { text: string; weight: number }[] = [];
      for (const key of options.keys)
        for (const text of fieldTexts((item as Record<string, unknown>)[key.name]))
          own.push({ text: normalised(text), weight: key.weight });
      this.texts.push(own);
      this.lengths[i] = own.reduce((n, t) => n + t.text.length, 0);
      // Like fuse.js, which scores every matching field and list element and multiplies the
      // scores, a piece counts once for each text that holds it, by its key's weight.
      for (const { text, weight } of own)
        for (const g of trigramCodes(text)) {
          let list = lists.get(g);
          if (!list) lists.set(g, (list = { items: [], keyWeights: [], holders: 0 }));
          // Items come in order, so a new holder is one unlike the last item listed.
          if (list.items[list.items.length - 1] !== i) list.holders++;
          list.items.push(i);
          list.keyWeights.push(weight);
        }
    });
    // A piece found in few individuals says more than one found in nearly all (" on", "lef").
    for (const [g, list] of lists)
      this.postings.set(g, {
        items: Uint32Array.from(list.items),
        keyWeights: Float32Array.from(list.keyWeights),
        weight: Math.log(1 + items.length / list.holders),
      });
  }

  /** Number of individuals searched. */
  get size(): number {
    return this.items.length;
  }

  /**
   * The individuals sharing the most telling trigrams with the phrase, at most `size`;
   * among equals the shorter text first, as fuse.js's field-length norm prefers it.
   */
  shortlist(phrase: string, size = SHORTLIST_SIZE): T[] {
    this.prepare();
    const scores = this.scores;
    scores.fill(0);
    let full = 0;
    const found = [...trigramCodes(normalised(phrase))]
      .map((g) => this.postings.get(g))
      .filter((x) => x !== undefined);
    // Pieces held by more than half the catalogue (" on", "lef") cost the most and tell the least:
    // left out unless the phrase has nothing else.
    const telling = found.filter((x) => x.weight >= COMMON_PIECE_WEIGHT);
    for (const posting of telling.length ? telling : found) {
      full += posting.weight;
      const { items, keyWeights, weight } = posting;
      for (let k = 0; k < items.length; k++) scores[items[k]!]! += weight * keyWeights[k]!;
    }
    if (full === 0) return [];
    // Holding every piece is not holding the phrase ("left flank" and "right shoulder" hold the
    // pieces of "left shoulder"): the texts that hold it word for word go first.
    const words = phrase.toLowerCase().replace(/\s+/g, ' ').trim();
    for (let i = 0; i < scores.length; i++) {
      if (scores[i]! < full - 1e-9) continue;
      for (const t of this.texts[i]!) if (t.text.includes(words)) scores[i]! += full * t.weight;
    }
    // Keep the best `size` in a sorted array (insertion: cheap while the list is short).
    const best: number[] = [];
    const better = (a: number, b: number) =>
      scores[a]! > scores[b]! || (scores[a] === scores[b] && this.lengths[a]! < this.lengths[b]!);
    for (let i = 0; i < scores.length; i++) {
      if (scores[i] === 0) continue;
      if (best.length === size && !better(i, best[best.length - 1]!)) continue;
      let at = best.length;
      while (at > 0 && better(i, best[at - 1]!)) at--;
      best.splice(at, 0, i);
      if (best.length > size) best.pop();
    }
    return best.map((i) => this.items[i]!);
  }

  /**
   * Up to `limit` matches for one phrase, best first, as fuse.js reports them. A limit of a tenth
   * of the catalogue or more searches it whole (a shortlist that long saves little).
   */
  search(phrase: string, options: { limit?: number } = {}): FuseResult<T>[] {
    const limit = options.limit ?? SHORTLIST_SIZE;
    if (this.fuse) return this.fuse.search(phrase, { limit });
    if (limit * 10 >= this.items.length) {
      this.whole ??= new Fuse(this.items, this.options);
      return this.whole.search(phrase, { limit });
    }
    const shortlist = this.shortlist(phrase, Math.max(limit, SHORTLIST_SIZE));
    if (shortlist.length === 0) return [];
    return new Fuse(shortlist, this.options).search(phrase, { limit });
  }
}

/** Capture-history parsing and the summary statistics every closed-population estimator uses. */

/** Summary statistics of a set of capture histories (notation of Otis et al. 1978). */
export interface CaptureSummary {
  /** Occasions. */
  t: number;
  /** Distinct animals caught. */
  S: number;
  /** Animals caught on occasion j. */
  n: number[];
  /** First captures on occasion j. */
  u: number[];
  /** Recaptures on occasion j (n_j − u_j). */
  m: number[];
  /** Animals marked before occasion j. */
  marked: number[];
  /** f[k] = animals caught exactly k times (f[0] unused, 0). */
  f: number[];
  /** Total captures Σ n_j. */
  nDot: number;
  /** Σ M_j. */
  markedDot: number;
  /** Σ m_j. */
  mDot: number;
  /** Per animal: number of captures, first and last occasion (0-based). */
  captures: Int32Array;
  first: Int32Array;
  last: Int32Array;
}

/** Capture histories as rows of 0/1 (numbers) or strings such as "01101". */
export type HistoryInput = readonly string[] | readonly (readonly number[])[];

/** Convert histories to a 0/1 matrix, rejecting ragged rows, other symbols and all-zero rows. */
export function parseHistories(histories: HistoryInput): Uint8Array[] {
  if (histories.length === 0) throw new RangeError('No capture histories were given.');
  const rows = histories.map((h, i) => {
    const cells =
      typeof h === 'string' ? [...h].map((c) => (c === '1' ? 1 : c === '0' ? 0 : -1)) : [...h];
    if (cells.some((c) => c !== 0 && c !== 1)) {
      throw new RangeError(`History ${i + 1} contains values other than 0 and 1.`);
    }
    return Uint8Array.from(cells);
  });
  const t = rows[0].length;
  rows.forEach((r, i) => {
    if (r.length !== t) {
      throw new RangeError(`History ${i + 1} has ${r.length} occasions; history 1 has ${t}.`);
    }
    if (!r.includes(1))
      throw new RangeError(`History ${i + 1} is all zeros (animal never caught).`);
  });
  return rows;
}

/** Summary statistics from a parsed 0/1 matrix. */
export function summarise(rows: readonly Uint8Array[]): CaptureSummary {
  const t = rows[0]?.length ?? 0;
  const S = rows.length;
  const n = new Array<number>(t).fill(0);
  const u = new Array<number>(t).fill(0);
  const f = new Array<number>(t + 1).fill(0);
  const captures = new Int32Array(S);
  const first = new Int32Array(S);
  const last = new Int32Array(S);
  rows.forEach((row, i) => {
    let k = 0;
    let fi = -1;
    let li = -1;
    for (let j = 0; j < t; j++) {
      if (row[j] !== 1) continue;
      n[j]++;
      k++;
      if (fi < 0) fi = j;
      li = j;
    }
    if (fi >= 0) u[fi]++;
    f[k]++;
    captures[i] = k;
    first[i] = fi;
    last[i] = li;
  });
  const marked = new Array<number>(t).fill(0);
  for (let j = 1; j < t; j++) marked[j] = marked[j - 1] + u[j - 1];
  const m = n.map((nj, j) => nj - u[j]);
  const sum = (a: number[]): number => a.reduce((s, x) => s + x, 0);
  return {
    t,
    S,
    n,
    u,
    m,
    marked,
    f,
    nDot: sum(n),
    markedDot: sum(marked),
    mDot: sum(m),
    captures,
    first,
    last,
  };
}

/** Multiplicities of distinct histories (for the multinomial constant of full likelihoods). */
export function historyMultiplicities(rows: readonly Uint8Array[]): number[] {
  const counts = new Map<string, number>();
  for (const r of rows) {
    const key = r.join('');
    counts.set(key, (counts.get(key) ?? 0) + 1);
  }
  return [...counts.values()];
}

/** Prepare SECR inputs: trap indices, usage, and per-animal detections grouped by (trap, usage). */

/** SECR inputs as accepted by fitSecr (occasions numbered from 1). */
export interface SecrInput {
  traps: { id: string; x: number; y: number }[];
  occasions: number;
  detector: 'proximity' | 'count';
  captures: { animal: string; occasion: number; trap: string }[];
  /** usage[k][s]: days trap k was active on occasion s (0 = not working); default 1 everywhere. */
  usage?: number[][];
  mask?: { spacing: number; buffer: number };
}

/** One column of detection terms: trap k with usage u, used by `count` detections of an animal. */
export interface DetectionGroup {
  trap: number;
  usage: number;
}

/** Data ready for the likelihood. */
export interface PreparedSecr {
  detector: 'proximity' | 'count';
  K: number;
  /** Total usage per trap, Σ_s u_ks. */
  totalUsage: Float64Array;
  groups: DetectionGroup[];
  /** Per animal: group indices and counts (detections in that group). */
  animals: { id: string; group: Int32Array; count: Float64Array }[];
  /** Log-likelihood constant for count detectors: Σ y·log u − log y!. */
  constant: number;
  detections: number;
  droppedAtZeroUsage: number;
  duplicateProximity: number;
  /** Animals detected at two or more different traps. */
  spatialRecaptures: number;
  /** Pooled spatial standard deviation of animals seen at ≥ 2 traps (start value for σ). */
  rpsv: number | null;
}

/** Group detections and collect the facts the guards need. */
export function prepareSecr(input: SecrInput): PreparedSecr {
  const K = input.traps.length;
  const S = input.occasions;
  const trapIndex = new Map(input.traps.map((t, k) => [t.id, k]));
  const usage = input.usage ?? input.traps.map(() => new Array<number>(S).fill(1));
  const totalUsage = Float64Array.from(usage.map((row) => row.reduce((a, v) => a + v, 0)));
  const byAnimal = new Map<string, Map<string, number>>();
  let dropped = 0;
  let duplicates = 0;
  let constant = 0;
  for (const c of input.captures) {
    const k = trapIndex.get(c.trap);
    if (k === undefined)
      throw new RangeError(`Capture of ${c.animal} is at unknown trap ${c.trap}.`);
    const s = c.occasion - 1;
    if (s < 0 || s >= S)
      throw new RangeError(`Capture of ${c.animal} is on occasion ${c.occasion}, outside 1..${S}.`);
    if (!(usage[k][s] > 0)) {
      dropped++;
      continue;
    }
    const cells = byAnimal.get(c.animal) ?? new Map<string, number>();
    byAnimal.set(c.animal, cells);
    const key = `${k}:${s}`;
    cells.set(key, (cells.get(key) ?? 0) + 1);
  }
  const groupIndex = new Map<string, number>();
  const groups: DetectionGroup[] = [];
  const animals: PreparedSecr['animals'] = [];
  let detections = 0;
  let spatial = 0;
  let ss = 0;
  let dfTotal = 0;
  for (const [id, cells] of byAnimal) {
    const perGroup = new Map<number, number>();
    const trapsSeen: number[] = [];
    for (const [key, y] of cells) {
      const [k, s] = key.split(':').map(Number);
      let yy = y;
      if (input.detector === 'proximity' && y > 1) {
        duplicates += y - 1;
        yy = 1;
      }
      if (input.detector === 'count') constant += yy * Math.log(usage[k][s]) - logFactorial(yy);
      // Count detectors need only per-trap totals; proximity needs the usage of each occasion.
      const u = input.detector === 'count' ? 0 : usage[k][s];
      const gk = `${k}:${u}`;
      let g = groupIndex.get(gk);
      if (g === undefined) {
        g = groups.length;
        groupIndex.set(gk, g);
        groups.push({ trap: k, usage: u });
      }
      perGroup.set(g, (perGroup.get(g) ?? 0) + yy);
      for (let r = 0; r < yy; r++) trapsSeen.push(k);
      detections += yy;
    }
    animals.push({
      id,
      group: Int32Array.from(perGroup.keys()),
      count: Float64Array.from(perGroup.values()),
    });
    if (new Set(trapsSeen).size >= 2) {
      spatial++;
      const xs = trapsSeen.map((k) => input.traps[k].x);
      const ys = trapsSeen.map((k) => input.traps[k].y);
      const mx = xs.reduce((a, v) => a + v, 0) / xs.length;
      const my = ys.reduce((a, v) => a + v, 0) / ys.length;
      xs.forEach((x, i) => (ss += (x - mx) ** 2 + (ys[i] - my) ** 2));
      dfTotal += xs.length - 1;
    }
  }
  return {
    detector: input.detector,
    K,
    totalUsage,
    groups,
    animals,
    constant,
    detections,
    droppedAtZeroUsage: dropped,
    duplicateProximity: duplicates,
    spatialRecaptures: spatial,
    rpsv: dfTotal > 0 && ss > 0 ? Math.sqrt(ss / (2 * dfTotal)) : null,
  };
}

function logFactorial(n: number): number {
  let s = 0;
  for (let i = 2; i <= n; i++) s += Math.log(i);
  return s;
}

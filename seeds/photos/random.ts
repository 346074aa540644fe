/** Seeded randomness: every photo must re-render byte for byte from its spec, so no Math.random. */

/** 32-bit FNV-1a hash of a string, used to turn ids and labels into seeds. */
export function hashString(text: string): number {
  let h = 0x811c9dc5;
  for (let i = 0; i < text.length; i++) {
    h ^= text.charCodeAt(i);
    h = Math.imul(h, 0x01000193);
  }
  return h >>> 0;
}

/** Mixes several integers into one well-spread 32-bit value (a murmur3-style finaliser). */
export function mix(...values: number[]): number {
  let h = 0x9e3779b9;
  for (const v of values) {
    h = Math.imul(h ^ (v >>> 0), 0x85ebca6b);
    h = (h << 13) | (h >>> 19);
    h = Math.imul(h, 0xc2b2ae35) ^ 0x27d4eb2f;
  }
  h ^= h >>> 16;
  h = Math.imul(h, 0x7feb352d);
  h ^= h >>> 15;
  h = Math.imul(h, 0x846ca68b);
  h ^= h >>> 16;
  return h >>> 0;
}

/** A small deterministic generator (mulberry32) with the helpers the painters need. */
export class Rng {
  private state: number;

  constructor(seed: number) {
    this.state = mix(seed) || 1;
  }

  /** Uniform in [0, 1). */
  next(): number {
    this.state = (this.state + 0x6d2b79f5) >>> 0;
    let t = this.state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  }

  /** Uniform in [lo, hi). */
  range(lo: number, hi: number): number {
    return lo + (hi - lo) * this.next();
  }

  /** Integer in [lo, hi] inclusive. */
  int(lo: number, hi: number): number {
    return lo + Math.floor(this.next() * (hi - lo + 1));
  }

  /** True with probability p. */
  chance(p: number): boolean {
    return this.next() < p;
  }

  /** One element of a non-empty list. */
  pick<T>(items: readonly T[]): T {
    return items[Math.floor(this.next() * items.length)];
  }

  /** Approximately normal (sum of uniforms), mean 0 and the given spread. */
  normal(sd = 1): number {
    return (this.next() + this.next() + this.next() + this.next() - 2) * sd * 1.732;
  }

  /** An independent stream named by a label, so adding draws to one stream never shifts another. */
  fork(label: string | number): Rng {
    const tag = typeof label === 'number' ? label : hashString(label);
    return new Rng(mix(this.state, tag));
  }
}

/** A generator for a seed plus a label, without consuming anything from another stream. */
export function rngFor(seed: number, label: string): Rng {
  return new Rng(mix(seed, hashString(label)));
}

/** Cheap per-pixel hash noise in [0, 1), stable for a given (x, y, seed). */
export function hashNoise(x: number, y: number, seed: number): number {
  let h = Math.imul(x | 0, 0x27d4eb2d) ^ Math.imul(y | 0, 0x165667b1) ^ seed;
  h = Math.imul(h ^ (h >>> 15), 0x2c1b3c6d);
  h = Math.imul(h ^ (h >>> 12), 0x297a2d39);
  return ((h ^ (h >>> 15)) >>> 0) / 4294967296;
}

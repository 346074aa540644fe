/** Seeded pseudo-random numbers (xoshiro128**) with normal, binomial and Poisson draws. */
import { lgamma } from './special';

/** A seeded generator; the same seed always gives the same sequence. */
export class SeededRandom {
  private s0: number;
  private s1: number;
  private s2: number;
  private s3: number;
  private spareNormal: number | null = null;

  constructor(seed: number) {
    // splitmix32 spreads a small integer seed over the 128-bit state.
    let x = seed >>> 0;
    const next = (): number => {
      x = (x + 0x9e3779b9) >>> 0;
      let z = x;
      z = Math.imul(z ^ (z >>> 16), 0x85ebca6b) >>> 0;
      z = Math.imul(z ^ (z >>> 13), 0xc2b2ae35) >>> 0;
      return (z ^ (z >>> 16)) >>> 0;
    };
    this.s0 = next();
    this.s1 = next();
    this.s2 = next();
    this.s3 = next();
  }

  /** Uniform on [0, 1) with 32 random bits. */
  uniform(): number {
    const result = Math.imul(rotl(Math.imul(this.s1, 5), 7), 9) >>> 0;
    const t = (this.s1 << 9) >>> 0;
    this.s2 ^= this.s0;
    this.s3 ^= this.s1;
    this.s1 ^= this.s2;
    this.s0 ^= this.s3;
    this.s2 ^= t;
    this.s3 = rotl(this.s3, 11);
    return result / 4294967296;
  }

  /** Uniform integer in [0, n). */
  integer(n: number): number {
    return Math.floor(this.uniform() * n);
  }

  /** Standard normal draw (Marsaglia polar method). */
  normal(): number {
    if (this.spareNormal !== null) {
      const v = this.spareNormal;
      this.spareNormal = null;
      return v;
    }
    for (;;) {
      const u = 2 * this.uniform() - 1;
      const v = 2 * this.uniform() - 1;
      const s = u * u + v * v;
      if (s > 0 && s < 1) {
        const m = Math.sqrt((-2 * Math.log(s)) / s);
        this.spareNormal = v * m;
        return u * m;
      }
    }
  }

  /** Bernoulli(p) as 0/1. */
  bernoulli(p: number): number {
    return this.uniform() < p ? 1 : 0;
  }

  /** Binomial(n, p) draw: inversion when n·p is small, a sum of Bernoulli draws otherwise (both exact). */
  binomial(n: number, p: number): number {
    if (p <= 0 || n <= 0) return 0;
    if (p >= 1) return n;
    if (p > 0.5) return n - this.binomial(n, 1 - p);
    if (n * p > 30) return this.binomialByPoissonSplit(n, p);
    const q = 1 - p;
    const ratio = p / q;
    let prob = Math.pow(q, n);
    let cdf = prob;
    const u = this.uniform();
    let k = 0;
    while (u > cdf && k < n) {
      prob *= (ratio * (n - k)) / (k + 1);
      k++;
      cdf += prob;
    }
    return k;
  }

  private binomialByPoissonSplit(n: number, p: number): number {
    // Exact but O(n); large n·p only occurs in big synthetic populations.
    let k = 0;
    for (let i = 0; i < n; i++) if (this.uniform() < p) k++;
    return k;
  }

  /** Poisson(λ) draw: inversion for small λ, Hörmann's PTRS rejection for λ ≥ 10. */
  poisson(lambda: number): number {
    if (lambda <= 0) return 0;
    if (lambda < 10) {
      let k = 0;
      let prob = Math.exp(-lambda);
      let cdf = prob;
      const u = this.uniform();
      while (u > cdf && k < 1000) {
        k++;
        prob *= lambda / k;
        cdf += prob;
      }
      return k;
    }
    const slam = Math.sqrt(lambda);
    const loglam = Math.log(lambda);
    const b = 0.931 + 2.53 * slam;
    const a = -0.059 + 0.02483 * b;
    const invalpha = 1.1239 + 1.1328 / (b - 3.4);
    const vr = 0.9277 - 3.6224 / (b - 2);
    for (;;) {
      const u = this.uniform() - 0.5;
      const v = this.uniform();
      const us = 0.5 - Math.abs(u);
      const k = Math.floor(((2 * a) / us + b) * u + lambda + 0.43);
      if (us >= 0.07 && v <= vr) return k;
      if (k < 0 || (us < 0.013 && v > us)) continue;
      const lhs = Math.log(v) + Math.log(invalpha) - Math.log(a / (us * us) + b);
      if (lhs <= -lambda + k * loglam - lgamma(k + 1)) return k;
    }
  }
}

function rotl(x: number, k: number): number {
  return ((x << k) | (x >>> (32 - k))) >>> 0;
}

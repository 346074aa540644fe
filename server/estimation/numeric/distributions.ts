/** Normal, Student t, chi-square and beta distribution functions and quantiles. */
/* eslint-disable no-loss-of-precision -- published algorithm coefficients are quoted digit for digit */
import { betaInc, gammaP, gammaQ } from './special';
import { brentRoot } from './roots';

/** z for a two-sided 95 % interval, Φ⁻¹(0.975). */
export const Z95 = 1.959963984540054;

/** Standard normal cumulative distribution Φ(x), accurate in both tails. */
export function normalCdf(x: number): number {
  // Φ(x) = ½·erfc(−x/√2) and erfc(y) = Q(½, y²) for y ≥ 0.
  const y = x / Math.SQRT2;
  if (y >= 0) return 1 - 0.5 * gammaQ(0.5, y * y);
  return 0.5 * gammaQ(0.5, y * y);
}

/** Standard normal quantile Φ⁻¹(p) (Wichura 1988, AS 241, about 16 digits). */
export function normalQuantile(p: number): number {
  if (p <= 0) return -Infinity;
  if (p >= 1) return Infinity;
  const q = p - 0.5;
  if (Math.abs(q) <= 0.425) {
    const r = 0.180625 - q * q;
    return (
      (q *
        (((((((r * 2509.0809287301226727 + 33430.575583588128105) * r + 67265.770927008700853) * r +
          45921.953931549871457) *
          r +
          13731.693765509461125) *
          r +
          1971.5909503065514427) *
          r +
          133.14166789178437745) *
          r +
          3.387132872796366608)) /
      (((((((r * 5226.495278852545925 + 28729.085735721942674) * r + 39307.89580009271061) * r +
        21213.794301586595867) *
        r +
        5394.1960214247511077) *
        r +
        687.1870074920579083) *
        r +
        42.313330701600911252) *
        r +
        1)
    );
  }
  let r = q < 0 ? p : 1 - p;
  r = Math.sqrt(-Math.log(r));
  let value: number;
  if (r <= 5) {
    r -= 1.6;
    value =
      (((((((r * 7.7454501427834140764e-4 + 0.0227238449892691845833) * r +
        0.24178072517745061177) *
        r +
        1.27045825245236838258) *
        r +
        3.64784832476320460504) *
        r +
        5.7694972214606914055) *
        r +
        4.6303378461565452959) *
        r +
        1.42343711074968357734) /
      (((((((r * 1.05075007164441684324e-9 + 5.475938084995344946e-4) * r +
        0.0151986665636164571966) *
        r +
        0.14810397642748007459) *
        r +
        0.68976733498510000455) *
        r +
        1.6763848301838038494) *
        r +
        2.05319162663775882187) *
        r +
        1);
  } else {
    r -= 5;
    value =
      (((((((r * 2.01033439929228813265e-7 + 2.71155556874348757815e-5) * r +
        0.0012426609473880784386) *
        r +
        0.026532189526576123093) *
        r +
        0.29656057182850489123) *
        r +
        1.7848265399172913358) *
        r +
        5.4637849111641143699) *
        r +
        6.6579046435011037772) /
      (((((((r * 2.04426310338993978564e-15 + 1.4215117583164458887e-7) * r +
        1.8463183175100546818e-5) *
        r +
        7.868691311456132591e-4) *
        r +
        0.0148753612908506148525) *
        r +
        0.13692988092273580531) *
        r +
        0.59983220655588793769) *
        r +
        1);
  }
  return q < 0 ? -value : value;
}

/** Student t cumulative distribution with `df` degrees of freedom. */
export function tCdf(x: number, df: number): number {
  const tail = 0.5 * betaInc(df / (df + x * x), df / 2, 0.5);
  return x >= 0 ? 1 - tail : tail;
}

/** Student t quantile (root of the cdf; exact to about 1e-12). */
export function tQuantile(p: number, df: number): number {
  if (p <= 0) return -Infinity;
  if (p >= 1) return Infinity;
  if (p === 0.5) return 0;
  if (p < 0.5) return -tQuantile(1 - p, df);
  // The upper tail probability is monotone in x; widen the bracket until it holds the root.
  let hi = Math.max(2, normalQuantile(p) * 2);
  while (tCdf(hi, df) < p) hi *= 2;
  return brentRoot((x) => tCdf(x, df) - p, 0, hi, 1e-14);
}

/** Chi-square cumulative distribution with `df` degrees of freedom. */
export function chiSquareCdf(x: number, df: number): number {
  return x <= 0 ? 0 : gammaP(df / 2, x / 2);
}

/** Chi-square quantile with `df` degrees of freedom (df may be any positive real). */
export function chiSquareQuantile(p: number, df: number): number {
  if (p <= 0) return 0;
  if (p >= 1) return Infinity;
  let hi = Math.max(1, df + 10 * Math.sqrt(2 * df));
  while (chiSquareCdf(hi, df) < p) hi *= 2;
  // Compare upper tails when p is near 1 so the root keeps full precision.
  if (p > 0.5) return brentRoot((x) => 1 - p - gammaQ(df / 2, x / 2), 0, hi, 1e-14 * hi);
  return brentRoot((x) => chiSquareCdf(x, df) - p, 0, hi, 1e-14 * hi);
}

/** Beta(a, b) quantile. */
export function betaQuantile(p: number, a: number, b: number): number {
  if (p <= 0) return 0;
  if (p >= 1) return 1;
  return brentRoot((x) => betaInc(x, a, b) - p, 0, 1, 1e-15);
}

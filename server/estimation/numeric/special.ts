/** Special functions used by the estimators: log-gamma, digamma, incomplete gamma/beta, E1 and Ein. */

/** Euler–Mascheroni constant. */
export const EULER_GAMMA = 0.5772156649015329;

const LANCZOS_G = 7;
const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313,
  -176.61502916214059, 12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6,
  1.5056327351493116e-7,
];

/** Natural log of |Γ(x)| (Lanczos, g = 7; about 15 significant digits). */
export function lgamma(x: number): number {
  if (x < 0.5) {
    // Reflection keeps the Lanczos sum in its accurate range.
    return Math.log(Math.PI / Math.abs(Math.sin(Math.PI * x))) - lgamma(1 - x);
  }
  const z = x - 1;
  let a = LANCZOS[0];
  const tt = z + LANCZOS_G + 0.5;
  for (let i = 1; i < LANCZOS.length; i++) a += LANCZOS[i] / (z + i);
  return 0.5 * Math.log(2 * Math.PI) + (z + 0.5) * Math.log(tt) - tt + Math.log(a);
}

/** log of the binomial coefficient C(n, k) for real n ≥ k ≥ 0. */
export function lchoose(n: number, k: number): number {
  return lgamma(n + 1) - lgamma(k + 1) - lgamma(n - k + 1);
}

/** Digamma ψ(x) for x > 0 (recurrence to x ≥ 10, then the asymptotic series). */
export function digamma(x: number): number {
  let result = 0;
  let y = x;
  while (y < 10) {
    result -= 1 / y;
    y += 1;
  }
  const f = 1 / (y * y);
  const series =
    f *
    (-1 / 12 + f * (1 / 120 + f * (-1 / 252 + f * (1 / 240 + f * (-1 / 132 + f * (691 / 32760))))));
  return result + Math.log(y) - 0.5 / y + series;
}

const EPS = 1e-16;
const TINY = 1e-300;

/** Regularised lower incomplete gamma P(a, x). */
export function gammaP(a: number, x: number): number {
  if (x <= 0) return 0;
  if (x < a + 1) return gammaSeries(a, x);
  return 1 - gammaContinuedFraction(a, x);
}

/** Regularised upper incomplete gamma Q(a, x) = 1 − P(a, x), accurate in the upper tail. */
export function gammaQ(a: number, x: number): number {
  if (x <= 0) return 1;
  if (x < a + 1) return 1 - gammaSeries(a, x);
  return gammaContinuedFraction(a, x);
}

function gammaSeries(a: number, x: number): number {
  let sum = 1 / a;
  let term = sum;
  for (let n = 1; n < 10000; n++) {
    term *= x / (a + n);
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPS) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - lgamma(a));
}

function gammaContinuedFraction(a: number, x: number): number {
  // Modified Lentz evaluation of the continued fraction for Q(a, x).
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return Math.exp(-x + a * Math.log(x) - lgamma(a)) * h;
}

/** Regularised incomplete beta I_x(a, b). */
export function betaInc(x: number, a: number, b: number): number {
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  const front = Math.exp(
    lgamma(a + b) - lgamma(a) - lgamma(b) + a * Math.log(x) + b * Math.log1p(-x),
  );
  // The continued fraction converges fast only on this side of the mean.
  if (x < (a + 1) / (a + b + 2)) return (front * betaContinuedFraction(x, a, b)) / a;
  return 1 - (front * betaContinuedFraction(1 - x, b, a)) / b;
}

function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m < 10000; m++) {
    const m2 = 2 * m;
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const del = d * c;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h;
}

/** Exponential integral E1(x) = ∫_x^∞ e^{−u}/u du for x > 0. */
export function expint1(x: number): number {
  if (!(x > 0)) throw new RangeError('E1(x) needs x > 0');
  if (x <= 1) return -EULER_GAMMA - Math.log(x) + einSeries(x);
  // Continued fraction (modified Lentz) for large x.
  let b = x + 1;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i < 10000; i++) {
    const an = -i * i;
    b += 2;
    d = 1 / (an * d + b);
    c = b + an / c;
    const del = c * d;
    h *= del;
    if (Math.abs(del - 1) < EPS) break;
  }
  return h * Math.exp(-x);
}

/** Entire exponential integral Ein(x) = ∫_0^x (1 − e^{−u})/u du = E1(x) + ln x + γ. */
export function ein(x: number): number {
  if (x === 0) return 0;
  if (x <= 1) return einSeries(x);
  return expint1(x) + Math.log(x) + EULER_GAMMA;
}

function einSeries(x: number): number {
  // Σ_{k≥1} (−1)^{k+1} x^k / (k·k!): alternating but well-conditioned for x ≤ 1.
  let term = x;
  let sum = x;
  for (let k = 2; k < 200; k++) {
    term *= (-x * (k - 1)) / (k * k);
    sum += term;
    if (Math.abs(term) < EPS * Math.abs(sum)) break;
  }
  return sum;
}

/** log(Σ exp(v_i)) without overflow. */
export function logSumExp(values: ArrayLike<number>, length = values.length): number {
  let max = -Infinity;
  for (let i = 0; i < length; i++) if (values[i] > max) max = values[i];
  if (max === -Infinity) return -Infinity;
  let sum = 0;
  for (let i = 0; i < length; i++) sum += Math.exp(values[i] - max);
  return max + Math.log(sum);
}

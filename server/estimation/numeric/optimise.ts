/** Quasi-Newton (BFGS) minimisation with numerical or analytic gradients, and a numerical Hessian. */

/** Objective to minimise; `gradient` is optional (central differences are used without it). */
export interface Objective {
  value(x: readonly number[]): number;
  gradient?(x: readonly number[]): number[];
}

/** Outcome of a BFGS run. */
export interface MinimiseResult {
  x: number[];
  value: number;
  gradient: number[];
  iterations: number;
  evaluations: number;
  converged: boolean;
  /** Final BFGS inverse-Hessian estimate. */
  inverseHessian: number[][];
}

/** Options for {@link bfgs}. */
export interface BfgsOptions {
  maxIterations?: number;
  gradientTolerance?: number;
  /** Largest step (in parameter units) a line search may try; guards against overflow. */
  maxStep?: number;
  /** Starting inverse-Hessian estimate (identity when absent), e.g. from an earlier fit. */
  initialInverseHessian?: number[][];
}

/** Central-difference gradient with a step scaled to each coordinate. */
export function numericalGradient(
  f: (x: readonly number[]) => number,
  x: readonly number[],
): number[] {
  const g = new Array<number>(x.length);
  const xp = [...x];
  for (let i = 0; i < x.length; i++) {
    const h = 1e-5 * Math.max(1, Math.abs(x[i]));
    xp[i] = x[i] + h;
    const fp = f(xp);
    xp[i] = x[i] - h;
    const fm = f(xp);
    xp[i] = x[i];
    g[i] = (fp - fm) / (2 * h);
  }
  return g;
}

/** Numerical Hessian: central differences of the gradient when given, else of the function. */
export function numericalHessian(objective: Objective, x: readonly number[]): number[][] {
  const n = x.length;
  const h = x.map((xi) => 1e-4 * Math.max(1, Math.abs(xi)));
  const H = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  const xp = [...x];
  if (objective.gradient) {
    const grad = objective.gradient.bind(objective);
    for (let i = 0; i < n; i++) {
      xp[i] = x[i] + h[i];
      const gp = grad(xp);
      xp[i] = x[i] - h[i];
      const gm = grad(xp);
      xp[i] = x[i];
      for (let j = 0; j < n; j++) H[i][j] = (gp[j] - gm[j]) / (2 * h[i]);
    }
  } else {
    const f = (p: readonly number[]): number => objective.value(p);
    const f0 = f(x);
    for (let i = 0; i < n; i++) {
      for (let j = i; j < n; j++) {
        H[i][j] = secondDifference(f, xp, i, j, h[i], h[j], f0);
        H[j][i] = H[i][j];
      }
    }
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const s = 0.5 * (H[i][j] + H[j][i]);
      H[i][j] = s;
      H[j][i] = s;
    }
  }
  return H;
}

function secondDifference(
  f: (p: readonly number[]) => number,
  xp: number[],
  i: number,
  j: number,
  hi: number,
  hj: number,
  f0: number,
): number {
  const xi = xp[i];
  const xj = xp[j];
  if (i === j) {
    xp[i] = xi + hi;
    const fp = f(xp);
    xp[i] = xi - hi;
    const fm = f(xp);
    xp[i] = xi;
    return (fp - 2 * f0 + fm) / (hi * hi);
  }
  const at = (di: number, dj: number): number => {
    xp[i] = xi + di;
    xp[j] = xj + dj;
    const v = f(xp);
    xp[i] = xi;
    xp[j] = xj;
    return v;
  };
  return (at(hi, hj) - at(hi, -hj) - at(-hi, hj) + at(-hi, -hj)) / (4 * hi * hj);
}

/** Minimise an objective by BFGS with a backtracking (Armijo) line search. */
export function bfgs(
  objective: Objective,
  start: readonly number[],
  options: BfgsOptions = {},
): MinimiseResult {
  const n = start.length;
  const maxIterations = options.maxIterations ?? 200;
  const gtol = options.gradientTolerance ?? 1e-6;
  const maxStep = options.maxStep ?? 5;
  let evaluations = 0;
  const f = (p: readonly number[]): number => {
    evaluations++;
    const v = objective.value(p);
    return Number.isFinite(v) ? v : Infinity;
  };
  const grad = (p: readonly number[]): number[] =>
    objective.gradient ? objective.gradient(p) : numericalGradient(f, p);
  let x = [...start];
  let fx = f(x);
  let g = grad(x);
  let Hinv = options.initialInverseHessian?.map((row) => [...row]) ?? identity(n);
  let iterations = 0;
  let converged = false;
  for (; iterations < maxIterations; iterations++) {
    if (maxAbs(g) < gtol * Math.max(1, Math.abs(fx))) {
      converged = true;
      break;
    }
    let dir = matVec(Hinv, g).map((v) => -v);
    let slope = dot(dir, g);
    if (!(slope < 0)) {
      // The curvature estimate went bad: restart from steepest descent.
      Hinv = identity(n);
      dir = g.map((v) => -v);
      slope = dot(dir, g);
    }
    const norm = Math.sqrt(dot(dir, dir));
    let step = norm > maxStep ? maxStep / norm : 1;
    let xNew = x;
    let fNew = Infinity;
    for (let k = 0; k < 40; k++) {
      xNew = x.map((xi, i) => xi + step * dir[i]);
      fNew = f(xNew);
      if (fNew <= fx + 1e-4 * step * slope) break;
      step *= 0.5;
    }
    if (!(fNew < fx)) {
      converged = maxAbs(g) < 1e-3 * Math.max(1, Math.abs(fx));
      break;
    }
    const gNew = grad(xNew);
    const s = xNew.map((v, i) => v - x[i]);
    const y = gNew.map((v, i) => v - g[i]);
    const sy = dot(s, y);
    if (sy > 1e-12 * Math.sqrt(dot(s, s) * dot(y, y))) Hinv = bfgsUpdate(Hinv, s, y, sy);
    const relChange = Math.abs(fx - fNew) / Math.max(1, Math.abs(fx));
    x = xNew;
    fx = fNew;
    g = gNew;
    if (relChange < 1e-14 && maxAbs(g) < Math.sqrt(gtol)) {
      converged = true;
      iterations++;
      break;
    }
  }
  return { x, value: fx, gradient: g, iterations, evaluations, converged, inverseHessian: Hinv };
}

function bfgsUpdate(H: number[][], s: number[], y: number[], sy: number): number[][] {
  const n = s.length;
  const rho = 1 / sy;
  const Hy = matVec(H, y);
  const yHy = dot(y, Hy);
  const out = identity(n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) {
      out[i][j] =
        H[i][j] - rho * (Hy[i] * s[j] + s[i] * Hy[j]) + (rho * rho * yHy + rho) * s[i] * s[j];
    }
  }
  return out;
}

function identity(n: number): number[][] {
  return Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)),
  );
}

function matVec(m: number[][], v: number[]): number[] {
  return m.map((row) => dot(row, v));
}

function dot(a: readonly number[], b: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < a.length; i++) s += a[i] * b[i];
  return s;
}

function maxAbs(v: readonly number[]): number {
  let m = 0;
  for (const x of v) m = Math.max(m, Math.abs(x));
  return m;
}

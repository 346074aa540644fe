/** Small dense linear algebra for information matrices (row-major number[][]). */

/** Inverse of a square matrix by Gauss–Jordan elimination with partial pivoting; null if singular. */
export function invertMatrix(matrix: readonly (readonly number[])[]): number[][] | null {
  const n = matrix.length;
  const a = matrix.map((row, i) => [
    ...row,
    ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)),
  ]);
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) if (Math.abs(a[r][col]) > Math.abs(a[pivot][col])) pivot = r;
    const scale = Math.max(...matrix.map((row) => Math.abs(row[col])), 1e-300);
    if (!(Math.abs(a[pivot][col]) > 1e-13 * scale)) return null;
    [a[col], a[pivot]] = [a[pivot], a[col]];
    const inv = 1 / a[col][col];
    for (let j = 0; j < 2 * n; j++) a[col][j] *= inv;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const factor = a[r][col];
      if (factor === 0) continue;
      for (let j = 0; j < 2 * n; j++) a[r][j] -= factor * a[col][j];
    }
  }
  return a.map((row) => row.slice(n));
}

/** Quadratic form vᵀ M v. */
export function quadraticForm(m: readonly (readonly number[])[], v: readonly number[]): number {
  let sum = 0;
  for (let i = 0; i < v.length; i++)
    for (let j = 0; j < v.length; j++) sum += v[i] * m[i][j] * v[j];
  return sum;
}

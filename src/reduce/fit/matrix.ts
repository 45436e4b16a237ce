/**
 * The little linear algebra a degree ≤ 3 least-squares fit needs. Matrices are at most 4 × 4,
 * so plain Gauss–Jordan elimination with partial pivoting is exact enough and easy to check.
 */

export type Matrix = number[][];

export function zeros(rows: number, cols: number): Matrix {
  return Array.from({ length: rows }, () => new Array<number>(cols).fill(0));
}

/** The inverse of a square matrix, or null when it is singular to working precision. */
export function invert(a: Matrix): Matrix | null {
  const n = a.length;
  // Work on [A | I] and reduce the left half to I; the right half becomes A⁻¹.
  const work = a.map((row, i) => [...row, ...Array.from({ length: n }, (_, j) => (i === j ? 1 : 0))]);
  const scale = Math.max(...a.flat().map(Math.abs), 0);
  if (!(scale > 0)) return null;
  for (let col = 0; col < n; col++) {
    let pivot = col;
    for (let r = col + 1; r < n; r++) {
      if (Math.abs(work[r]![col]!) > Math.abs(work[pivot]![col]!)) pivot = r;
    }
    if (Math.abs(work[pivot]![col]!) <= scale * 1e-14) return null;
    [work[col], work[pivot]] = [work[pivot]!, work[col]!];
    const pivotRow = work[col]!;
    const p = pivotRow[col]!;
    for (let j = 0; j < 2 * n; j++) pivotRow[j] = pivotRow[j]! / p;
    for (let r = 0; r < n; r++) {
      if (r === col) continue;
      const row = work[r]!;
      const f = row[col]!;
      if (f === 0) continue;
      for (let j = 0; j < 2 * n; j++) row[j] = row[j]! - f * pivotRow[j]!;
    }
  }
  return work.map((row) => row.slice(n));
}

/** Matrix × vector. */
export function multiplyVector(a: Matrix, v: readonly number[]): number[] {
  return a.map((row) => row.reduce((acc, x, j) => acc + x * v[j]!, 0));
}

/** vᵀ A v, the variance of a linear combination v of correlated quantities with covariance A. */
export function quadraticForm(a: Matrix, v: readonly number[]): number {
  return v.reduce((acc, vi, i) => acc + vi * a[i]!.reduce((s, x, j) => s + x * v[j]!, 0), 0);
}

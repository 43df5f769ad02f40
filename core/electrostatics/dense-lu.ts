/**
 * Dense LU factorisation with partial (row) pivoting and the triangular solves, in place on a
 * row-major Float64Array (Doolittle form, G. H. Golub & C. F. Van Loan, *Matrix Computations*,
 * 4th ed., 2013, Algorithm 3.4.1). O(n³/3) flops; meant for the few hundred unknowns of a field
 * solve.
 */

/**
 * Factors the n × n matrix in place (L unit lower, U upper) and returns the pivot rows, or null
 * when a pivot is exactly zero or not finite (singular matrix).
 */
export function luFactor(matrix: Float64Array, n: number): Int32Array | null {
  const pivots = new Int32Array(n);
  for (let k = 0; k < n; k++) {
    let pivotRow = k;
    let pivotSize = Math.abs(matrix[k * n + k]);
    for (let i = k + 1; i < n; i++) {
      const size = Math.abs(matrix[i * n + k]);
      if (size > pivotSize) {
        pivotSize = size;
        pivotRow = i;
      }
    }
    if (!(pivotSize > 0) || !Number.isFinite(pivotSize)) return null;
    pivots[k] = pivotRow;
    if (pivotRow !== k) {
      const a = k * n;
      const b = pivotRow * n;
      for (let c = 0; c < n; c++) {
        const swap = matrix[a + c];
        matrix[a + c] = matrix[b + c];
        matrix[b + c] = swap;
      }
    }
    const pivot = matrix[k * n + k];
    const pivotRowStart = k * n;
    for (let i = k + 1; i < n; i++) {
      const rowStart = i * n;
      const factor = matrix[rowStart + k] / pivot;
      matrix[rowStart + k] = factor;
      if (factor === 0) continue;
      for (let c = k + 1; c < n; c++) matrix[rowStart + c] -= factor * matrix[pivotRowStart + c];
    }
  }
  return pivots;
}

/** Solves A x = b in place in `rhs` with the factors and pivots from `luFactor`. */
export function luSolve(factors: Float64Array, n: number, pivots: Int32Array, rhs: Float64Array): void {
  for (let k = 0; k < n; k++) {
    const p = pivots[k];
    if (p !== k) {
      const swap = rhs[k];
      rhs[k] = rhs[p];
      rhs[p] = swap;
    }
  }
  for (let i = 0; i < n; i++) {
    let sum = rhs[i];
    const rowStart = i * n;
    for (let c = 0; c < i; c++) sum -= factors[rowStart + c] * rhs[c];
    rhs[i] = sum;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sum = rhs[i];
    const rowStart = i * n;
    for (let c = i + 1; c < n; c++) sum -= factors[rowStart + c] * rhs[c];
    rhs[i] = sum / factors[rowStart + i];
  }
}

/**
 * Dense LU factorisation with partial (row) pivoting and the triangular solves, in place on a
 * row-major Float64Array (Doolittle form, G. H. Golub & C. F. Van Loan, *Matrix Computations*,
 * 4th ed., 2013, Algorithm 3.4.1). O(n³/3) flops; meant for the few hundred unknowns of a field
 * solve.
 *
 * Leading block: with `leading` = p, the pivot of each of the first p columns is searched among the
 * first p rows only. The first p steps are then exactly the factorisation of the leading p × p block
 * A11 = L11 U11 (the same operations on the same numbers), and the remaining steps factor the Schur
 * complement A22 − L21 U12 with ordinary partial pivoting (block LU, Golub & Van Loan §3.2.9). One
 * factorisation then answers both the leading block's system (`luSolve` with `size` = p) and the
 * whole one, where two factorisations were needed before.
 */

/**
 * Factors the n × n matrix in place (L unit lower, U upper) and returns the pivot rows, or null
 * when a pivot is exactly zero or not finite (singular matrix, or a singular leading block; the
 * matrix is then left part-way).
 * Steps go two at a time (`eliminatePair`); when n is odd the last step has no rows below it, and
 * only its pivot is checked.
 * @param leading the size p of a leading block whose pivots stay inside it (0: plain partial pivoting)
 */
export function luFactor(matrix: Float64Array, n: number, leading = 0): Int32Array | null {
  const pivots = new Int32Array(n);
  let k = 0;
  for (; k + 1 < n; k += 2) if (!eliminatePair(matrix, n, k, leading, pivots)) return null;
  if (k < n && !choosePivot(matrix, n, k, leading, pivots)) return null;
  return pivots;
}

/**
 * Partial pivoting for step k: the largest |entry| of column k among rows k … (the leading block's
 * end while k is inside it, else n − 1), the first of equals; records it and swaps the whole rows.
 * False when that pivot is zero or not finite.
 */
function choosePivot(matrix: Float64Array, n: number, k: number, leading: number, pivots: Int32Array): boolean {
  const searchEnd = k < leading ? leading : n;
  let pivotRow = k;
  let pivotSize = Math.abs(matrix[k * n + k]);
  for (let i = k + 1; i < searchEnd; i++) {
    const size = Math.abs(matrix[i * n + k]);
    if (size > pivotSize) {
      pivotSize = size;
      pivotRow = i;
    }
  }
  if (!(pivotSize > 0) || !Number.isFinite(pivotSize)) return false;
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
  return true;
}

/**
 * Steps k and k + 1 of the elimination in one pass over the trailing rows: every entry sees the
 * same two subtractions in the same order as in two single steps of Gaussian elimination, so the
 * factors are the same bits; the pass reads each trailing entry once where two steps read it
 * twice. Order: pivot of column k, its multipliers and their update of column k + 1 alone (all
 * that step k + 1's pivot search needs), the pivot of column k + 1 (its row swap carries rows that
 * are both still short of step k beyond column k + 1, the same state for both), step k on the new
 * pivot row, then both updates on every row below it.
 */
function eliminatePair(matrix: Float64Array, n: number, k: number, leading: number, pivots: Int32Array): boolean {
  if (!choosePivot(matrix, n, k, leading, pivots)) return false;
  const first = k * n;
  const pivotK = matrix[first + k];
  const upperK = matrix[first + k + 1];
  for (let i = k + 1; i < n; i++) {
    const row = i * n;
    const factor = matrix[row + k] / pivotK;
    matrix[row + k] = factor;
    matrix[row + k + 1] -= factor * upperK;
  }
  if (!choosePivot(matrix, n, k + 1, leading, pivots)) return false;
  const second = first + n;
  const factorSecond = matrix[second + k];
  for (let c = k + 2; c < n; c++) matrix[second + c] -= factorSecond * matrix[first + c];
  const pivotNext = matrix[second + k + 1];
  let i = k + 2;
  for (; i + 1 < n; i += 2) {
    const rowA = i * n;
    const rowB = rowA + n;
    const stepA = matrix[rowA + k];
    const stepB = matrix[rowB + k];
    const nextA = matrix[rowA + k + 1] / pivotNext;
    const nextB = matrix[rowB + k + 1] / pivotNext;
    matrix[rowA + k + 1] = nextA;
    matrix[rowB + k + 1] = nextB;
    for (let c = k + 2; c < n; c++) {
      const u = matrix[first + c];
      const v = matrix[second + c];
      matrix[rowA + c] = matrix[rowA + c] - stepA * u - nextA * v;
      matrix[rowB + c] = matrix[rowB + c] - stepB * u - nextB * v;
    }
  }
  if (i < n) {
    const row = i * n;
    const step = matrix[row + k];
    const next = matrix[row + k + 1] / pivotNext;
    matrix[row + k + 1] = next;
    for (let c = k + 2; c < n; c++)
      matrix[row + c] = matrix[row + c] - step * matrix[first + c] - next * matrix[second + c];
  }
  return true;
}

/**
 * Solves A x = b in place in `rhs` with the factors and pivots from `luFactor`.
 * @param size solve the leading size × size block only (the `leading` of `luFactor`; default n)
 */
export function luSolve(factors: Float64Array, n: number, pivots: Int32Array, rhs: Float64Array, size = n): void {
  for (let k = 0; k < size; k++) {
    const p = pivots[k];
    if (p !== k) {
      const swap = rhs[k];
      rhs[k] = rhs[p];
      rhs[p] = swap;
    }
  }
  for (let i = 0; i < size; i++) {
    let sum = rhs[i];
    const rowStart = i * n;
    for (let c = 0; c < i; c++) sum -= factors[rowStart + c] * rhs[c];
    rhs[i] = sum;
  }
  for (let i = size - 1; i >= 0; i--) {
    let sum = rhs[i];
    const rowStart = i * n;
    for (let c = i + 1; c < size; c++) sum -= factors[rowStart + c] * rhs[c];
    rhs[i] = sum / factors[rowStart + i];
  }
}

/**
 * Solves A x = b in place for several right-hand sides: `rhs` holds them one after another, n
 * numbers each (column l from l·n). Four columns go through the substitutions together, each with
 * its own running sum, so that the four chains of dependent subtractions overlap in the processor
 * where one column's chain waits on each step; every column sees exactly the operations of
 * `luSolve` in the same order (the same bits).
 */
export function luSolveColumns(
  factors: Float64Array,
  n: number,
  pivots: Int32Array,
  rhs: Float64Array,
  m: number,
): void {
  let l = 0;
  for (; l + 3 < m; l += 4) solveFourColumns(factors, n, pivots, rhs, l * n);
  for (; l < m; l++) luSolve(factors, n, pivots, rhs.subarray(l * n, (l + 1) * n));
}

/** The substitutions of `luSolve` on the four columns starting at `a` of `rhs` (see luSolveColumns). */
function solveFourColumns(factors: Float64Array, n: number, pivots: Int32Array, rhs: Float64Array, a: number): void {
  const b = a + n;
  const c = b + n;
  const d = c + n;
  for (let k = 0; k < n; k++) {
    const p = pivots[k];
    if (p === k) continue;
    for (let start = a; start <= d; start += n) {
      const swap = rhs[start + k];
      rhs[start + k] = rhs[start + p];
      rhs[start + p] = swap;
    }
  }
  for (let i = 0; i < n; i++) {
    let sumA = rhs[a + i];
    let sumB = rhs[b + i];
    let sumC = rhs[c + i];
    let sumD = rhs[d + i];
    const rowStart = i * n;
    for (let j = 0; j < i; j++) {
      const factor = factors[rowStart + j];
      sumA -= factor * rhs[a + j];
      sumB -= factor * rhs[b + j];
      sumC -= factor * rhs[c + j];
      sumD -= factor * rhs[d + j];
    }
    rhs[a + i] = sumA;
    rhs[b + i] = sumB;
    rhs[c + i] = sumC;
    rhs[d + i] = sumD;
  }
  for (let i = n - 1; i >= 0; i--) {
    let sumA = rhs[a + i];
    let sumB = rhs[b + i];
    let sumC = rhs[c + i];
    let sumD = rhs[d + i];
    const rowStart = i * n;
    for (let j = i + 1; j < n; j++) {
      const factor = factors[rowStart + j];
      sumA -= factor * rhs[a + j];
      sumB -= factor * rhs[b + j];
      sumC -= factor * rhs[c + j];
      sumD -= factor * rhs[d + j];
    }
    const diagonal = factors[rowStart + i];
    rhs[a + i] = sumA / diagonal;
    rhs[b + i] = sumB / diagonal;
    rhs[c + i] = sumC / diagonal;
    rhs[d + i] = sumD / diagonal;
  }
}

/**
 * Small dense symmetric eigenproblems, row-major Float64Array: Cholesky factorisation, the cyclic
 * Jacobi method for a symmetric matrix, and the symmetric-definite generalised problem
 * K x = λ M x reduced to standard form by M = G Gᵀ, A = G⁻¹ K G⁻ᵀ, x = G⁻ᵀ y
 * [golubvanloan2013] (Algorithm 4.5.1 for Cholesky, §8.5 for Jacobi, §8.7.2 for the reduction).
 * Meant for the few dozen unknowns of a segmented winding: O(n³) per sweep, a handful of sweeps.
 */

/** Lower Cholesky factor G of a symmetric positive-definite n × n matrix (A = G Gᵀ), or null. */
export function choleskyFactor(matrix: Float64Array, n: number): Float64Array | null {
  const g = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    let diagonal = matrix[j * n + j];
    for (let k = 0; k < j; k++) diagonal -= g[j * n + k] * g[j * n + k];
    if (!(diagonal > 0) || !Number.isFinite(diagonal)) return null;
    const pivot = Math.sqrt(diagonal);
    g[j * n + j] = pivot;
    for (let i = j + 1; i < n; i++) {
      let sum = matrix[i * n + j];
      for (let k = 0; k < j; k++) sum -= g[i * n + k] * g[j * n + k];
      g[i * n + j] = sum / pivot;
    }
  }
  return g;
}

/** Solves G x = b in place (G lower triangular). */
export function forwardSubstitute(g: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let sum = b[i];
    for (let k = 0; k < i; k++) sum -= g[i * n + k] * b[k];
    b[i] = sum / g[i * n + i];
  }
}

/** Solves Gᵀ x = b in place (G lower triangular). */
export function backSubstituteTransposed(g: Float64Array, n: number, b: Float64Array): void {
  for (let i = n - 1; i >= 0; i--) {
    let sum = b[i];
    for (let k = i + 1; k < n; k++) sum -= g[k * n + i] * b[k];
    b[i] = sum / g[i * n + i];
  }
}

/** Eigenvalues (ascending) and eigenvectors (column j of `vectors`, row-major n × n). */
export interface SymmetricEigen {
  values: Float64Array;
  vectors: Float64Array;
}

const MAX_JACOBI_SWEEPS = 60;

/**
 * All eigenpairs of a symmetric n × n matrix by the cyclic Jacobi method with the stable rotation
 * formulas (Golub & Van Loan §8.5.2, Algorithm 8.5.1/8.5.3). Sweeps until the off-diagonal
 * Frobenius norm is below 10⁻¹⁵ of the whole; the input is not changed. Orthonormal vectors.
 */
export function symmetricEigen(matrix: Float64Array, n: number): SymmetricEigen {
  const a = Float64Array.from(matrix.subarray(0, n * n));
  const v = new Float64Array(n * n);
  for (let i = 0; i < n; i++) v[i * n + i] = 1;
  let total = 0;
  for (let i = 0; i < n * n; i++) total += a[i] * a[i];
  for (let sweep = 0; sweep < MAX_JACOBI_SWEEPS; sweep++) {
    let off = 0;
    for (let p = 0; p < n; p++) for (let q = p + 1; q < n; q++) off += 2 * a[p * n + q] * a[p * n + q];
    if (!(off > 1e-30 * total)) break;
    for (let p = 0; p < n - 1; p++) {
      for (let q = p + 1; q < n; q++) {
        const apq = a[p * n + q];
        if (apq === 0) continue;
        const tau = (a[q * n + q] - a[p * n + p]) / (2 * apq);
        const t = (tau >= 0 ? 1 : -1) / (Math.abs(tau) + Math.sqrt(1 + tau * tau));
        const c = 1 / Math.sqrt(1 + t * t);
        const s = t * c;
        // A ← Jᵀ A J with J the rotation in the (p, q) plane.
        for (let k = 0; k < n; k++) {
          const akp = a[k * n + p];
          const akq = a[k * n + q];
          a[k * n + p] = c * akp - s * akq;
          a[k * n + q] = s * akp + c * akq;
        }
        for (let k = 0; k < n; k++) {
          const apk = a[p * n + k];
          const aqk = a[q * n + k];
          a[p * n + k] = c * apk - s * aqk;
          a[q * n + k] = s * apk + c * aqk;
        }
        for (let k = 0; k < n; k++) {
          const vkp = v[k * n + p];
          const vkq = v[k * n + q];
          v[k * n + p] = c * vkp - s * vkq;
          v[k * n + q] = s * vkp + c * vkq;
        }
      }
    }
  }
  const order = Array.from({ length: n }, (_, i) => i).sort((i, j) => a[i * n + i] - a[j * n + j]);
  const values = new Float64Array(n);
  const vectors = new Float64Array(n * n);
  for (let to = 0; to < n; to++) {
    const from = order[to];
    values[to] = a[from * n + from];
    for (let k = 0; k < n; k++) vectors[k * n + to] = v[k * n + from];
  }
  return { values, vectors };
}

/**
 * The symmetric-definite generalised problem K x = λ M x (K symmetric, M symmetric positive
 * definite): eigenvalues ascending, eigenvectors M-orthonormal (xᵀ M x = 1) in the columns.
 * Null when M is not positive definite.
 */
export function generalizedSymmetricEigen(k: Float64Array, m: Float64Array, n: number): SymmetricEigen | null {
  const g = choleskyFactor(m, n);
  if (!g) return null;
  // A = G⁻¹ K G⁻ᵀ: first B = G⁻¹ K (columns), then A = G⁻¹ Bᵀ (B symmetric product).
  const b = new Float64Array(n * n);
  const column = new Float64Array(n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) column[i] = k[i * n + j];
    forwardSubstitute(g, n, column);
    for (let i = 0; i < n; i++) b[i * n + j] = column[i];
  }
  const a = new Float64Array(n * n);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) column[j] = b[i * n + j]; // row i of B = column i of Bᵀ
    forwardSubstitute(g, n, column);
    for (let j = 0; j < n; j++) a[j * n + i] = column[j];
  }
  for (let i = 0; i < n; i++) {
    for (let j = i + 1; j < n; j++) {
      const mean = 0.5 * (a[i * n + j] + a[j * n + i]);
      a[i * n + j] = mean;
      a[j * n + i] = mean;
    }
  }
  const standard = symmetricEigen(a, n);
  const vectors = new Float64Array(n * n);
  for (let j = 0; j < n; j++) {
    for (let i = 0; i < n; i++) column[i] = standard.vectors[i * n + j];
    backSubstituteTransposed(g, n, column);
    for (let i = 0; i < n; i++) vectors[i * n + j] = column[i];
  }
  return { values: standard.values, vectors };
}

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

/**
 * A symmetric matrix reduced to tridiagonal form by Householder reflections, A = Q T Qᵀ
 * [golubvanloan2013] Algorithm 8.3.1: the diagonal and subdiagonal of T and the reflections
 * (Q = H_0 H_1 ⋯ H_(n−3), H_k = I − β_k v_k v_kᵀ acting on indices k + 1 … n − 1).
 */
export interface Tridiagonal {
  n: number;
  diagonal: Float64Array;
  /** offDiagonal[k] = T(k + 1, k), n − 1 entries. */
  offDiagonal: Float64Array;
  /** Reflection k: its vector in reflectors[k·n + k + 1 …], its β in betas[k]. */
  reflectors: Float64Array;
  betas: Float64Array;
}

/** Householder tridiagonalisation of a symmetric n × n matrix (row-major; the input is not changed). */
export function tridiagonalize(matrix: Float64Array, n: number): Tridiagonal {
  const a = Float64Array.from(matrix.subarray(0, n * n));
  const reflectors = new Float64Array(n * n);
  const betas = new Float64Array(Math.max(0, n - 2));
  const offDiagonal = new Float64Array(Math.max(0, n - 1));
  const p = new Float64Array(n);
  for (let k = 0; k < n - 2; k++) {
    let norm = 0;
    for (let i = k + 1; i < n; i++) norm += a[i * n + k] * a[i * n + k];
    norm = Math.sqrt(norm);
    if (norm === 0) continue; // already reduced in this column: H_k = I
    const first = a[(k + 1) * n + k];
    const alpha = first > 0 ? -norm : norm;
    const base = k * n; // reflection k's vector v: reflectors[base + i], i = k + 1 … n − 1
    for (let i = k + 1; i < n; i++) reflectors[base + i] = a[i * n + k];
    reflectors[base + k + 1] -= alpha;
    let vv = 0;
    for (let i = k + 1; i < n; i++) vv += reflectors[base + i] * reflectors[base + i];
    const beta = 2 / vv;
    betas[k] = beta;
    // The trailing block S ← H S H = S − v wᵀ − w vᵀ, p = β S v, w = p − (β/2)(pᵀv) v.
    let pv = 0;
    for (let i = k + 1; i < n; i++) {
      const row = i * n;
      let sum = 0;
      for (let j = k + 1; j < n; j++) sum += a[row + j] * reflectors[base + j];
      p[i] = beta * sum;
      pv += p[i] * reflectors[base + i];
    }
    const half = 0.5 * beta * pv;
    for (let i = k + 1; i < n; i++) p[i] -= half * reflectors[base + i];
    // The block stays exactly symmetric (the two products of (i, j) and (j, i) are the same, added
    // in the other order): the upper half is updated and mirrored.
    for (let i = k + 1; i < n; i++) {
      const row = i * n;
      const vi = reflectors[base + i];
      const pi = p[i];
      for (let j = i; j < n; j++) {
        const value = a[row + j] - (vi * p[j] + pi * reflectors[base + j]);
        a[row + j] = value;
        a[j * n + i] = value;
      }
    }
    a[(k + 1) * n + k] = alpha;
  }
  const diagonal = new Float64Array(n);
  for (let i = 0; i < n; i++) diagonal[i] = a[i * n + i];
  for (let i = 0; i + 1 < n; i++) offDiagonal[i] = a[(i + 1) * n + i];
  return { n, diagonal, offDiagonal, reflectors, betas };
}

/** y = Q z in place: the reflections applied from the last to the first. */
export function applyReflections(t: Tridiagonal, z: Float64Array): void {
  const n = t.n;
  for (let k = n - 3; k >= 0; k--) {
    const beta = t.betas[k];
    if (beta === 0) continue;
    let dot = 0;
    for (let i = k + 1; i < n; i++) dot += t.reflectors[k * n + i] * z[i];
    const scale = beta * dot;
    for (let i = k + 1; i < n; i++) z[i] -= scale * t.reflectors[k * n + i];
  }
}

const MAX_QR_STEPS_PER_VALUE = 30;

/**
 * All eigenvalues of a symmetric tridiagonal matrix, ascending, by the implicit symmetric QR
 * iteration with the Wilkinson shift ([golubvanloan2013] Algorithms 8.3.2 and 8.3.3): a Givens
 * rotation chases the bulge down each unreduced block; an off-diagonal entry below
 * ε (|d_i| + |d_(i+1)|) is set to zero. Null if the iteration does not settle (never seen).
 */
export function tridiagonalEigenvalues(
  diagonal: ArrayLike<number>,
  offDiagonal: ArrayLike<number>,
): Float64Array | null {
  const n = diagonal.length;
  // Scaled by a power of two (exact) to a largest entry near 1, so that √(x² + z²) below can
  // neither overflow nor lose the rotation to underflow; Math.hypot does the same at several times the cost.
  let largest = 0;
  for (let i = 0; i < n; i++) largest = Math.max(largest, Math.abs(diagonal[i]));
  for (let i = 0; i + 1 < n; i++) largest = Math.max(largest, Math.abs(offDiagonal[i]));
  if (!Number.isFinite(largest)) return null;
  const scale = largest > 0 ? 2 ** -Math.round(Math.log2(largest)) : 1;
  const d = new Float64Array(n);
  const e = new Float64Array(Math.max(0, n - 1));
  for (let i = 0; i < n; i++) d[i] = diagonal[i] * scale;
  for (let i = 0; i + 1 < n; i++) e[i] = offDiagonal[i] * scale;
  let m = n - 1;
  let steps = 0;
  while (m > 0) {
    if (Math.abs(e[m - 1]) <= Number.EPSILON * (Math.abs(d[m - 1]) + Math.abs(d[m]))) {
      e[m - 1] = 0;
      m--;
      continue;
    }
    if (++steps > MAX_QR_STEPS_PER_VALUE * n) return null;
    let l = m - 1;
    while (l > 0 && Math.abs(e[l - 1]) > Number.EPSILON * (Math.abs(d[l - 1]) + Math.abs(d[l]))) l--;
    // Wilkinson shift: the eigenvalue of the trailing 2 × 2 block nearer d_m.
    const half = 0.5 * (d[m - 1] - d[m]);
    const last = e[m - 1];
    const shift = d[m] - (last * last) / (half + (half >= 0 ? 1 : -1) * Math.sqrt(half * half + last * last));
    let x = d[l] - shift;
    let z = e[l];
    for (let k = l; k < m; k++) {
      const r = Math.sqrt(x * x + z * z);
      const c = r === 0 ? 1 : x / r;
      const s = r === 0 ? 0 : z / r;
      if (k > l) e[k - 1] = r;
      const a = d[k];
      const b = e[k];
      const cc = d[k + 1];
      d[k] = c * c * a + 2 * c * s * b + s * s * cc;
      d[k + 1] = s * s * a - 2 * c * s * b + c * c * cc;
      e[k] = c * s * (cc - a) + (c * c - s * s) * b;
      if (k + 1 < m) {
        x = e[k];
        z = s * e[k + 1];
        e[k + 1] *= c;
      }
    }
  }
  d.sort();
  for (let i = 0; i < n; i++) d[i] /= scale;
  return d;
}

/**
 * The unit eigenvector of a symmetric tridiagonal matrix for a computed eigenvalue, by inverse
 * iteration ([golubvanloan2013] §8.2.2, §7.6.1): (T − σ I) x_(k+1) = x_k with σ the eigenvalue,
 * solved by Gaussian elimination with partial pivoting in banded form (§4.3.5; a zero pivot
 * becomes ε‖T‖). Three steps from a start that no eigenvector is orthogonal to in practice.
 */
export function tridiagonalEigenvector(
  diagonal: ArrayLike<number>,
  offDiagonal: ArrayLike<number>,
  eigenvalue: number,
): Float64Array {
  const n = diagonal.length;
  let norm = 0;
  for (let i = 0; i < n; i++)
    norm = Math.max(
      norm,
      Math.abs(diagonal[i]) + (i > 0 ? Math.abs(offDiagonal[i - 1]) : 0) + (i + 1 < n ? Math.abs(offDiagonal[i]) : 0),
    );
  const tiny = Number.EPSILON * (norm > 0 ? norm : 1);
  // Factor P (T − σ I) = L U: U has two superdiagonals (u1, u2), L unit lower bidiagonal (lower).
  const u0 = new Float64Array(n);
  const u1 = new Float64Array(n);
  const u2 = new Float64Array(n);
  const lower = new Float64Array(n);
  const swapped = new Uint8Array(n);
  for (let i = 0; i < n; i++) u0[i] = diagonal[i] - eigenvalue;
  for (let i = 0; i + 1 < n; i++) u1[i] = offDiagonal[i];
  for (let i = 0; i + 1 < n; i++) {
    const below = offDiagonal[i]; // T(i + 1, i)
    if (Math.abs(u0[i]) >= Math.abs(below)) {
      if (u0[i] === 0) u0[i] = tiny;
      const factor = below / u0[i];
      lower[i] = factor;
      u0[i + 1] -= factor * u1[i];
    } else {
      swapped[i] = 1;
      const factor = u0[i] / below;
      lower[i] = factor;
      u0[i] = below;
      const above = u1[i];
      u1[i] = u0[i + 1];
      u0[i + 1] = above - factor * u0[i + 1];
      if (i + 2 < n) {
        u2[i] = u1[i + 1];
        u1[i + 1] = -factor * u1[i + 1];
      }
    }
  }
  if (u0[n - 1] === 0) u0[n - 1] = tiny;
  const x = new Float64Array(n);
  for (let i = 0; i < n; i++) x[i] = 1 + i / (3 * n);
  for (let step = 0; step < 3; step++) {
    for (let i = 0; i + 1 < n; i++) {
      if (swapped[i]) {
        const top = x[i];
        x[i] = x[i + 1];
        x[i + 1] = top - lower[i] * x[i + 1];
      } else {
        x[i + 1] -= lower[i] * x[i];
      }
    }
    for (let i = n - 1; i >= 0; i--) {
      let sum = x[i];
      if (i + 1 < n) sum -= u1[i] * x[i + 1];
      if (i + 2 < n) sum -= u2[i] * x[i + 2];
      x[i] = sum / u0[i];
    }
    let length = 0;
    for (let i = 0; i < n; i++) length += x[i] * x[i];
    length = Math.sqrt(length);
    for (let i = 0; i < n; i++) x[i] /= length;
  }
  return x;
}

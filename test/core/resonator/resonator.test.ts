import { describe, expect, it } from 'vitest';
import { windingNodeFraction } from '../../../core/electrostatics/bodies.ts';
import { nodeCapacitanceMatrix } from '../../../core/electrostatics/capacitance-matrix.ts';
import { type FieldArrangement, solveField } from '../../../core/electrostatics/field-solve.ts';
import { coaxialLoopMutualInductance } from '../../../core/inductance/coaxial-loops.ts';
import { loopSumSolenoidInductance } from '../../../core/inductance/filament-sum.ts';
import {
  applyReflections,
  choleskyFactor,
  generalizedSymmetricEigen,
  symmetricEigen,
  tridiagonalEigenvalues,
  tridiagonalEigenvector,
  tridiagonalize,
} from '../../../core/resonator/dense-eigen.ts';
import { foldTopload, solveResonator } from '../../../core/resonator/resonator.ts';
import { segmentInductanceMatrix } from '../../../core/resonator/segment-inductance.ts';
import { estimatedError, windingResonator } from '../../../core/resonator/winding-resonator.ts';

describe('dense symmetric eigensolvers', () => {
  it('Jacobi: the (−1, 2, −1) matrix has eigenvalues 2 − 2cos(kπ/(n+1)) (exact; [golubvanloan2013] §4.8)', () => {
    const n = 12;
    const a = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      a[i * n + i] = 2;
      if (i + 1 < n) {
        a[i * n + i + 1] = -1;
        a[(i + 1) * n + i] = -1;
      }
    }
    const { values, vectors } = symmetricEigen(a, n);
    for (let k = 1; k <= n; k++) expect(values[k - 1]).toBeCloseTo(2 - 2 * Math.cos((k * Math.PI) / (n + 1)), 12);
    // orthonormal vectors
    let dot = 0;
    for (let i = 0; i < n; i++) dot += vectors[i * n] * vectors[i * n + 1];
    expect(Math.abs(dot)).toBeLessThan(1e-12);
  });

  it('generalised problem: the uniform LC chain, grounded base and open top, has ω_m = (2/√(LC)) sin((2m−1)π/(2(2n+1))) (exact; [brillouin1946] ch. 1)', () => {
    const n = 10;
    const l = 1e-3;
    const c = 1e-9;
    const inductance = new Float64Array(n * n);
    const capacitance = new Float64Array(n * n);
    for (let i = 0; i < n; i++) {
      inductance[i * n + i] = l;
      capacitance[i * n + i] = c;
    }
    const fractions = Array.from({ length: n + 1 }, (_, k) => k / n);
    const solution = solveResonator({ inductance, capacitance, fractions, length: 1 });
    expect(solution).not.toBeNull();
    for (let m = 1; m <= n; m++) {
      const exact = ((2 / Math.sqrt(l * c)) * Math.sin(((2 * m - 1) * Math.PI) / (2 * (2 * n + 1)))) / (2 * Math.PI);
      expect(solution?.frequencies[m - 1]).toBeCloseTo(exact, 6 - Math.round(Math.log10(exact)));
    }
  });

  it('generalised eigenvectors are M-orthonormal; a non-definite M is refused', () => {
    const k = Float64Array.from([4, 1, 1, 3]);
    const m = Float64Array.from([2, 0.5, 0.5, 1]);
    const eigen = generalizedSymmetricEigen(k, m, 2);
    const x = eigen?.vectors ?? new Float64Array(4);
    const mx0 = [2 * x[0] + 0.5 * x[2], 0.5 * x[0] + x[2]];
    expect(x[0] * mx0[0] + x[2] * mx0[1]).toBeCloseTo(1, 12);
    expect(x[1] * mx0[0] + x[3] * mx0[1]).toBeCloseTo(0, 12);
    expect(choleskyFactor(Float64Array.from([1, 2, 2, 1]), 2)).toBeNull();
  });
});

/** λ_k = 2 − 2cos(kπ/(n+1)) and x_j = sin(jkπ/(n+1)), j, k = 1 … n: the (−1, 2, −1) matrix's exact eigenpairs. */
function secondDifferencePair(n: number, k: number): { value: number; vector: Float64Array } {
  const vector = new Float64Array(n);
  let length = 0;
  for (let j = 1; j <= n; j++) {
    vector[j - 1] = Math.sin((j * k * Math.PI) / (n + 1));
    length += vector[j - 1] ** 2;
  }
  for (let j = 0; j < n; j++) vector[j] /= Math.sqrt(length);
  return { value: 2 - 2 * Math.cos((k * Math.PI) / (n + 1)), vector };
}

/** Largest |x_j − s·y_j| over j, s = ±1 the sign that matches (eigenvectors are defined up to sign). */
function vectorDistance(x: ArrayLike<number>, y: ArrayLike<number>): number {
  let dot = 0;
  for (let j = 0; j < x.length; j++) dot += x[j] * y[j];
  const sign = dot < 0 ? -1 : 1;
  let worst = 0;
  for (let j = 0; j < x.length; j++) worst = Math.max(worst, Math.abs(x[j] - sign * y[j]));
  return worst;
}

describe('tridiagonal QR and inverse iteration against the (−1, 2, −1) matrix (exact eigenpairs; [golubvanloan2013] §4.8)', () => {
  it('the implicit QR gives λ_k = 2 − 2cos(kπ/(n+1)) for orders 1 to 64, also scaled by 10⁻¹⁴ and 10²⁰⁰', () => {
    for (const n of [1, 2, 3, 7, 16, 33, 64]) {
      for (const scale of [1, 1e-14, 1e200]) {
        const values = tridiagonalEigenvalues(
          new Float64Array(n).fill(2 * scale),
          new Float64Array(n - 1).fill(-scale),
        );
        expect(values).not.toBeNull();
        for (let k = 1; k <= n; k++) {
          const exact = secondDifferencePair(n, k).value * scale;
          // Backward stable: the error is a small multiple of ε‖T‖ (‖T‖ ≤ 4·scale; [golubvanloan2013] §8.3.7),
          // allowed here as n·ε‖T‖ (seen: at most 11 ε‖T‖ at n = 64). The relative error of the
          // smallest eigenvalues is then larger, as n².
          const error = Math.abs((values?.[k - 1] ?? Number.NaN) - exact);
          expect(error).toBeLessThan(n * Number.EPSILON * 4 * scale);
        }
      }
    }
  });

  it('inverse iteration at each computed eigenvalue gives the unit vector sin(jkπ/(n+1)), normalised', () => {
    for (const n of [2, 5, 16, 40]) {
      const diagonal = new Float64Array(n).fill(2);
      const offDiagonal = new Float64Array(n - 1).fill(-1);
      const values = tridiagonalEigenvalues(diagonal, offDiagonal) ?? new Float64Array(n);
      for (let k = 1; k <= n; k++) {
        const vector = tridiagonalEigenvector(diagonal, offDiagonal, values[k - 1]);
        expect(vectorDistance(vector, secondDifferencePair(n, k).vector)).toBeLessThan(1e-10);
      }
    }
  });

  it('a dense matrix H T H (T the (−1, 2, −1) matrix, H a reflection) is tridiagonalised to the same eigenvalues, and Q carries the eigenvectors back to H x_k', () => {
    const n = 12;
    const u = Float64Array.from({ length: n }, (_, j) => Math.cos(0.7 * j + 0.3));
    let norm = 0;
    for (const value of u) norm += value * value;
    for (let j = 0; j < n; j++) u[j] /= Math.sqrt(norm);
    const reflect = (x: Float64Array) => {
      let dot = 0;
      for (let j = 0; j < n; j++) dot += u[j] * x[j];
      return Float64Array.from(x, (value, j) => value - 2 * dot * u[j]);
    };
    // A = H T H column by column (H is its own inverse and symmetric).
    const a = new Float64Array(n * n);
    for (let c = 0; c < n; c++) {
      const e = new Float64Array(n);
      e[c] = 1;
      const he = reflect(e);
      const the = Float64Array.from(
        he,
        (value, j) => 2 * value - (j > 0 ? he[j - 1] : 0) - (j + 1 < n ? he[j + 1] : 0),
      );
      const column = reflect(the);
      for (let j = 0; j < n; j++) a[j * n + c] = column[j];
    }
    for (let i = 0; i < n; i++) for (let j = i + 1; j < n; j++) a[j * n + i] = a[i * n + j];
    const t = tridiagonalize(a, n);
    const values = tridiagonalEigenvalues(t.diagonal, t.offDiagonal) ?? new Float64Array(n);
    for (let k = 1; k <= n; k++) {
      const { value, vector } = secondDifferencePair(n, k);
      expect(Math.abs(values[k - 1] - value)).toBeLessThan(1e-13);
      const back = tridiagonalEigenvector(t.diagonal, t.offDiagonal, values[k - 1]);
      applyReflections(t, back);
      expect(vectorDistance(back, reflect(vector))).toBeLessThan(1e-10);
    }
  });
});

describe('segment inductance matrix', () => {
  const winding = { radius: 0.08, turns: 400.4, pitch: 0.0015, wireRadius: 0.0004 };
  it('the sum of all entries equals the exact loop sum, for graded segments and a fractional turn count (Maxwell [maxwell1873] §701, Grover [grover1946])', () => {
    for (const n of [1, 5, 16, 32]) {
      const fractions = Array.from({ length: n + 1 }, (_, k) => windingNodeFraction(k / n));
      const matrix = segmentInductanceMatrix(winding, fractions);
      let sum = 0;
      for (const value of matrix) sum += value;
      const loop = loopSumSolenoidInductance(
        winding.radius,
        winding.turns,
        winding.pitch,
        winding.wireRadius,
        'surface',
      );
      expect(sum / loop - 1).toBeLessThan(1e-12);
      expect(Math.abs(sum / loop - 1)).toBeLessThan(1e-12);
      // symmetric (reciprocity of mutual inductance) and positive definite (stored energy > 0)
      for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) expect(matrix[i * n + j]).toBe(matrix[j * n + i]);
      expect(choleskyFactor(matrix, n)).not.toBeNull();
    }
  });

  it('every entry equals the double sum over the turns it links, Σ_t Σ_t′ w_kt w_lt′ F(|t − t′|) (the definition, summed term by term; Maxwell [maxwell1873] §701)', () => {
    // Uniform and graded segments, whole and fractional turn counts, segments of less than one turn
    // and of many: the O(1) block formula of the matrix against the plain quadruple loop.
    const cases = [
      { winding: { radius: 0.08, turns: 400.4, pitch: 0.0015, wireRadius: 0.0004 }, n: 16, graded: true },
      { winding: { radius: 0.05, turns: 37, pitch: 0.002, wireRadius: 0.0005 }, n: 8, graded: false },
      { winding: { radius: 0.11, turns: 9.3, pitch: 0.004, wireRadius: 0.001 }, n: 13, graded: true },
      { winding: { radius: 0.07, turns: 1203.75, pitch: 0.0006, wireRadius: 0.00025 }, n: 32, graded: false },
    ];
    for (const { winding: w, n, graded } of cases) {
      const fractions = Array.from({ length: n + 1 }, (_, k) => (graded ? windingNodeFraction(k / n) : k / n));
      const matrix = segmentInductanceMatrix(w, fractions);
      const count = Math.ceil(w.turns);
      const f = (s: number) =>
        s === 0
          ? loopSumSolenoidInductance(w.radius, 1, w.pitch, w.wireRadius, 'surface')
          : coaxialLoopMutualInductance(w.radius, w.radius, s * w.pitch);
      const table = Array.from({ length: count }, (_, s) => f(s));
      const weight = (k: number, t: number) =>
        Math.max(0, Math.min(t + 1, w.turns, fractions[k + 1] * w.turns) - Math.max(t, fractions[k] * w.turns));
      let worst = 0;
      for (let k = 0; k < n; k++)
        for (let l = 0; l < n; l++) {
          let direct = 0;
          for (let t = 0; t < count; t++) {
            const wk = weight(k, t);
            if (wk === 0) continue;
            for (let u = 0; u < count; u++) {
              const wl = weight(l, u);
              if (wl !== 0) direct += wk * wl * table[Math.abs(t - u)];
            }
          }
          worst = Math.max(worst, Math.abs(matrix[k * n + l] - direct) / Math.abs(direct));
        }
      expect(worst).toBeLessThan(1e-13);
    }
  });
});

/** A bare winding 0.6 m long, radius 80 mm, base 0.3 m above the floor; optional toroid on top. */
function coil(
  majorRadius: number | null,
  turns = 1000,
): { arrangement: FieldArrangement; turns: number; pitch: number } {
  const arrangement: FieldArrangement = {
    floor: true,
    winding: { radius: 0.08, bottomZ: 0.3, topZ: 0.9, profile: 'linear' },
  };
  if (majorRadius !== null) {
    arrangement.topload = {
      shape: 'toroid',
      majorRadius,
      minorRadius: majorRadius / 3,
      centerZ: 0.92 + majorRadius / 3,
    };
  }
  return { arrangement, turns, pitch: 0.6 / turns };
}
const WIRE = 0.00025;

describe('node capacitance matrix', () => {
  it('the linear profile stores the energy of the field solve (same model, superposition; [smythe1950] §3.07) and C is reciprocal to discretisation accuracy', () => {
    const { arrangement } = coil(0.15);
    const matrix = nodeCapacitanceMatrix(arrangement, 64);
    const field = solveField(arrangement, { panelCounts: { winding: 64 } });
    expect(matrix && field).toBeTruthy();
    if (!matrix || !field) return;
    const folded = foldTopload(matrix.matrix, matrix.size, matrix.nodes);
    const n = matrix.nodes;
    let energy = 0;
    for (let i = 0; i < n; i++)
      for (let j = 0; j < n; j++) energy += matrix.fractions[i + 1] * folded[i * n + j] * matrix.fractions[j + 1];
    expect(energy / field.totalCapacitance - 1).toBeCloseTo(0, 9);
    expect(matrix.asymmetry).toBeLessThan(0.05);
    expect(choleskyFactor(matrix.matrix, matrix.size)).not.toBeNull();
  });
});

describe('distributed resonator of a winding', () => {
  const solve = (majorRadius: number | null, turnCount = 1000) => {
    const { arrangement, turns, pitch } = coil(majorRadius, turnCount);
    const resonator = windingResonator(arrangement, { radius: 0.08, turns, pitch, wireRadius: WIRE });
    const field = solveField(arrangement);
    const inductance = loopSumSolenoidInductance(0.08, turns, pitch, WIRE, 'surface');
    if (!resonator || !field) throw new Error('no solution');
    const lumped = 1 / (2 * Math.PI * Math.sqrt(inductance * field.totalCapacitance));
    return { resonator, lumped, inductance };
  };

  it('a topload many times the winding capacitance: the fundamental is Thomson’s lumped value within 0.5 % ([thomson1853]; limit of the ladder)', () => {
    const { resonator, lumped, inductance } = solve(0.6);
    expect(Math.abs(resonator.solution.fundamental.frequency / lumped - 1)).toBeLessThan(0.005);
    expect(Math.abs(resonator.solution.effectiveInductance / inductance - 1)).toBeLessThan(0.005);
  });

  it('a bare winding resonates below the lumped estimate with the linear profile’s capacitance (the computed profile puts more charge high up)', () => {
    const { resonator, lumped } = solve(null);
    expect(resonator.solution.fundamental.frequency).toBeLessThan(lumped);
    // The profile rises faster than linear near the base (quarter-wave-like, [medhurst1947] discussion)
    const v = resonator.solution.fundamental.voltage;
    const mid = resonator.fractions.findIndex((x) => x >= 0.5);
    expect(v[mid]).toBeGreaterThan(resonator.fractions[mid]);
  });

  it('converges in the segment count: the kept fundamental is within 0.1 % of the limit of a finer solve (Richardson estimate, [richardson1927])', () => {
    const { arrangement, turns, pitch } = coil(null, 2000);
    const winding = { radius: 0.08, turns, pitch, wireRadius: WIRE };
    const { resonator } = solve(null, 2000);
    expect(resonator.converged).toBe(true);
    const counts = resonator.fundamentalByCount;
    const kept = resonator.solution.fundamental.frequency;
    expect(kept).toBe(counts[counts.length - 1].frequency);
    expect(estimatedError(counts[counts.length - 2].frequency, kept)).toBeLessThan(1e-3);
    // the limit from 32 and 64 uniform segments of a 128-panel solve, extrapolated with order 2
    const fine = windingResonator(arrangement, winding, 0, 128, nodeCapacitanceMatrix(arrangement, 128, 64));
    const f32 = fine?.fundamentalByCount.find((x) => x.segments === 32)?.frequency ?? Number.NaN;
    const f64 = fine?.fundamentalByCount.find((x) => x.segments === 64)?.frequency ?? f32;
    const limit = f64 + (f64 - f32) / 3;
    expect(Math.abs(kept / limit - 1)).toBeLessThan(1e-3);
  });

  it('energy balance of the fundamental: peak electric = peak magnetic energy (Rayleigh quotient; exact)', () => {
    for (const radius of [null, 0.15]) {
      const { resonator } = solve(radius);
      expect(resonator.solution.electricEnergy / resonator.solution.magneticEnergy).toBeCloseTo(1, 9);
    }
  });

  it('the bare winding’s first overtone lies below the uniform line’s 3× (a helix is dispersive; [pierce1950] ch. 3)', () => {
    const { resonator } = solve(null);
    const ratio = resonator.solution.overtoneRatio ?? Number.NaN;
    expect(ratio).toBeGreaterThan(1.5);
    expect(ratio).toBeLessThan(3);
  });
});

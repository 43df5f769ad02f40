/**
 * The axisymmetric boundary-element solve against exact solutions and published series, all to
 * 0.2 % or better (the bound); most agree to 10⁻⁴.
 */
import { describe, expect, test } from 'vitest';
import { solveField } from '../../core/electrostatics/field-solve.ts';
import { VACUUM_PERMITTIVITY } from '../../core/electrostatics/ring-kernel.ts';
import { must } from '../../core/must.ts';

const FOUR_PI_EPS0 = 4 * Math.PI * VACUUM_PERMITTIVITY;
const TOLERANCE = 2e-3;

function relative(value: number | null, expected: number): number {
  return Math.abs((value as number) / expected - 1);
}

describe('isolated bodies (exact solutions)', () => {
  test('sphere: C = 4πε0a and surface field V/a (exact, e.g. Jackson ch. 1)', () => {
    const solution = must(solveField({ topload: { shape: 'sphere', radius: 0.25, centerZ: 0 }, floor: false }));
    expect(relative(solution.totalCapacitance, FOUR_PI_EPS0 * 0.25)).toBeLessThan(1e-5);
    expect(relative(solution.toploadPeakFieldPerVolt, 1 / 0.25)).toBeLessThan(1e-4);
  });
  test('thin disc: C = 8ε0a (exact, Jackson 3rd ed. ch. 3)', () => {
    const solution = must(solveField({ topload: { shape: 'disc', radius: 1, centerZ: 0 }, floor: false }));
    expect(relative(solution.totalCapacitance, 8 * VACUUM_PERMITTIVITY)).toBeLessThan(TOLERANCE);
    expect(relative(solution.totalCapacitance, 70.8335e-12)).toBeLessThan(TOLERANCE); // refs §5.3 [P]
  });
});

describe('sphere over a grounded plane (image series, Smythe; refs §5.3)', () => {
  /** C = 4πε0 a sinh α Σ_{n≥1} 1/sinh(nα), cosh α = h/a (image series, evaluated here). */
  function imageSeriesCapacitance(radius: number, height: number): number {
    const alpha = Math.acosh(height / radius);
    let sum = 0;
    for (let n = 1; n < 2000; n++) {
      const term = 1 / Math.sinh(n * alpha);
      sum += term;
      if (term < 1e-17 * sum) break;
    }
    return FOUR_PI_EPS0 * radius * Math.sinh(alpha) * sum;
  }
  // E_max·a/V at the point nearest the plane: refs §5.3 table, [X] (independent BEM).
  test.each([
    [1.5, 1.5353705, 2.7174],
    [2, 1.3410598, 1.7701],
    [3, 1.2011553, 1.3388],
    [5, 1.1112361, 1.1511],
    [10, 1.0526385, 1.0612],
  ])(
    'h/a = %f: C matches the series (table %f) and the peak field (%f V/a) sits at the bottom',
    (ratio, tabulated, peak) => {
      const solution = must(solveField({ topload: { shape: 'sphere', radius: 1, centerZ: ratio }, floor: true }));
      expect(relative(solution.totalCapacitance, imageSeriesCapacitance(1, ratio))).toBeLessThan(1e-4);
      expect(relative(imageSeriesCapacitance(1, ratio) / FOUR_PI_EPS0, tabulated)).toBeLessThan(1e-7);
      expect(relative(solution.toploadPeakFieldPerVolt, peak)).toBeLessThan(TOLERANCE);
      expect(solution.toploadPeakAngle).toBeCloseTo(-Math.PI / 2, 6);
    },
  );
  test.each([
    [0.2, 14.9213],
    [0.5, 12.3642],
    [1.0, 11.7122],
  ])('a = 0.1 m at h = %f m: %f pF (refs §5.3 [X])', (height, picofarads) => {
    const solution = must(solveField({ topload: { shape: 'sphere', radius: 0.1, centerZ: height }, floor: true }));
    expect(relative(solution.totalCapacitance, picofarads * 1e-12)).toBeLessThan(1e-4);
    expect(relative(solution.totalCapacitance, imageSeriesCapacitance(0.1, height))).toBeLessThan(1e-4);
  });
});

describe('isolated torus (toroidal harmonics; refs §5.3)', () => {
  /**
   * C = 8ε0 c Σ ε_n Q_{n−½}(cosh η0)/P_{n−½}(cosh η0), c = √(R² − r²), cosh η0 = R/r (toroidal
   * harmonics, Smythe; refs §5.3 [M], confirmed [X]). The Legendre functions are evaluated
   * here from Laplace's and Heine's integrals (NIST DLMF §14.12): P_ν(x) = (1/π)∫₀^π (x + √(x²−1)
   * cos φ)^ν dφ, Q_ν(x) = ∫₀^∞ (x + √(x²−1) cosh t)^(−ν−1) dt.
   */
  function torusSeriesCapacitance(major: number, minor: number): number {
    const x = major / minor;
    const root = Math.sqrt(x * x - 1);
    const legendreP = (nu: number) => {
      const steps = 400; // periodic integrand: the trapezoid rule converges geometrically
      let sum = 0;
      for (let k = 0; k < steps; k++) sum += (x + root * Math.cos((Math.PI * (k + 0.5)) / steps)) ** nu;
      return sum / steps;
    };
    const legendreQ = (nu: number) => {
      // Substitution t = ln(1 + u/(1 − u)) is avoided: the integrand decays like e^{−(ν+1)t}; the
      // trapezoid rule on [0, T] with a fine step is exact to far below the test tolerance.
      const limit = 60 / (nu + 1);
      const steps = 4000;
      const h = limit / steps;
      let sum = 0.5 * (x + root) ** (-nu - 1);
      for (let k = 1; k <= steps; k++) sum += (k === steps ? 0.5 : 1) * (x + root * Math.cosh(k * h)) ** (-nu - 1);
      return sum * h;
    };
    let total = 0;
    for (let n = 0; n < 60; n++) {
      const term = (n === 0 ? 1 : 2) * (legendreQ(n - 0.5) / legendreP(n - 0.5));
      total += term;
      if (term < 1e-12 * total) break;
    }
    return 8 * VACUUM_PERMITTIVITY * Math.sqrt(major * major - minor * minor) * total;
  }
  // C/(4πε0R), E_max·r/V at the outer equator: refs §5.3 table [X] (mpmath series; BEM).
  test.each([
    [1.5, 1.393955733, 0.5853],
    [2, 1.215835206, 0.5301],
    [3, 1.030591456, 0.456],
    [5, 0.8687103499, 0.3744],
    [10, 0.7216898805, 0.2894],
  ])('R/r = %f: C/(4πε0R) = %f and peak field %f V/r at the outer equator', (ratio, shape, peak) => {
    const solution = must(
      solveField({
        topload: { shape: 'toroid', majorRadius: 1, minorRadius: 1 / ratio, centerZ: 0 },
        floor: false,
      }),
    );
    expect(relative(solution.totalCapacitance / FOUR_PI_EPS0, shape)).toBeLessThan(2e-4);
    expect(relative(must(solution.toploadPeakFieldPerVolt) / ratio, peak)).toBeLessThan(TOLERANCE);
    expect(Math.abs(must(solution.toploadPeakAngle))).toBeLessThan(1e-6);
  });
  test.each([1.5, 3, 10])('R/r = %f: the series evaluated here agrees with the table and the solve', (ratio) => {
    const series = torusSeriesCapacitance(1, 1 / ratio);
    const table: Record<number, number> = { 1.5: 1.393955733, 3: 1.030591456, 10: 0.7216898805 };
    expect(relative(series / FOUR_PI_EPS0, table[ratio])).toBeLessThan(1e-5);
    const solution = must(
      solveField({
        topload: { shape: 'toroid', majorRadius: 1, minorRadius: 1 / ratio, centerZ: 0 },
        floor: false,
      }),
    );
    expect(relative(solution.totalCapacitance, series)).toBeLessThan(2e-4);
  });
  // Torus R = 0.3 m, r = 0.1 m over the floor: refs §5.3 [X] (independent BEM with image).
  test.each([
    [0.5, 48.011, 0.6326],
    [1.0, 40.506, 0.535],
    [1.5, 38.302, 0.5071],
    [3.0, 36.264, 0.4806],
  ])('R = 0.3 m, r = 0.1 m at h = %f m over the floor: %f pF, peak %f V/r', (height, picofarads, peak) => {
    const solution = must(
      solveField({
        topload: { shape: 'toroid', majorRadius: 0.3, minorRadius: 0.1, centerZ: height },
        floor: true,
      }),
    );
    expect(relative(solution.totalCapacitance, picofarads * 1e-12)).toBeLessThan(2e-4);
    expect(relative(must(solution.toploadPeakFieldPerVolt) * 0.1, peak)).toBeLessThan(TOLERANCE);
    // Near the floor the peak moves below the outer equator.
    expect(must(solution.toploadPeakAngle)).toBeLessThanOrEqual(1e-9);
  });
});

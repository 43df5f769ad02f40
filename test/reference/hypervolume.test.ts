import { describe, expect, it } from 'vitest';
import { hypervolume } from '../../optimize/pareto/hypervolume.ts';

// Source: E. Zitzler, K. Deb and L. Thiele, "Comparison of multiobjective evolutionary algorithms: empirical
// results", Evolutionary Computation 8(2), 173-195 (2000): ZDT1 true front f2 = 1 − sqrt(f1), ZDT2
// f2 = 1 − f1², f1 ∈ [0, 1]. For points on a front sorted by f1, the region they dominate inside the
// reference (1, 1) is a staircase: HV = Σ_i (f1_{i+1} − f1_i)(1 − f2_i), an exact closed form used below.

const evenlySpaced = (count: number) => Array.from({ length: count }, (_, i) => i / (count - 1));

describe('hypervolume on the ZDT fronts (Zitzler, Deb & Thiele 2000)', () => {
  it('ZDT1, 100 evenly spaced f1 on the true front, reference (1, 1): 0.661409368920674', () => {
    const points = evenlySpaced(100).map((f1) => [f1, 1 - Math.sqrt(f1)]);
    // 0.661409368920674 is the value quoted in the issue (from memory of common benchmark suites); the
    // staircase sum (1/99) Σ_{i<99} sqrt(i/99) reproduces it exactly.
    let staircase = 0;
    for (let i = 0; i < 99; i++) staircase += Math.sqrt(i / 99) / 99;
    expect(staircase).toBeCloseTo(0.661409368920674, 14);
    expect(hypervolume(points, [1, 1])).toBeCloseTo(0.661409368920674, 14);
  });

  it("ZDT1 tends to the continuous front's 2/3 = ∫(1 − (1 − sqrt f)) df; 10 001 points are within 1e-4 below it", () => {
    const value = hypervolume(
      evenlySpaced(10_001).map((f1) => [f1, 1 - Math.sqrt(f1)]),
      [1, 1],
    );
    expect(value).toBeLessThan(2 / 3);
    expect(2 / 3 - value).toBeLessThan(1e-4);
  });

  it('ZDT2, 100 points: exactly Σ_{i<99} i² / 99³ = 98·197/(6·99²) = 0.328299833350338; continuous limit 1/3', () => {
    const points = evenlySpaced(100).map((f1) => [f1, 1 - f1 * f1]);
    expect(hypervolume(points, [1, 1])).toBeCloseTo((98 * 197) / (6 * 99 * 99), 14);
    const fine = hypervolume(
      evenlySpaced(10_001).map((f1) => [f1, 1 - f1 * f1]),
      [1, 1],
    );
    expect(1 / 3 - fine).toBeGreaterThan(0);
    expect(1 / 3 - fine).toBeLessThan(1e-4);
  });

  it('ZDT1 in 3-D and 4-D, extended by a constant objective 0 with reference 1, equals the 2-D value (exact: a prism)', () => {
    const points = evenlySpaced(100).map((f1) => [f1, 1 - Math.sqrt(f1)]);
    const value = hypervolume(points, [1, 1]);
    expect(
      hypervolume(
        points.map((p) => [p[0], p[1], 0]),
        [1, 1, 1],
      ),
    ).toBeCloseTo(value, 13);
    expect(
      hypervolume(
        points.map((p) => [0, p[0], 0, p[1]]),
        [1, 1, 1, 1],
      ),
    ).toBeCloseTo(value, 13);
  });

  it('DTLZ2 spherical front (Deb, Thiele, Laumanns & Zitzler 2002): sampled fronts approach box − orthant of the unit ball from below', () => {
    // Exact continuous limit: a point x ≥ 0 of the box is dominated by the unit sphere's positive orthant
    // iff |x| ≥ 1, so HV = r^M − (volume of the unit M-ball)/2^M: 3-D 1.1³ − π/6, 4-D 1.1⁴ − π²/32.
    const sphere3 = (count: number) =>
      Array.from({ length: count }, (_, i) => {
        const z = (i + 0.5) / count; // cos of the polar angle, equal-area spacing
        const phi = ((i * 0.6180339887498949) % 1) * (Math.PI / 2);
        const rho = Math.sqrt(1 - z * z);
        return [rho * Math.cos(phi), rho * Math.sin(phi), z];
      });
    const limit3 = 1.1 ** 3 - Math.PI / 6;
    const coarse = hypervolume(sphere3(500), [1.1, 1.1, 1.1]);
    const fine = hypervolume(sphere3(8000), [1.1, 1.1, 1.1]);
    expect(coarse).toBeLessThan(fine);
    expect(fine).toBeLessThan(limit3);
    expect(limit3 - fine).toBeLessThan(0.02);
    const sphere4 = Array.from({ length: 600 }, (_, i) => {
      const a = ((i * 0.618034) % 1) * (Math.PI / 2);
      const b = ((i * 0.754878) % 1) * (Math.PI / 2);
      const c = ((i * 0.56984) % 1) * (Math.PI / 2);
      return [
        Math.cos(a) * Math.cos(b) * Math.cos(c),
        Math.cos(a) * Math.cos(b) * Math.sin(c),
        Math.cos(a) * Math.sin(b),
        Math.sin(a),
      ];
    });
    const limit4 = 1.1 ** 4 - Math.PI ** 2 / 32;
    const value4 = hypervolume(sphere4, [1.1, 1.1, 1.1, 1.1]);
    expect(value4).toBeLessThan(limit4);
    // Independent estimate of this 600-point set's hypervolume: Monte Carlo with numpy (4·10^5 uniform
    // points in the box, seed 1): 1.02589 with standard error 0.0011 [X]; allow 4 standard errors.
    expect(Math.abs(value4 - 1.02589)).toBeLessThan(0.0045);
  });
});

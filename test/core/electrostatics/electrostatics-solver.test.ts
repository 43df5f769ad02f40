/**
 * Internals of the field solve: the dense LU, the self-panel integral, the documented
 * convergence rule for the panel counts, and the speed budget's panel counts.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import { ellipticKEComplement } from '../../../core/elliptic.ts';
import { luFactor, luSolve, luSolveColumns } from '../../../core/electrostatics/dense-lu.ts';
import {
  assembleCollocationMatrix,
  CLOSE_RATIO,
  FAR_RATIO,
  NEAR_RATIO,
  panelIntegral,
  panelSelfIntegral,
} from '../../../core/electrostatics/assembly.ts';
import { buildPanelLayout, panelPoint, type PanelShape } from '../../../core/electrostatics/panels.ts';
import { toroidPanels, windingPanels } from '../../../core/electrostatics/bodies.ts';
import { defaultPanelCounts, solveField, type FieldArrangement } from '../../../core/electrostatics/field-solve.ts';
import { GAUSS8_NODES, GAUSS8_WEIGHTS } from '../../../core/gauss-legendre.ts';
import { must } from '../../../core/must.ts';

describe('luFactor / luSolve (Golub & Van Loan Alg. 3.4.1)', () => {
  test('solve a system that needs pivoting, checked by the residual A x − b', () => {
    const n = 6;
    const a = new Float64Array(n * n);
    let seed = 7;
    const next = () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647 - 0.5;
    };
    for (let i = 0; i < n * n; i++) a[i] = next();
    a[0] = 0; // forces a row exchange at the first step
    const b = Float64Array.from({ length: n }, () => next());
    const factors = a.slice();
    const pivots = must(luFactor(factors, n));
    const x = b.slice();
    luSolve(factors, n, pivots, x);
    for (let i = 0; i < n; i++) {
      let sum = 0;
      for (let j = 0; j < n; j++) sum += a[i * n + j] * x[j];
      expect(sum).toBeCloseTo(b[i], 12);
    }
  });
  test('returns null for a singular matrix', () => {
    expect(luFactor(Float64Array.from([1, 2, 2, 4]), 2)).toBeNull();
  });
  /** A random 7 × 7 system with a leading 4 × 4 block whose first column is largest below the block. */
  function blockSystem(): { a: Float64Array; n: number; p: number } {
    const n = 7;
    const p = 4;
    let seed = 11;
    const a = Float64Array.from({ length: n * n }, () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647 - 0.5;
    });
    // Plain partial pivoting would take row 5 first; the leading-block factorisation may not.
    a[5 * n] = 10;
    return { a, n, p };
  }
  test('a leading-block factorisation solves the whole system, checked by the residual A x − b (block LU, Golub & Van Loan §3.2.9)', () => {
    const { a, n, p } = blockSystem();
    checkLeadingBlock(a, n, p);
  });
  test('a leading block of odd size (its end inside a pair of elimination steps) keeps its pivots and solves the whole system (residual)', () => {
    const { a, n } = blockSystem();
    a[4 * n] = 20; // the largest of column 0 below a 3 × 3 block
    checkLeadingBlock(a, n, 3);
  });
  function checkLeadingBlock(a: Float64Array, n: number, p: number): void {
    const factors = a.slice();
    const pivots = must(luFactor(factors, n, p));
    for (let k = 0; k < p; k++) expect(pivots[k]).toBeLessThan(p);
    const b = Float64Array.from({ length: n }, (_, i) => 1 + i);
    const x = b.slice();
    luSolve(factors, n, pivots, x);
    for (let i = 0; i < n; i++) {
      let sum = 0;
      for (let j = 0; j < n; j++) sum += a[i * n + j] * x[j];
      expect(sum).toBeCloseTo(b[i], 12);
    }
  }
  test('the leading block of that factorisation is the factorisation of the block alone, bit for bit', () => {
    const { a, n, p } = blockSystem();
    const factors = a.slice();
    const pivots = must(luFactor(factors, n, p));
    const block = new Float64Array(p * p);
    for (let i = 0; i < p; i++) block.set(a.subarray(i * n, i * n + p), i * p);
    const blockFactors = block.slice();
    const blockPivots = must(luFactor(blockFactors, p));
    const b = Float64Array.from({ length: p }, (_, i) => 2 - i);
    const fromWhole = b.slice();
    luSolve(factors, n, pivots, fromWhole, p);
    const fromBlock = b.slice();
    luSolve(blockFactors, p, blockPivots, fromBlock);
    expect(Array.from(fromWhole)).toEqual(Array.from(fromBlock));
    // And it solves the block's own system (residual).
    for (let i = 0; i < p; i++) {
      let sum = 0;
      for (let j = 0; j < p; j++) sum += block[i * p + j] * fromWhole[j];
      expect(sum).toBeCloseTo(b[i], 12);
    }
  });
  test('luSolveColumns solves seven right-hand sides of a pivoting 9 × 9 system, checked by the residual and equal bit for bit to luSolve on each', () => {
    const n = 9;
    const m = 7; // one group of four columns and three single ones
    let seed = 5;
    const next = () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647 - 0.5;
    };
    const a = Float64Array.from({ length: n * n }, () => next());
    a[0] = 0; // forces a row exchange at the first step
    const factors = a.slice();
    const pivots = must(luFactor(factors, n));
    const columns = Float64Array.from({ length: n * m }, () => next());
    const b = columns.slice();
    luSolveColumns(factors, n, pivots, columns, m);
    for (let l = 0; l < m; l++) {
      const one = b.slice(l * n, (l + 1) * n);
      luSolve(factors, n, pivots, one);
      expect(Array.from(columns.subarray(l * n, (l + 1) * n))).toEqual(Array.from(one));
      for (let i = 0; i < n; i++) {
        let sum = 0;
        for (let j = 0; j < n; j++) sum += a[i * n + j] * columns[l * n + j];
        expect(sum).toBeCloseTo(b[l * n + i], 12);
      }
    }
  });
  test('a singular leading block is refused even where the whole matrix is regular', () => {
    // [[0, 1], [1, 0]]: regular, but its leading 1 × 1 block is 0.
    expect(luFactor(Float64Array.from([0, 1, 1, 0]), 2)).not.toBeNull();
    expect(luFactor(Float64Array.from([0, 1, 1, 0]), 2, 1)).toBeNull();
  });
});

describe('panelSelfIntegral (log singularity subtracted in closed form)', () => {
  /**
   * Brute force with the AGM elliptic integral (core/elliptic.ts, A&S 17.6): each half of the
   * panel cut into 40 geometrically shrinking pieces toward the collocation point, 8-point Gauss on
   * each; the neglected innermost piece is below 10⁻¹⁰ of the integral.
   */
  function bruteForce(shape: PanelShape): number {
    const layout = buildPanelLayout([shape]);
    const r0 = layout.midR[0];
    const z0 = layout.midZ[0];
    const half = 0.5 * layout.length[0];
    const point = new Float64Array(2);
    let sum = 0;
    for (const side of [-1, 1]) {
      for (let piece = 0; piece < 40; piece++) {
        const outer = 2 ** -piece;
        const inner = 2 ** -(piece + 1);
        for (let q = 0; q < 8; q++) {
          const t = side * (inner + 0.5 * (outer - inner) * (1 + GAUSS8_NODES[q]));
          panelPoint(layout, 0, t, point);
          const dz = z0 - point[1];
          const plus2 = (r0 + point[0]) ** 2 + dz * dz;
          const minus2 = (r0 - point[0]) ** 2 + dz * dz;
          const { k } = ellipticKEComplement(minus2 / plus2);
          sum += (0.5 * (outer - inner) * GAUSS8_WEIGHTS[q] * half * point[0] * k) / Math.sqrt(plus2);
        }
      }
    }
    return sum;
  }
  test.each<[string, PanelShape]>([
    ['a winding panel', { kind: 'line', r0: 0.08, z0: 0.5, r1: 0.08, z1: 0.53, position: 0 }],
    ['a disc panel', { kind: 'line', r0: 0.2, z0: 0.3, r1: 0.25, z1: 0.3, position: 0 }],
    [
      'a toroid panel at the outer equator',
      { kind: 'arc', centerR: 0.25, centerZ: 1, radius: 0.07, angle0: -0.15, angle1: 0.15, position: 0 },
    ],
    [
      'a coarse sphere panel near the pole',
      { kind: 'arc', centerR: 0, centerZ: 1, radius: 0.2, angle0: -1.45, angle1: -1.2, position: 0 },
    ],
  ])('matches a brute-force graded quadrature on %s to 1e-6', (_, shape) => {
    const layout = buildPanelLayout([shape]);
    expect(Math.abs(panelSelfIntegral(layout, 0) / bruteForce(shape) - 1)).toBeLessThan(1e-6);
  });
  test('neighbouring panel integrals agree with the same brute force split at the nearest point', () => {
    // Panel from z = 0.53 to 0.56 seen from the midpoint of its lower neighbour (z = 0.515).
    const layout = buildPanelLayout([{ kind: 'line', r0: 0.08, z0: 0.53, r1: 0.08, z1: 0.56, position: 0 }]);
    const point = new Float64Array(2);
    let reference = 0;
    for (let piece = 0; piece < 400; piece++) {
      const ta = -1 + (2 * piece) / 400;
      for (let q = 0; q < 8; q++) {
        const t = ta + (1 / 400) * (1 + GAUSS8_NODES[q]);
        panelPoint(layout, 0, t, point);
        const dz = 0.515 - point[1];
        const plus2 = (0.08 + point[0]) ** 2 + dz * dz;
        const minus2 = (0.08 - point[0]) ** 2 + dz * dz;
        reference +=
          ((1 / 400) * GAUSS8_WEIGHTS[q] * 0.015 * point[0] * ellipticKEComplement(minus2 / plus2).k) /
          Math.sqrt(plus2);
      }
    }
    expect(Math.abs(panelIntegral(layout, 0, 0.08, 0.515) / reference - 1)).toBeLessThan(1e-6);
  });
});

describe('panelIntegral quadrature tiers (Gauss–Legendre error bounds, Trefethen 2013 Thm 19.3 [trefethen2013])', () => {
  /** Brute force: 2000 equal pieces, 8-point Gauss on each, AGM elliptic integral (A&S 17.6). */
  function bruteForce(shape: PanelShape, r: number, z: number): number {
    const layout = buildPanelLayout([shape]);
    const point = new Float64Array(2);
    const pieces = 2000;
    let sum = 0;
    for (let piece = 0; piece < pieces; piece++) {
      const ta = -1 + (2 * piece) / pieces;
      for (let q = 0; q < 8; q++) {
        panelPoint(layout, 0, ta + (1 / pieces) * (1 + GAUSS8_NODES[q]), point);
        const dz = z - point[1];
        const plus2 = (r + point[0]) ** 2 + dz * dz;
        const minus2 = (r - point[0]) ** 2 + dz * dz;
        sum +=
          ((1 / pieces) *
            GAUSS8_WEIGHTS[q] *
            0.5 *
            layout.length[0] *
            point[0] *
            ellipticKEComplement(minus2 / plus2).k) /
          Math.sqrt(plus2);
      }
    }
    return sum;
  }
  // Field points on a circle of radius ratio × length around the panel's midpoint, just outside each
  // tier's boundary; the bound is ρ^(−2n) with ρ the Bernstein ellipse through the nearest singularity
  // (the field point on the panel's own line, the worst direction): 2 points at 3× (5·10⁻⁵), 4 at
  // 1.5× (8·10⁻⁷), 8 at 0.75× (2·10⁻⁷).
  test.each<[string, PanelShape]>([
    ['a winding panel', { kind: 'line', r0: 0.2, z0: 0.53, r1: 0.2, z1: 0.56, position: 0 }],
    [
      'a toroid panel',
      { kind: 'arc', centerR: 0.25, centerZ: 1, radius: 0.07, angle0: -0.2, angle1: 0.2, position: 0 },
    ],
  ])('each tier of %s stays within its error bound', (_, shape) => {
    const layout = buildPanelLayout([shape]);
    const length = layout.length[0];
    for (const [ratio, bound] of [
      [FAR_RATIO * 1.0003, 5e-5],
      [NEAR_RATIO * 1.0003, 8e-7],
      [CLOSE_RATIO * 1.0003, 2e-7],
    ]) {
      for (let a = 0; a < 12; a++) {
        const angle = (2 * Math.PI * (a + 0.5)) / 12;
        const r = layout.midR[0] + ratio * length * Math.cos(angle);
        const z = layout.midZ[0] + ratio * length * Math.sin(angle);
        expect(Math.abs(panelIntegral(layout, 0, r, z) / bruteForce(shape, r, z) - 1)).toBeLessThan(bound);
      }
    }
  });
});

/** Arrangements spanning the designs the sweeps will see. */
const ARRANGEMENTS: Array<[string, FieldArrangement]> = [
  [
    'toroid on a winding with a flat primary and a strike rail',
    {
      winding: { radius: 0.0825, bottomZ: 0.45, topZ: 1.25, profile: 'linear' },
      topload: { shape: 'toroid', majorRadius: 0.23, minorRadius: 0.075, centerZ: 1.29 },
      groundedRings: [
        ...Array.from({ length: 10 }, (_, i) => ({ r: 0.115 + i * 0.01235, z: 0.45, wireRadius: 0.003175 })),
        { r: 0.35, z: 0.5, wireRadius: 0.01 },
      ],
      floor: true,
    },
  ],
  [
    'a low, wide toroid close over a short winding (quarter-wave profile)',
    {
      winding: { radius: 0.15, bottomZ: 0.3, topZ: 0.9, profile: 'quarter_wave' },
      topload: { shape: 'toroid', majorRadius: 0.45, minorRadius: 0.12, centerZ: 0.92 },
      groundedRings: Array.from({ length: 8 }, (_, i) => ({ r: 0.2 + i * 0.02, z: 0.3 + i * 0.01, wireRadius: 0.004 })),
      floor: true,
    },
  ],
  [
    'a sphere on a slender winding',
    {
      winding: { radius: 0.05, bottomZ: 0.6, topZ: 1.2, profile: 'linear' },
      topload: { shape: 'sphere', radius: 0.15, centerZ: 1.4 },
      floor: true,
    },
  ],
  [
    'a toroid alone close to the floor',
    { topload: { shape: 'toroid', majorRadius: 0.3, minorRadius: 0.1, centerZ: 0.15 }, floor: true },
  ],
  ['a bare winding on the floor', { winding: { radius: 0.1, bottomZ: 0, topZ: 0.9, profile: 'linear' }, floor: true }],
];

describe('convergence rule: doubling the default panel counts changes capacitance by < 0.2 %', () => {
  test.each(ARRANGEMENTS)('%s', (_, arrangement) => {
    const base = must(solveField(arrangement));
    const doubled = must(solveField(arrangement, { resolution: 2 }));
    const change = (a: number | null, b: number | null) => (a === null ? 0 : Math.abs(a / must(b) - 1));
    expect(change(base.totalCapacitance, doubled.totalCapacitance)).toBeLessThan(2e-3);
    expect(change(base.toploadCapacitance, doubled.toploadCapacitance)).toBeLessThan(2e-3);
    expect(change(base.selfCapacitance, doubled.selfCapacitance)).toBeLessThan(2e-3);
    // Fields settle too (the peak to 0.5 %, the underside and winding-top values to 2 %).
    expect(change(base.toploadPeakFieldPerVolt, doubled.toploadPeakFieldPerVolt)).toBeLessThan(5e-3);
    expect(change(base.toploadUndersideFieldPerVolt, doubled.toploadUndersideFieldPerVolt)).toBeLessThan(2e-2);
    expect(change(base.windingTopFieldPerVolt, doubled.windingTopFieldPerVolt)).toBeLessThan(2e-2);
    // And a second doubling changes them less than the first did (or both are at rounding level).
    const quadrupled = must(solveField(arrangement, { resolution: 4 }));
    const first = change(base.totalCapacitance, doubled.totalCapacitance);
    const second = change(doubled.totalCapacitance, quadrupled.totalCapacitance);
    expect(second <= first || second < 1e-5).toBe(true);
  });
  test('holds for random buildable toroid-on-winding arrangements with a primary', () => {
    fc.assert(
      fc.property(
        fc.record({
          radius: fc.double({ min: 0.04, max: 0.16, noNaN: true }),
          aspect: fc.double({ min: 1.5, max: 6.5, noNaN: true }),
          base: fc.double({ min: 0.1, max: 0.9, noNaN: true }),
          tube: fc.double({ min: 0.05, max: 0.3, noNaN: true }),
          extra: fc.double({ min: 0.3, max: 1.5, noNaN: true }),
          lift: fc.double({ min: 0.02, max: 0.4, noNaN: true }),
          turns: fc.integer({ min: 3, max: 14 }),
        }),
        ({ radius, aspect, base, tube, extra, lift, turns }) => {
          const top = base + 2 * radius * aspect;
          const minor = tube / 2;
          const outer = tube + Math.max(2 * radius + tube + 0.02, extra);
          const arrangement: FieldArrangement = {
            winding: { radius, bottomZ: base, topZ: top, profile: 'linear' },
            topload: {
              shape: 'toroid',
              majorRadius: (outer - tube) / 2,
              minorRadius: minor,
              centerZ: top - 0.9 * minor + lift,
            },
            groundedRings: Array.from({ length: turns }, (_, i) => ({
              r: radius + 0.03 + i * 0.012,
              z: base + 0.01,
              wireRadius: 0.003,
            })),
            floor: true,
          };
          const base1 = must(solveField(arrangement));
          const doubled = must(solveField(arrangement, { resolution: 2 }));
          expect(Math.abs(base1.totalCapacitance / doubled.totalCapacitance - 1)).toBeLessThan(2e-3);
          expect(Math.abs(must(base1.toploadCapacitance) / must(doubled.toploadCapacitance) - 1)).toBeLessThan(2e-3);
          expect(Math.abs(must(base1.selfCapacitance) / must(doubled.selfCapacitance) - 1)).toBeLessThan(2e-3);
          // The peak field settles more slowly where a crowded underside takes the peak (a primary
          // ring a few centimetres below the tube, a tube hugging the winding): within 1 % (a scan of
          // 300 such random arrangements moved it by at most 0.8 %).
          expect(
            Math.abs(must(base1.toploadPeakFieldPerVolt) / must(doubled.toploadPeakFieldPerVolt) - 1),
          ).toBeLessThan(1e-2);
        },
      ),
      { numRuns: 20, seed: 2026, endOnFailure: true },
    );
  });
  test('the default counts are 15 toroid, 12 sphere, 24 winding panels', () => {
    expect(defaultPanelCounts(ARRANGEMENTS[0][1])).toEqual({ topload: 15, winding: 24 });
    expect(defaultPanelCounts(ARRANGEMENTS[2][1])).toEqual({ topload: 12, winding: 24 });
    expect(must(solveField(ARRANGEMENTS[0][1])).unknowns).toBe(15 + 24 + 11);
  });
});

describe('assembleCollocationMatrix', () => {
  test('pairing distant entries through the symmetric kernel gives the same matrix as entry by entry', () => {
    const layout = must(solveField(ARRANGEMENTS[0][1])).layout;
    const paired = assembleCollocationMatrix(layout, true, true);
    const plain = assembleCollocationMatrix(layout, true, false);
    let worst = 0;
    for (let k = 0; k < plain.length; k++) worst = Math.max(worst, Math.abs(paired[k] - plain[k]) / Math.abs(plain[k]));
    expect(worst).toBeLessThan(1e-14);
  });
});

describe('Green’s reciprocity of the coupled solve (exact: the capacitance matrix is symmetric)', () => {
  test('toroid and winding as two conductors over the floor: charge on one per volt on the other agrees both ways to 0.05 %', () => {
    const shapes = [
      ...windingPanels({ radius: 0.0804, bottomZ: 0.45, topZ: 1.25 }, 24),
      ...toroidPanels({ shape: 'toroid', majorRadius: 0.23, minorRadius: 0.075, centerZ: 1.29 }, 25),
    ];
    const layout = buildPanelLayout(shapes);
    const n = layout.count;
    const factors = assembleCollocationMatrix(layout, true);
    const pivots = must(luFactor(factors, n));
    const chargeOn = (density: Float64Array, from: number, to: number) => {
      let q = 0;
      for (let j = from; j < to; j++) q += density[j] * layout.area[j];
      return q;
    };
    const windingAtOne = Float64Array.from({ length: n }, (_, j) => (j < 24 ? 1 : 0));
    const toroidAtOne = Float64Array.from({ length: n }, (_, j) => (j < 24 ? 0 : 1));
    luSolve(factors, n, pivots, windingAtOne);
    luSolve(factors, n, pivots, toroidAtOne);
    const c12 = chargeOn(windingAtOne, 24, n); // toroid charge, winding at 1 V
    const c21 = chargeOn(toroidAtOne, 0, 24); // winding charge, toroid at 1 V
    expect(c12).toBeLessThan(0);
    expect(Math.abs(c12 / c21 - 1)).toBeLessThan(5e-4); // observed 5·10⁻⁵
  });
});

describe('solveField definitions', () => {
  test('total capacitance of a topload alone is its charge per volt', () => {
    const solution = must(solveField(ARRANGEMENTS[3][1]));
    expect(solution.totalCapacitance).toBeCloseTo(must(solution.toploadCapacitance), 20);
    expect(solution.selfCapacitance).toBeNull();
  });
  test('the winding alone gives total = self-capacitance, no topload values', () => {
    const solution = must(solveField(ARRANGEMENTS[4][1]));
    expect(solution.totalCapacitance).toBe(solution.selfCapacitance);
    expect(solution.toploadCapacitance).toBeNull();
    expect(solution.toploadPeakFieldPerVolt).toBeNull();
  });
  test('the self-capacitance with a topload present equals a solve without the topload', () => {
    const [, arrangement] = ARRANGEMENTS[0];
    const withTopload = must(solveField(arrangement));
    const withoutTopload = must(solveField({ ...arrangement, topload: undefined }));
    expect(must(withTopload.selfCapacitance) / withoutTopload.totalCapacitance).toBeCloseTo(1, 12);
  });
  test('grounded rings near the base raise the winding’s energy capacitance', () => {
    const [, arrangement] = ARRANGEMENTS[0];
    const bare = must(solveField({ winding: arrangement.winding, floor: true }));
    const withRings = must(
      solveField({
        winding: arrangement.winding,
        groundedRings: arrangement.groundedRings,
        floor: true,
      }),
    );
    expect(withRings.totalCapacitance).toBeGreaterThan(bare.totalCapacitance);
  });
});

import fc from 'fast-check';
import { describe, expect, test } from 'vitest';
import { minimize, minimizeAsync, minimizeManyAsync } from '../../../optimize/refine/minimize.ts';
import { NelderMead, nelderMeadCoefficients } from '../../../optimize/refine/nelder-mead.ts';
import type { Merit } from '../../../optimize/refine/merit.ts';
import { compareMerits, toMerit } from '../../../optimize/refine/merit.ts';

describe('nelderMeadCoefficients', () => {
  test('nelderMeadCoefficients(n, false) is Nelder & Mead 1965: ρ 1, χ 2, γ 0.5, σ 0.5', () => {
    expect(nelderMeadCoefficients(7, false)).toEqual({ reflection: 1, expansion: 2, contraction: 0.5, shrink: 0.5 });
  });
  test('nelderMeadCoefficients(2, true) equals the standard ones (Gao & Han 2012: their formulas at n = 2)', () => {
    expect(nelderMeadCoefficients(2, true)).toEqual(nelderMeadCoefficients(2, false));
  });
  test('nelderMeadCoefficients(10, true) is 1, 1 + 2/n, 0.75 − 1/(2n), 1 − 1/n (Gao & Han 2012, as in the adaptive option of scipy)', () => {
    expect(nelderMeadCoefficients(10, true)).toEqual({ reflection: 1, expansion: 1.2, contraction: 0.7, shrink: 0.9 });
  });
  test('nelderMeadCoefficients(0, false) throws', () => {
    expect(() => nelderMeadCoefficients(0, false)).toThrow(/requires an integer dimension >= 1/);
  });
});

describe('compareMerits (Deb 2000 feasibility rules)', () => {
  test('feasible beats infeasible whatever the values; feasible pairs compare by value; infeasible pairs by violation', () => {
    expect(compareMerits({ violation: 0, value: 1e9 }, { violation: 1e-12, value: -1e9 })).toBeLessThan(0);
    expect(compareMerits({ violation: 0, value: 1 }, { violation: 0, value: 2 })).toBeLessThan(0);
    expect(compareMerits({ violation: 0.5, value: 100 }, { violation: 2, value: -100 })).toBeLessThan(0);
    expect(compareMerits({ violation: 0.5, value: 1 }, { violation: 0.5, value: 1 })).toBe(0);
  });
  test("on any finite set, Deb's order is the order of the exact penalty value + P·violation once P is large enough", () => {
    // Exact-penalty view (common practice): with P > max |Δvalue| / min positive |Δviolation| the
    // penalised order equals the lexicographic (violation, value) order of compareMerits.
    fc.assert(
      fc.property(
        fc.array(
          fc.record({
            violation: fc.oneof(
              fc.constant(0),
              fc.integer({ min: 1, max: 50 }).map((k) => k / 10),
            ),
            value: fc.integer({ min: -100, max: 100 }),
          }),
          { minLength: 2, maxLength: 12 },
        ),
        (merits) => {
          const penalty = 201 / 0.1 + 1;
          const byDeb = merits.map((_, i) => i).sort((a, b) => compareMerits(merits[a], merits[b]) || a - b);
          const byPenalty = merits
            .map((_, i) => i)
            .sort(
              (a, b) =>
                merits[a].value + penalty * merits[a].violation - (merits[b].value + penalty * merits[b].violation) ||
                a - b,
            );
          expect(byPenalty).toEqual(byDeb);
        },
      ),
      { numRuns: 200, seed: 3 },
    );
  });
  test('toMerit reads NaN as +Infinity and rejects a negative violation', () => {
    expect(toMerit(NaN)).toEqual({ violation: 0, value: Infinity });
    expect(toMerit({ violation: NaN, value: 1 })).toEqual({ violation: Infinity, value: 1 });
    expect(() => toMerit({ violation: -1, value: 0 })).toThrow(/requires a violation >= 0, got -1/);
  });
});

describe('NelderMead ask/tell', () => {
  test('asks n+1 points first, then 1 per step or n for a shrink, and never more than maxEvaluations', () => {
    const machine = new NelderMead([0.5, 0.5, 0.5], { maxEvaluations: 40 });
    const sizes: number[] = [];
    while (!machine.done) {
      const points = machine.ask();
      sizes.push(points.length);
      machine.tell(points.map((x) => (x[0] - 0.1) ** 2 + 4 * (x[1] - 0.9) ** 2 + Math.abs(x[2] - 0.3)));
    }
    expect(sizes[0]).toBe(4);
    for (const size of sizes.slice(1)) expect([1, 3]).toContain(size);
    const result = machine.result();
    expect(result.evaluations).toBe(40);
    expect(sizes.reduce((a, b) => a + b, 0)).toBe(40);
    expect(result.status).toBe('max_evaluations');
  });

  test("tell with the wrong number of values throws in the engine's one format", () => {
    const machine = new NelderMead([0.5, 0.5]);
    expect(() => machine.tell([1, 2])).toThrow('NelderMead.tell requires 3 values (one per asked point), got 2');
  });

  test('a budget smaller than the simplex evaluates only that many points', () => {
    const machine = new NelderMead([0.5, 0.5, 0.5], { maxEvaluations: 2 });
    expect(machine.ask()).toHaveLength(2);
    machine.tell([3, 1]);
    expect(machine.done).toBe(true);
    expect(machine.result().evaluations).toBe(2);
    expect(machine.result().value).toBe(1);
  });

  test('maxIterations stops the run with status max_iterations', () => {
    const result = minimize((x) => (x[0] - 0.3) ** 2 + (x[1] - 0.6) ** 2, [0.9, 0.1], { maxIterations: 5 });
    expect(result.status).toBe('max_iterations');
    expect(result.iterations).toBe(5);
  });

  test('minimize does not mutate the start', () => {
    const start = Float64Array.of(0.2, 0.8);
    minimize((x) => x[0] + x[1], start);
    expect(Array.from(start)).toEqual([0.2, 0.8]);
  });

  test('a NaN value (a design that could not be evaluated) is treated as worst and avoided', () => {
    // f = (x − 0.7)² where x ≤ 0.5 evaluates; NaN beyond. Minimum over the evaluable part: x = 0.5.
    const result = minimize((x) => (x[0] > 0.5 ? NaN : (x[0] - 0.7) ** 2), [0.1], { xatol: 1e-9, fatol: 1e-12 });
    expect(result.x[0]).toBeLessThanOrEqual(0.5);
    expect(result.x[0]).toBeCloseTo(0.5, 6);
  });
});

describe('bounds are never crossed', () => {
  test('separable quadratics with minima inside or outside the unit cube: every asked point is in the cube, and the answer is the clipped minimum (exact solution)', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1, max: 2, noNaN: true }), { minLength: 1, maxLength: 4 }),
        fc.array(fc.constantFrom(0, 1, 0.5, 0.25, 0.999), { minLength: 4, maxLength: 4 }),
        (centre, startPool) => {
          const n = centre.length;
          const start = startPool.slice(0, n);
          const weights = centre.map((_, i) => 1 + i);
          let outside = 0;
          const result = minimize(
            (x) => {
              for (const value of x) if (value < 0 || value > 1) outside++;
              return x.reduce((sum, value, i) => sum + weights[i] * (value - centre[i]) ** 2, 0);
            },
            start,
            { xatol: 1e-7, fatol: 1e-12, maxEvaluations: 4000 },
          );
          expect(outside).toBe(0);
          for (let i = 0; i < n; i++)
            expect(Math.abs(result.x[i] - Math.min(1, Math.max(0, centre[i])))).toBeLessThan(1e-4);
        },
      ),
      { numRuns: 60, seed: 20261201 },
    );
  });

  test('a simplex collapsed onto a bound face is restarted and reaches the interior minimum (which it misses with restarts off)', () => {
    // Coupled quadratic with its minimum inside the unit square at (0.55, 0.27) (exact solution);
    // from (1, 0.36) an expansion is clipped onto y = 0 and the whole simplex ends on that face.
    const f = (x: Float64Array) => 2 * (x[0] - 0.55 + 0.34 * (x[1] - 0.27)) ** 2 + 0.8 * (x[1] - 0.27) ** 2;
    const withoutRestarts = minimize(f, [1, 0.36], { xatol: 1e-6, fatol: 1e-10, maxRestarts: 0 });
    const withRestarts = minimize(f, [1, 0.36], { xatol: 1e-6, fatol: 1e-10 });
    expect(withoutRestarts.x[1]).toBe(0);
    expect(withoutRestarts.value).toBeGreaterThan(1e-3);
    expect(withRestarts.restarts).toBeGreaterThanOrEqual(1);
    expect(withRestarts.x[0]).toBeCloseTo(0.55, 5);
    expect(withRestarts.x[1]).toBeCloseTo(0.27, 5);
    expect([withoutRestarts.evaluations, withRestarts.evaluations, withRestarts.restarts]).toEqual([65, 99, 1]); // regression figures
  });

  test('a coordinate with equal bounds stays fixed and is not taken for a collapse (no restarts)', () => {
    const result = minimize((x) => (x[0] - 0.3) ** 2 + (x[1] - 0.5) ** 2, [0.9, 0.5], {
      lower: [0, 0.5],
      upper: [1, 0.5],
    });
    expect(result.restarts).toBe(0);
    expect(result.x[1]).toBe(0.5);
    expect(result.x[0]).toBeCloseTo(0.3, 3);
  });

  test('a start on the upper bound of every coordinate gets a simplex of full width (reflected inside)', () => {
    const machine = new NelderMead([1, 1, 1]);
    const simplex = machine.ask();
    expect(simplex.map((x) => Array.from(x))).toEqual([
      [1, 1, 1],
      [0.95, 1, 1],
      [1, 0.95, 1],
      [1, 1, 0.95],
    ]);
  });
});

describe("constraints by Deb's rules: known optima on the constraint boundary", () => {
  const merit = (value: number, ...constraints: number[]): Merit => ({
    value,
    violation: constraints.reduce((sum, g) => sum + Math.max(0, g), 0),
  });

  test('min (x − 2)² + (y − 1)² subject to x + y ≤ 1 reaches (1, 0), f = 2 (exact: projection onto the line, KKT)', () => {
    const result = minimize((x) => merit((x[0] - 2) ** 2 + (x[1] - 1) ** 2, x[0] + x[1] - 1), [-1, -1], {
      lower: [-3, -3],
      upper: [3, 3],
      xatol: 1e-9,
      fatol: 1e-12,
      maxEvaluations: 2000,
    });
    expect(result.feasible).toBe(true);
    expect(result.x[0]).toBeCloseTo(1, 6);
    expect(result.x[1]).toBeCloseTo(0, 6);
    expect(result.value).toBeCloseTo(2, 6);
    expect(result.evaluations).toBe(309); // regression figure
  });

  test('min x + y subject to x² + y² ≤ 2 reaches (−1, −1), f = −2 (exact: Lagrange conditions)', () => {
    const result = minimize((x) => merit(x[0] + x[1], x[0] ** 2 + x[1] ** 2 - 2), [0.5, 0.2], {
      lower: [-3, -3],
      upper: [3, 3],
      xatol: 1e-9,
      fatol: 1e-12,
      maxEvaluations: 2000,
    });
    // On a curved boundary the feasibility order stalls the simplex a little short of the
    // optimum (f within 1e-5, x within 3e-3): a known weakness of direct search with an extreme
    // barrier, documented rather than hidden.
    expect(result.feasible).toBe(true);
    expect(result.value).toBeCloseTo(-2, 4);
    expect(Math.abs(result.x[0] + 1)).toBeLessThan(3e-3);
    expect(Math.abs(result.x[1] + 1)).toBeLessThan(3e-3);
    expect(result.evaluations).toBe(220); // regression figure
  });

  test('an infeasible start is driven into the feasible set first', () => {
    const result = minimize((x) => merit(x[0], 0.6 - x[1]), [0.1, 0.1], { maxEvaluations: 400 });
    expect(result.feasible).toBe(true);
    expect(result.x[1]).toBeGreaterThanOrEqual(0.6);
  });
});

describe('async drivers', () => {
  const objective = (x: Float64Array) => (x[0] - 0.25) ** 2 + 3 * (x[1] - 0.75) ** 2;

  test('minimizeAsync gives exactly the iterates of minimize', async () => {
    const sync = minimize(objective, [0.9, 0.1]);
    const async = await minimizeAsync(async (points) => points.map(objective), [0.9, 0.1]);
    expect(async).toEqual(sync);
  });

  test('minimizeManyAsync batches all starts per round and gives each start its own result', async () => {
    const starts = [
      [0.9, 0.1],
      [0.1, 0.1],
      [0.5, 0.5],
      [1, 1],
    ];
    const batchSizes: number[] = [];
    const many = await minimizeManyAsync(async (points) => {
      batchSizes.push(points.length);
      return points.map(objective);
    }, starts);
    for (const [index, start] of starts.entries()) expect(many[index]).toEqual(minimize(objective, start));
    expect(batchSizes[0]).toBe(12);
    expect(batchSizes.length).toBeLessThan(many.reduce((sum, result) => sum + result.iterations, 0));
  });
});

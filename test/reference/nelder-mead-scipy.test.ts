/**
 * Nelder–Mead against scipy and published test functions.
 *
 * Reference figures marked [X] were computed with scipy 1.17.1 (numpy 2.4.6),
 * `scipy.optimize.minimize(f, x0, method='Nelder-Mead', options=...)`, by the author of this
 * file; scipy reports nit = our iterations + 1 (its counter starts at 1). With no bounds our
 * iterates are scipy's bit for bit, so its x and nfev are matched exactly. The counts are also
 * pinned as regression figures: a change of step order or of a stopping rule shows up here.
 */
import { describe, expect, test } from 'vitest';
import { minimize } from '../../optimize/refine/minimize.ts';

/** Rosenbrock's function, sum over i of 100 (x_{i+1} − x_i²)² + (1 − x_i)²; minimum 0 at (1, …, 1). */
function rosenbrock(x: Float64Array): number {
  let sum = 0;
  for (let i = 0; i < x.length - 1; i++) sum += 100 * (x[i + 1] - x[i] ** 2) ** 2 + (1 - x[i]) ** 2;
  return sum;
}

/** Himmelblau's function (x² + y − 11)² + (x + y² − 7)² (D. M. Himmelblau, Applied Nonlinear Programming, 1972). */
function himmelblau(x: Float64Array): number {
  return (x[0] ** 2 + x[1] - 11) ** 2 + (x[0] + x[1] ** 2 - 7) ** 2;
}

const unbounded = (n: number) => ({ lower: new Array(n).fill(-Infinity), upper: new Array(n).fill(Infinity) });

describe('minimize(rosenbrock) against scipy', () => {
  test('2-D from (−1.2, 1), xatol = fatol = 1e-8: 219 evaluations, scipy nit 117 [X]; reaches (1, 1)', () => {
    // 219 evaluations is also the figure scipy gives for this case (order-of-magnitude check).
    const result = minimize(rosenbrock, [-1.2, 1], { ...unbounded(2), xatol: 1e-8, fatol: 1e-8 });
    expect(result.status).toBe('converged');
    expect(result.evaluations).toBe(219);
    expect(result.iterations).toBe(116);
    expect(result.x[0]).toBe(0.9999999991878143); // scipy's x [X], exactly
    expect(result.x[1]).toBe(0.9999999984419192);
    expect(result.value).toBeLessThan(1e-17);
  });

  test('2-D from (−1.2, 1), default tolerances: 159 evaluations, scipy nit 85 [X]', () => {
    const result = minimize(rosenbrock, [-1.2, 1], unbounded(2));
    expect(result.evaluations).toBe(159);
    expect(result.iterations).toBe(84);
    expect(result.x[0]).toBeCloseTo(1.0000220217835696, 14);
  });

  test('5-D from (1.3, 0.7, 0.8, 1.9, 1.2), xatol 1e-8: 571 evaluations, 339 iterations', () => {
    // scipy's optimize tutorial shows this run: "Iterations: 339, Function evaluations: 571"
    // (recalled from memory [M]; confirmed by running scipy 1.17.1 [X]).
    const result = minimize(rosenbrock, [1.3, 0.7, 0.8, 1.9, 1.2], { ...unbounded(5), xatol: 1e-8 });
    expect(result.status).toBe('converged');
    expect(result.evaluations).toBe(571);
    expect(result.iterations).toBe(338);
    for (const coordinate of result.x) expect(coordinate).toBeCloseTo(1, 7);
  });

  test('5-D adaptive (Gao & Han 2012 coefficients), xatol = fatol = 1e-8: 838 evaluations, scipy nit 487 [X]', () => {
    const result = minimize(rosenbrock, [1.3, 0.7, 0.8, 1.9, 1.2], {
      ...unbounded(5),
      xatol: 1e-8,
      fatol: 1e-8,
      adaptive: true,
    });
    expect(result.evaluations).toBe(838);
    expect(result.iterations).toBe(486);
    expect(result.x[4]).toBe(1.0000000001205287); // scipy's x [X]
    for (const coordinate of result.x) expect(coordinate).toBeCloseTo(1, 8);
  });

  test('2-D adaptive equals standard (the coefficients coincide at n = 2): 219 evaluations [X]', () => {
    const result = minimize(rosenbrock, [-1.2, 1], { ...unbounded(2), xatol: 1e-8, fatol: 1e-8, adaptive: true });
    expect(result.evaluations).toBe(219);
  });

  test("2-D with bounds x ≤ 0.5 and scipy's relative initial step, no restarts: scipy's 159 evaluations, nit 88, x = (0.5, 0.25) [X]", () => {
    // Exact constrained optimum of Rosenbrock on x ≤ 0.5: y = x² = 0.25, f = (1 − 0.5)² = 0.25.
    const result = minimize(rosenbrock, [-1.2, 1], {
      lower: [-2, -2],
      upper: [0.5, 2],
      xatol: 1e-8,
      fatol: 1e-8,
      initialStep: 'relative',
      maxRestarts: 0,
    });
    expect(result.evaluations).toBe(159);
    expect(result.iterations).toBe(87);
    expect(result.x[0]).toBe(0.5);
    expect(result.x[1]).toBeCloseTo(0.25, 8);
    expect(result.value).toBeCloseTo(0.25, 14);
  });

  test('the same with our defaults (range step, restarts on a collapsed simplex): 169 evaluations, 3 restarts (regression figures)', () => {
    const result = minimize(rosenbrock, [-1.2, 1], { lower: [-2, -2], upper: [0.5, 2], xatol: 1e-8, fatol: 1e-8 });
    expect(result.evaluations).toBe(169);
    expect(result.restarts).toBe(3);
    expect(result.x[0]).toBe(0.5);
    expect(result.x[1]).toBeCloseTo(0.25, 8);
  });
});

describe('minimize(himmelblau)', () => {
  // The four minima, all with f = 0 (Himmelblau 1972; the decimals of the three irrational ones
  // recalled from memory [M], and each checked below to give f < 1e-10 at that precision).
  const minima = [
    [3, 2],
    [-2.805118, 3.131312],
    [-3.77931, -3.283186],
    [3.584428, -1.848126],
  ];
  test('the published minima are minima (f < 1e-10 at six decimals)', () => {
    for (const point of minima) expect(himmelblau(Float64Array.from(point))).toBeLessThan(1e-9);
  });

  // Start, scipy's nfev [X] for xatol = fatol = 1e-8 (pinned), and the minimum scipy reached.
  const cases: Array<[number[], number, number]> = [
    [[0, 0], 214, 0],
    [[-1, -1], 144, 2],
    [[-3, 3], 119, 1],
    [[3, -3], 132, 3],
    [[4, 4], 137, 0],
    [[-4, -4], 121, 2],
    [[1, -2], 143, 0],
    [[-2, 1], 135, 1],
  ];
  test.each(cases)(
    'from %j converges to one of the four minima in %i evaluations, as scipy [X]',
    (start, evaluations, minimumIndex) => {
      const result = minimize(himmelblau, start, { ...unbounded(2), xatol: 1e-8, fatol: 1e-8 });
      expect(result.status).toBe('converged');
      expect(result.evaluations).toBe(evaluations);
      const nearest = minima.findIndex((point) => Math.hypot(point[0] - result.x[0], point[1] - result.x[1]) < 1e-5);
      expect(nearest).toBe(minimumIndex);
      expect(result.value).toBeLessThan(1e-14);
    },
  );
});

describe('bounds (reflected then clipped, as scipy [scipy-nm])', () => {
  test('minimize(x² − 3) on [0, 4] from the upper bound 4 reaches the minimum at 0, f = −3', () => {
    // Before scipy 1.13 this returned 4: the initial vertex 4.2 was clipped back onto 4 and
    // the simplex had no width. Exact solution: x = 0 (on the lower bound), f = −3.
    const trace: number[] = [];
    const result = minimize(
      (x) => {
        trace.push(x[0]);
        return x[0] ** 2 - 3;
      },
      [4],
      { lower: [0], upper: [4] },
    );
    expect(result.x[0]).toBeCloseTo(0, 4);
    expect(result.value).toBeCloseTo(-3, 6);
    expect(Math.min(...trace)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...trace)).toBeLessThanOrEqual(4);
    expect(result.evaluations).toBe(15); // regression figure
  });
});

/**
 * Helpers for the refinement tests: a 2-D hypervolume (written here so these tests do not depend on
 * optimize/pareto) and the ZDT1 test problem.
 */

/**
 * Hypervolume of a set of 2-objective points (both minimised) against a reference point: the area
 * dominated by the set and bounded by the reference (E. Zitzler and L. Thiele, "Multiobjective
 * evolutionary algorithms: a comparative case study and the strength Pareto approach", IEEE Trans.
 * Evol. Comput. 3 (1999) 257–271, the "size of the space covered"). Sweep in f1 order: O(n log n).
 */
export function hypervolume2d(points: ReadonlyArray<ArrayLike<number>>, reference: readonly [number, number]): number {
  const inside = points
    .filter((p) => p[0] < reference[0] && p[1] < reference[1])
    .map((p) => [p[0], p[1]] as const)
    .sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  let area = 0;
  let ceiling = reference[1];
  for (const [f1, f2] of inside) {
    if (f2 >= ceiling) continue;
    area += (reference[0] - f1) * (ceiling - f2);
    ceiling = f2;
  }
  return area;
}

/** The non-dominated subset (both objectives minimised), in input order; duplicates kept once. */
export function nondominated2d(points: ReadonlyArray<ArrayLike<number>>): number[] {
  const keep: number[] = [];
  points.forEach((p, i) => {
    const dominated = points.some(
      (q, j) => j !== i && q[0] <= p[0] && q[1] <= p[1] && (q[0] < p[0] || q[1] < p[1] || j < i),
    );
    if (!dominated) keep.push(i);
  });
  return keep;
}

/**
 * ZDT1 (E. Zitzler, K. Deb and L. Thiele, "Comparison of multiobjective evolutionary algorithms:
 * empirical results", Evol. Comput. 8 (2000) 173–195): x in [0, 1]^n, f1 = x1,
 * g = 1 + 9/(n − 1)·Σ_{i≥2} x_i, f2 = g·(1 − sqrt(f1/g)). Pareto front: g = 1, f2 = 1 − sqrt(f1),
 * whose hypervolume against (1, 1) is ∫₀¹ sqrt(f1) df1 = 2/3 exactly.
 */
export function zdt1(x: ArrayLike<number>): [number, number] {
  const n = x.length;
  let tail = 0;
  for (let i = 1; i < n; i++) tail += x[i];
  const g = 1 + (9 * tail) / (n - 1);
  const f1 = x[0];
  return [f1, g * (1 - Math.sqrt(f1 / g))];
}

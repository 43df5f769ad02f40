/**
 * Pareto dominance for minimisation: a dominates b when a is no worse in every objective and better in
 * at least one (Deb, "Multi-objective optimization using evolutionary algorithms", Wiley 2001, def. 2.5).
 * Equal vectors do not dominate each other; a NaN component makes every comparison with it false, so a
 * vector with NaN neither dominates nor is dominated.
 * @param a,b objective vectors of the same length, minimisation convention (maximised metrics negated).
 * @example dominates([1, 2], [1, 3]) // true; dominates([1, 2], [1, 2]) // false
 */
export function dominates(a: ArrayLike<number>, b: ArrayLike<number>): boolean {
  return dominatesAt(a, 0, b, 0, a.length);
}

/**
 * The same test on vectors stored inside flat arrays: does a[aOffset …] dominate b[bOffset …], m
 * objectives each? (The candidate pool's index keeps its points in one Float64Array.)
 */
export function dominatesAt(
  a: ArrayLike<number>,
  aOffset: number,
  b: ArrayLike<number>,
  bOffset: number,
  m: number,
): boolean {
  let strictlyBetter = false;
  for (let j = 0; j < m; j++) {
    const x = a[aOffset + j];
    const y = b[bOffset + j];
    if (x < y) strictlyBetter = true;
    else if (!(x === y)) return false; // x > y, or NaN on either side
  }
  return strictlyBetter;
}

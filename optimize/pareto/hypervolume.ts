/**
 * The hypervolume indicator (Zitzler & Thiele 1998, "S metric"): the Lebesgue measure of the region
 * dominated by a set of points and bounded by a reference point, for minimisation.
 */

/** One point as the sweeps below see it: its coordinates, copied. */
type Point = Float64Array;

/**
 * Hypervolume of points (minimisation) with respect to a reference point.
 * Only points strictly better than the reference in every objective contribute; points with NaN
 * components contribute nothing; dominated and repeated points add nothing.
 * - 1 objective: reference − minimum.
 * - 2 objectives: sort by the first objective and sweep, O(n log n).
 * - 3 objectives: the sweep of Beume, Fonseca, López-Ibáñez, Paquete & Vahrenhold, "On the complexity of
 *   computing the hypervolume indicator", IEEE TEC 13(5), 1075-1082 (2009): points by the third objective,
 *   the 2-D staircase of those seen so far kept sorted, its area updated on each insertion. The staircase is
 *   a sorted array with binary search, so O(n log n) comparisons; insertions and removals shift the array,
 *   O(n²) element moves at worst (each point is removed at most once).
 * - 4 or more objectives: a dimension sweep over the last objective (Fonseca, Paquete & López-Ibáñez,
 *   "An improved dimension-sweep algorithm for the hypervolume indicator", IEEE CEC 2006): slabs between
 *   consecutive values of the last objective, each the (d−1)-dimensional hypervolume of the points below it
 *   times its thickness, down to the 3-D sweep; O(n²) sweep steps for 4 objectives (plus the staircase
 *   updates of each 3-D sweep).
 * @param points objective vectors (minimisation), all of the reference's length.
 * @param reference the reference point (see defaultReferencePoint).
 * @returns the hypervolume, in the product of the objectives' units; 0 for no contributing point.
 * @example hypervolume([[0, 1], [1, 0], [0.5, 0.5]], [1, 1]) // 0.25
 */
export function hypervolume(points: readonly ArrayLike<number>[], reference: ArrayLike<number>): number {
  const dimensions = reference.length;
  if (dimensions < 1)
    throw new RangeError('hypervolume: the reference point must have at least one objective, got none');
  const contributing: Point[] = [];
  for (const point of points) {
    if (point.length !== dimensions) {
      throw new RangeError(
        `hypervolume: every point needs ${dimensions} objectives like the reference, got ${point.length}`,
      );
    }
    let inside = true;
    for (let j = 0; j < dimensions; j++) if (!(point[j] < reference[j])) inside = false;
    if (inside) contributing.push(Float64Array.from(point));
  }
  if (contributing.length === 0) return 0;
  return volumeOf(contributing, Float64Array.from(reference), dimensions);
}

function volumeOf(points: Point[], reference: Float64Array, dimensions: number): number {
  if (dimensions === 1) {
    let lowest = Infinity;
    for (const point of points) lowest = Math.min(lowest, point[0]);
    return reference[0] - lowest;
  }
  if (dimensions === 2) return area2d(points, reference[0], reference[1]);
  if (dimensions === 3) return volume3d(points, reference);
  return sweepLastDimension(points, reference, dimensions);
}

/** 2-D: sort by x ascending (y ascending on ties) and add the rectangle each new lower y uncovers. */
function area2d(points: Point[], referenceX: number, referenceY: number): number {
  const sorted = points.slice().sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  let area = 0;
  let lastY = referenceY;
  for (const point of sorted) {
    if (point[1] < lastY) {
      area += (referenceX - point[0]) * (lastY - point[1]);
      lastY = point[1];
    }
  }
  return area;
}

/** Order of the 3-D sweep: z, then x, then y ascending. */
function compare3d(a: Point, b: Point): number {
  return a[2] - b[2] || a[0] - b[0] || a[1] - b[1];
}

/** 3-D sweep over z with a sorted 2-D staircase (x ascending, y descending) and its running area. */
function volume3d(points: Point[], reference: Float64Array): number {
  return volume3dSorted(points.slice().sort(compare3d), reference);
}

/** volume3d for points already in compare3d order. */
function volume3dSorted(sorted: Point[], reference: Float64Array): number {
  const referenceX = reference[0];
  const referenceY = reference[1];
  const stairX: number[] = [];
  const stairY: number[] = [];
  let area = 0;
  let volume = 0;
  let previousZ = sorted[0][2];
  for (const point of sorted) {
    volume += area * (point[2] - previousZ);
    previousZ = point[2];
    const x = point[0];
    const y = point[1];
    // First stair with x ≥ point's x.
    let low = 0;
    let high = stairX.length;
    while (low < high) {
      const middle = (low + high) >>> 1;
      if (stairX[middle] < x) low = middle + 1;
      else high = middle;
    }
    const position = low;
    // Dominated (weakly) by the stair to the left, or by one at the same x with y no larger: no change.
    if (position > 0 && stairY[position - 1] <= y) continue;
    if (position < stairX.length && stairX[position] === x && stairY[position] <= y) continue;
    // Remove the stairs the point dominates (x ≥ its x, y ≥ its y), adding the area they did not cover.
    let ceilingY = position > 0 ? stairY[position - 1] : referenceY;
    let fromX = x;
    let end = position;
    while (end < stairX.length && stairY[end] >= y) {
      area += (stairX[end] - fromX) * (ceilingY - y);
      fromX = stairX[end];
      ceilingY = stairY[end];
      end++;
    }
    const rightX = end < stairX.length ? stairX[end] : referenceX;
    area += (rightX - fromX) * (ceilingY - y);
    stairX.splice(position, end - position, x);
    stairY.splice(position, end - position, y);
  }
  volume += area * (reference[2] - previousZ);
  return volume;
}

/**
 * d ≥ 4: slabs along the last objective, each a (d − 1)-dimensional hypervolume. For d = 4 the points
 * below the current slab are kept in the 3-D sweep's order by binary insertion, so each slab costs O(n)
 * plus the staircase updates instead of a fresh sort.
 */
function sweepLastDimension(points: Point[], reference: Float64Array, dimensions: number): number {
  const last = dimensions - 1;
  const sorted = points.slice().sort((a, b) => a[last] - b[last]);
  const lowerReference = reference.subarray(0, last);
  const below: Point[] = [];
  let volume = 0;
  for (let i = 0; i < sorted.length; i++) {
    const projected = sorted[i].subarray(0, last);
    if (last === 3) {
      let low = 0;
      let high = below.length;
      while (low < high) {
        const middle = (low + high) >>> 1;
        if (compare3d(below[middle], projected) <= 0) low = middle + 1;
        else high = middle;
      }
      below.splice(low, 0, projected);
    } else {
      below.push(projected);
    }
    const top = i + 1 < sorted.length ? sorted[i + 1][last] : reference[last];
    const thickness = top - sorted[i][last];
    if (thickness > 0) {
      volume +=
        (last === 3 ? volume3dSorted(below, lowerReference) : volumeOf(below, lowerReference, last)) * thickness;
    }
  }
  return volume;
}

/**
 * The default reference point for hypervolume when the sweep file gives none: the nadir of the points
 * (the worst value of each objective) plus 10 % of that objective's range, or plus 1 where the range is 0
 * (common practice; the margin keeps the extreme points' contributions non-zero). NaN values are ignored.
 * @param points objective vectors (minimisation), at least one with a number in each objective.
 * @returns the reference point, one value per objective.
 * @throws RangeError for no points or an objective with no numeric value.
 * @example defaultReferencePoint([[0, 4], [2, 1]]) // [2.2, 4.3]
 */
export function defaultReferencePoint(points: readonly ArrayLike<number>[]): Float64Array {
  if (points.length === 0) throw new RangeError('defaultReferencePoint: points must hold at least one point, got none');
  const dimensions = points[0].length;
  const reference = new Float64Array(dimensions);
  for (let j = 0; j < dimensions; j++) {
    let lowest = Infinity;
    let highest = -Infinity;
    for (const point of points) {
      const value = point[j];
      if (Number.isNaN(value)) continue;
      if (value < lowest) lowest = value;
      if (value > highest) highest = value;
    }
    if (highest === -Infinity && lowest === Infinity) {
      throw new RangeError(`defaultReferencePoint: objective ${j} has no numeric value in any point`);
    }
    const range = highest - lowest;
    reference[j] = highest + (range > 0 ? 0.1 * range : 1);
  }
  return reference;
}

/**
 * Crowding distance of the members of one front (Deb et al. 2002, NSGA-II, IEEE TEC 6(2), sec. III-B):
 * for each objective, sort the front by it; the two boundary members get Infinity, each interior member
 * adds (next − previous)/(max − min) of that objective. Ties in an objective are ordered by position, so
 * the result does not depend on how the front is listed. An objective with zero (or non-finite) range
 * adds nothing to interior members. Fronts of one or two members: all Infinity.
 * @param points objective vectors (minimisation). @param front positions into `points`.
 * @returns distances aligned with `front` (dimensionless, ≥ 0, Infinity at the boundaries).
 * @example crowdingDistance([[0, 4], [1, 2], [4, 0]], [0, 1, 2]) // [Infinity, 2, Infinity]
 */
export function crowdingDistance(points: readonly ArrayLike<number>[], front: readonly number[]): Float64Array {
  const size = front.length;
  const distance = new Float64Array(size);
  if (size <= 2) {
    distance.fill(Infinity);
    return distance;
  }
  const objectiveCount = points[front[0]].length;
  const order = new Array<number>(size);
  for (let m = 0; m < objectiveCount; m++) {
    for (let i = 0; i < size; i++) order[i] = i;
    order.sort((a, b) => {
      const va = points[front[a]][m];
      const vb = points[front[b]][m];
      return va < vb ? -1 : va > vb ? 1 : front[a] - front[b];
    });
    const lowest = points[front[order[0]]][m];
    const highest = points[front[order[size - 1]]][m];
    distance[order[0]] = Infinity;
    distance[order[size - 1]] = Infinity;
    const range = highest - lowest;
    if (!(range > 0) || !Number.isFinite(range)) continue;
    for (let i = 1; i < size - 1; i++) {
      const previous = points[front[order[i - 1]]][m];
      const next = points[front[order[i + 1]]][m];
      distance[order[i]] += (next - previous) / range;
    }
  }
  return distance;
}

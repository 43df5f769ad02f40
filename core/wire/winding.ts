/**
 * Length of wire in a single-layer helical winding.
 */

/**
 * Wire length of a helix, m: N √((2π r)² + p²), the exact length of N turns of a circular helix
 * of centre-line radius r and pitch p (the axial rise per turn).
 * @param turns number of turns (may be fractional), ≥ 0
 * @param radius radius of the wire's centre line, m
 * @param pitch axial distance between turn centres, m
 * Source: arc length of the helix (r cos θ, r sin θ, p θ / 2π), elementary geometry.
 */
export function helicalWireLength(turns: number, radius: number, pitch: number): number {
  const circumference = 2 * Math.PI * radius;
  return turns * Math.sqrt(circumference * circumference + pitch * pitch);
}

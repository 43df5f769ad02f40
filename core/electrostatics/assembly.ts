/**
 * Assembly of the collocation matrix of the axisymmetric boundary-element model.
 *
 * Entry (i, j) is the potential at the collocation point of element i due to unit surface charge
 * density on panel j (unit line charge on a thin ring), with the floor z = 0 represented by the
 * image of every element (charge −σ at z → −z): the ring potential (Smythe; see ring-kernel.ts)
 *   a_ij = (1/(π ε0)) ∫_j r′ K(m)/d₊ ds′  −  (same with z′ → −z′).
 * Quadrature (documented rule, checked in the tests by the convergence rule and brute force):
 *   distance to the panel midpoint ≥ 16 × panel length: one ring at the midpoint carrying the
 *   panel's charge (relative error of the entry ≈ (length/distance)²/24 ≤ 2·10⁻⁴);
 *   ≥ 3 ×: 2-point Gauss–Legendre (error ≈ ρ⁻⁴ ≤ 5·10⁻⁵, ρ = t + √(t² − 1) ≥ 11.9 the Bernstein
 *   ellipse through the kernel's nearest singularity at t ≥ 6 half-lengths; Trefethen 2013
 *   [trefethen2013] Thm 19.3; below the midpoint tier's bound);
 *   ≥ 1.5 ×: 4-point (ρ⁻⁸ ≤ 8·10⁻⁷); ≥ 0.75 ×: 8-point (ρ⁻¹⁶ ≤ 2·10⁻⁷, ρ ≥ 2.6);
 *   nearer: the piece is bisected recursively (near-singular neighbours), each part by these rules;
 *   the panel's own collocation point: the logarithmic singularity of K is subtracted in closed
 *   form, K = P(m1) + Q(m1) ln(1/m1) with Q(0) = ½ (A&S 17.3.34), and the smooth remainder
 *   integrated by 8-point Gauss–Legendre on each half of the panel.
 * A thin ring's own entry is the ring potential on its wire surface (distance = wire radius from
 * the centre line), the thin-wire approximation (accurate to O(wire radius / ring radius)).
 */
import { ellipticKLogPart, ellipticKSmoothPart } from './elliptic-polynomial.ts';
import { GAUSS4_NODES, GAUSS4_WEIGHTS, GAUSS8_NODES, GAUSS8_WEIGHTS } from '../gauss-legendre.ts';
import { PANEL_THIN_RING, panelPoint, type PanelLayout } from './panels.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

/** Distance/length ratio at and beyond which a panel is a single ring at its midpoint. */
export const DISTANT_RATIO = 16;
/** Distance/length ratio at and beyond which a panel is integrated with 2 points. */
export const FAR_RATIO = 3;
/** Distance/length ratio at and beyond which 4 points suffice. */
export const NEAR_RATIO = 1.5;
/** Distance/length ratio at and beyond which a piece takes 8 points; nearer pieces are bisected. */
export const CLOSE_RATIO = 0.75;
const MAX_BISECTION_DEPTH = 14;

/**
 * K(m)/d₊ for a ring through (sourceR, sourceZ) seen from (r, z), m1 = d₋²/d₊² (A&S 17.3.34).
 * Units 1/m.
 */
function ringKernel(r: number, z: number, sourceR: number, sourceZ: number): number {
  const dz = z - sourceZ;
  const sum = r + sourceR;
  const difference = r - sourceR;
  const plus2 = sum * sum + dz * dz;
  const m1 = (difference * difference + dz * dz) / plus2;
  const k =
    1.38629436112 +
    m1 * (0.09666344259 + m1 * (0.03590092383 + m1 * (0.03742563713 + m1 * 0.01451196212))) -
    (0.5 + m1 * (0.12498593597 + m1 * (0.06880248576 + m1 * (0.03328355346 + m1 * 0.00441787012)))) * Math.log(m1);
  return k / Math.sqrt(plus2);
}

const scratchPoint = new Float64Array(2);

/** ∫ r′K/d₊ ds′ over the parameter interval [ta, tb] of panel j, adaptive by distance. */
function integrateAdaptive(
  layout: PanelLayout,
  j: number,
  ta: number,
  tb: number,
  r: number,
  z: number,
  depth: number,
): number {
  const halfSpan = 0.5 * (tb - ta);
  const centre = 0.5 * (ta + tb);
  const pieceLength = layout.length[j] * halfSpan;
  panelPoint(layout, j, centre, scratchPoint);
  const dr = r - scratchPoint[0];
  const dz = z - scratchPoint[1];
  const distance2 = dr * dr + dz * dz;
  if (distance2 >= NEAR_RATIO * NEAR_RATIO * pieceLength * pieceLength || depth >= MAX_BISECTION_DEPTH) {
    // 4-point Gauss on the piece; ds/dt = length/2 on the whole panel.
    let sum = 0;
    const jacobian = 0.5 * layout.length[j] * halfSpan;
    for (let q = 0; q < 4; q++) {
      panelPoint(layout, j, centre + halfSpan * GAUSS4_NODES[q], scratchPoint);
      sum += GAUSS4_WEIGHTS[q] * jacobian * scratchPoint[0] * ringKernel(r, z, scratchPoint[0], scratchPoint[1]);
    }
    return sum;
  }
  if (distance2 >= CLOSE_RATIO * CLOSE_RATIO * pieceLength * pieceLength) {
    // 8-point Gauss: a neighbour's piece in one step, where bisection took four to six pieces.
    let sum = 0;
    const jacobian = 0.5 * layout.length[j] * halfSpan;
    for (let q = 0; q < 8; q++) {
      panelPoint(layout, j, centre + halfSpan * GAUSS8_NODES[q], scratchPoint);
      sum += GAUSS8_WEIGHTS[q] * jacobian * scratchPoint[0] * ringKernel(r, z, scratchPoint[0], scratchPoint[1]);
    }
    return sum;
  }
  return (
    integrateAdaptive(layout, j, ta, centre, r, z, depth + 1) +
    integrateAdaptive(layout, j, centre, tb, r, z, depth + 1)
  );
}

/** ∫ r′K/d₊ ds′ over panel j seen from (r, z) ≠ its own midpoint. */
export function panelIntegral(layout: PanelLayout, j: number, r: number, z: number): number {
  if (layout.kind[j] === PANEL_THIN_RING) return layout.midR[j] * ringKernel(r, z, layout.midR[j], layout.midZ[j]);
  const dr = r - layout.midR[j];
  const dz = z - layout.midZ[j];
  const distance2 = dr * dr + dz * dz;
  const length = layout.length[j];
  if (distance2 >= DISTANT_RATIO * DISTANT_RATIO * length * length) {
    // Midpoint rule: relative error ≈ (length/distance)²/24 ≤ 2·10⁻⁴ of this entry.
    return (layout.area[j] / (2 * Math.PI)) * ringKernel(r, z, layout.midR[j], layout.midZ[j]);
  }
  if (distance2 >= FAR_RATIO * FAR_RATIO * length * length) {
    const o = 2 * j;
    return (
      layout.gauss2W[o] * ringKernel(r, z, layout.gauss2R[o], layout.gauss2Z[o]) +
      layout.gauss2W[o + 1] * ringKernel(r, z, layout.gauss2R[o + 1], layout.gauss2Z[o + 1])
    );
  }
  if (distance2 >= NEAR_RATIO * NEAR_RATIO * length * length) {
    const o = 4 * j;
    let sum = 0;
    for (let q = 0; q < 4; q++)
      sum += layout.gauss4W[o + q] * ringKernel(r, z, layout.gauss4R[o + q], layout.gauss4Z[o + q]);
    return sum;
  }
  return integrateAdaptive(layout, j, -1, 1, r, z, 0);
}

/** ln t² at the self integral's nodes t = ½(1 + x_q) of each half (the same for both halves). */
const SELF_LOG_T2 = GAUSS8_NODES.map((x) => Math.log((0.5 * (1 + x)) ** 2));

/**
 * ∫ r′K/d₊ ds′ over panel j seen from its own midpoint, with the log singularity subtracted:
 * K/d₊·r′ = r′/d₊ [P + Q ln(1/m1)] and its logarithmic part ≈ −g0 ln s² near s = 0 (g0 = ¼,
 * Q(0) = ½, A&S 17.3.34); the nodes integrate r′K/d₊ + g0 ln s², which is bounded, and
 * −g0 ∫ ln s² ds over [−h/2, h/2] = −2h g0 (ln(h/2) − 1) is added in closed form. With s = t·h/2 the
 * ln(h/2) parts cancel between the two, leaving the nodes' g0 ln t² and the constant 2h·g0.
 */
export function panelSelfIntegral(layout: PanelLayout, j: number): number {
  if (layout.kind[j] === PANEL_THIN_RING) {
    const ringR = layout.midR[j];
    return ringR * ringKernel(ringR, layout.midZ[j] + layout.geometry[5 * j + 2], ringR, layout.midZ[j]);
  }
  const r0 = layout.midR[j];
  const z0 = layout.midZ[j];
  const length = layout.length[j];
  const half = 0.5 * length;
  const g0 = 0.25;
  let sum = 0;
  for (let side = -1; side <= 1; side += 2) {
    for (let q = 0; q < 8; q++) {
      const t = side * 0.5 * (1 + GAUSS8_NODES[q]); // in (−1, 0) or (0, 1)
      panelPoint(layout, j, t, scratchPoint);
      const sourceR = scratchPoint[0];
      const dz = z0 - scratchPoint[1];
      const sum2 = (r0 + sourceR) ** 2 + dz * dz;
      const minus2 = (r0 - sourceR) ** 2 + dz * dz;
      const m1 = minus2 / sum2;
      const kernel = (sourceR / Math.sqrt(sum2)) * (ellipticKSmoothPart(m1) - ellipticKLogPart(m1) * Math.log(m1));
      // Each half spans t ∈ [0, 1] with weight ½·w; ds = half·dt.
      sum += 0.5 * GAUSS8_WEIGHTS[q] * half * (kernel + g0 * SELF_LOG_T2[q]);
    }
  }
  return sum + 2 * g0 * length;
}

/**
 * The dense collocation matrix, row-major n × n, V per (C/m²) (V per C/m for thin rings).
 *
 * Structure used: the ring kernel K(m)/d₊ is symmetric in field and source point (d₊, d₋ are), and
 * so is its image term (z + z′). Each unordered pair (i, j) is visited once. Where a pair is distant
 * both ways by the longer of the two panels (a thin ring counts as length 0, its entry is a single
 * node anyway), its direct part is one kernel value k shared by the entries (i, j) and (j, i) as
 * w_j·k and w_i·k (w = area/2π, r for a thin ring): exactly the midpoint values `panelIntegral`
 * would return. The image part is shared in the same way on its own test (the image of a pair is
 * often distant when the pair is not). Entries whose both parts are shared keep the one product
 * (area_j/2π)·scale·(k − k_image). The entries are the same numbers, bit for bit, as before this
 * split (the test compares with entry-by-entry evaluation).
 * @param layout panels of the arrangement
 * @param floor true to include the grounded floor z = 0 by images
 * @param pairDistant false to evaluate every entry on its own (reference path for the tests)
 * @param out scratch of at least n² numbers to write the matrix into (spares an allocation per solve)
 */
export function assembleCollocationMatrix(
  layout: PanelLayout,
  floor: boolean,
  pairDistant = true,
  out?: Float64Array,
): Float64Array {
  const n = layout.count;
  // `out` (at least n² long) spares a fresh n² allocation per solve: in a sweep the same memory stays
  // in the cache, which lets two worker threads scale better on a shared memory bus.
  const matrix = out ? out.subarray(0, n * n) : new Float64Array(n * n);
  const scale = 1 / (Math.PI * VACUUM_PERMITTIVITY);
  const { midR, midZ, kind, area, length } = layout;
  for (let i = 0; i < n; i++) {
    const r = midR[i];
    const z = midZ[i];
    let value = panelSelfIntegral(layout, i);
    if (floor) value -= panelIntegral(layout, i, r, -z);
    matrix[i * n + i] = scale * value;
  }
  const distant2 = DISTANT_RATIO * DISTANT_RATIO;
  for (let i = 0; i < n; i++) {
    const ri = midR[i];
    const zi = midZ[i];
    const thinI = kind[i] === PANEL_THIN_RING;
    const li = thinI ? 0 : length[i];
    // What `panelIntegral` multiplies a midpoint kernel by (the same expression, the same bits).
    const weightI = thinI ? ri : area[i] / (2 * Math.PI);
    const pairWeightI = (area[i] / (2 * Math.PI)) * scale;
    for (let j = i + 1; j < n; j++) {
      const rj = midR[j];
      const zj = midZ[j];
      const thinJ = kind[j] === PANEL_THIN_RING;
      const lj = thinJ ? 0 : length[j];
      const longest = Math.max(li, lj);
      const limit2 = distant2 * longest * longest;
      const dr = ri - rj;
      const dz = zi - zj;
      const directShared = pairDistant && dr * dr + dz * dz >= limit2;
      const dzImage = zi + zj;
      const imageShared = floor && pairDistant && dr * dr + dzImage * dzImage >= limit2;
      if (directShared && (imageShared || !floor)) {
        let kernel = ringKernel(ri, zi, rj, zj);
        if (floor) kernel -= ringKernel(ri, -zi, rj, zj);
        matrix[i * n + j] = (area[j] / (2 * Math.PI)) * scale * kernel;
        matrix[j * n + i] = pairWeightI * kernel;
        continue;
      }
      const weightJ = thinJ ? rj : area[j] / (2 * Math.PI);
      let ij: number;
      let ji: number;
      if (directShared) {
        const kernel = ringKernel(ri, zi, rj, zj);
        ij = weightJ * kernel;
        ji = weightI * kernel;
      } else {
        ij = panelIntegral(layout, j, ri, zi);
        ji = panelIntegral(layout, i, rj, zj);
      }
      if (floor) {
        // Image in the floor: the panel's image seen from (r, z) equals the panel seen from (r, −z).
        if (imageShared) {
          const kernel = ringKernel(ri, -zi, rj, zj);
          ij -= weightJ * kernel;
          ji -= weightI * kernel;
        } else {
          ij -= panelIntegral(layout, j, ri, -zi);
          ji -= panelIntegral(layout, i, rj, -zj);
        }
      }
      matrix[i * n + j] = scale * ij;
      matrix[j * n + i] = scale * ji;
    }
  }
  return matrix;
}

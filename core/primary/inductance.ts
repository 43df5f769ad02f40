/**
 * Inductance of a primary modelled as coaxial rings, as a smooth function of a fractional tap.
 *
 * L(t) = Σ_i Σ_j w_i(t) w_j(t) M_ij with the tap weights of rings.ts (1 for whole rings inside
 * the tap, the fraction for the ring the tap lands on, 0 beyond). M_ij for i ≠ j is Maxwell's
 * mutual inductance of the rings' centre lines (exact for round conductors, whose GMD to a
 * neighbour is the centre distance); M_ii is the ring's self-inductance with the current on the
 * conductor's surface (the primary runs at radio frequency: skin depth ≪ conductor radius for
 * tube or heavy wire, e.g. 0.2 mm in copper at 100 kHz), L = μ0 r (ln(8r/ρ) − 2).
 *
 * Within ring k (t = k + f, 0 ≤ f ≤ 1) L(t) = S_k + 2 f B_k + f² M_kk, with S_k the inductance of
 * the first k whole rings and B_k = Σ_{i<k} M_ik: a piecewise quadratic in t, continuous, exact at
 * whole turns, and strictly increasing (every M_ij > 0).
 */
import type { Ring } from '../context.ts';
import { coaxialLoopMutualInductance } from '../inductance/coaxial-loops.ts';
import { loopSelfInductance } from '../inductance/loop.ts';

/** What the tap functions need, computed once per primary: O(n²) Maxwell evaluations. */
export interface PrimaryInductanceTable {
  ringCount: number;
  /** Symmetric n × n matrix of M_ij, row-major, H (diagonal: ring self-inductances). */
  matrix: Float64Array;
  /** S_k for k = 0..n: inductance of the first k whole rings, H. */
  wholeRingInductance: Float64Array;
  /** B_k for k = 0..n−1: Σ_{i<k} M_ik, H. */
  crossInductance: Float64Array;
}

/**
 * The ring matrix and the partial sums of a primary.
 * @param rings ring centre lines, inner end first (rings.ts), m
 * @param conductorRadius radius of the tube or wire, m (≪ ring radius)
 * Source: Maxwell (1873) §701 for M_ij; Grover (1946) for the surface-current loop self-inductance.
 */
export function primaryInductanceTable(rings: readonly Ring[], conductorRadius: number): PrimaryInductanceTable {
  const ringCount = rings.length;
  const matrix = new Float64Array(ringCount * ringCount);
  for (let i = 0; i < ringCount; i++) {
    matrix[i * ringCount + i] = loopSelfInductance(rings[i].r, conductorRadius, 'surface');
    for (let j = i + 1; j < ringCount; j++) {
      const mutual = coaxialLoopMutualInductance(rings[i].r, rings[j].r, rings[j].z - rings[i].z);
      matrix[i * ringCount + j] = mutual;
      matrix[j * ringCount + i] = mutual;
    }
  }
  const wholeRingInductance = new Float64Array(ringCount + 1);
  const crossInductance = new Float64Array(ringCount);
  for (let k = 0; k < ringCount; k++) {
    let cross = 0;
    for (let i = 0; i < k; i++) cross += matrix[i * ringCount + k];
    crossInductance[k] = cross;
    wholeRingInductance[k + 1] = wholeRingInductance[k] + 2 * cross + matrix[k * ringCount + k];
  }
  return { ringCount, matrix, wholeRingInductance, crossInductance };
}

/**
 * Inductance of the primary tapped `tapTurns` from the inner end, H (the quadratic form above).
 * @param table from `primaryInductanceTable`
 * @param tapTurns tap position in turns, clamped to [0, ringCount]
 */
export function primaryInductanceAtTap(table: PrimaryInductanceTable, tapTurns: number): number {
  const tap = Math.min(Math.max(tapTurns, 0), table.ringCount);
  const ring = Math.min(Math.floor(tap), table.ringCount - 1);
  if (ring < 0) return 0;
  const fraction = tap - ring;
  const self = table.matrix[ring * table.ringCount + ring];
  return table.wholeRingInductance[ring] + 2 * fraction * table.crossInductance[ring] + fraction * fraction * self;
}

/**
 * Conductor length of the tapped part, m: Σ w_i 2π r_i (circles; the small length added by the
 * spiral's or helix's pitch is neglected, about (p / 2πr)²/2 relative).
 * @param rings ring centre lines, m
 * @param tapTurns tap position in turns
 */
export function primaryConductorLength(rings: readonly Ring[], tapTurns: number): number {
  let length = 0;
  for (let i = 0; i < rings.length; i++) length += Math.min(1, Math.max(0, tapTurns - i)) * 2 * Math.PI * rings[i].r;
  return length;
}

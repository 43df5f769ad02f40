/**
 * Tuning the tank circuit to the secondary: the tap at which 1/(2π √(L1(t) C1)) equals the
 * secondary's resonant frequency.
 */
import { primaryInductanceAtTap, type PrimaryInductanceTable } from './inductance.ts';

/** Where the tuning landed. */
export interface TuningResult {
  /** Tap in turns from the inner end, within [minimumTap, maximumTap]. */
  tapTurns: number;
  /** Inductance the tank needs, H: L2 C2 / C1. */
  requiredInductance: number;
  /** 'tuned', or which end of the primary was used because the target lies beyond it. */
  status: 'tuned' | 'below_range' | 'above_range';
}

/**
 * The tap at which the tapped primary has a given inductance. L1(t) is strictly increasing and
 * piecewise quadratic (inductance.ts), so the ring holding the target is found from the whole-ring
 * sums and the quadratic S_k + 2 f B_k + f² M_kk = L is solved in closed form (the stable root
 * f = (L − S_k) / (B_k + √(B_k² + M_kk (L − S_k)))); the result is exact to rounding, no iteration.
 * If the target lies below L1(minimumTap) or above L1(maximumTap) the nearer end is returned with
 * the status saying so.
 * @param table the primary's inductance table
 * @param requiredInductance target L1, H
 * @param minimumTap lowest tap allowed, turns (1: one ring's worth)
 * @param maximumTap highest tap, turns (the primary's turns, ≤ ringCount)
 */
export function tapForInductance(
  table: PrimaryInductanceTable,
  requiredInductance: number,
  minimumTap: number,
  maximumTap: number,
): TuningResult {
  const lowest = primaryInductanceAtTap(table, minimumTap);
  const highest = primaryInductanceAtTap(table, maximumTap);
  if (!(requiredInductance >= lowest)) return { tapTurns: minimumTap, requiredInductance, status: 'below_range' };
  if (requiredInductance > highest) return { tapTurns: maximumTap, requiredInductance, status: 'above_range' };
  let ring = Math.min(Math.floor(minimumTap), table.ringCount - 1);
  while (ring + 1 < table.ringCount && table.wholeRingInductance[ring + 1] < requiredInductance) ring++;
  const excess = requiredInductance - table.wholeRingInductance[ring];
  const cross = table.crossInductance[ring];
  const self = table.matrix[ring * table.ringCount + ring];
  const fraction = excess / (cross + Math.sqrt(cross * cross + self * excess));
  const tapTurns = Math.min(Math.max(ring + fraction, minimumTap), maximumTap);
  return { tapTurns, requiredInductance, status: 'tuned' };
}

/**
 * The tap that tunes the tank (capacitance C1) to a secondary of inductance L2 and total
 * capacitance C2: L1 = L2 C2 / C1, i.e. 1/(2π √(L1 C1)) = 1/(2π √(L2 C2)).
 * @param table the primary's inductance table
 * @param secondaryInductance L2, H
 * @param secondaryCapacitance C2 (total, at the top of the winding), F
 * @param tankCapacitance C1, F
 * @param primaryTurns the primary's turns (the highest tap); the lowest is one turn
 */
export function tuneTap(
  table: PrimaryInductanceTable,
  secondaryInductance: number,
  secondaryCapacitance: number,
  tankCapacitance: number,
  primaryTurns: number,
): TuningResult {
  const required = (secondaryInductance * secondaryCapacitance) / tankCapacitance;
  return tapForInductance(table, required, Math.min(1, primaryTurns), primaryTurns);
}

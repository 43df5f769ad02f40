/**
 * Medhurst's empirical self-capacitance of a single-layer solenoid.
 *
 * C = H(l/D) · D, with D in cm giving pF (SI: C = H · D[m] · 100 pF), H a function of the
 * length-to-diameter ratio only, from coils measured with one end grounded (R. G. Medhurst, "H.F.
 * resistance and self-capacitance of single-layer solenoids", Wireless Engineer 24, 1947; the H
 * table as reproduced in builders' correspondence citing Medhurst and the Radiotron Designer's
 * Handbook, 4th ed., 1953 — refs §4.1 [P2]). Interpolated log–log between table rows; outside
 * 0.1 ≤ l/D ≤ 50 there is no value (null). Claimed accuracy about 5 %.
 */

/** Medhurst's table: l/D and H (refs §4.1 [P2]). */
export const MEDHURST_TABLE: ReadonlyArray<readonly [number, number]> = [
  [0.1, 0.96],
  [0.15, 0.79],
  [0.2, 0.7],
  [0.25, 0.64],
  [0.3, 0.6],
  [0.35, 0.57],
  [0.4, 0.54],
  [0.45, 0.52],
  [0.5, 0.5],
  [0.6, 0.48],
  [0.7, 0.47],
  [0.8, 0.46],
  [0.9, 0.46],
  [1.0, 0.46],
  [1.5, 0.47],
  [2.0, 0.5],
  [2.5, 0.56],
  [3.0, 0.61],
  [3.5, 0.67],
  [4.0, 0.72],
  [4.5, 0.77],
  [5.0, 0.81],
  [6.0, 0.92],
  [7.0, 1.01],
  [8.0, 1.12],
  [9.0, 1.22],
  [10, 1.32],
  [15, 1.86],
  [20, 2.36],
  [25, 2.9],
  [30, 3.4],
  [40, 4.6],
  [50, 5.8],
];

/** Medhurst's H for the ratio l/D, log–log interpolated; null outside the table (0.1–50). */
export function medhurstFactor(lengthOverDiameter: number): number | null {
  const table = MEDHURST_TABLE;
  if (!(lengthOverDiameter >= table[0][0] && lengthOverDiameter <= table[table.length - 1][0])) return null;
  for (let k = 0; k < table.length - 1; k++) {
    const [x0, h0] = table[k];
    const [x1, h1] = table[k + 1];
    if (lengthOverDiameter <= x1) {
      const w = Math.log(lengthOverDiameter / x0) / Math.log(x1 / x0);
      return Math.exp((1 - w) * Math.log(h0) + w * Math.log(h1));
    }
  }
  return table[table.length - 1][1];
}

/**
 * Medhurst's self-capacitance, F.
 * @param diameter coil diameter D, m (to the wire's centre line)
 * @param length winding length l, m
 * @returns C = H(l/D) · D[cm] pF, or null outside 0.1 ≤ l/D ≤ 50 or for non-positive sizes
 */
export function medhurstSelfCapacitance(diameter: number, length: number): number | null {
  if (!(diameter > 0) || !(length > 0)) return null;
  const factor = medhurstFactor(length / diameter);
  if (factor === null) return null;
  return factor * diameter * 100 * 1e-12;
}

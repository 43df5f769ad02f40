/**
 * Copper tube for primaries: ASTM B88 (inch, types K, L and M) and EN 1057 (metric) outside
 * diameters (refs §12.3 [astmB88], §12.4 [en1057]).
 *
 * ASTM B88, "Standard Specification for Seamless Copper Water Tube": the outside diameter of every
 * type is the nominal (standard) size plus 1/8 in; the types differ in wall. EN 1057, "Copper and
 * copper alloys — Seamless, round copper tubes for water and gas in sanitary and heating
 * applications": the tube is named by its outside diameter in mm. Both tables are typed from memory
 * of the standards, not checked against the printed standards; walls of EN 1057 are not listed
 * (several walls are made for each outside diameter).
 */

/** One ASTM B88 size: the nominal size as written, the outside diameter and the walls (null: not made), in. */
export interface InchTubeRow {
  size: string;
  outside: number;
  wallK: number;
  wallL: number;
  wallM: number | null;
}

/** ASTM B88 outside diameters and nominal walls of types K, L, M, inches (from memory). */
export const ASTM_B88_ROWS: readonly InchTubeRow[] = [
  { size: '1/4', outside: 0.375, wallK: 0.035, wallL: 0.03, wallM: null },
  { size: '3/8', outside: 0.5, wallK: 0.049, wallL: 0.035, wallM: 0.025 },
  { size: '1/2', outside: 0.625, wallK: 0.049, wallL: 0.04, wallM: 0.028 },
  { size: '5/8', outside: 0.75, wallK: 0.049, wallL: 0.042, wallM: null },
  { size: '3/4', outside: 0.875, wallK: 0.065, wallL: 0.045, wallM: 0.032 },
  { size: '1', outside: 1.125, wallK: 0.065, wallL: 0.05, wallM: 0.035 },
  { size: '1-1/4', outside: 1.375, wallK: 0.065, wallL: 0.055, wallM: 0.042 },
  { size: '1-1/2', outside: 1.625, wallK: 0.072, wallL: 0.06, wallM: 0.049 },
  { size: '2', outside: 2.125, wallK: 0.083, wallL: 0.07, wallM: 0.058 },
];

/** EN 1057 outside diameters, mm (from memory), up to the largest a primary plausibly uses. */
export const EN_1057_OUTSIDE_DIAMETERS_MM: readonly number[] = [
  6, 8, 10, 12, 14, 15, 16, 18, 22, 28, 35, 42, 54, 64, 66.7, 76.1, 88.9, 108,
];

/**
 * Inch PVC pipe: outside diameters and minimum walls of ASTM D1785, schedules 40 and 80
 * (refs §12.2 [astmD1785]).
 *
 * Source: ASTM D1785, "Standard Specification for Poly(Vinyl Chloride) (PVC) Plastic Pipe,
 * Schedules 40, 80, and 120", the table of outside diameters and wall thicknesses (the iron-pipe
 * sizes shared with steel pipe). Typed from memory of the standard's table, not checked against the
 * printed standard. The wall is the minimum wall; the inside diameter given here is the outside
 * diameter less twice that wall (the largest bore the standard allows at the nominal outside).
 */

/** One nominal size: the trade size as written, the average outside diameter and the minimum walls, in. */
export interface InchPipeRow {
  size: string;
  outside: number;
  wallSchedule40: number;
  wallSchedule80: number;
}

/** ASTM D1785 outside diameters and minimum walls, inches (from memory). */
export const ASTM_D1785_ROWS: readonly InchPipeRow[] = [
  { size: '1/8', outside: 0.405, wallSchedule40: 0.068, wallSchedule80: 0.095 },
  { size: '1/4', outside: 0.54, wallSchedule40: 0.088, wallSchedule80: 0.119 },
  { size: '3/8', outside: 0.675, wallSchedule40: 0.091, wallSchedule80: 0.126 },
  { size: '1/2', outside: 0.84, wallSchedule40: 0.109, wallSchedule80: 0.147 },
  { size: '3/4', outside: 1.05, wallSchedule40: 0.113, wallSchedule80: 0.154 },
  { size: '1', outside: 1.315, wallSchedule40: 0.133, wallSchedule80: 0.179 },
  { size: '1-1/4', outside: 1.66, wallSchedule40: 0.14, wallSchedule80: 0.191 },
  { size: '1-1/2', outside: 1.9, wallSchedule40: 0.145, wallSchedule80: 0.2 },
  { size: '2', outside: 2.375, wallSchedule40: 0.154, wallSchedule80: 0.218 },
  { size: '2-1/2', outside: 2.875, wallSchedule40: 0.203, wallSchedule80: 0.276 },
  { size: '3', outside: 3.5, wallSchedule40: 0.216, wallSchedule80: 0.3 },
  { size: '3-1/2', outside: 4.0, wallSchedule40: 0.226, wallSchedule80: 0.318 },
  { size: '4', outside: 4.5, wallSchedule40: 0.237, wallSchedule80: 0.337 },
  { size: '5', outside: 5.563, wallSchedule40: 0.258, wallSchedule80: 0.375 },
  { size: '6', outside: 6.625, wallSchedule40: 0.28, wallSchedule80: 0.432 },
  { size: '8', outside: 8.625, wallSchedule40: 0.322, wallSchedule80: 0.5 },
  { size: '10', outside: 10.75, wallSchedule40: 0.365, wallSchedule80: 0.593 },
  { size: '12', outside: 12.75, wallSchedule40: 0.406, wallSchedule80: 0.687 },
  { size: '14', outside: 14.0, wallSchedule40: 0.437, wallSchedule80: 0.75 },
  { size: '16', outside: 16.0, wallSchedule40: 0.5, wallSchedule80: 0.843 },
  { size: '18', outside: 18.0, wallSchedule40: 0.562, wallSchedule80: 0.937 },
  { size: '20', outside: 20.0, wallSchedule40: 0.593, wallSchedule80: 1.031 },
  { size: '24', outside: 24.0, wallSchedule40: 0.687, wallSchedule80: 1.218 },
];

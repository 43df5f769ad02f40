/**
 * Thermoplastic pipe: the nominal outside diameters of ISO 161-1 (refs §12.1 [iso161]).
 *
 * Source: ISO 161-1, "Thermoplastics pipes for the conveyance of fluids — Nominal outside diameters
 * and nominal pressures — Part 1: Metric series", table of nominal outside diameters. The values are
 * typed from memory of the standard's table (the series is the one PVC-U, PE and PP pressure pipe is
 * sold in), not checked against the printed standard. The standard goes below 10 mm and above 1 m;
 * this catalogue keeps the sizes a coil form or a former can plausibly be cut from, 10 mm to 1000 mm.
 */

/** Nominal outside diameters dn, mm (ISO 161-1, from memory). */
export const ISO_161_OUTSIDE_DIAMETERS_MM: readonly number[] = [
  10, 12, 16, 20, 25, 32, 40, 50, 63, 75, 90, 110, 125, 140, 160, 180, 200, 225, 250, 280, 315, 355, 400, 450, 500, 560,
  630, 710, 800, 900, 1000,
];

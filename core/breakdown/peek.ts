/**
 * Peek's law: the visual corona-onset surface field of smooth conductors in air.
 *
 * Cylinder (parallel wires), applied to a toroid's tube (the tube's radius is the smaller
 * curvature radius and decides onset):
 *   g = 30 · m · δ · (1 + 0.301/√(δ r)) kV/cm, r in cm (peak value)
 * (F. W. Peek, *Dielectric Phenomena in High-Voltage Engineering*, 3rd ed., 1929; Kuffel & Zaengl,
 * *High Voltage Engineering Fundamentals*, p. 366 — refs §6.1 [P2]; "peak" from memory).
 * Sphere: g = 27.2 · m · δ · (1 + 0.54/√(δ R)) kV/cm, R sphere radius in cm — constants from memory
 * (refs §6.1 [M], not confirmed in a source read).
 * m is the surface (irregularity) factor: polished 1.0, roughened or weathered 0.98–0.93 (§6.1
 * [P2]). Peek's constants come from power-frequency tests on conductors of mm–cm radius; at the
 * 50–500 kHz of a resonant transformer, with space charge, onset is lower and less defined: the
 * result is a corona-onset estimate, not a guarantee that the terminal holds.
 */

/**
 * Default surface factor: 1.0, Peek's polished case, for a smooth spun-metal topload, and the value
 * DEFAULT_ENVIRONMENT already carries. For a corrugated duct toroid set about 0.9 (common practice,
 * no source); Peek's roughened range is 0.98–0.93.
 */
export const DEFAULT_SURFACE_FACTOR = 1.0;

const KILOVOLT_PER_CM = 1e5; // V/m

/**
 * Peek's onset field for a cylinder of radius r (a toroid's tube), V/m (peak).
 * @param radius conductor (tube) radius, m (> 0)
 * @param airDensity relative air density δ (> 0)
 * @param surfaceFactor m, 0 < m ≤ 1
 */
export function peekCylinderOnsetField(
  radius: number,
  airDensity: number,
  surfaceFactor = DEFAULT_SURFACE_FACTOR,
): number {
  if (!(radius > 0) || !(airDensity > 0) || !(surfaceFactor > 0)) return Number.NaN;
  const radiusCm = radius * 100;
  return 30 * KILOVOLT_PER_CM * surfaceFactor * airDensity * (1 + 0.301 / Math.sqrt(airDensity * radiusCm));
}

/**
 * Peek's onset field for a sphere of radius R, V/m (peak); constants 27.2 and 0.54 from memory.
 * Arguments as for `peekCylinderOnsetField`.
 */
export function peekSphereOnsetField(
  radius: number,
  airDensity: number,
  surfaceFactor = DEFAULT_SURFACE_FACTOR,
): number {
  if (!(radius > 0) || !(airDensity > 0) || !(surfaceFactor > 0)) return Number.NaN;
  const radiusCm = radius * 100;
  return 27.2 * KILOVOLT_PER_CM * surfaceFactor * airDensity * (1 + 0.54 / Math.sqrt(airDensity * radiusCm));
}

/**
 * Breakout (corona-onset) voltage at the top, V: the onset field over the peak surface field per
 * volt. An estimate of onset, not of streamer length.
 * @param onsetField V/m
 * @param fieldPerVolt peak surface field per volt at the top, 1/m
 */
export function breakoutVoltage(onsetField: number, fieldPerVolt: number): number {
  if (!(fieldPerVolt > 0) || !(onsetField > 0)) return Number.NaN;
  return onsetField / fieldPerVolt;
}

/**
 * Relative air density δ for Peek's law, from altitude and temperature.
 *
 * Pressure from the ICAO / ISO 2533 standard atmosphere, troposphere (0–11 km):
 *   p = 101 325 Pa · (1 − 2.25577·10⁻⁵ · h)^5.25588, h geopotential altitude in m.
 * Peek's relative density δ = 3.92 b/(273 + t) (b in cmHg, t in °C), in SI
 *   δ = (p / 101.325 kPa) · (298.15 K / T),
 * equal to 1 at 76 cmHg and 25 °C, Peek's reference (F. W. Peek, *Dielectric Phenomena in
 * High-Voltage Engineering*, 3rd ed., 1929; Kuffel & Zaengl, *High Voltage Engineering
 * Fundamentals* — refs §6.1). The pressure comes from the standard atmosphere at the
 * altitude; the temperature is the actual air temperature (not the standard one).
 */

/** Sea-level standard pressure, Pa (ICAO). */
export const SEA_LEVEL_PRESSURE = 101325;
/** Peek's reference temperature, K (25 °C). */
export const PEEK_REFERENCE_TEMPERATURE = 298.15;
/** Top of the troposphere in the standard atmosphere, m. */
export const TROPOPAUSE_ALTITUDE = 11000;

/**
 * Standard-atmosphere pressure at an altitude, Pa (ICAO troposphere, valid −500 m … 11 km; NaN
 * outside).
 */
export function standardAtmospherePressure(altitude: number): number {
  if (!(altitude >= -500 && altitude <= TROPOPAUSE_ALTITUDE)) return Number.NaN;
  return SEA_LEVEL_PRESSURE * (1 - 2.25577e-5 * altitude) ** 5.25588;
}

/**
 * Peek's relative air density δ (dimensionless).
 * @param altitude above sea level, m (−500 … 11 000)
 * @param temperature air temperature, K (> 0)
 */
export function relativeAirDensity(altitude: number, temperature: number): number {
  if (!(temperature > 0)) return Number.NaN;
  return (standardAtmospherePressure(altitude) / SEA_LEVEL_PRESSURE) * (PEEK_REFERENCE_TEMPERATURE / temperature);
}

/**
 * Annealed copper: resistivity, its temperature coefficient and density, and what follows from
 * them for a round wire (DC resistance, mass, skin depth).
 */
import { VACUUM_PERMEABILITY } from '../inductance/vacuum.ts';

/** Resistivity of annealed copper at 20 °C, Ω·m: 1/58 Ω·mm²/m (IEC 60028:1925, 100 % IACS). */
export const COPPER_RESISTIVITY_20C = 1 / 58e6;

/** Temperature coefficient of resistance of annealed copper at 20 °C, 1/K (IEC 60028; 0.00393 from memory). */
export const COPPER_TEMPERATURE_COEFFICIENT = 0.00393;

/** Density of annealed copper at 20 °C, kg/m³ (8.89 g/cm³, the IEC 60028 figure; from memory). */
export const COPPER_DENSITY = 8890;

/** 20 °C in kelvin, the reference temperature of the resistivity. */
const REFERENCE_TEMPERATURE = 293.15;

/**
 * Resistivity of copper at a temperature, Ω·m: ρ(T) = ρ20 [1 + α20 (T − 20 °C)].
 * @param temperature conductor temperature, K; the linear law is good from about −50 °C to 200 °C.
 * @param resistivity20 resistivity at 20 °C, Ω·m (annealed copper by default)
 * @param temperatureCoefficient α at 20 °C, 1/K (0.00393 by default)
 * Source: IEC 60028 (linear temperature law with α20 = 0.00393 /K).
 */
export function copperResistivity(
  temperature: number,
  resistivity20: number = COPPER_RESISTIVITY_20C,
  temperatureCoefficient: number = COPPER_TEMPERATURE_COEFFICIENT,
): number {
  // IEC 60028: ρ(T) = ρ20 (1 + α20 (T − 20 °C))
  return resistivity20 * (1 + temperatureCoefficient * (temperature - REFERENCE_TEMPERATURE));
}

/**
 * DC resistance of a round wire, Ω: R = ρ(T) ℓ / (π d² / 4).
 * @param length wire length, m
 * @param bareDiameter copper diameter, m
 * @param temperature conductor temperature, K (20 °C = 293.15 K)
 * @param resistivity20 resistivity at 20 °C, Ω·m (annealed copper by default)
 * Source: Ohm's law with IEC 60028 copper.
 */
export function wireDcResistance(
  length: number,
  bareDiameter: number,
  temperature: number,
  resistivity20: number = COPPER_RESISTIVITY_20C,
): number {
  const area = (Math.PI * bareDiameter * bareDiameter) / 4;
  return (copperResistivity(temperature, resistivity20) * length) / area;
}

/**
 * Mass of the copper of a round wire, kg (insulation not included): density × π d²/4 × ℓ.
 * @param length wire length, m
 * @param bareDiameter copper diameter, m
 * Source: IEC 60028 density 8.89 g/cm³ (from memory).
 */
export function copperMass(length: number, bareDiameter: number): number {
  return COPPER_DENSITY * ((Math.PI * bareDiameter * bareDiameter) / 4) * length;
}

/**
 * Skin depth of a good conductor, m: δ = √(ρ / (π f μ0 μr)).
 * @param frequency Hz, > 0
 * @param resistivity Ω·m
 * @param relativePermeability μr (1 for copper)
 * Valid while the conductor's displacement current is negligible (any metal below optical
 * frequencies). Source: the standard plane-wave solution in a conductor (e.g. Ramo, Whinnery &
 * Van Duzer, Fields and Waves in Communication Electronics, skin effect).
 */
export function skinDepth(frequency: number, resistivity: number, relativePermeability = 1): number {
  return Math.sqrt(resistivity / (Math.PI * frequency * VACUUM_PERMEABILITY * relativePermeability));
}

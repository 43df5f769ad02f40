/**
 * AC resistances of the secondary winding and of the primary conductor at their operating
 * frequencies (skin and proximity effect), from their DC resistances.
 */
import { skinDepth } from '../wire/copper.ts';
import { roundWireResistanceRatio } from './round-wire.ts';
import { dowellRoundWirePenetration, dowellSingleLayerFactor } from './dowell.ts';

/**
 * AC resistance of a single-layer solenoid winding (skin plus proximity effect), Ω.
 *
 * R_ac = R_dc · max(F_Dowell, F_isolated): Dowell's one-layer factor (Dowell 1966, see dowell.ts)
 * for the winding, never below the exact skin-effect ratio of the same wire alone (Bessel solution,
 * round-wire.ts), because the neighbours' field only adds loss (skin and proximity losses of a round
 * wire are orthogonal — J. A. Ferreira, IEEE Trans. Power Electron. 9(1), 1994 [M]). The resistivity
 * is recovered from the DC resistance (ρ = R_dc·πd²/(4ℓ)), so the temperature is that of R_dc.
 * @param dcResistance DC resistance of the winding, Ω
 * @param wireLength wire length, m
 * @param bareDiameter copper diameter, m
 * @param pitch turn-to-turn centre distance, m
 * @param frequency operating frequency, Hz (> 0)
 * Valid for long single-layer solenoids (winding length ≳ diameter: the field is axial and
 * uniform inside, ≈ 0 outside) with porosity d/p ≳ 0.5; end effects of short coils are ignored
 * (the loss is underestimated there), and so is the field curvature across the wire.
 */
export function solenoidAcResistance(
  dcResistance: number,
  wireLength: number,
  bareDiameter: number,
  pitch: number,
  frequency: number,
): number {
  const area = (Math.PI * bareDiameter * bareDiameter) / 4;
  const resistivity = (dcResistance * area) / wireLength;
  const depth = skinDepth(frequency, resistivity);
  const winding = dowellSingleLayerFactor(
    dowellRoundWirePenetration(bareDiameter, Math.max(pitch, bareDiameter), depth),
  );
  const isolated = roundWireResistanceRatio(bareDiameter / 2, depth);
  return dcResistance * Math.max(winding, isolated);
}

/**
 * AC resistance of a round conductor (wire, rod or thick-walled tube) by the exact skin-effect
 * solution, Ω: R_ac = ρ ℓ / (π a²) · (R_ac/R_dc)(a/δ).
 * @param length conductor length, m
 * @param radius conductor radius, m
 * @param resistivity Ω·m at the working temperature
 * @param frequency Hz (> 0)
 * Source: Bessel solution of the round wire (round-wire.ts). Proximity between turns is left out:
 * in a flat or conical primary with a gap of about one conductor diameter or more it adds a modest
 * fraction (not modelled); a tube counts as solid while its wall is thicker than about 2δ.
 */
export function roundConductorAcResistance(
  length: number,
  radius: number,
  resistivity: number,
  frequency: number,
): number {
  const dcResistance = (resistivity * length) / (Math.PI * radius * radius);
  return dcResistance * roundWireResistanceRatio(radius, skinDepth(frequency, resistivity));
}

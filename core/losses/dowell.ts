/**
 * Skin and proximity effect in a single-layer winding by Dowell's one-dimensional method.
 *
 * P. L. Dowell, "Effects of eddy currents in transformer windings", Proc. IEE 113(8), 1387–1394,
 * 1966: a layer of conductors is replaced by a conducting foil of the same copper height in a
 * magnetic field parallel to the layer; for layer m of a section (field 0 on one side, m·H on
 * the other) the AC/DC resistance ratio is
 *   F = Δ [ (sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ) + (2/3)(m² − 1)(sinh Δ − sin Δ)/(cosh Δ + cos Δ) ],
 * Δ = h/δ_eff (from memory [M]; the same formula in the form
 * F = Re{αh coth αh} + ((m² − 1)/3) Re{2αh tanh(αh/2)}, α = √(jωμ0ση), is reproduced on the
 * e-magnetica.pl "proximity effect from Dowell curves" calculator page [P2]; its m = 1 term is the
 * exact 1-D diffusion solution, which the tests check). A long single-layer solenoid is exactly the m = 1 case: the axial field is
 * N I / l inside the winding and close to zero outside. Round wire of diameter d at pitch p is
 * taken as a square of the same area (side h = d√π/2) with the layer porosity η = h/p, which
 * scales the conductivity, so Δ = (π/4)^{3/4} (d/δ) √(d/p) (Dowell's equivalences, [M]). (The
 * [P2] page above takes h = d for round wire instead, which gives a Δ larger by (4/π)^{3/4} ≈ 1.20;
 * the equal-area square of the original [M] is kept here; it gives the lower of the two losses.)
 */

/**
 * Dowell's AC/DC resistance ratio of one layer with the field on one side only (m = 1).
 * @param penetrationRatio Δ = effective layer height over skin depth, dimensionless, ≥ 0
 * @returns F_R = Δ (sinh 2Δ + sin 2Δ)/(cosh 2Δ − cos 2Δ), ≥ 1
 * Exact for a uniform foil in a uniform tangential field (1-D diffusion). Source: Dowell 1966 [M].
 */
export function dowellSingleLayerFactor(penetrationRatio: number): number {
  const delta = penetrationRatio;
  if (delta < 0.05) return 1 + (4 / 45) * delta ** 4; // Taylor series of the same expression, avoids 0/0
  if (delta > 20) return delta; // the hyperbolic terms dominate to e^{−40}
  const twice = 2 * delta;
  return (delta * (Math.sinh(twice) + Math.sin(twice))) / (Math.cosh(twice) - Math.cos(twice));
}

/**
 * Dowell's penetration ratio of a layer of round wires: Δ = (π/4)^{3/4} (d/δ) √(d/p).
 * @param bareDiameter copper diameter d, m
 * @param pitch centre distance of neighbouring turns p, m (≥ d)
 * @param skinDepthValue δ at the frequency, m
 * Round-to-square equivalence and porosity of Dowell 1966 [M]. The equivalence is best for
 * close-wound layers (porosity d/p above about 0.5) and degrades for widely spaced wires.
 */
export function dowellRoundWirePenetration(bareDiameter: number, pitch: number, skinDepthValue: number): number {
  return (Math.PI / 4) ** 0.75 * (bareDiameter / skinDepthValue) * Math.sqrt(bareDiameter / pitch);
}

/**
 * Free ringing of one series RLC loop: L di/dt + R i + v = 0, C dv/dt = i.
 *
 * Exact solution of the second-order linear equation (any circuit-theory text): with
 * α = R/(2L) and ω0² = 1/(LC), v(τ) = e^{−ατ}[v0 cos ωd τ + ((i0/C + α v0)/ωd) sin ωd τ],
 * ωd = √(ω0² − α²) when underdamped; cosh/sinh with √(α² − ω0²) when overdamped; the
 * critically damped limit by continuity.
 */

/**
 * Voltage across C and loop current of a freely ringing series RLC loop after a time τ.
 * @param inductance L, H; @param capacitance C, F; @param resistance R, Ω
 * @param voltage v at τ = 0, V; @param current i at τ = 0, A (i = C dv/dt)
 * @param elapsed τ ≥ 0, s
 * @returns [v(τ), i(τ)] in V and A
 */
export function freeResonatorState(
  inductance: number,
  capacitance: number,
  resistance: number,
  voltage: number,
  current: number,
  elapsed: number,
): [number, number] {
  const alpha = resistance / (2 * inductance);
  const naturalSquared = 1 / (inductance * capacitance);
  const slope = current / capacitance; // dv/dt at τ = 0
  const decay = Math.exp(-alpha * elapsed);
  const discriminant = naturalSquared - alpha * alpha;
  let cosine: number; // "cos ωτ" or "cosh ωτ"
  let sineOverOmega: number; // sin(ωτ)/ω or sinh(ωτ)/ω
  let omegaSine: number; // d/dτ of cosine: −ω sin ωτ or +ω sinh ωτ
  if (discriminant > 1e-12 * naturalSquared) {
    const omega = Math.sqrt(discriminant);
    cosine = Math.cos(omega * elapsed);
    sineOverOmega = Math.sin(omega * elapsed) / omega;
    omegaSine = -omega * Math.sin(omega * elapsed);
  } else if (discriminant < -1e-12 * naturalSquared) {
    const omega = Math.sqrt(-discriminant);
    cosine = Math.cosh(omega * elapsed);
    sineOverOmega = Math.sinh(omega * elapsed) / omega;
    omegaSine = omega * Math.sinh(omega * elapsed);
  } else {
    cosine = 1;
    sineOverOmega = elapsed;
    omegaSine = 0;
  }
  // v = e^{−ατ}[v0 cos + (slope + α v0) sin/ω]
  const b = slope + alpha * voltage;
  const v = decay * (voltage * cosine + b * sineOverOmega);
  // dv/dτ = e^{−ατ}[v0 (d cos) + b cos] − α v   (d/dτ (sin/ω) = cos)
  const derivative = decay * (voltage * omegaSine + b * cosine) - alpha * v;
  return [v, capacitance * derivative];
}

/**
 * The lumped circuit of an air-core resonant transformer: two series RLC loops coupled by a
 * mutual inductance.
 *
 *   primary:   L1 di1/dt + M di2/dt + R1 i1 + v1 = e(t),   C1 dv1/dt = i1
 *   secondary: L2 di2/dt + M di1/dt + R2 i2 + v2 = 0,      C2 dv2/dt = i2
 *
 * v1 is the tank-capacitor voltage, v2 the voltage across C2 (the top of the secondary), e(t) a
 * source in the primary loop (a bridge; 0 for a spark gap). Kirchhoff's voltage law with the
 * mutual-inductance coupling of two loops (any circuit-theory text, e.g. Terman, Radio Engineers'
 * Handbook, 1943, coupled circuits).
 */

/** The lumped values, SI (H, F, Ω). */
export interface CoupledCircuit {
  /** L1, H */
  primaryInductance: number;
  /** C1, F */
  primaryCapacitance: number;
  /** R1, Ω: everything in series in the primary loop (conductor and, for a spark gap, the gap). */
  primaryResistance: number;
  /** L2, H */
  secondaryInductance: number;
  /** C2, F */
  secondaryCapacitance: number;
  /** R2, Ω */
  secondaryResistance: number;
  /** M, H (k √(L1 L2)); sign is irrelevant to voltage magnitudes. */
  mutualInductance: number;
}

/**
 * Stored energy of the whole circuit, J: ½C1v1² + ½C2v2² + ½L1i1² + ½L2i2² + M i1 i2.
 * @param state [v1, v2, i1, i2] in V and A
 */
export function circuitEnergy(circuit: CoupledCircuit, state: ArrayLike<number>): number {
  const [v1, v2, i1, i2] = [state[0], state[1], state[2], state[3]];
  return (
    0.5 * circuit.primaryCapacitance * v1 * v1 +
    0.5 * circuit.secondaryCapacitance * v2 * v2 +
    0.5 * circuit.primaryInductance * i1 * i1 +
    0.5 * circuit.secondaryInductance * i2 * i2 +
    circuit.mutualInductance * i1 * i2
  );
}

/**
 * Energy stored in the primary alone, J: ½C1v1² + ½L1i1² (the mutual term left out). Its first
 * minimum marks the end of the first energy transfer.
 */
export function primaryEnergy(circuit: CoupledCircuit, v1: number, i1: number): number {
  return 0.5 * circuit.primaryCapacitance * v1 * v1 + 0.5 * circuit.primaryInductance * i1 * i1;
}

/**
 * Lossless normal-mode angular frequencies ω₋ ≤ ω₊ of the coupled circuit, rad/s: the roots of
 * (L1L2 − M²)ω⁴ − (L1/C2 + L2/C1)ω² + 1/(C1C2) = 0 (determinant of the loop equations with
 * R = 0). For equal tuning they reduce to ω0/√(1 ± k) (refs §8.1, Terman 1943).
 */
export function losslessModeFrequencies(circuit: CoupledCircuit): [number, number] {
  const { primaryInductance: l1, primaryCapacitance: c1, secondaryInductance: l2, secondaryCapacitance: c2 } = circuit;
  const m = circuit.mutualInductance;
  const a = l1 * l2 - m * m;
  const b = l1 / c2 + l2 / c1;
  const c = 1 / (c1 * c2);
  const root = Math.sqrt(Math.max(0, b * b - 4 * a * c));
  // numerically stable quadratic roots for ω²
  const large = (b + root) / (2 * a);
  const small = c / (a * large);
  return [Math.sqrt(small), Math.sqrt(large)];
}

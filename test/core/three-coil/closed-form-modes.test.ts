/**
 * The closed-form lossless modes behind `losslessTransferFraction` (core/three-coil/tuning.ts: the
 * trigonometric eigenvalues of a symmetric 3×3 matrix [smith1961]) against an exact solution and the
 * general dense solver:
 * - at the complete-transfer tuning (k² = 5/11, L1C1/(L2C2) = 33/32, L1C1/(L3C3) = 11/6,
 *   C3/C2 = 15/32; refs §8.5 [bieniosek1990]) all of the tank's energy is on C3 at π/ω_low: 1;
 * - on seeded circuits (lengths of the tuning knobs far off too) the fraction equals the one formed
 *   from the modes of resonator/dense-eigen.ts within 1e-9.
 */
import { describe, expect, test } from 'vitest';
import { type ThreeCoilCircuit, threeCoilNetwork } from '../../../core/dynamics/three-coil.ts';
import { generalizedSymmetricEigen } from '../../../core/resonator/dense-eigen.ts';
import { COMPLETE_TRANSFER, losslessTransferFraction } from '../../../core/three-coil/tuning.ts';

/** The fraction from the dense solver's modes (the formula of losslessTransferFraction). */
function denseFraction(circuit: ThreeCoilCircuit): number | null {
  const network = threeCoilNetwork(circuit);
  const eigen = generalizedSymmetricEigen(network.elastance, network.inductance, 3);
  if (!eigen || !(eigen.values[0] > 0)) return null;
  const time = Math.PI / Math.sqrt(eigen.values[0]);
  const l = network.inductance;
  let q3 = 0;
  for (let j = 0; j < 3; j++) {
    const [x0, x1, x2] = [eigen.vectors[j], eigen.vectors[3 + j], eigen.vectors[6 + j]];
    q3 += x2 * (x0 * l[0] + x1 * l[3]) * circuit.primaryCapacitance * Math.cos(Math.sqrt(eigen.values[j]) * time);
  }
  return (q3 * q3) / (circuit.resonatorCapacitance * circuit.primaryCapacitance);
}

function circuit(l1: number, c1: number, l2: number, k: number, c2: number, l3: number, c3: number): ThreeCoilCircuit {
  return {
    primaryInductance: l1,
    primaryCapacitance: c1,
    primaryResistance: 0,
    driverInductance: l2,
    driverResistance: 0,
    mutualInductance: k * Math.sqrt(l1 * l2),
    junctionCapacitance: c2,
    resonatorInductance: l3,
    resonatorResistance: 0,
    resonatorCapacitance: c3,
  };
}

describe('the closed-form three-coil modes', () => {
  test('put all of the energy on C3 at the complete-transfer tuning (exact, refs §8.5)', () => {
    const l1 = 20e-6;
    const c1 = 30e-9;
    const c2 = 40e-12;
    const c3 = COMPLETE_TRANSFER.capacitanceRatio * c2;
    const l2 = (l1 * c1) / (COMPLETE_TRANSFER.driverFrequencyRatioSquared * c2);
    const l3 = (l1 * c1) / (COMPLETE_TRANSFER.resonatorFrequencyRatioSquared * c3);
    const fraction = losslessTransferFraction(
      circuit(l1, c1, l2, Math.sqrt(COMPLETE_TRANSFER.couplingSquared), c2, l3, c3),
    );
    expect(Math.abs((fraction as number) - 1)).toBeLessThan(1e-9);
  });
  test('agree with the dense generalized eigen-solver on 200 seeded circuits within 1e-9', () => {
    let seed = 12345;
    // Park–Miller minimal standard generator [parkmiller1988].
    const next = () => {
      seed = (seed * 16807) % 2147483647;
      return seed / 2147483647;
    };
    for (let n = 0; n < 200; n++) {
      const spread = (centre: number, decades: number) => centre * 10 ** (decades * (next() - 0.5));
      const c = circuit(
        spread(20e-6, 1),
        spread(30e-9, 1),
        spread(50e-3, 1),
        0.05 + 0.85 * next(),
        spread(30e-12, 1),
        spread(100e-3, 1),
        spread(20e-12, 1),
      );
      const closed = losslessTransferFraction(c);
      const dense = denseFraction(c);
      expect(closed).not.toBeNull();
      expect(Math.abs((closed as number) - (dense as number))).toBeLessThan(1e-9);
    }
  });
  test('a coupling of 1 (L singular) gives no modes rather than a number', () => {
    expect(losslessTransferFraction(circuit(20e-6, 30e-9, 50e-3, 1, 30e-12, 100e-3, 20e-12))).toBeNull();
  });
});

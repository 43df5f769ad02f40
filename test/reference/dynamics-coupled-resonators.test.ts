/**
 * The coupled two-resonator circuit against coupled-circuit theory:
 * - normal modes f0/√(1 ± k) of two equally tuned lossless circuits (refs §8.1, Terman 1943 [P]);
 * - the full-transfer couplings k = (2n+1)/(2n²+2n+1) and their transfer times t₁·f0 (refs
 *   §8.2 table [X]: formula, each row verified there with scipy DOP853) with V2 = V1√(C1/C2)
 *   (energy conservation, §8.3);
 * - an independent fixed-step RK4 integration written in this file.
 */
import { describe, expect, test } from 'vitest';
import type { CoupledCircuit } from '../../core/dynamics/circuit.ts';
import { losslessModeFrequencies } from '../../core/dynamics/circuit.ts';
import { coupledModes, coupledStateAt } from '../../core/dynamics/coupled-modes.ts';
import { sparkGapShot } from '../../core/dynamics/spark-gap.ts';
import { fullTransferCoupling, nearestFullTransferCoupling } from '../../core/dynamics/full-transfer.ts';
import { must } from '../../core/must.ts';

// The circuit of the §8.2 check table: L1 = 10 µH, C1 = 10 nF, C2 = 20 pF, equally tuned.
const L1 = 10e-6;
const C1 = 10e-9;
const C2 = 20e-12;
const L2 = (L1 * C1) / C2;
const F0 = 1 / (2 * Math.PI * Math.sqrt(L1 * C1));

function tuned(k: number, r1 = 0, r2 = 0): CoupledCircuit {
  return {
    primaryInductance: L1,
    primaryCapacitance: C1,
    primaryResistance: r1,
    secondaryInductance: L2,
    secondaryCapacitance: C2,
    secondaryResistance: r2,
    mutualInductance: k * Math.sqrt(L1 * L2),
  };
}

describe('normal modes of the lossless tuned pair (refs §8.1)', () => {
  test.each([0.05, 0.15, 0.3, 0.6, 0.9])('k = %f gives f0/√(1+k) and f0/√(1−k)', (k) => {
    const [low, high] = losslessModeFrequencies(tuned(k)).map((omega) => omega / (2 * Math.PI));
    expect(low / (F0 / Math.sqrt(1 + k))).toBeCloseTo(1, 12);
    expect(high / (F0 / Math.sqrt(1 - k))).toBeCloseTo(1, 12);
    const shot = must(sparkGapShot(tuned(k), 1000, true));
    expect(shot.modeFrequencyLow / (F0 / Math.sqrt(1 + k))).toBeCloseTo(1, 10);
    expect(shot.modeFrequencyHigh / (F0 / Math.sqrt(1 - k))).toBeCloseTo(1, 10);
  });
});

describe('full transfer at the first envelope null (refs §8.2 [X], §8.3)', () => {
  // [n, k, t₁·f0 (ODE)] from the §8.2 table
  const table: Array<[number, number, number]> = [
    [1, 0.6, 0.63246],
    [2, 0.384615, 1.1767],
    [3, 0.28, 1.69707],
    [4, 0.219512, 2.20864],
    [5, 0.180328, 2.71608],
    [6, 0.152941, 3.22124],
    [8, 0.117241, 4.22796],
    [10, 0.095023, 5.23217],
  ];
  test.each(table)('n = %i: k = %f, t₁·f0 = %f and V2 = V1·√(C1/C2)', (n, k, transferTimes) => {
    const coupling = fullTransferCoupling(n);
    expect(coupling).toBeCloseTo(k, 6);
    const shot = must(sparkGapShot(tuned(coupling), 1000, true));
    expect(Math.abs(must(shot.transferTime) * F0 - transferTimes)).toBeLessThan(5e-5); // the table's ODE and formula columns differ by up to 3e-5
    expect(must(shot.transferTime) * F0).toBeCloseTo(
      1 / (2 * (Math.sqrt(1 / (1 - coupling)) - Math.sqrt(1 / (1 + coupling)))),
      9,
    );
    expect(shot.peakVoltage / (1000 * Math.sqrt(C1 / C2))).toBeCloseTo(1, 9);
    expect(must(shot.primaryEnergyAtTransfer) / shot.energyPerShot).toBeLessThan(1e-12);
    expect(shot.energyPerShot).toBe(0.5 * C1 * 1000 * 1000);
  });

  test('between full-transfer couplings the transfer is partial and the peak lower (k = 0.2)', () => {
    const shot = must(sparkGapShot(tuned(0.2), 1000, true));
    expect(shot.peakVoltage).toBeLessThan(1000 * Math.sqrt(C1 / C2));
    expect(shot.peakVoltage).toBeGreaterThan(0.9 * 1000 * Math.sqrt(C1 / C2));
    // the first envelope null is half a beat, 1/(2(f₊ − f₋)), to within the ripple of half a cycle
    const halfBeat = 1 / (2 * (shot.modeFrequencyHigh - shot.modeFrequencyLow));
    expect(Math.abs(must(shot.transferTime) - halfBeat) * F0).toBeLessThan(0.5);
  });

  test('nearestFullTransferCoupling picks the closest (2n+1)/(2n²+2n+1)', () => {
    expect(nearestFullTransferCoupling(0.15)).toEqual({ n: 6, coupling: fullTransferCoupling(6) });
    expect(nearestFullTransferCoupling(0.2)).toEqual({ n: 4, coupling: fullTransferCoupling(4) });
    expect(nearestFullTransferCoupling(0.95).n).toBe(1);
    for (const k of [0.0015, 0.033, 0.071, 0.27, 0.45]) {
      let bestN = 1;
      for (let n = 1; n <= 5000; n++)
        if (Math.abs(fullTransferCoupling(n) - k) < Math.abs(fullTransferCoupling(bestN) - k)) bestN = n;
      expect(nearestFullTransferCoupling(k).n).toBe(bestN);
    }
  });
});

describe('coupledStateAt against an independent RK4 integration of the loop equations', () => {
  test('lossy, detuned circuit agrees to 1e-7 over 20 cycles', () => {
    const circuit: CoupledCircuit = { ...tuned(0.17, 0.8, 120), secondaryCapacitance: 23e-12 };
    const modes = must(coupledModes(circuit, 15e3));
    const cycles = 20;
    const stepsPerCycle = 2000;
    const h = 1 / (F0 * stepsPerCycle);
    let y = [15e3, 0, 0, 0];
    const out = new Float64Array(4);
    const det = L1 * L2 - circuit.mutualInductance ** 2;
    const f = (s: number[]): number[] => {
      const a1 = -circuit.primaryResistance * s[2] - s[0];
      const a2 = -circuit.secondaryResistance * s[3] - s[1];
      return [
        s[2] / circuit.primaryCapacitance,
        s[3] / circuit.secondaryCapacitance,
        (L2 * a1 - circuit.mutualInductance * a2) / det,
        (L1 * a2 - circuit.mutualInductance * a1) / det,
      ];
    };
    let worst = 0;
    for (let n = 1; n <= cycles * stepsPerCycle; n++) {
      const k1 = f(y);
      const k2 = f(y.map((v, c) => v + 0.5 * h * k1[c]));
      const k3 = f(y.map((v, c) => v + 0.5 * h * k2[c]));
      const k4 = f(y.map((v, c) => v + h * k3[c]));
      y = y.map((v, c) => v + (h / 6) * (k1[c] + 2 * k2[c] + 2 * k3[c] + k4[c]));
      if (n % 500 === 0) {
        coupledStateAt(modes, n * h, out);
        worst = Math.max(worst, Math.abs(out[0] - y[0]) / 15e3, Math.abs(out[1] - y[1]) / (15e3 * Math.sqrt(C1 / C2)));
      }
    }
    expect(worst).toBeLessThan(1e-7);
  });
});

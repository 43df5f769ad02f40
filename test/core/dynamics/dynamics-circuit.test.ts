/**
 * The lossy coupled circuit, the free resonator and the spark-gap shot against exact results:
 * energy balance (stored + dissipated = initial, with ∫R i² dt integrated here by Gauss–Legendre
 * on the analytic solution), the exp(−Rt/2L) decay of a series RLC loop (exact solution of the
 * linear ODE), and the quench rule.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import type { CoupledCircuit } from '../../../core/dynamics/circuit.ts';
import { circuitEnergy, primaryEnergy } from '../../../core/dynamics/circuit.ts';
import { coupledModes, coupledStateAt } from '../../../core/dynamics/coupled-modes.ts';
import { freeResonatorState } from '../../../core/dynamics/free-resonator.ts';
import { sparkGapShot } from '../../../core/dynamics/spark-gap.ts';
import { must } from '../../../core/must.ts';

// An invented demo-sized circuit: 12 µH with 40 nF against 40 mH with 14 pF.
const lossy: CoupledCircuit = {
  primaryInductance: 12e-6,
  primaryCapacitance: 40e-9,
  primaryResistance: 1.3,
  secondaryInductance: 40e-3,
  secondaryCapacitance: 14e-12,
  secondaryResistance: 180,
  mutualInductance: 0.14 * Math.sqrt(12e-6 * 40e-3),
};

/** ∫ (R1 i1² + R2 i2²) dt over [0, T] by 8-point Gauss–Legendre on `panels` panels. */
function dissipated(circuit: CoupledCircuit, voltage: number, end: number, panels: number): number {
  const modes = must(coupledModes(circuit, voltage));
  const nodes = [
    -0.9602898564975363, -0.7966664774136267, -0.525532409916329, -0.1834346424956498, 0.1834346424956498,
    0.525532409916329, 0.7966664774136267, 0.9602898564975363,
  ];
  const weights = [
    0.1012285362903763, 0.2223810344533745, 0.3137066458778873, 0.362683783378362, 0.362683783378362,
    0.3137066458778873, 0.2223810344533745, 0.1012285362903763,
  ];
  const out = new Float64Array(4);
  let total = 0;
  const width = end / panels;
  for (let p = 0; p < panels; p++) {
    for (let q = 0; q < 8; q++) {
      const t = (p + 0.5) * width + 0.5 * width * nodes[q];
      coupledStateAt(modes, t, out);
      total +=
        0.5 *
        width *
        weights[q] *
        (circuit.primaryResistance * out[2] ** 2 + circuit.secondaryResistance * out[3] ** 2);
    }
  }
  return total;
}

describe('coupledModes with losses', () => {
  test('stored + dissipated energy equals the initial ½C1V² to 1e-6 (energy balance)', () => {
    const voltage = 12e3;
    const initial = 0.5 * lossy.primaryCapacitance * voltage ** 2;
    const modes = must(coupledModes(lossy, voltage));
    const out = new Float64Array(4);
    for (const end of [2e-6, 9e-6, 31e-6]) {
      const stored = circuitEnergy(lossy, coupledStateAt(modes, end, out));
      const lost = dissipated(lossy, voltage, end, Math.ceil(end / 2e-8));
      expect(Math.abs(stored + lost - initial) / initial).toBeLessThan(1e-6);
      expect(lost).toBeGreaterThan(0);
    }
  });

  test('starts from the given state: v1 = V, v2 = i1 = i2 = 0', () => {
    const out = coupledStateAt(must(coupledModes(lossy, 5000)), 0, new Float64Array(4));
    expect(out[0]).toBeCloseTo(5000, 6);
    for (const c of [1, 2, 3]) expect(Math.abs(out[c])).toBeLessThan(1e-8);
  });

  test('a weakly coupled, far-detuned primary decays as exp(−R1 t / 2L1) (exact RLC decay)', () => {
    const circuit: CoupledCircuit = {
      ...lossy,
      secondaryCapacitance: 1e-12 * 0.05,
      mutualInductance: 1e-7 * Math.sqrt(12e-6 * 40e-3),
    };
    const modes = must(coupledModes(circuit, 1000));
    const out = new Float64Array(4);
    const period = 2 * Math.PI * Math.sqrt(circuit.primaryInductance * circuit.primaryCapacitance);
    const alpha = circuit.primaryResistance / (2 * circuit.primaryInductance);
    const damped = Math.sqrt(1 / (circuit.primaryInductance * circuit.primaryCapacitance) - alpha * alpha);
    for (const cycles of [5.13, 20.4, 60.77]) {
      const t = cycles * period;
      coupledStateAt(modes, t, out);
      // exact: v1 = V e^{−αt} (cos ωd t + (α/ωd) sin ωd t), α = R1/(2L1)
      const exact = 1000 * Math.exp(-alpha * t) * (Math.cos(damped * t) + (alpha / damped) * Math.sin(damped * t));
      expect(Math.abs(out[0] - exact) / (1000 * Math.exp(-alpha * t))).toBeLessThan(1e-6);
    }
  });

  test('refuses k = 0 and k ≥ 1', () => {
    expect(coupledModes({ ...lossy, mutualInductance: 0 }, 1)).toBeNull();
    expect(coupledModes({ ...lossy, mutualInductance: 1.0001 * Math.sqrt(12e-6 * 40e-3) }, 1)).toBeNull();
  });
});

describe('freeResonatorState', () => {
  test('successive voltage maxima fall by exp(−R T_d / 2L) (exact RLC solution)', () => {
    const [L, C, R] = [40e-3, 14e-12, 300];
    const alpha = R / (2 * L);
    const damped = Math.sqrt(1 / (L * C) - alpha * alpha);
    for (const cycles of [1, 10, 50]) {
      // maxima of v for v0 = 1, i0 = 0 lie at τ = n·2π/ωd (v' = 0 there)
      const t = (cycles * 2 * Math.PI) / damped;
      const [v, i] = freeResonatorState(L, C, R, 1, 0, t);
      expect(v).toBeCloseTo(Math.exp(-alpha * t), 12);
      expect(Math.abs(i) * Math.sqrt(L / C)).toBeLessThan(1e-10);
    }
  });

  test('energy decays as the dissipated power says: d/dt(½Cv² + ½Li²) = −R i² (numerically at random points)', () => {
    const [L, C, R] = [2e-3, 1e-9, 40];
    const h = 1e-10;
    for (const t of [1e-7, 3.3e-6, 2.1e-5]) {
      const energy = (s: [number, number]): number => 0.5 * C * s[0] ** 2 + 0.5 * L * s[1] ** 2;
      const before = energy(freeResonatorState(L, C, R, 100, 0.2, t - h));
      const after = energy(freeResonatorState(L, C, R, 100, 0.2, t + h));
      const current = freeResonatorState(L, C, R, 100, 0.2, t)[1];
      expect((after - before) / (2 * h) / (-R * current * current)).toBeCloseTo(1, 4);
    }
  });

  test('handles the overdamped case (no oscillation, monotone decay from rest)', () => {
    const [L, C, R] = [1e-3, 1e-9, 5000]; // R > 2√(L/C) ≈ 2000 Ω
    let previous = 1;
    for (const t of [1e-7, 1e-6, 1e-5]) {
      const [v] = freeResonatorState(L, C, R, 1, 0, t);
      expect(v).toBeLessThan(previous);
      expect(v).toBeGreaterThan(0);
      previous = v;
    }
  });
});

describe('sparkGapShot', () => {
  test('quenches at the first primary current zero after the transfer time', () => {
    const shot = must(sparkGapShot(lossy, 12e3, true));
    const primaryPeriod = 2 * Math.PI * Math.sqrt(lossy.primaryInductance * lossy.primaryCapacitance);
    expect(must(shot.quenchTime)).toBeGreaterThanOrEqual(must(shot.transferTime) - primaryPeriod / 8);
    expect(must(shot.quenchTime) - must(shot.transferTime)).toBeLessThan(0.6 * primaryPeriod);
    const out = coupledStateAt(must(coupledModes(lossy, 12e3)), must(shot.quenchTime), new Float64Array(4));
    expect(Math.abs(out[2]) / (12e3 * Math.sqrt(lossy.primaryCapacitance / lossy.primaryInductance))).toBeLessThan(
      1e-9,
    );
  });

  test('with or without quench the peak within the contract window differs by little', () => {
    const quenched = must(sparkGapShot(lossy, 12e3, true));
    const sloshing = must(sparkGapShot(lossy, 12e3, false));
    expect(sloshing.quenchTime).toBeNull();
    expect(Math.abs(quenched.peakVoltage / sloshing.peakVoltage - 1)).toBeLessThan(0.02);
    expect(quenched.transferTime).toBe(sloshing.transferTime);
  });

  test('peak voltage is below the lossless bound V1√(C1/C2) and scales linearly with V1 (linear circuit)', () => {
    const bound = 12e3 * Math.sqrt(lossy.primaryCapacitance / lossy.secondaryCapacitance);
    const shot = must(sparkGapShot(lossy, 12e3, true));
    expect(shot.peakVoltage).toBeLessThan(bound);
    expect(shot.peakVoltage).toBeGreaterThan(0.5 * bound);
    expect(must(sparkGapShot(lossy, 24e3, true)).peakVoltage / shot.peakVoltage).toBeCloseTo(2, 9);
  });

  test('near a full-transfer coupling the quench does not jump half a cycle with the charge voltage (k = 0.394)', () => {
    const circuit = {
      ...lossy,
      mutualInductance: 0.39414026736121693 * Math.sqrt(lossy.primaryInductance * lossy.secondaryInductance),
    };
    const low = must(sparkGapShot(circuit, 1000, true));
    const high = must(sparkGapShot(circuit, 1000.1, true));
    expect(must(high.quenchTime) / must(low.quenchTime)).toBeCloseTo(1, 9);
    expect(high.peakVoltage / low.peakVoltage).toBeCloseTo(1.0001, 9);
  });

  test('property: the transfer time is the deepest primary-energy dip so far, and the dip is followed by a rise', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0.03, max: 0.6, noNaN: true }),
        fc.double({ min: 0, max: 5, noNaN: true }),
        fc.double({ min: 0.8, max: 1.25, noNaN: true }),
        (k, r1, detune) => {
          const circuit = {
            ...lossy,
            primaryResistance: r1,
            secondaryCapacitance: lossy.secondaryCapacitance * detune,
            mutualInductance: k * Math.sqrt(lossy.primaryInductance * lossy.secondaryInductance),
          };
          const shot = must(sparkGapShot(circuit, 1000, true));
          if (shot.transferTime === null) return true;
          const modes = must(coupledModes(circuit, 1000));
          const out = new Float64Array(4);
          const w1 = (t: number): number => {
            coupledStateAt(modes, t, out);
            return primaryEnergy(circuit, out[0], out[2]);
          };
          const atTransfer = w1(shot.transferTime);
          for (let n = 0; n < 200; n++)
            if (w1((shot.transferTime * n) / 200) < atTransfer - 1e-12 * shot.energyPerShot) return false;
          const period = 1 / shot.modeFrequencyHigh;
          let later = 0;
          for (let n = 1; n <= 100; n++) later = Math.max(later, w1(shot.transferTime + (3 * period * n) / 100));
          return later > atTransfer;
        },
      ),
      { numRuns: 80, seed: 11 },
    );
  });

  test('a heavily damped primary far from the secondary only decays: no transfer time', () => {
    const circuit = {
      ...lossy,
      primaryResistance: 5,
      secondaryCapacitance: lossy.secondaryCapacitance * 1.07,
      mutualInductance: 0.03 * Math.sqrt(lossy.primaryInductance * lossy.secondaryInductance),
    };
    const shot = must(sparkGapShot(circuit, 1000, true));
    expect(shot.transferTime).toBeNull();
    expect(shot.quenchTime).toBeNull();
    expect(shot.peakVoltage).toBeGreaterThan(0);
  });

  test('property: more tank energy (charge voltage) never lowers the peak voltage', () => {
    fc.assert(
      fc.property(
        fc.double({ min: 1e3, max: 50e3, noNaN: true }),
        fc.double({ min: 1.0001, max: 3, noNaN: true }),
        fc.double({ min: 0.05, max: 0.4, noNaN: true }),
        (voltage, factor, k) => {
          const circuit = {
            ...lossy,
            mutualInductance: k * Math.sqrt(lossy.primaryInductance * lossy.secondaryInductance),
          };
          const low = must(sparkGapShot(circuit, voltage, true));
          const high = must(sparkGapShot(circuit, voltage * factor, true));
          return high.peakVoltage >= low.peakVoltage;
        },
      ),
      { numRuns: 60, seed: 4242 },
    );
  });
});

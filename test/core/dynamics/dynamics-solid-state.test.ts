/**
 * The solid-state burst against exact results: a lossless series LC driven by a square wave in
 * phase with its current gains exactly 2E of capacitor amplitude per half cycle (superposition:
 * each half cycle the capacitor swings symmetrically about the source voltage), i.e. the
 * amplitude grows linearly with cycles; energy balance source = stored + dissipated; the current
 * limit ends the burst.
 */
import { describe, expect, test } from 'vitest';
import type { CoupledCircuit } from '../../../core/dynamics/circuit.ts';
import { circuitEnergy } from '../../../core/dynamics/circuit.ts';
import { solidStateBurst } from '../../../core/dynamics/solid-state.ts';
import { must } from '../../../core/must.ts';

// Invented demo circuit: 8 µH, 150 nF tank; 30 mH secondary tuned to it (40 pF).
const base: CoupledCircuit = {
  primaryInductance: 8e-6,
  primaryCapacitance: 150e-9,
  primaryResistance: 0.05,
  secondaryInductance: 30e-3,
  secondaryCapacitance: (8e-6 * 150e-9) / 30e-3, // tuned to the tank: 40 pF
  secondaryResistance: 60,
  mutualInductance: 0.2 * Math.sqrt(8e-6 * 30e-3),
};

describe('solidStateBurst', () => {
  test('a lossless driven resonator gains 2E of tank amplitude per half cycle (exact, linear in cycles)', () => {
    const single: CoupledCircuit = { ...base, primaryResistance: 0, secondaryResistance: 0, mutualInductance: 0 };
    const drive = 170;
    for (const cycles of [1, 3, 8]) {
      const burst = solidStateBurst(single, { driveVoltage: drive, cycles });
      expect(burst.endReason).toBe('cycles');
      expect(burst.cycles).toBe(cycles);
      // after 2n half cycles the tank voltage is 2·(2n)·E; the burst ends at a current zero
      expect(burst.peakTankVoltage / (4 * cycles * drive)).toBeCloseTo(1, 6);
      // current peak in the last half cycle: (2·2n − 1)·E·√(C/L)
      const impedance = Math.sqrt(single.primaryInductance / single.primaryCapacitance);
      expect(burst.peakPrimaryCurrent / (((4 * cycles - 1) * drive) / impedance)).toBeCloseTo(1, 6);
      // lossless: everything drawn from the source is stored
      expect(burst.energyFromSource / (0.5 * single.primaryCapacitance * (4 * cycles * drive) ** 2)).toBeCloseTo(1, 6);
      // the period of the drive is that of the resonator
      const period = 2 * Math.PI * Math.sqrt(single.primaryInductance * single.primaryCapacitance);
      expect(burst.endTime / (cycles * period)).toBeCloseTo(1, 6);
    }
  });

  test('energy drawn from the bridge = stored + dissipated (coupled, lossy) to 1e-6', () => {
    const burst = solidStateBurst(base, { driveVoltage: 340, onTime: 60e-6 });
    expect(burst.endReason).toBe('on_time');
    expect(burst.endTime).toBeCloseTo(60e-6, 15);
    const stored = circuitEnergy(base, burst.finalState);
    expect(Math.abs(burst.energyFromSource - stored - burst.energyDissipated) / burst.energyFromSource).toBeLessThan(
      1e-6,
    );
    expect(burst.peakVoltage).toBeGreaterThan(0);
  });

  test('the current limit ends the burst when |i1| reaches it', () => {
    const free = solidStateBurst(base, { driveVoltage: 340, onTime: 200e-6 });
    const limit = 0.5 * free.peakPrimaryCurrent;
    const limited = solidStateBurst(base, { driveVoltage: 340, onTime: 200e-6, currentLimit: limit });
    expect(limited.endReason).toBe('current_limit');
    expect(limited.endTime).toBeLessThan(200e-6);
    expect(limited.peakPrimaryCurrent / limit).toBeCloseTo(1, 9);
    expect(Math.abs(limited.finalState[2]) / limit).toBeCloseTo(1, 9);
    expect(limited.peakVoltage).toBeLessThan(free.peakVoltage);
  });

  test('reports when the secondary first reaches a breakout voltage, without cutting the burst', () => {
    const free = solidStateBurst(base, { driveVoltage: 340, onTime: 60e-6 });
    const breakout = 0.6 * free.peakVoltage;
    const burst = solidStateBurst(base, { driveVoltage: 340, onTime: 60e-6, breakoutVoltage: breakout });
    expect(burst.peakVoltage).toBe(free.peakVoltage);
    expect(must(burst.breakoutTime)).toBeGreaterThan(0);
    expect(must(burst.breakoutTime)).toBeLessThan(60e-6);
    // just before the reported time the secondary was below breakout (a shorter burst stays under it)
    const shorter = solidStateBurst(base, { driveVoltage: 340, onTime: must(burst.breakoutTime) * 0.98 });
    expect(shorter.peakVoltage).toBeLessThan(breakout);
    expect(free.breakoutTime).toBeNull();
  });

  test('a longer on-time never lowers the peak secondary voltage; a half bridge (E/2) gives half of it (linear circuit)', () => {
    let previous = 0;
    for (const onTime of [10e-6, 20e-6, 40e-6, 80e-6]) {
      const burst = solidStateBurst(base, { driveVoltage: 300, onTime });
      expect(burst.peakVoltage).toBeGreaterThanOrEqual(previous);
      previous = burst.peakVoltage;
    }
    const full = solidStateBurst(base, { driveVoltage: 300, onTime: 40e-6 });
    const half = solidStateBurst(base, { driveVoltage: 150, onTime: 40e-6 });
    expect(half.peakVoltage / full.peakVoltage).toBeCloseTo(0.5, 9);
  });
});

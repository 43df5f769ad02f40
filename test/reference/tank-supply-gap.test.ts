/**
 * The supply, the tank bank and the safety gap against their sources: the resonant-capacitance
 * formula of AC-circuit theory on a hand-worked example [terman1943], the bank arithmetic against
 * exact hand cases, the closed-form ∫i1² dt against an independent numerical integration of the
 * modal waveform and against the exact lossless RLC result, and the sphere gap against the
 * IEC 60052 table points (typed from memory, refs §12.4) and its air-density rule.
 */
import { describe, expect, test } from 'vitest';
import {
  RECTIFIED_MEAN_FACTOR,
  resonantCapacitance,
  rotaryChargeVoltage,
  staticBreakRateEstimate,
  unloadedChargePeak,
} from '../../core/supply/supply.ts';
import { bankLayout, bleederResistance, primaryCurrentSquaredIntegral } from '../../core/tank/bank.ts';
import { coupledModes, coupledStateAt } from '../../core/dynamics/coupled-modes.ts';
import type { CoupledCircuit } from '../../core/dynamics/circuit.ts';
import {
  electrodeGapSpacing,
  SPHERE_GAP_TABLE,
  sphereGapAirDensity,
  sphereGapSpacing,
  sphereGapVoltage,
} from '../../core/breakdown/sphere-gap.ts';

describe('the supply seen from the tank', () => {
  test('a 15 kV 60 mA 60 Hz supply resonates with 10.61 nF (C = I/(2πfV), worked by hand [terman1943])', () => {
    // 0.060 / (2π · 60 · 15 000) = 1.061033e-8 F
    expect(resonantCapacitance({ voltage: 15e3, current: 0.06, frequency: 60 })).toBeCloseTo(1.0610329e-8, 14);
  });

  test('the same supply at 50 Hz resonates with 12.73 nF (hand: 0.06/(2π·50·15000))', () => {
    expect(resonantCapacitance({ voltage: 15e3, current: 0.06, frequency: 50 })).toBeCloseTo(1.2732395e-8, 14);
  });

  test('a non-positive rating gives NaN, never a number', () => {
    expect(resonantCapacitance({ voltage: 0, current: 0.06, frequency: 50 })).toBeNaN();
    expect(resonantCapacitance({ voltage: 15e3, current: Number.NaN, frequency: 50 })).toBeNaN();
  });

  test('half the resonant size charges to twice the supply peak, √2·V/|1 − ½| (series L–C divider [terman1943])', () => {
    const source = { voltage: 10e3, current: 0.05, frequency: 50 };
    const half = resonantCapacitance(source) / 2;
    expect(unloadedChargePeak(source, half)).toBeCloseTo(2 * Math.SQRT2 * 10e3, 6);
    expect(unloadedChargePeak(source, 3 * resonantCapacitance(source))).toBeCloseTo((Math.SQRT2 * 10e3) / 2, 6);
    expect(unloadedChargePeak(source, resonantCapacitance(source))).toBe(Number.POSITIVE_INFINITY);
  });

  test('a rotary gap at 120 Hz brings 30 nF to (2√2/π)·0.06/(120·30 nF) = 15.005 kV (hand arithmetic)', () => {
    const source = { voltage: 15e3, current: 0.06, frequency: 50 };
    expect(RECTIFIED_MEAN_FACTOR).toBeCloseTo(0.9003163161571061, 15);
    // 30 nF is 2.356× the resonant size: the unloaded bound √2·15 kV/1.356 = 15.64 kV is above it
    expect(rotaryChargeVoltage(source, 30e-9, 120)).toBeCloseTo((0.9003163161571061 * 0.06) / (120 * 30e-9), 6);
    // at 20 Hz the mean current would reach 90 kV: the unloaded bound caps it
    expect(rotaryChargeVoltage(source, 30e-9, 20)).toBeCloseTo(unloadedChargePeak(source, 30e-9), 6);
  });

  test('the static-gap rate estimate inverts the rotary charge', () => {
    const source = { voltage: 15e3, current: 0.06, frequency: 50 };
    const v = rotaryChargeVoltage(source, 30e-9, 120);
    expect(staticBreakRateEstimate(source, 30e-9, v)).toBeCloseTo(120, 9);
  });
});

describe('the tank bank from a capacitor part (exact hand cases)', () => {
  const part = { capacitance: 150e-9, voltageRating: 2e3, rmsCurrentRating: 10 };

  test('15 kV with margin 2 on 2 kV parts takes 15 in series; 30 nF takes 3 strings: 3·150/15 = 30 nF, 45 parts', () => {
    const layout = bankLayout(part, 30e-9, 15e3, 2);
    expect(layout).toEqual({ series: 15, parallel: 3, capacitance: expect.any(Number), partCount: 45 });
    expect(layout.capacitance).toBeCloseTo(30e-9, 20);
  });

  test('a working voltage exactly at the margin needs no extra part (10 kV, margin 2, 2 kV: 10 in series)', () => {
    expect(bankLayout(part, 30e-9, 10e3, 2).series).toBe(10);
    expect(bankLayout(part, 30e-9, 10.001e3, 2).series).toBe(11);
  });

  test('given counts are kept: 4 × 2 of 150 nF is 75 nF with 8 parts', () => {
    const layout = bankLayout(part, 30e-9, 15e3, 2, 4, 2);
    expect(layout.series).toBe(4);
    expect(layout.parallel).toBe(2);
    expect(layout.partCount).toBe(8);
    expect(layout.capacitance).toBeCloseTo(75e-9, 20);
  });

  test('a target far below one string still gets one string', () => {
    expect(bankLayout(part, 1e-12, 15e3, 2).parallel).toBe(1);
  });

  test('bleeders: 150 nF from 15 kV below 50 V in 60 s needs R ≤ 60/(150 nF·ln 300) = 70.13 MΩ', () => {
    const r = bleederResistance(150e-9, 15e3, 60);
    expect(r).toBeCloseTo(60 / (150e-9 * Math.log(300)), 3);
    expect(r).toBeCloseTo(7.0129e7, -3);
    // the bank then decays with τ = R·C_part: after 60 s exactly 50 V remain
    expect(15e3 * Math.exp(-60 / ((r ?? 0) * 150e-9))).toBeCloseTo(50, 9);
    expect(bleederResistance(150e-9, 40, 60)).toBeNull();
  });
});

describe('∫ i1² dt of a shot in closed form', () => {
  const circuit: CoupledCircuit = {
    primaryInductance: 60e-6,
    primaryCapacitance: 25e-9,
    primaryResistance: 1.2,
    secondaryInductance: 50e-3,
    secondaryCapacitance: 30e-12,
    secondaryResistance: 180,
    mutualInductance: 0.14 * Math.sqrt(60e-6 * 50e-3),
  };

  /** Composite Simpson over [0, T] with n (even) intervals of coupledStateAt's i1 (independent of the closed form). */
  function simpson(end: number, intervals: number): number {
    const modes = coupledModes(circuit, 15e3);
    if (modes === null) throw new Error('no modes');
    const out = new Float64Array(4);
    const h = end / intervals;
    let sum = 0;
    for (let n = 0; n <= intervals; n++) {
      const i = coupledStateAt(modes, n * h, out)[2];
      const weight = n === 0 || n === intervals ? 1 : n % 2 === 1 ? 4 : 2;
      sum += weight * i * i;
    }
    return (sum * h) / 3;
  }

  test('matches Simpson integration of the waveform to 1e-9 over the first 20 µs and 200 µs', () => {
    const modes = coupledModes(circuit, 15e3);
    if (modes === null) throw new Error('no modes');
    for (const end of [20e-6, 200e-6]) {
      const closed = primaryCurrentSquaredIntegral(modes, end);
      expect(Math.abs(closed / simpson(end, 200_000) - 1)).toBeLessThan(1e-9);
    }
  });

  test('to infinity equals the long-time Simpson integral (the losses spend the whole energy)', () => {
    const modes = coupledModes(circuit, 15e3);
    if (modes === null) throw new Error('no modes');
    const infinite = primaryCurrentSquaredIntegral(modes, Number.POSITIVE_INFINITY);
    // |decay| ≥ ~1e4/s: by 3 ms what is left is below 1e-12 of the integral
    expect(Math.abs(infinite / simpson(3e-3, 2_000_000) - 1)).toBeLessThan(1e-7);
  });

  test('of a lossless, barely coupled primary equals the exact RLC result V²(C/L)(T/2 − sin 2ωT/(4ω))', () => {
    const weak: CoupledCircuit = {
      ...circuit,
      primaryResistance: 0,
      secondaryResistance: 0,
      mutualInductance: 1e-7 * Math.sqrt(60e-6 * 50e-3),
    };
    const modes = coupledModes(weak, 10e3);
    if (modes === null) throw new Error('no modes');
    const omega = 1 / Math.sqrt(60e-6 * 25e-9);
    const end = 7.3e-6;
    const exact = 1e8 * (25e-9 / 60e-6) * (end / 2 - Math.sin(2 * omega * end) / (4 * omega));
    expect(primaryCurrentSquaredIntegral(modes, end) / exact).toBeCloseTo(1, 9);
  });
});

describe('the sphere safety gap (IEC 60052 Table 1 points typed from memory, refs §12.4)', () => {
  test('returns the typed table points themselves: 12.5 cm spheres at 1 cm → 31.7 kV, 25 cm at 5 cm → 137 kV', () => {
    expect(sphereGapVoltage(0.125, 0.01)).toBeCloseTo(31.7e3, 6);
    expect(sphereGapVoltage(0.25, 0.05)).toBeCloseTo(137e3, 6);
    expect(sphereGapVoltage(0.0625, 0.02)).toBeCloseTo(58.5e3, 6);
  });

  test('interpolates linearly in the spacing and in the diameter', () => {
    // 12.5 cm, 2.25 cm: halfway between 59.0 and 72.5 kV
    expect(sphereGapVoltage(0.125, 0.0225)).toBeCloseTo(65.75e3, 6);
    // 18.75 cm at 3 cm: halfway between 85.0 (12.5 cm) and 86.0 (25 cm)
    expect(sphereGapVoltage(0.1875, 0.03)).toBeCloseTo(85.5e3, 6);
  });

  test('is null outside the table: below its first spacing, beyond its last, outside its diameters', () => {
    expect(sphereGapVoltage(0.125, 0.004)).toBeNull();
    expect(sphereGapVoltage(0.125, 0.07)).toBeNull();
    expect(sphereGapVoltage(1.0, 0.05)).toBeNull();
    expect(sphereGapVoltage(Number.NaN, 0.05)).toBeNull();
  });

  test('every column rises with the spacing (what the inverse needs)', () => {
    for (const column of SPHERE_GAP_TABLE) {
      for (let i = 1; i < column.points.length; i++)
        expect(column.points[i][1]).toBeGreaterThan(column.points[i - 1][1]);
    }
  });

  test('the spacing inverts the table: 12.5 cm spheres fire at 45.5 kV at 1.5 cm in the reference air', () => {
    expect(sphereGapSpacing(0.125, 45.5e3, 1)).toBeCloseTo(0.015, 9);
    expect(sphereGapSpacing(0.125, 65.75e3, 1)).toBeCloseTo(0.0225, 9);
  });

  test('thinner air needs a wider gap: at δ = 0.9 the spacing for 0.9 × 45.5 kV is the 45.5 kV one (U = δ·U₀)', () => {
    expect(sphereGapSpacing(0.125, 0.9 * 45.5e3, 0.9)).toBeCloseTo(0.015, 9);
  });

  test('the relative density is 1 at sea level and 20 °C (the table reference of IEC 60052)', () => {
    expect(sphereGapAirDensity(0, 293.15)).toBeCloseTo(1, 12);
    expect(sphereGapAirDensity(0, 313.15)).toBeCloseTo(293.15 / 313.15, 12);
  });

  test('rounded electrodes follow the 3 kV/mm rule (common practice): 18 kV → 6 mm', () => {
    expect(electrodeGapSpacing(18e3, 1)).toBeCloseTo(6e-3, 12);
    expect(electrodeGapSpacing(-1, 1)).toBeNull();
  });
});

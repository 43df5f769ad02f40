/**
 * The supply, tank-bank and safety-gap stage through the whole evaluation of the invented example
 * examples/rotary-bank-coil.yaml: the bank's counts and capacitance by hand arithmetic, the tank the
 * primary tunes to, the part currents against an independent Simpson integration of the computed
 * tank waveform, the infeasible reasons, and designs without the new sections left unchanged.
 */
import { describe, expect, test } from 'vitest';
import { loadDesignFile } from '../../../cli/load-design.ts';
import type { Design } from '../../../core/design.ts';
import { evaluateDesign, evaluateDesignInDetail } from '../../../core/evaluate.ts';
import { coupledModes, coupledStateAt } from '../../../core/dynamics/coupled-modes.ts';
import { sparkGapShot } from '../../../core/dynamics/spark-gap.ts';
import { solidStateBurst } from '../../../core/dynamics/solid-state.ts';
import type { CoupledCircuit } from '../../../core/dynamics/circuit.ts';
import { RECTIFIED_MEAN_FACTOR } from '../../../core/supply/supply.ts';
import { sphereGapAirDensity } from '../../../core/breakdown/sphere-gap.ts';

/** 0.06 A / (2π · 50 Hz · 15 kV), the supply's resonant capacitance (hand arithmetic). */
const C_RES = 0.06 / (2 * Math.PI * 50 * 15e3);
const example = loadDesignFile('examples/rotary-bank-coil.yaml').design;
const evaluation = evaluateDesign(example);
const m = evaluation.metrics;
const num = (key: string): number => {
  const value = m[key];
  if (value === null || value === undefined) throw new Error(`${key} is null`);
  return value;
};

describe('the rotary-gap example with a bank of 150 nF / 2 kV parts on a 15 kV 60 mA 50 Hz supply', () => {
  test('is feasible', () => {
    expect(evaluation.problems).toEqual([]);
  });

  test('the supply resonates with 0.06/(2π·50·15000) = 12.73 nF and the bank is its ratio times that', () => {
    expect(num('supply_resonant_capacitance')).toBeCloseTo(1.2732395e-8, 14);
    expect(num('supply_capacitance_ratio')).toBeCloseTo(num('tank_bank_capacitance') / C_RES, 9);
  });

  test('bank counts by hand: C = n_p·150 nF/n_s, parts = n_s·n_p, each part within 2 kV / 2 at the charge', () => {
    const ns = num('tank_bank_series');
    const np = num('tank_bank_parallel');
    expect(num('tank_bank_capacitance')).toBeCloseTo((np * 150e-9) / ns, 20);
    expect(num('tank_bank_part_count')).toBe(ns * np);
    expect(np).toBe(Math.max(1, Math.round((30e-9 * ns) / 150e-9)));
    expect(2 * num('tank_bank_part_voltage')).toBeLessThanOrEqual(2e3);
    // one part fewer would not hold: the layout is the smallest that does
    const fewer = ns - 1;
    const fewerCapacitance = (Math.max(1, Math.round((30e-9 * fewer) / 150e-9)) * 150e-9) / fewer;
    const fewerCharge = Math.min(
      (RECTIFIED_MEAN_FACTOR * 0.06) / (120 * fewerCapacitance),
      (Math.SQRT2 * 15e3) / Math.abs(1 - fewerCapacitance / C_RES),
    );
    expect((2 * fewerCharge) / fewer).toBeGreaterThan(2e3);
  });

  test('the rotary charge is the mean-current charge capped by √2·V/|1 − C/C_res|, and it sets the shot energy', () => {
    const c = num('tank_bank_capacitance');
    const reached = (RECTIFIED_MEAN_FACTOR * 0.06) / (120 * c);
    const limit = (Math.SQRT2 * 15e3) / Math.abs(1 - c / C_RES);
    expect(num('supply_charge_limit')).toBeCloseTo(limit, 6);
    expect(num('supply_charge_voltage')).toBeCloseTo(Math.min(reached, limit), 6);
    expect(num('energy_per_shot')).toBeCloseTo(0.5 * c * num('supply_charge_voltage') ** 2, 9);
    expect(num('tank_bank_stored_energy')).toBeCloseTo(num('energy_per_shot'), 9);
    expect(num('input_power')).toBeCloseTo(num('energy_per_shot') * 120, 6);
    expect(num('supply_load_fraction')).toBeCloseTo(num('input_power') / (15e3 * 0.06), 9);
  });

  test('the primary tunes to the bank as built, not to the target 30 nF', () => {
    const f1 = 1 / (2 * Math.PI * Math.sqrt(num('primary_inductance') * num('tank_bank_capacitance')));
    expect(num('primary_frequency')).toBeCloseTo(f1, 3);
  });

  test('the rms part current equals an independent Simpson integration of the tank waveform up to the quench', () => {
    const circuit: CoupledCircuit = {
      primaryInductance: num('primary_inductance'),
      primaryCapacitance: num('tank_bank_capacitance'),
      primaryResistance: num('primary_resistance'),
      secondaryInductance: num('effective_inductance'),
      secondaryCapacitance: num('total_capacitance'),
      secondaryResistance: num('secondary_ac_resistance'),
      mutualInductance: num('coupling') * Math.sqrt(num('primary_inductance') * num('effective_inductance')),
    };
    const v0 = num('supply_charge_voltage');
    const shot = sparkGapShot(circuit, v0, true);
    const modes = coupledModes(circuit, v0);
    if (shot === null || modes === null || shot.quenchTime === null) throw new Error('no shot');
    const intervals = 400_000;
    const h = shot.quenchTime / intervals;
    const out = new Float64Array(4);
    let sum = 0;
    let peak = 0;
    for (let n = 0; n <= intervals; n++) {
      const i = coupledStateAt(modes, n * h, out)[2];
      peak = Math.max(peak, Math.abs(i));
      sum += (n === 0 || n === intervals ? 1 : n % 2 === 1 ? 4 : 2) * i * i;
    }
    const integral = (sum * h) / 3;
    const rms = Math.sqrt(120 * integral);
    expect(num('tank_rms_current') / rms).toBeCloseTo(1, 7);
    expect(num('tank_bank_part_rms_current')).toBeCloseTo(rms / num('tank_bank_parallel'), 6);
    expect(num('tank_peak_current') / peak).toBeCloseTo(1, 4);
    expect(num('tank_bank_part_peak_current')).toBeCloseTo(num('tank_peak_current') / num('tank_bank_parallel'), 9);
  });

  test('bleeders bring the bank below 50 V in 60 s: R = 60/(150 nF·ln(V/50)), P = (V/n_s)²/R', () => {
    const v = num('supply_charge_voltage');
    const r = num('tank_bank_bleeder_resistance');
    expect(r).toBeCloseTo(60 / (150e-9 * Math.log(v / 50)), 0);
    expect(num('tank_bank_bleeder_power')).toBeCloseTo((v / num('tank_bank_series')) ** 2 / r, 12);
  });

  test('the safety gap is set to 1.5 × the charge', () => {
    expect(num('safety_gap_voltage')).toBeCloseTo(1.5 * num('supply_charge_voltage'), 6);
    expect(num('safety_gap_spacing')).toBeGreaterThan(0.005);
    expect(num('safety_gap_spacing')).toBeLessThan(0.0065);
  });
});

describe('a bank that cannot meet its ratings is infeasible with its reason', () => {
  const bank = example.tankBank;
  if (!bank) throw new Error('the example has a bank');

  test('parts rated 1 A rms', () => {
    const result = evaluateDesign({ ...example, tankBank: { ...bank, partRmsCurrentRating: 1 } });
    expect(result.problems[0]?.field).toBe('tank.bank.part.rms_current_rating');
    expect(result.problems[0]?.reason).toMatch(/rms/);
  });

  test('parts rated 20 A peak', () => {
    const result = evaluateDesign({ ...example, tankBank: { ...bank, partPeakCurrentRating: 20 } });
    expect(result.problems[0]?.field).toBe('tank.bank.part.peak_current_rating');
  });

  test('a fixed series count too small for the charge', () => {
    const result = evaluateDesign({ ...example, tankBank: { ...bank, series: 4 } });
    expect(result.problems[0]?.field).toBe('tank.bank.series');
  });

  test('a static gap set above what the supply can reach never fires', () => {
    const design: Design = {
      ...example,
      tankBank: undefined,
      tank: { capacitance: 30e-9, chargeVoltage: 40e3 },
      driver: { kind: 'spark_gap', gap: 'static', breakRate: 120, quench: true },
    };
    const result = evaluateDesign(design);
    expect(result.problems[0]?.field).toBe('tank.charge_voltage');
    expect(result.problems[0]?.reason).toMatch(/never fires/);
  });
});

describe('designs without supply, bank or safety gap', () => {
  test('keep their tank and get no supply or bank metrics', () => {
    const design = loadDesignFile('examples/tabletop-teaching-coil.yaml').design;
    const result = evaluateDesign(design);
    expect(result.problems).toEqual([]);
    for (const key of ['supply_resonant_capacitance', 'tank_bank_series', 'safety_gap_spacing']) {
      expect(result.metrics[key]).toBeNull();
    }
    expect(result.metrics.energy_per_shot).toBeCloseTo(0.5 * 10e-9 * 12e3 * 12e3, 9);
    expect(result.metrics.tank_rms_current).toBeGreaterThan(0);
  });
});

describe('a static gap on a ballasted supply (an invented bench case)', () => {
  const design: Design = {
    ...example,
    tankBank: undefined,
    safetyGap: { electrodes: 'rounded', fireAt: 1.25 },
    supply: { kind: 'ballasted', voltage: 10e3, power: 1e3, frequency: 60, ballastImpedance: 200e3 },
    tank: { capacitance: 20e-9, chargeVoltage: 12e3 },
    driver: { kind: 'spark_gap', gap: 'static', breakRate: 120, quench: true },
  };
  const result = evaluateDesign(design);
  const r = result.metrics;

  test('the ballast sets the short-circuit current: C_res = (10 kV/200 kΩ)/(2π·60·10 kV) = 13.26 nF', () => {
    expect(r.supply_resonant_capacitance).toBeCloseTo(0.05 / (2 * Math.PI * 60 * 10e3), 14);
  });

  test('the gap fires at its setting, and the supply could reach √2·10 kV/|1 − C/C_res|', () => {
    const ratio = 20e-9 / (0.05 / (2 * Math.PI * 60 * 10e3));
    expect(r.supply_charge_voltage).toBe(12e3);
    expect(r.supply_charge_limit).toBeCloseTo((Math.SQRT2 * 10e3) / Math.abs(1 - ratio), 6);
    expect(r.energy_per_shot).toBeCloseTo(0.5 * 20e-9 * 12e3 * 12e3, 9);
    // the mean rectified current (2√2/π)·50 mA refills 20 nF to 12 kV this often
    expect(r.supply_break_rate_estimate).toBeCloseTo((RECTIFIED_MEAN_FACTOR * 0.05) / (20e-9 * 12e3), 9);
    // with a supply, that refill rate is the break rate: input power = energy per shot × rate
    expect(r.input_power).toBeCloseTo((r.energy_per_shot ?? 0) * (r.supply_break_rate_estimate ?? 0), 6);
    expect(Math.abs((r.input_power ?? 0) - (r.energy_per_shot ?? 0) * 120)).toBeGreaterThan(1);
    // the rated VA is the given power, 1 kVA
    expect(r.supply_load_fraction).toBeCloseTo((r.input_power ?? 0) / 1e3, 12);
  });

  test('rounded electrodes at 3 kV/mm (common practice) in air of relative density δ', () => {
    expect(r.safety_gap_voltage).toBeCloseTo(15e3, 9);
    expect(r.safety_gap_spacing).toBeCloseTo(15e3 / 3e6 / sphereGapAirDensity(200, 293.15), 12);
  });

  test('inside the resonant band the warning says so', () => {
    const near = evaluateDesign({ ...design, tank: { capacitance: 13e-9, chargeVoltage: 12e3 } });
    expect(near.warnings.map((w) => w.key)).toContain('supply_resonant_rise');
    expect(result.warnings.map((w) => w.key)).not.toContain('supply_resonant_rise');
  });
});

describe('a solid-state bank with automatic counts (examples/solid-state-bench-coil.yaml, invented 330 nF / 1.2 kV parts)', () => {
  const bench = loadDesignFile('examples/solid-state-bench-coil.yaml').design;
  const bank = {
    partCapacitance: 330e-9,
    partVoltageRating: 1.2e3,
    partRmsCurrentRating: 40,
    voltageMargin: 2,
    bleedTime: 60,
  };
  const withBank: Design = { ...bench, tankBank: bank };
  const bare = evaluateDesignInDetail(bench);
  const built = evaluateDesignInDetail(withBank);
  const b = built.evaluation.metrics;
  const peak = bare.context.burstPeakTankVoltage ?? Number.NaN;

  test('is feasible and lays the bank out from the burst at the target capacitance', () => {
    expect(built.evaluation.problems).toEqual([]);
    expect(peak).toBeGreaterThan(0);
    // hand arithmetic (core/tank/bank.ts): n_s = ⌈2·V_peak/1.2 kV⌉, n_p = round(100 nF·n_s/330 nF)
    const ns = Math.ceil((2 * peak) / 1.2e3);
    expect(b.tank_bank_series).toBe(ns);
    expect(b.tank_bank_parallel).toBe(Math.max(1, Math.round((100e-9 * ns) / 330e-9)));
    expect(b.tank_bank_capacitance).toBeCloseTo(((b.tank_bank_parallel ?? 0) * 330e-9) / ns, 20);
    expect(2 * (b.tank_bank_part_voltage ?? Number.POSITIVE_INFINITY)).toBeLessThanOrEqual(1.2e3);
  });

  test('the part currents are the burst tank current shared by the strings', () => {
    const np = b.tank_bank_parallel ?? Number.NaN;
    const rms = b.tank_rms_current ?? Number.NaN;
    const peakCurrent = b.tank_peak_current ?? Number.NaN;
    expect(b.tank_bank_part_rms_current).toBeCloseTo(rms / np, 9);
    expect(b.tank_bank_part_peak_current).toBeCloseTo(peakCurrent / np, 9);
    // rms of a repetitive pulse (exact bounds): below peak·√(rate·on time), and at least the
    // rms a sine rising linearly to the peak over the 40 µs burst would have, peak·√(rate·T/6)
    expect(rms).toBeLessThanOrEqual(peakCurrent * Math.sqrt(100 * 40e-6) * (1 + 1e-9));
    expect(rms).toBeGreaterThan(peakCurrent * Math.sqrt((100 * 40e-6) / 6) * 0.5);
  });

  test('the rms tank current equals an independent Simpson integration of the computed burst waveform', () => {
    const circuit = built.context.circuit;
    if (!circuit) throw new Error('no circuit');
    // The computed waveform: every step the integrator took (the same burst: its ∫i1²dt is the one evaluated).
    const steps: { from: number[]; to: number[]; length: number; source: number }[] = [];
    const driver = withBank.driver;
    if (driver?.kind !== 'solid_state') throw new Error('a solid-state driver');
    const drive = { driveVoltage: driver.busVoltage, currentLimit: driver.currentLimit, onTime: driver.onTime }; // full bridge
    const burst = solidStateBurst(circuit, drive, (from, to, length, source) =>
      steps.push({ from: Array.from(from.subarray(0, 4)), to: Array.from(to.subarray(0, 4)), length, source }),
    );
    expect(burst.primaryCurrentSquared).toBe(built.context.burstTankCurrentSquared);
    // Each step resampled from its start by our own RK4 of the loop equations
    //   L1 i1' + M i2' = e − R1 i1 − v1,  M i1' + L2 i2' = −R2 i2 − v2,  C1 v1' = i1,  C2 v2' = i2
    // (Kirchhoff's voltage law, exact), with ∫ i1² dt by composite Simpson on 16 substeps.
    const { primaryInductance: l1, secondaryInductance: l2, mutualInductance: mu } = circuit;
    const det = l1 * l2 - mu * mu;
    const slope = (y: number[], e: number): number[] => {
      const a1 = e - circuit.primaryResistance * y[2] - y[0];
      const a2 = -circuit.secondaryResistance * y[3] - y[1];
      return [
        y[2] / circuit.primaryCapacitance,
        y[3] / circuit.secondaryCapacitance,
        (l2 * a1 - mu * a2) / det,
        (l1 * a2 - mu * a1) / det,
      ];
    };
    const rk4 = (y: number[], e: number, h: number): number[] => {
      const k1 = slope(y, e);
      const k2 = slope(
        y.map((v, c) => v + (h / 2) * k1[c]),
        e,
      );
      const k3 = slope(
        y.map((v, c) => v + (h / 2) * k2[c]),
        e,
      );
      const k4 = slope(
        y.map((v, c) => v + h * k3[c]),
        e,
      );
      return y.map((v, c) => v + (h / 6) * (k1[c] + 2 * k2[c] + 2 * k3[c] + k4[c]));
    };
    const sub = 16;
    let integral = 0;
    let worstEnd = 0;
    for (const { from, to, length, source } of steps) {
      const h = length / sub;
      let y = from;
      let sum = y[2] * y[2];
      for (let q = 1; q <= sub; q++) {
        y = rk4(y, source, h);
        sum += (q === sub ? 1 : q % 2 === 1 ? 4 : 2) * y[2] * y[2];
      }
      integral += (sum * h) / 3;
      worstEnd = Math.max(worstEnd, Math.abs(y[2] - to[2]));
    }
    // the resample lands on the integrator's own step ends (one waveform, to 1e-6 of the peak current)
    expect(worstEnd).toBeLessThan(1e-6 * burst.peakPrimaryCurrent);
    // tank_rms_current = √(100 Hz · ∫i1²dt); the evaluation's trapezoidal rule on 256 steps per upper-mode
    // period errs by about (2π/256)²/12 ≈ 5e-5 of the integral, so the rms agrees to 1e-4
    const rms = Math.sqrt(100 * integral);
    expect(Math.abs((b.tank_rms_current ?? Number.NaN) / rms - 1)).toBeLessThan(1e-4);
    expect(
      Math.abs((b.tank_bank_part_rms_current ?? Number.NaN) / (rms / (b.tank_bank_parallel ?? Number.NaN)) - 1),
    ).toBeLessThan(1e-4);
  });

  test('parts rated below the rms current make the design infeasible, naming the rating', () => {
    const rms = b.tank_bank_part_rms_current ?? 0;
    const weak = evaluateDesign({ ...withBank, tankBank: { ...bank, partRmsCurrentRating: rms / 2 } });
    expect(weak.problems[0]?.field).toBe('tank.bank.part.rms_current_rating');
  });

  test('a fixed parallel count with an automatic series count is refused with its reason', () => {
    const fixed = evaluateDesign({ ...withBank, tankBank: { ...bank, parallel: 3 } });
    expect(fixed.problems[0]?.field).toBe('tank.bank.parallel');
  });
});

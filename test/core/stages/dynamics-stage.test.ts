/**
 * dynamicsStage and outcomeStage on hand-made contexts (the other stages are not needed): the
 * metrics they set, the lumped circuit those metrics describe (re-solved here by an independent
 * RK4 integration, as an outside checker would), nulls for what a design cannot have, and the
 * warnings. The design below is an invented demo scenario.
 */
import { describe, expect, test } from 'vitest';
import fc from 'fast-check';
import type { Design, SolidStateDriver, SparkGapDriver } from '../../../core/design.ts';
import type { EvalContext, SecondaryGeometry, PrimaryGeometry, ElectrostaticSolution } from '../../../core/context.ts';
import { emptyMetrics } from '../../../core/metrics.ts';
import { dynamicsStage } from '../../../core/stages/dynamics-stage.ts';
import { outcomeStage } from '../../../core/stages/outcome-stage.ts';
import { SPARK_LENGTH_PER_ROOT_WATT } from '../../../core/outcome/spark-length.ts';
import { must } from '../../../core/must.ts';

const secondary: SecondaryGeometry = {
  turns: 1000,
  pitch: 0.8e-3,
  windingLength: 0.8,
  radius: 0.1,
  bareDiameter: 0.7e-3,
  overallDiameter: 0.76e-3,
  bottomZ: 0.5,
  topZ: 1.3,
  inductance: 44.4e-3,
  dcResistance: 28.1,
  wireLength: 628.3,
};
const totalCapacitance = 30e-12;
const secondaryFrequency = 1 / (2 * Math.PI * Math.sqrt(secondary.inductance * totalCapacitance));
const tankCapacitance = 25e-9;
const primaryInductance = (secondary.inductance * totalCapacitance) / tankCapacitance; // tuned
const coupling = 0.14;

function makeContext(
  driver: SparkGapDriver | SolidStateDriver | undefined,
  overrides: Partial<Design> = {},
): EvalContext {
  const design: Design = {
    secondary: {
      formDiameter: 0.2,
      wire: { bareDiameter: 0.7e-3, insulation: 'grade2' },
      turns: 1000,
      baseHeight: 0.5,
      voltageProfile: 'linear',
    },
    topload: { shape: 'toroid', outerDiameter: 0.8, tubeDiameter: 0.2, heightAboveWinding: 0.1 },
    primary: {
      shape: 'flat_spiral',
      innerDiameter: 0.26,
      turns: 12,
      conductorDiameter: 6.35e-3,
      turnSpacing: 6e-3,
      elevation: 0,
    },
    tank: { capacitance: tankCapacitance, chargeVoltage: 15e3, voltageRating: 30e3 },
    driver,
    environment: { altitude: 0, temperature: 293.15 },
    ...overrides,
  };
  const rings = Array.from({ length: 12 }, (_, i) => ({ r: 0.13 + i * 0.01235, z: 0.5 }));
  const primary: PrimaryGeometry = {
    rings,
    conductorRadius: 3.175e-3,
    tapTurns: 9.5,
    inductance: primaryInductance,
    mutual: coupling * Math.sqrt(primaryInductance * secondary.inductance),
    conductorLength: 7.2,
  };
  const electrostatics: ElectrostaticSolution = {
    totalCapacitance,
    toploadCapacitance: 22e-12,
    toploadFieldPerVolt: 8.5,
    onsetField: 3.2e6,
    breakoutVoltage: 3.2e6 / 8.5,
  };
  const metrics = emptyMetrics();
  metrics.resonant_frequency = secondaryFrequency;
  metrics.coupling = coupling;
  metrics.primary_inductance = primaryInductance;
  metrics.primary_frequency = 1 / (2 * Math.PI * Math.sqrt(primaryInductance * tankCapacitance));
  metrics.primary_tap_turns = 9.5;
  return { design, metrics, warnings: [], problems: [], secondary, primary, electrostatics };
}

const sparkGap: SparkGapDriver = { kind: 'spark_gap', gap: 'static', breakRate: 120, quench: true };

function run(context: EvalContext): EvalContext {
  dynamicsStage(context);
  outcomeStage(context);
  return context;
}

/** The checker's view: the circuit from the reported metrics, solved by plain RK4 (400 steps per cycle). */
function independentShot(
  metrics: Record<string, number | null>,
  tankC: number,
  chargeVoltage: number,
): { transferTime: number; peakVoltage: number } {
  const L1 = must(metrics.primary_inductance),
    R1 = must(metrics.primary_resistance),
    L2 = metrics.secondary_inductance ?? secondary.inductance;
  const C2 = metrics.total_capacitance ?? totalCapacitance,
    R2 = must(metrics.secondary_ac_resistance),
    M = must(metrics.coupling) * Math.sqrt(L1 * L2);
  const det = L1 * L2 - M * M;
  const f = (s: number[]): number[] => {
    const a1 = -R1 * s[2] - s[0];
    const a2 = -R2 * s[3] - s[1];
    return [s[2] / tankC, s[3] / C2, (L2 * a1 - M * a2) / det, (L1 * a2 - M * a1) / det];
  };
  const h = (2 * Math.PI * Math.sqrt(L2 * C2)) / 400;
  let y = [chargeVoltage, 0, 0, 0];
  const w1 = (s: number[]): number => 0.5 * tankC * s[0] ** 2 + 0.5 * L1 * s[2] ** 2;
  const samples: number[][] = [y];
  for (let n = 0; n < 400 * 40; n++) {
    const k1 = f(y),
      k2 = f(y.map((v, c) => v + 0.5 * h * k1[c])),
      k3 = f(y.map((v, c) => v + 0.5 * h * k2[c])),
      k4 = f(y.map((v, c) => v + h * k3[c]));
    y = y.map((v, c) => v + (h / 6) * (k1[c] + 2 * k2[c] + 2 * k3[c] + k4[c]));
    samples.push(y);
  }
  // deepest primary-energy dip in the first ~ beat (k = 0.14: about 3.6 cycles to the null)
  let best = 0;
  for (let n = 1; n < 400 * 6; n++) if (w1(samples[n]) < w1(samples[best])) best = n;
  const end = best + 200; // + half a secondary cycle
  let peak = 0;
  for (let n = 0; n <= end; n++) peak = Math.max(peak, Math.abs(samples[n][1]));
  return { transferTime: best * h, peakVoltage: peak };
}

describe('dynamicsStage with a spark gap', () => {
  test('sets the lossy circuit metrics; energy per shot is exactly ½C1V²; R1 includes the 1 Ω gap', () => {
    const { metrics } = run(makeContext(sparkGap));
    expect(metrics.energy_per_shot).toBe(0.5 * tankCapacitance * 15e3 * 15e3);
    expect(metrics.input_power).toBe(must(metrics.energy_per_shot) * 120);
    expect(metrics.gap_resistance).toBe(1);
    expect(metrics.primary_resistance).toBeCloseTo(must(metrics.primary_conductor_resistance) + 1, 12);
    expect(must(metrics.primary_conductor_resistance)).toBeGreaterThan(0);
    expect(must(metrics.secondary_ac_resistance)).toBeGreaterThan(secondary.dcResistance);
    expect(metrics.secondary_q).toBeCloseTo(
      (2 * Math.PI * secondaryFrequency * secondary.inductance) / must(metrics.secondary_ac_resistance),
      9,
    );
    expect(must(metrics.mode_frequency_low) / (secondaryFrequency / Math.sqrt(1 + coupling))).toBeCloseTo(1, 3);
    expect(must(metrics.mode_frequency_high) / (secondaryFrequency / Math.sqrt(1 - coupling))).toBeCloseTo(1, 3);
    expect(metrics.full_transfer_coupling).toBeCloseTo(0.132743, 5); // n = 7, nearest to 0.14 (§8.2 formula)
    expect(must(metrics.transfer_time)).toBeGreaterThan(0);
    expect(metrics.tank_voltage_margin).toBe(2);
  });

  test('the reported lumped values reproduce transfer_time (2 %) and peak_voltage (3 %) in an independent RK4 solve', () => {
    const { metrics } = run(makeContext(sparkGap));
    const check = independentShot(metrics, tankCapacitance, 15e3);
    expect(Math.abs(must(metrics.transfer_time) / check.transferTime - 1)).toBeLessThan(0.02);
    expect(Math.abs(must(metrics.peak_voltage) / check.peakVoltage - 1)).toBeLessThan(0.03);
  });

  test('a user gap resistance replaces the 1 Ω default and lowers the peak', () => {
    const lossless = run(makeContext({ ...sparkGap, gapResistance: 0.1 })).metrics;
    const lossy = run(makeContext({ ...sparkGap, gapResistance: 5 })).metrics;
    expect(lossy.gap_resistance).toBe(5);
    expect(must(lossy.peak_voltage)).toBeLessThan(must(lossless.peak_voltage));
  });

  test('without a driver the shot metrics are null; without a tank the primary loop is null too', () => {
    const noDriver = run(makeContext(undefined)).metrics;
    expect(noDriver.peak_voltage).toBeNull();
    expect(noDriver.transfer_time).toBeNull();
    expect(noDriver.energy_per_shot).toBeNull();
    expect(noDriver.spark_length).toBeNull();
    expect(noDriver.breakout_margin).toBeNull();
    expect(noDriver.gap_resistance).toBeNull();
    expect(noDriver.mode_frequency_low).not.toBeNull();
    const noTank = run(makeContext(sparkGap, { tank: undefined })).metrics;
    expect(noTank.primary_resistance).toBeNull();
    expect(noTank.peak_voltage).toBeNull();
    expect(noTank.secondary_ac_resistance).not.toBeNull();
    const noCharge = run(makeContext(sparkGap, { tank: { capacitance: tankCapacitance } }));
    expect(noCharge.metrics.energy_per_shot).toBeNull();
    expect(noCharge.warnings.some(({ message: w }) => w.includes('charge_voltage'))).toBe(true);
  });

  test('warns about high coupling for a spark gap and an under-rated tank capacitor, with the numbers', () => {
    const context = makeContext(sparkGap, {
      tank: { capacitance: tankCapacitance, chargeVoltage: 15e3, voltageRating: 12e3 },
    });
    context.metrics.coupling = 0.31;
    run(context);
    expect(context.warnings.some(({ message: w }) => w.includes('coupling 0.31') && w.includes('spark gap'))).toBe(
      true,
    );
    expect(
      context.warnings.some(({ message: w }) => w.includes('12 kV') && w.includes('15 kV') && w.includes('0.8')),
    ).toBe(true);
    expect(context.metrics.tank_voltage_margin).toBeCloseTo(0.8, 12);
  });
});

describe('dynamicsStage with a solid-state bridge', () => {
  const bridge: SolidStateDriver = {
    kind: 'solid_state',
    bridge: 'full',
    busVoltage: 340,
    onTime: 80e-6,
    repetitionRate: 200,
  };

  test('simulates the burst: bus energy, input power, peak voltage; no transfer time', () => {
    const { metrics } = run(makeContext(bridge));
    expect(metrics.transfer_time).toBeNull();
    expect(must(metrics.energy_per_shot)).toBeGreaterThan(0);
    expect(metrics.input_power).toBeCloseTo(must(metrics.energy_per_shot) * 200, 9);
    expect(must(metrics.peak_voltage)).toBeGreaterThan(0);
    expect(metrics.gap_resistance).toBeNull();
    expect(metrics.primary_resistance).toBe(metrics.primary_conductor_resistance);
  });

  test('a half bridge gives half the peak voltage of a full bridge (linear circuit, E = bus/2)', () => {
    const full = must(run(makeContext(bridge)).metrics.peak_voltage);
    const half = must(run(makeContext({ ...bridge, bridge: 'half' })).metrics.peak_voltage);
    expect(half / full).toBeCloseTo(0.5, 9);
  });

  test('the current limit ends the burst with a warning', () => {
    const context = run(makeContext({ ...bridge, currentLimit: 150 }));
    expect(context.warnings.some(({ message: w }) => w.includes('150 A limit'))).toBe(true);
  });

  test('warns when the topload reaches breakout during the burst', () => {
    const context = makeContext({ ...bridge, onTime: 400e-6 });
    context.electrostatics = { ...must(context.electrostatics), breakoutVoltage: 60e3 };
    run(context);
    expect(must(context.metrics.peak_voltage)).toBeGreaterThan(60e3);
    expect(
      context.warnings.some(
        ({ message: w }) => w.includes('reaches its breakout voltage 60 kV') && w.includes('cycles'),
      ),
    ).toBe(true);
  });

  test('needs on_time or cycles', () => {
    const context = run(makeContext({ ...bridge, onTime: undefined }));
    expect(context.metrics.peak_voltage).toBeNull();
    expect(context.warnings.some(({ message: w }) => w.includes('on_time'))).toBe(true);
  });
});

describe('outcomeStage', () => {
  test('breakout margin, topload field and axial gradient follow the peak voltage; margin scales as 1/V', () => {
    const low = run(makeContext(sparkGap)).metrics;
    const high = run(makeContext(sparkGap, { tank: { capacitance: tankCapacitance, chargeVoltage: 30e3 } })).metrics;
    expect(low.breakout_margin).toBeCloseTo(3.2e6 / 8.5 / must(low.peak_voltage), 12);
    expect(must(high.breakout_margin) / must(low.breakout_margin)).toBeCloseTo(0.5, 9);
    expect(low.topload_peak_field).toBeCloseTo(8.5 * must(low.peak_voltage), 6);
    expect(low.axial_gradient).toBeCloseTo(must(low.peak_voltage) / 0.8, 6);
  });

  test('property: breakout_margin × peak_voltage is the breakout voltage for any charge voltage (margin ∝ 1/V)', () => {
    fc.assert(
      fc.property(fc.double({ min: 2e3, max: 60e3, noNaN: true }), (chargeVoltage) => {
        const { metrics } = run(makeContext(sparkGap, { tank: { capacitance: tankCapacitance, chargeVoltage } }));
        const reference = run(makeContext(sparkGap)).metrics;
        const ratio = must(metrics.breakout_margin) / must(reference.breakout_margin);
        return (
          Math.abs(ratio * (chargeVoltage / 15e3) - 1) < 1e-9 &&
          Math.abs((must(metrics.breakout_margin) * must(metrics.peak_voltage)) / (3.2e6 / 8.5) - 1) < 1e-12
        );
      }),
      { numRuns: 25, seed: 7 },
    );
  });

  test('overall height is the toroid mid-plane plus half the tube, or the winding top without a topload', () => {
    expect(run(makeContext(sparkGap)).metrics.overall_height).toBeCloseTo(1.3 + 0.1 + 0.1, 12);
    expect(run(makeContext(sparkGap, { topload: undefined })).metrics.overall_height).toBeCloseTo(1.3, 12);
    const sphere = run(makeContext(sparkGap, { topload: { shape: 'sphere', diameter: 0.3, heightAboveWinding: 0.2 } }));
    expect(sphere.metrics.overall_height).toBeCloseTo(1.3 + 0.2 + 0.15, 12);
  });

  test('spark length is the common-practice 0.043 √P and loads the resonance by 1 pF per foot', () => {
    const { metrics } = run(makeContext(sparkGap));
    expect(metrics.spark_length).toBeCloseTo(SPARK_LENGTH_PER_ROOT_WATT * Math.sqrt(must(metrics.input_power)), 12);
    const loaded =
      1 /
      (2 *
        Math.PI *
        Math.sqrt(secondary.inductance * (totalCapacitance + (1e-12 / 0.3048) * must(metrics.spark_length))));
    expect(metrics.loaded_resonant_frequency).toBeCloseTo(loaded, 6);
    // a given streamer length is left to the electrostatics stage
    const given = run(
      makeContext(sparkGap, { environment: { altitude: 0, temperature: 293.15, streamerLength: 0.5 } }),
    );
    expect(given.metrics.loaded_resonant_frequency).toBeNull();
  });

  test('warns when the topload breaks out below the peak voltage, and when it never breaks out', () => {
    const breaking = makeContext(sparkGap, { tank: { capacitance: tankCapacitance, chargeVoltage: 40e3 } });
    run(breaking);
    expect(must(breaking.metrics.breakout_margin)).toBeLessThan(1);
    expect(breaking.warnings.some(({ message: w }) => w.includes('breaks out') && w.includes('breakout margin'))).toBe(
      true,
    );
    const holding = makeContext(sparkGap, { tank: { capacitance: tankCapacitance, chargeVoltage: 5e3 } });
    run(holding);
    expect(must(holding.metrics.breakout_margin)).toBeGreaterThan(1);
    expect(holding.warnings.some(({ message: w }) => w.includes('breakout point'))).toBe(true);
  });

  test('warns about the axial gradient and a primary strike, with their numbers', () => {
    const context = makeContext(sparkGap, { tank: { capacitance: tankCapacitance, chargeVoltage: 40e3 } });
    run(context);
    expect(must(context.metrics.axial_gradient)).toBeGreaterThan(400e3);
    expect(context.warnings.some(({ message: w }) => w.startsWith('axial gradient') && w.includes('kV/m'))).toBe(true);
    expect(must(context.metrics.primary_strike_margin)).toBeLessThan(1);
    expect(context.warnings.some(({ message: w }) => w.includes('strike risk') && w.includes('strike margin'))).toBe(
      true,
    );
  });

  test('strike margin grows when the outer ring moves away; spark-to-primary warning only without a strike rail', () => {
    const near = must(run(makeContext(sparkGap)).metrics.primary_strike_margin);
    const far = makeContext(sparkGap);
    must(far.primary).rings[must(far.primary).rings.length - 1] = { r: 0.6, z: 0.5 };
    run(far);
    expect(must(far.metrics.primary_strike_margin)).toBeGreaterThan(near);
    const strong = makeContext(
      { ...sparkGap, breakRate: 2000 },
      { tank: { capacitance: tankCapacitance, chargeVoltage: 30e3 } },
    );
    run(strong);
    expect(strong.warnings.some(({ message: w }) => w.includes('strike rail'))).toBe(true);
    const railed = makeContext(
      { ...sparkGap, breakRate: 2000 },
      {
        tank: { capacitance: tankCapacitance, chargeVoltage: 30e3 },
        strikeRail: { diameter: 0.9, conductorDiameter: 0.01, elevation: 0.05 },
      },
    );
    run(railed);
    expect(railed.warnings.some(({ message: w }) => w.includes('strike rail'))).toBe(false);
  });

  test('strike margin uses the winding voltage at the outer ring height: raising the ring lowers it', () => {
    const flat = run(makeContext(sparkGap));
    const raised = makeContext(sparkGap);
    must(raised.primary).rings[must(raised.primary).rings.length - 1] = { r: 0.2658, z: 0.9 }; // half-way up the winding
    run(raised);
    // at half height the linear profile gives half the peak, plus the 15 kV tank, over the radial gap
    const gap = 0.2658 - (0.1 + 0.38e-3) - 3.175e-3;
    const expected = (gap * 200e3) / (must(raised.metrics.peak_voltage) / 2 + 15e3);
    expect(raised.metrics.primary_strike_margin).toBeCloseTo(expected, 9);
    expect(must(raised.metrics.primary_strike_margin)).toBeLessThan(must(flat.metrics.primary_strike_margin));
  });
});

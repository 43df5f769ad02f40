/**
 * The acceptance check of the dynamics, done the way an outside checker would: evaluate example
 * designs through the whole pipeline, take only the lumped values `evaluate --json` reports
 * (primary_inductance, the tank capacitance, primary_resistance, secondary_inductance,
 * total_capacitance, secondary_ac_resistance, coupling, the charge voltage) and re-solve that
 * circuit here with a plain fixed-step RK4 (Butcher 2008, §23) written in this file. Targets:
 * transfer_time within 2 %, peak_voltage within 3 %, energy_per_shot exact (½C1V²). The example
 * designs are invented demo scenarios; the reference is the circuit's own ODE.
 */
import { describe, expect, test } from 'vitest';
import { fileURLToPath } from 'node:url';
import { loadDesignFile } from '../../cli/load-design.ts';
import { evaluateDesign } from '../../core/evaluate.ts';
import { must } from '../../core/must.ts';

const examples = (name: string): string => fileURLToPath(new URL(`../../examples/${name}`, import.meta.url));

interface Lumped {
  L1: number;
  C1: number;
  R1: number;
  L2: number;
  C2: number;
  R2: number;
  M: number;
}

function lumped(metrics: Record<string, number | null>, tankCapacitance: number): Lumped {
  const L1 = must(metrics.primary_inductance),
    L2 = must(metrics.effective_inductance); // the secondary as the circuit sees it (dynamics-stage.ts)
  return {
    L1,
    C1: tankCapacitance,
    R1: must(metrics.primary_resistance),
    L2,
    C2: must(metrics.total_capacitance),
    R2: must(metrics.secondary_ac_resistance),
    M: must(metrics.coupling) * Math.sqrt(L1 * L2),
  };
}

function rk4(c: Lumped, y: number[], h: number, source: number): number[] {
  const det = c.L1 * c.L2 - c.M * c.M;
  const f = (s: number[]): number[] => {
    const a1 = source - c.R1 * s[2] - s[0];
    const a2 = -c.R2 * s[3] - s[1];
    return [s[2] / c.C1, s[3] / c.C2, (c.L2 * a1 - c.M * a2) / det, (c.L1 * a2 - c.M * a1) / det];
  };
  const k1 = f(y),
    k2 = f(y.map((v, i) => v + 0.5 * h * k1[i])),
    k3 = f(y.map((v, i) => v + 0.5 * h * k2[i])),
    k4 = f(y.map((v, i) => v + h * k3[i]));
  return y.map((v, i) => v + (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]));
}

/** Transfer time (deepest ½C1v1² + ½L1i1² before ¾ of a beat) and the peak |v2| up to half a secondary period after it. */
function sparkGapCheck(c: Lumped, chargeVoltage: number): { transferTime: number; peakVoltage: number } {
  // lossless mode frequencies from the determinant (coupled-circuit theory)
  const a = c.L1 * c.L2 - c.M * c.M,
    b = c.L1 / c.C2 + c.L2 / c.C1,
    q = 1 / (c.C1 * c.C2);
  const wHigh = Math.sqrt((b + Math.sqrt(b * b - 4 * a * q)) / (2 * a));
  const wLow = Math.sqrt((b - Math.sqrt(b * b - 4 * a * q)) / (2 * a));
  const beat = (2 * Math.PI) / (wHigh - wLow);
  const h = (2 * Math.PI) / wHigh / 1000;
  const halfSecondary = Math.PI * Math.sqrt(c.L2 * c.C2);
  let y = [chargeVoltage, 0, 0, 0];
  let time = 0;
  let bestEnergy = Infinity;
  let transferTime = 0;
  const v2: Array<[number, number]> = [];
  while (time < 0.75 * beat + halfSecondary) {
    const energy = 0.5 * c.C1 * y[0] ** 2 + 0.5 * c.L1 * y[2] ** 2;
    if (time < 0.75 * beat && energy < bestEnergy) {
      bestEnergy = energy;
      transferTime = time;
    }
    v2.push([time, Math.abs(y[1])]);
    y = rk4(c, y, h, 0);
    time += h;
  }
  let peakVoltage = 0;
  for (const [t, v] of v2) if (t <= transferTime + halfSecondary) peakVoltage = Math.max(peakVoltage, v);
  return { transferTime, peakVoltage };
}

describe("evaluate → lumped metrics → independent solve (the lead's acceptance check)", () => {
  test.each(['exhibit-two-metre-coil.yaml', 'tabletop-teaching-coil.yaml'])('spark gap, %s', (file) => {
    const { design } = loadDesignFile(examples(file));
    const { metrics, problems } = evaluateDesign(design);
    expect(problems).toEqual([]);
    const c = lumped(metrics, must(design.tank).capacitance);
    const chargeVoltage = must(must(design.tank).chargeVoltage);
    expect(metrics.energy_per_shot).toBe(0.5 * must(design.tank).capacitance * chargeVoltage * chargeVoltage);
    const check = sparkGapCheck(c, chargeVoltage);
    expect(Math.abs(must(metrics.transfer_time) / check.transferTime - 1)).toBeLessThan(0.02);
    expect(Math.abs(must(metrics.peak_voltage) / check.peakVoltage - 1)).toBeLessThan(0.03);
  });

  test('solid state, solid-state-bench-coil.yaml: peak voltage and bus energy against a naive switched RK4 (1 %)', () => {
    const { design } = loadDesignFile(examples('solid-state-bench-coil.yaml'));
    const { metrics } = evaluateDesign(design);
    const driver = must(design.driver);
    if (driver.kind !== 'solid_state') throw new Error('the example should have a solid-state driver');
    const c = lumped(metrics, must(design.tank).capacitance);
    const h = 1 / (must(metrics.mode_frequency_high) * 4000);
    let y = [0, 0, 0, 0];
    let polarity = 1;
    let energy = 0;
    let peak = 0;
    for (let time = 0; time < (driver.onTime ?? 0); time += h) {
      const next = rk4(c, y, h, polarity * driver.busVoltage);
      energy += polarity * driver.busVoltage * c.C1 * (next[0] - y[0]);
      y = next;
      peak = Math.max(peak, Math.abs(y[1]));
      if (driver.currentLimit !== undefined && Math.abs(y[2]) >= driver.currentLimit) break;
      if (polarity * y[2] < 0) polarity = -polarity; // switch at the current zero (to within one step)
    }
    expect(Math.abs(must(metrics.peak_voltage) / peak - 1)).toBeLessThan(0.01);
    expect(Math.abs(must(metrics.energy_per_shot) / energy - 1)).toBeLessThan(0.01);
  });
});

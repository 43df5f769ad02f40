/**
 * Benchmarks of the dynamics and losses: time per call of the spark-gap shot (exact modal
 * solution) at several couplings, of a solid-state burst (RK4), of the AC resistances, and of the
 * dynamics + outcome stages together on an invented demo design. Returns printable lines.
 */
import type { CoupledCircuit } from '../core/dynamics/circuit.ts';
import { sparkGapShot } from '../core/dynamics/spark-gap.ts';
import { solidStateBurst } from '../core/dynamics/solid-state.ts';
import { solenoidAcResistance, roundConductorAcResistance } from '../core/losses/resistance.ts';

/** Invented demo circuit: 53 µH with 25 nF against 44 mH with 30 pF, tuned near 138 kHz. */
function demoCircuit(coupling: number): CoupledCircuit {
  const l1 = 53.3e-6;
  const l2 = 44.4e-3;
  return {
    primaryInductance: l1,
    primaryCapacitance: 25e-9,
    primaryResistance: 1.04,
    secondaryInductance: l2,
    secondaryCapacitance: 30e-12,
    secondaryResistance: 87,
    mutualInductance: coupling * Math.sqrt(l1 * l2),
  };
}

/** Mean wall time per call in microseconds, after a warm-up of a tenth of the runs. */
function timePerCall(runs: number, body: (index: number) => void): number {
  for (let i = 0; i < Math.ceil(runs / 10); i++) body(i);
  const started = performance.now();
  for (let i = 0; i < runs; i++) body(i);
  return ((performance.now() - started) * 1000) / runs;
}

/**
 * Times the dynamics (spark-gap shot at four couplings, solid-state bursts of two lengths) and the AC
 * resistances; returns one printable line per case.
 * @param options.runs calls per spark-gap case (bursts get a twentieth of it)
 */
export async function benchDynamics(options: { runs?: number } = {}): Promise<string[]> {
  const runs = options.runs ?? 5000;
  const lines: string[] = [`dynamics: mean time per call over ${runs} calls (burst: ${Math.ceil(runs / 20)})`];
  let sink = 0;
  for (const coupling of [0.05, 0.1, 0.15, 0.3]) {
    const circuit = demoCircuit(coupling);
    const microseconds = timePerCall(runs, (i) => {
      sink += sparkGapShot(circuit, 15e3 + i, true)?.peakVoltage ?? 0;
    });
    lines.push(`  spark-gap shot, k = ${coupling}: ${microseconds.toFixed(1)} µs`);
  }
  for (const onTime of [50e-6, 150e-6]) {
    const circuit = demoCircuit(0.2);
    const microseconds = timePerCall(Math.ceil(runs / 20), (i) => {
      sink += solidStateBurst(circuit, { driveVoltage: 340 + i * 1e-3, onTime }).peakVoltage;
    });
    lines.push(
      `  solid-state burst, ${(onTime * 1e6).toFixed(0)} µs on-time (${(onTime * 138e3).toFixed(0)} cycles): ${microseconds.toFixed(1)} µs`,
    );
  }
  const resistance = timePerCall(runs, (i) => {
    sink +=
      solenoidAcResistance(28.1, 628.3, 0.7e-3, 0.8e-3, 138e3 + i) +
      roundConductorAcResistance(7.2, 3.175e-3, 1.7e-8, 138e3 + i);
  });
  lines.push(`  secondary + primary AC resistance: ${resistance.toFixed(2)} µs`);
  if (!Number.isFinite(sink)) lines.push('  (non-finite result: check the physics)');
  return lines;
}

/**
 * Benchmark of the electrostatic field solve: time per solve and panel counts for invented demo
 * arrangements (a toroid on a winding with a primary and strike rail, a sphere on a winding, a
 * bare winding, a topload alone), with the split into assembly, factorisation and the rest, the
 * error of the default counts against a fine reference solve (four times the panels on every
 * body), and the whole electrostatics stage. Returns printable lines.
 */
import type { EvalContext } from '../core/context.ts';
import type { Design } from '../core/design.ts';
import { emptyMetrics } from '../core/metrics.ts';
import { electrostaticsStage } from '../core/stages/electrostatics-stage.ts';
import { assembleCollocationMatrix } from '../core/electrostatics/assembly.ts';
import { luFactor } from '../core/electrostatics/dense-lu.ts';
import { solveField, type FieldArrangement } from '../core/electrostatics/field-solve.ts';
import { must } from '../core/must.ts';

/**
 * Time per call in microseconds: the best of five batch means (each batch a fifth of the runs),
 * after a warm-up of a tenth of the runs. Measured as the process's CPU time (user + system,
 * `process.cpuUsage`), which on a shared machine excludes the time the thread waited for a core;
 * the best batch is the least disturbed one.
 */
function timePerCall(runs: number, body: () => void): number {
  for (let i = 0; i < Math.ceil(runs / 10); i++) body();
  const batch = Math.max(1, Math.ceil(runs / 5));
  let best = Number.POSITIVE_INFINITY;
  for (let b = 0; b < 5; b++) {
    const started = process.cpuUsage();
    for (let i = 0; i < batch; i++) body();
    const used = process.cpuUsage(started);
    best = Math.min(best, (used.user + used.system) / batch);
  }
  return best;
}

/** Invented demo arrangements (not data of any real coil). */
const DEMO_ARRANGEMENTS: Array<[string, FieldArrangement]> = [
  [
    'toroid 610×150 mm on a 161 mm × 0.8 m winding, 10-turn primary, strike rail',
    {
      winding: { radius: 0.0804, bottomZ: 0.45, topZ: 1.25, profile: 'linear' },
      topload: { shape: 'toroid', majorRadius: 0.23, minorRadius: 0.075, centerZ: 1.29 },
      groundedRings: [
        ...Array.from({ length: 10 }, (_, i) => ({ r: 0.115 + i * 0.01235, z: 0.45, wireRadius: 0.003175 })),
        { r: 0.35, z: 0.5, wireRadius: 0.01 },
      ],
      floor: true,
    },
  ],
  [
    'sphere 300 mm on a 100 mm × 0.6 m winding',
    {
      winding: { radius: 0.05, bottomZ: 0.6, topZ: 1.2, profile: 'linear' },
      topload: { shape: 'sphere', radius: 0.15, centerZ: 1.4 },
      floor: true,
    },
  ],
  [
    'bare winding 200 mm × 0.9 m',
    { winding: { radius: 0.1, bottomZ: 0.5, topZ: 1.4, profile: 'linear' }, floor: true },
  ],
  [
    'toroid 800×200 mm alone at 1.5 m',
    { topload: { shape: 'toroid', majorRadius: 0.3, minorRadius: 0.1, centerZ: 1.5 }, floor: true },
  ],
];

export async function benchElectrostatics(options: { runs?: number } = {}): Promise<string[]> {
  const runs = options.runs ?? 2000;
  const lines: string[] = [
    `electrostatics: CPU time per field solve, best of 5 batches of ${Math.ceil(runs / 5)} (one thread)`,
  ];
  let sink = 0;
  for (const [name, arrangement] of DEMO_ARRANGEMENTS) {
    const solution = must(solveField(arrangement));
    const solveMicroseconds = timePerCall(runs, () => {
      sink += must(solveField(arrangement)).totalCapacitance;
    });
    const assemblyMicroseconds = timePerCall(runs, () => {
      sink += assembleCollocationMatrix(solution.layout, true)[0];
    });
    const matrix = assembleCollocationMatrix(solution.layout, true);
    const factorMicroseconds = timePerCall(runs, () => {
      sink += must(luFactor(matrix.slice(), solution.unknowns))[0];
    });
    const counts = solution.panelCounts;
    const fine = must(solveField(arrangement, { resolution: 4 }));
    const error = (value: number | null, reference: number | null) =>
      value === null || reference === null ? '–' : `${(100 * Math.abs(value / reference - 1)).toFixed(3)} %`;
    lines.push(
      `  ${name}: ${solution.unknowns} unknowns (topload ${counts.topload}, winding ${counts.winding}, rings ${solution.unknowns - counts.topload - counts.winding}): ` +
        `${solveMicroseconds.toFixed(0)} µs per solve (assembly ${assemblyMicroseconds.toFixed(0)} µs, one LU ${factorMicroseconds.toFixed(0)} µs)`,
      `    against ${fine.unknowns} unknowns (four times the panels): peak field ${error(solution.toploadPeakFieldPerVolt, fine.toploadPeakFieldPerVolt)}, ` +
        `total capacitance ${error(solution.totalCapacitance, fine.totalCapacitance)}, topload ${error(solution.toploadCapacitance, fine.toploadCapacitance)}, ` +
        `self ${error(solution.selfCapacitance, fine.selfCapacitance)}`,
    );
  }
  const design: Design = {
    secondary: {
      formDiameter: 0.16,
      wire: { bareDiameter: 0.0007, insulation: 'grade2' },
      turns: 1000,
      baseHeight: 0.45,
      voltageProfile: 'linear',
    },
    topload: { shape: 'toroid', outerDiameter: 0.61, tubeDiameter: 0.15, heightAboveWinding: 0.04 },
    primary: {
      shape: 'flat_spiral',
      innerDiameter: 0.23,
      turns: 10,
      conductorDiameter: 0.00635,
      turnSpacing: 0.006,
      elevation: 0,
    },
    environment: { altitude: 200, temperature: 293.15 },
  };
  const stageMicroseconds = timePerCall(runs, () => {
    const context: EvalContext = {
      design,
      metrics: emptyMetrics(),
      warnings: [],
      problems: [],
      secondary: {
        turns: 1000,
        pitch: 0.0008,
        windingLength: 0.8,
        radius: 0.0804,
        bareDiameter: 0.0007,
        overallDiameter: 0.00076,
        bottomZ: 0.45,
        topZ: 1.25,
        inductance: 0.03,
        dcResistance: 20,
        wireLength: 505,
      },
    };
    electrostaticsStage(context);
    sink += context.metrics.total_capacitance ?? 0;
  });
  lines.push(
    `  electrostatics stage (toroid, winding, 10-turn primary): ${stageMicroseconds.toFixed(0)} µs per design`,
  );
  if (!Number.isFinite(sink)) lines.push('  (non-finite result in the benchmark)');
  return lines;
}

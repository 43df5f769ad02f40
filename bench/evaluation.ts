/**
 * Benchmark of the full evaluation of one design, in this thread: where the time goes, stage by
 * stage, in µs per design, on the designs of the demo sweep (its first samples, in sweep order) and
 * on the example designs; and the designs per second of one worker (the batch evaluation that a
 * worker runs: design building, every stage, the metrics packed into the flat arrays).
 *
 * The pipeline's own stages are timed through the evaluation's stage observer (core/evaluate.ts).
 * Inside the electrostatics stage, the field solve (the node capacitance matrix at each panel count
 * the design needed) and the distributed winding's ladders are timed apart by running them again
 * on the same arrangement; inside the primary stage, the rings' mutuals to the winding's segments.
 * Times are the process's CPU time (`process.cpuUsage`, which leaves out the time the thread waited
 * for a core), the best of three passes over the same designs: on a shared machine the least
 * disturbed pass. Figures are printed, never asserted.
 */
import { readdirSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { loadDesignFile } from '../cli/load-design.ts';
import { loadSweepFile } from '../cli/sweep-spec.ts';
import type { EvalContext } from '../core/context.ts';
import type { Design } from '../core/design.ts';
import { nodeCapacitanceMatrix } from '../core/electrostatics/capacitance-matrix.ts';
import { arrangementFromDesign } from '../core/electrostatics/arrangement.ts';
import { EVALUATION_STAGES, evaluateDesign, evaluateDesignInDetail } from '../core/evaluate.ts';
import { RESONATOR_PANELS } from '../core/resonator/design-resonator.ts';
import { windingResonator } from '../core/resonator/winding-resonator.ts';
import { ringSegmentMutuals } from '../core/stages/primary-stage.ts';
import { primaryRings } from '../core/primary/rings.ts';
import { evaluateBatchTask } from '../optimize/evaluate-batch.ts';
import { DesignSpace, spaceDefinitionOf } from '../optimize/design-space.ts';

const ROOT = resolve(import.meta.dirname, '..', '..');
const DEMO = join(ROOT, 'examples', 'sweeps', 'science-centre-ceiling.yaml');
const PASSES = 3;

/** The process's CPU time, ms (user + system: on a shared machine, not the time spent waiting for a core). */
function clock(): number {
  const used = process.cpuUsage();
  return (used.user + used.system) / 1000;
}

/** Per-step totals (ms) of one pass of the pipeline over a set of designs. */
function stagePass(designs: readonly Design[]): Map<string, number> {
  const totals = new Map<string, number>();
  let current = '';
  let since = 0;
  const observe = (step: string) => {
    const now = clock();
    if (current !== '') totals.set(current, (totals.get(current) ?? 0) + now - since);
    current = step === 'done' ? '' : step;
    since = now;
  };
  for (const design of designs) evaluateDesignInDetail(design, observe);
  return totals;
}

/** Best-of-passes time (ms) of a body over the designs. */
function bestOf(body: () => void): number {
  let best = Number.POSITIVE_INFINITY;
  for (let pass = 0; pass < PASSES; pass++) {
    const started = clock();
    body();
    best = Math.min(best, clock() - started);
  }
  return best;
}

/** What the electrostatics and primary stages do inside, timed apart (see the header). */
interface InnerParts {
  fieldSolve: number;
  ladder: number;
  segmentMutuals: number;
  /** Field solves and ladders per design, and the designs with a distributed winding. */
  solves: number;
  distributed: number;
  segmentsSum: number;
}

function innerParts(designs: readonly Design[]): InnerParts {
  const cases: Array<{ context: EvalContext; panels: number[] }> = [];
  for (const design of designs) {
    const { context } = evaluateDesignInDetail(design);
    const resonator = context.resonator;
    if (!resonator || design.resonator) continue;
    const finest = resonator.capacitance.windingPanels;
    cases.push({ context, panels: RESONATOR_PANELS.filter((p) => p <= finest) });
  }
  const prepared = cases.map(({ context, panels }) => {
    const secondary = context.secondary;
    const arrangement = secondary ? arrangementFromDesign(context.design, secondary, []) : null;
    return { context, panels, arrangement };
  });
  const fieldSolve = bestOf(() => {
    for (const { arrangement, panels } of prepared)
      if (arrangement) for (const p of panels) nodeCapacitanceMatrix(arrangement, p, p / 2);
  });
  const matrices = prepared.map(({ arrangement, panels }) =>
    panels.map((p) => (arrangement ? nodeCapacitanceMatrix(arrangement, p, p / 2) : null)),
  );
  let segmentsSum = 0;
  const ladder = bestOf(() => {
    segmentsSum = 0;
    for (let index = 0; index < prepared.length; index++) {
      const { arrangement, panels, context } = prepared[index];
      const secondary = context.secondary;
      if (!arrangement || !secondary) continue;
      const winding = {
        radius: secondary.radius,
        turns: secondary.turns,
        pitch: secondary.pitch,
        wireRadius: secondary.bareDiameter / 2,
      };
      for (let i = 0; i < panels.length; i++)
        segmentsSum += windingResonator(arrangement, winding, 0, panels[i], matrices[index][i])?.solution.segments ?? 0;
    }
  });
  const segmentMutuals = bestOf(() => {
    for (const { context } of prepared) {
      const spec = context.design.primary;
      const secondary = context.secondary;
      const resonator = context.resonator;
      if (!spec || !secondary || !resonator) continue;
      ringSegmentMutuals(primaryRings(spec, secondary.bottomZ), secondary, resonator.fractions);
    }
  });
  let solves = 0;
  for (const { panels } of prepared) solves += panels.length;
  return { fieldSolve, ladder, segmentMutuals, solves, distributed: prepared.length, segmentsSum };
}

function exampleDesigns(): Array<[string, Design]> {
  const directory = join(ROOT, 'examples');
  return readdirSync(directory)
    .filter((name) => name.endsWith('.yaml'))
    .sort()
    .map((name) => [name, loadDesignFile(join(directory, name)).design]);
}

function profileLines(title: string, designs: readonly Design[]): string[] {
  for (const design of designs.slice(0, 50)) evaluateDesign(design); // warm-up
  let best: Map<string, number> | null = null;
  let bestTotal = Number.POSITIVE_INFINITY;
  for (let pass = 0; pass < PASSES; pass++) {
    const totals = stagePass(designs);
    let total = 0;
    for (const value of totals.values()) total += value;
    if (total < bestTotal) {
      bestTotal = total;
      best = totals;
    }
  }
  const perDesign = (ms: number) => (ms * 1000) / designs.length;
  const inner = innerParts(designs);
  const lines = [`${title}: ${designs.length} designs, ${perDesign(bestTotal).toFixed(0)} µs per design in all`];
  const row = (name: string, ms: number, note = '') =>
    lines.push(
      `  ${name.padEnd(34)} ${perDesign(ms).toFixed(1).padStart(8)} µs  ${((100 * ms) / bestTotal).toFixed(1).padStart(5)} %${note}`,
    );
  const steps = ['prepare', ...EVALUATION_STAGES.map((s) => s.name), 'profile'];
  for (const step of steps) {
    const ms = best?.get(step) ?? 0;
    if (step === 'electrostatics' && inner.distributed > 0) {
      row('electrostatics stage', ms);
      row('  field solve (capacitance matrix)', inner.fieldSolve, ` (${inner.solves} solves)`);
      row(
        '  distributed winding (ladders)',
        inner.ladder,
        ` (${inner.distributed} windings, ${(inner.segmentsSum / inner.distributed).toFixed(1)} segments kept)`,
      );
      row('  rest (fields of the profile, ...)', ms - inner.fieldSolve - inner.ladder);
    } else if (step === 'primary' && inner.distributed > 0) {
      row('primary stage', ms);
      row('  ring-to-segment mutuals', inner.segmentMutuals);
    } else {
      row(step === 'profile' ? 'profile table' : `${step} stage`, ms);
    }
  }
  if (inner.distributed > 0) {
    const ladderPerSolve = (1000 * inner.ladder) / inner.distributed;
    const solvePerDesign = (1000 * inner.fieldSolve) / inner.distributed;
    lines.push(
      `  ladders / field solve: ${((100 * ladderPerSolve) / solvePerDesign).toFixed(0)} % (${ladderPerSolve.toFixed(0)} µs against ${solvePerDesign.toFixed(0)} µs per distributed winding)`,
    );
  }
  return lines;
}

/**
 * The per-stage profile on the demo sweep and the examples, and one worker's designs per second.
 * @param options.samples demo-sweep designs profiled (default 400)
 */
export async function benchEvaluation(options: { samples?: number } = {}): Promise<string[]> {
  const samples = options.samples ?? 400;
  const space = new DesignSpace(spaceDefinitionOf(loadSweepFile(DEMO)));
  const demo: Design[] = [];
  for (let i = 0; i < samples; i++) {
    const design = space.designAt(i).design;
    if (design) demo.push(design);
  }
  const lines = profileLines(`demo sweep, first ${samples} samples`, demo);
  const examples = exampleDesigns();
  lines.push(
    ...profileLines(
      `examples/*.yaml (${examples.map(([name]) => name).join(', ')})`,
      examples.map(([, d]) => d),
    ),
  );
  evaluateBatchTask(space, { kind: 'indices', start: 0, count: 50 }); // warm-up
  const batch = bestOf(() => evaluateBatchTask(space, { kind: 'indices', start: 0, count: samples }));
  lines.push(
    `one worker's batch (demo sweep, ${samples} samples: building, evaluation, packing): ${((batch * 1000) / samples).toFixed(0)} µs per design, ${((1000 * samples) / batch).toFixed(0)} designs/s`,
  );
  return lines;
}

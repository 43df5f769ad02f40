/**
 * One evaluation of one design: the physics core's single entry point.
 *
 * Pure: a function of the SI design alone, no I/O, no globals. The stages run in the order in which
 * their results are needed: the secondary's geometry and inductance, the electrostatic solve
 * (capacitances, fields, breakout), the primary and its tuning (which needs the total capacitance),
 * then the dynamics of the coupled circuit and the outcome metrics with their warnings.
 */
import type { Design } from './design.ts';
import { emptyMetrics, type Metrics } from './metrics.ts';
import type { DesignProblem, EvalContext } from './context.ts';
import type { DesignWarning } from './outcome/warnings.ts';
import { secondaryStage } from './stages/secondary-stage.ts';
import { electrostaticsStage } from './stages/electrostatics-stage.ts';
import { primaryStage } from './stages/primary-stage.ts';
import { dynamicsStage } from './stages/dynamics-stage.ts';
import { outcomeStage } from './stages/outcome-stage.ts';
import { prepareTank, tankStage } from './stages/tank-stage.ts';
import { resonatorStage } from './stages/resonator-stage.ts';

export interface Evaluation {
  metrics: Metrics;
  /** The builder's warnings, each with its stable key (core/outcome/warnings.ts). */
  warnings: DesignWarning[];
  /** Empty for a buildable design; otherwise why it cannot be built (infeasible). */
  problems: DesignProblem[];
  /** The fundamental along the winding, with the computed profile (null otherwise). */
  profile: WindingProfileTable | null;
}

/**
 * The fundamental at every tenth of the winding's length from the base: the voltage normalised to
 * 1 at the top, the current normalised to its largest value (the segment's current at that height).
 */
export interface WindingProfileTable {
  fraction: number[];
  voltage: number[];
  current: number[];
}

/** The profile table of the distributed model, at every tenth of the winding. */
function profileTable(resonator: NonNullable<EvalContext['resonator']>): WindingProfileTable {
  const fraction = Array.from({ length: 11 }, (_, k) => k / 10);
  const current = resonator.solution.fundamental.current;
  let largest = 0;
  for (const value of current) largest = Math.max(largest, Math.abs(value));
  const currentAt = (x: number) => {
    let k = 0;
    while (k < current.length - 1 && resonator.fractions[k + 1] < x) k++;
    return largest > 0 ? Math.abs(current[k]) / largest : 0;
  };
  return { fraction, voltage: fraction.map((x) => resonator.shape(x)), current: fraction.map(currentAt) };
}

/** The stages in pipeline order, by name (the names the benchmark's per-stage profile prints). */
export const EVALUATION_STAGES: ReadonlyArray<{ name: string; run: (context: EvalContext) => void }> = [
  { name: 'secondary', run: secondaryStage },
  { name: 'electrostatics', run: electrostaticsStage },
  { name: 'resonator', run: resonatorStage },
  { name: 'primary', run: primaryStage },
  { name: 'dynamics', run: dynamicsStage },
  { name: 'outcome', run: outcomeStage },
  { name: 'tank', run: tankStage },
];

/**
 * Told the name of each step as it begins ('prepare' for the tank as built, then each stage of
 * EVALUATION_STAGES that runs, then 'profile' and 'done'): a profiler's hook; the evaluation ignores it.
 */
export type StageObserver = (step: string) => void;

/** Evaluates one design through every stage of the physics core. */
export function evaluateDesign(design: Design): Evaluation {
  return evaluateDesignInDetail(design).evaluation;
}

/**
 * The same evaluation with its working record (the stages' geometry: winding, primary rings and
 * tap, the distributed model), for pictures of the design.
 */
export function evaluateDesignInDetail(
  design: Design,
  observe?: StageObserver,
): { evaluation: Evaluation; context: EvalContext } {
  observe?.('prepare');
  const metrics = emptyMetrics();
  const warnings: DesignWarning[] = [];
  const problems: DesignProblem[] = [];
  // The tank as built (a bank of parts, the charge the supply reaches) is what every stage sees.
  const prepared = prepareTank(design, metrics, warnings, problems);
  const context: EvalContext = { design: prepared.design, metrics, warnings, problems, tankBank: prepared.layout };
  for (const stage of EVALUATION_STAGES) {
    if (context.problems.length > 0) break;
    observe?.(stage.name);
    stage.run(context);
  }
  observe?.('profile');
  context.metrics.warning_count = context.warnings.length;
  const profile = context.resonator && context.problems.length === 0 ? profileTable(context.resonator) : null;
  observe?.('done');
  return {
    evaluation: { metrics: context.metrics, warnings: context.warnings, problems: context.problems, profile },
    context,
  };
}

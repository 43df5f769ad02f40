/**
 * The sensitivity study shared by `coilfront sensitivity` (cli/sensitivity-command.ts) and a sweep's
 * `- sensitivity: { samples }` stage: the plan read from a sweep file, and the study evaluated into a
 * directory, locked while it runs, through its journal (run/sensitivity-run.ts).
 */
import { join } from 'node:path';
import { spaceDefinitionOf } from '../optimize/design-space.ts';
import type { SensitivityPlan, SaltelliOutputs } from '../optimize/sensitivity/index.ts';
import type { ShouldStop } from '../optimize/stage-stop.ts';
import { openEvaluator } from '../run/evaluator.ts';
import { RUN_FILES } from '../run/run-directory.ts';
import { runSensitivityStudy, SENSITIVITY_JOURNAL } from '../run/sensitivity-run.ts';
import type { Shard } from '../run/shard.ts';
import { lockRunOrRefuse } from '../run/sweep-setup.ts';
import { defaultWorkerCount } from '../workers/pool.ts';
import { fileError } from './input-errors.ts';
import type { CliIo } from './io.ts';
import { writeSensitivityOutputs } from './sensitivity-outputs.ts';
import { writeSummarySection } from './stage-outputs.ts';
import { loadRunSpec, type SweepSpec } from './sweep-spec.ts';

/** The study of a read sweep file (`file` names it in messages): its plan, and its identity (the spec hash). */
export function planOfSpec(
  spec: SweepSpec,
  file: string,
  samples: number,
): { plan: SensitivityPlan; identity: string } {
  const k = spec.dimensions.length;
  if (k < 1 || k > 32) throw fileError(file, `sensitivity needs 1 to 32 swept fields, the file has ${k}`);
  const metrics = [...new Set([...spec.objectives.map((o) => o.metric), ...spec.constraints.map((c) => c.metric)])];
  if (metrics.length === 0) throw fileError(file, `no objectives or constraints to analyse`);
  const required = spec.objectives.map((o) => o.metric);
  const plan = { definition: spaceDefinitionOf(spec), samples, metrics, constraints: spec.constraints, required };
  return { plan, identity: spec.hash };
}

/** The study evaluated into `directory` (locked while it runs) through its journal. */
export async function lockedStudy(
  directory: string,
  plan: SensitivityPlan,
  identity: string,
  options: { workers?: number; shard?: Shard | null; shouldStop?: ShouldStop },
  io: CliIo,
): Promise<SaltelliOutputs> {
  const lock = lockRunOrRefuse(directory);
  try {
    const threads = options.workers ?? defaultWorkerCount();
    return await runSensitivityStudy({
      journalPath: join(directory, SENSITIVITY_JOURNAL),
      identity,
      plan,
      evaluator: openEvaluator(plan.definition, threads),
      threads,
      shard: options.shard ?? null,
      notice: (line) => io.err(`${line}\n`),
      ...(options.shouldStop ? { shouldStop: options.shouldStop } : {}),
    });
  } finally {
    lock.release();
  }
}

/** The name of the section of summary.json that a sweep's sensitivity stage writes. */
export const SOBOL_SECTION = 'sobol';

export interface SensitivityStageOptions {
  samples: number;
  workers?: number;
  /** Polled between batches (the stages' stop request): true stops with StageStopped, the journal kept. */
  shouldStop?: ShouldStop;
}

/**
 * A sweep's `- sensitivity: { samples }` stage on its finished run directory: the study of `coilfront
 * sensitivity DIR/spec.yaml --samples N --out DIR` (the same plan, identity and journal, so the same files),
 * and the `sobol` section of summary.json, which holds what sensitivity.json holds less its safety line.
 */
export async function sensitivityStage(
  directory: string,
  options: SensitivityStageOptions,
  io: CliIo,
): Promise<number> {
  const file = join(directory, RUN_FILES.spec);
  const { plan, identity } = planOfSpec(loadRunSpec(directory), file, options.samples);
  const outputs = await lockedStudy(directory, plan, identity, options, io);
  const study = writeSensitivityOutputs(directory, plan, outputs, io);
  const path = writeSummarySection(directory, SOBOL_SECTION, study);
  io.out(`the same indices are in the '${SOBOL_SECTION}' section of ${path}\n`);
  return 0;
}

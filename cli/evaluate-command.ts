/**
 * `coilfront evaluate FILE [--json]`: one design, a readable report or the JSON contract.
 */
import { evaluateDesign, type Evaluation } from '../core/evaluate.ts';
import { fieldError } from '../run/input-error.ts';
import { loadDesignFile } from './load-design.ts';
import { formatReport } from './report.ts';
import type { NormalTree } from './design-schema.ts';
import { treeToJson } from './tree-json.ts';
import type { CliIo } from './io.ts';

/** The JSON contract (README, Metrics and Warnings): { design, metrics, warnings }, SI units. */
export function evaluationJson(tree: NormalTree, evaluation: Evaluation): Record<string, unknown> {
  return {
    design: treeToJson(tree),
    metrics: evaluation.metrics,
    warnings: evaluation.warnings,
    profile: evaluation.profile,
  };
}

export function evaluateCommand(file: string, options: { json?: boolean }, io: CliIo): number {
  const loaded = loadDesignFile(file);
  const evaluation = evaluateDesign(loaded.design);
  if (evaluation.problems.length > 0) {
    const problem = evaluation.problems[0];
    throw fieldError(file, { path: problem.field.split('.'), message: problem.reason });
  }
  if (options.json) io.out(`${JSON.stringify(evaluationJson(loaded.tree, evaluation), null, 2)}\n`);
  else io.out(formatReport(file, evaluation));
  return 0;
}

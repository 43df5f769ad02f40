/** Stage of the evaluation pipeline (see core/evaluate.ts): secondary. */
import type { EvalContext } from '../context.ts';

export function secondaryStage(context: EvalContext): void {
  void context; // filled in by the secondary work
}

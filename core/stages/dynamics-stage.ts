/** Stage of the evaluation pipeline (see core/evaluate.ts): dynamics. */
import type { EvalContext } from '../context.ts';

export function dynamicsStage(context: EvalContext): void {
  void context; // filled in by the dynamics work
}

/** Stage of the evaluation pipeline (see core/evaluate.ts): outcome. */
import type { EvalContext } from '../context.ts';

export function outcomeStage(context: EvalContext): void {
  void context; // filled in by the outcome work
}

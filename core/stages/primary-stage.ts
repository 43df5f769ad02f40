/** Stage of the evaluation pipeline (see core/evaluate.ts): primary. */
import type { EvalContext } from '../context.ts';

export function primaryStage(context: EvalContext): void {
  void context; // filled in by the primary work
}

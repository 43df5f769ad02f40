/** Stage of the evaluation pipeline (see core/evaluate.ts): electrostatics. */
import type { EvalContext } from '../context.ts';

export function electrostaticsStage(context: EvalContext): void {
  void context; // filled in by the electrostatics work
}

/**
 * The worker entry: one function of one plain argument (a BatchTask). The design space comes once,
 * in workerData; results go back with their buffers moved, not copied.
 *
 * Test hook (never set in normal use): COILFRONT_TEST_CRASH="<index>" makes the worker thread exit
 * when it reaches that sample index; "<index>:once:<file>" only while <file> does not exist (it is
 * created first), so a retry succeeds. The overnight tests use it to prove crash recovery.
 */
import { existsSync, writeFileSync } from 'node:fs';
import { Piscina } from 'piscina';
import { DesignSpace, type SpaceDefinition } from '../optimize/design-space.ts';
import { evaluateBatchTask, type BatchTask, type BatchResult } from '../optimize/evaluate-batch.ts';
import { evaluateDesign, type Evaluation } from '../core/evaluate.ts';
import type { Design } from '../core/design.ts';

const definition = (Piscina.workerData as { space: SpaceDefinition | null }).space;
const space = definition ? new DesignSpace(definition) : null;

function crashHook(): ((index: number) => void) | undefined {
  const setting = process.env.COILFRONT_TEST_CRASH;
  if (!setting) return undefined;
  const [indexText, mode, marker] = setting.split(':');
  const crashIndex = Number(indexText);
  return (index: number) => {
    if (index !== crashIndex) return;
    if (mode === 'once' && marker) {
      if (existsSync(marker)) return;
      writeFileSync(marker, 'crashed once\n');
    }
    process.exit(3);
  };
}

const beforeDesign = crashHook();

/** Moves the result's buffers to the main thread instead of copying them (piscina's Transferable). */
class MovedResult {
  constructor(private readonly result: BatchResult) {}
  get [Piscina.transferableSymbol](): ArrayBuffer[] {
    const { values, metrics, status, warningMasks } = this.result;
    return [values.buffer, metrics.buffer, status.buffer, warningMasks.buffer] as ArrayBuffer[];
  }
  get [Piscina.valueSymbol](): BatchResult {
    return this.result;
  }
}

/** Whole designs (SI), for `evaluate --batch`: one Evaluation each, in order. */
export interface DesignsTask {
  kind: 'designs';
  designs: Design[];
}

export default function evaluateTask(task: BatchTask | DesignsTask): BatchResult | Evaluation[] {
  if (task.kind === 'designs') return task.designs.map((design) => evaluateDesign(design));
  if (!space) throw new Error('this worker pool has no design space: it evaluates whole designs only');
  const result = evaluateBatchTask(space, task, beforeDesign ? { beforeDesign } : undefined);
  return Piscina.move(new MovedResult(result) as never) as unknown as BatchResult;
}

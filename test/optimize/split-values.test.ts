import { describe, expect, it } from 'vitest';
import { resolve } from 'node:path';
import { loadSweepFile } from '../../cli/sweep-spec.ts';
import { DesignSpace, spaceDefinitionOf } from '../../optimize/design-space.ts';
import { type BatchEvaluator, inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { splitValuesTasks } from '../../optimize/split-values.ts';

// Machinery check: a task cut into chunks must give exactly the result of the whole task (the reference
// is the same evaluator given the task whole). The fixture is invented test data.
describe('splitValuesTasks', () => {
  const spec = loadSweepFile(resolve('test/fixtures/sweep-small.yaml'), { force: true });
  const space = new DesignSpace(spaceDefinitionOf(spec));
  const whole = inProcessEvaluator(space);

  it('joins the chunks of a values task into the result of the whole task, reasons renumbered', async () => {
    const designs = await whole.evaluate({ kind: 'indices', start: 0, count: 37 });
    const task = { kind: 'values' as const, values: designs.values, count: 37 };
    const expected = await whole.evaluate(task);
    const sizes: number[] = [];
    const counting: BatchEvaluator = {
      evaluate: (t) => {
        sizes.push(t.count);
        return whole.evaluate(t);
      },
      close: async () => {},
    };
    const joined = await splitValuesTasks(counting, 8).evaluate(task);
    expect(sizes).toEqual([8, 8, 8, 8, 5]);
    expect(joined.count).toBe(37);
    expect(Array.from(joined.values)).toEqual(Array.from(expected.values));
    expect(Array.from(joined.metrics)).toEqual(Array.from(expected.metrics));
    expect(Array.from(joined.status)).toEqual(Array.from(expected.status));
    expect(Array.from(joined.warningMasks)).toEqual(Array.from(expected.warningMasks));
    expect(expected.reasons.some(([row]) => row >= 8)).toBe(true); // reasons in later chunks are renumbered
    expect(joined.reasons).toEqual(expected.reasons);
  });

  it('passes small and indices tasks through whole, and refuses a chunk size below 1', async () => {
    const sizes: number[] = [];
    const counting: BatchEvaluator = {
      evaluate: (t) => {
        sizes.push(t.count);
        return whole.evaluate(t);
      },
      close: async () => {},
    };
    await splitValuesTasks(counting, 8).evaluate({ kind: 'indices', start: 0, count: 20 });
    expect(sizes).toEqual([20]);
    expect(() => splitValuesTasks(counting, 0)).toThrow(RangeError);
  });
});

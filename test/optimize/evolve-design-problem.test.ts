import { describe, expect, it } from 'vitest';
import { METRIC_KEYS } from '../../core/metrics.ts';
import type { Dimension } from '../../optimize/design-tree.ts';
import type { BatchEvaluator, BatchResult } from '../../optimize/evaluate-batch.ts';
import { designProblem } from '../../optimize/evolve/design-problem.ts';
import { evolve } from '../../optimize/evolve/index.ts';
import { hypervolume } from '../../optimize/pareto/index.ts';
import { SweepState } from '../../optimize/sweep-state.ts';

const dimensions: Dimension[] = [
  {
    kind: 'range',
    path: ['a'],
    quantity: 'dimensionless',
    from: 0,
    to: 1,
    scale: 'linear',
    integer: false,
    step: null,
  },
  { kind: 'range', path: ['b'], quantity: 'length', from: 0.01, to: 1, scale: 'log', integer: false, step: null },
  { kind: 'range', path: ['c'], quantity: 'dimensionless', from: 3, to: 9, scale: 'linear', integer: true, step: null },
  { kind: 'choose', path: ['d'], values: [0, 0.5, 1], labels: ['zero', 'half', 'one'] },
];

/**
 * A stand-in for the worker pool: metric 0 = a, metric 1 = g·(1 − √(a/g)) with g = 1 + b + (c − 3) + d
 * (ZDT1's form [zitzler2000zdt], minimum g = 1.01 at b = 0.01, c = 3, d = level 0), metric 2 = b.
 */
function fakeEvaluator(): BatchEvaluator & { tasks: number } {
  const evaluator = {
    tasks: 0,
    evaluate: async (task: Parameters<BatchEvaluator['evaluate']>[0]): Promise<BatchResult> => {
      evaluator.tasks++;
      if (task.kind !== 'values') throw new Error('values tasks only');
      const m = METRIC_KEYS.length;
      const metrics = new Float64Array(task.count * m).fill(Number.NaN);
      for (let r = 0; r < task.count; r++) {
        const [a, b, c, d] = task.values.subarray(r * 4, r * 4 + 4);
        const g = 1 + b + (c - 3) + [0, 0.5, 1][d];
        metrics[r * m] = a;
        metrics[r * m + 1] = g * (1 - Math.sqrt(a / g));
        metrics[r * m + 2] = b;
      }
      return {
        start: -1,
        count: task.count,
        values: Float64Array.from(task.values),
        metrics,
        status: new Uint8Array(task.count),
        reasons: [],
        warningMasks: new Uint32Array(task.count),
      };
    },
    close: async () => {},
  };
  return evaluator;
}

describe('the design space as the evolutionary stage sees it', () => {
  const state = new SweepState(
    [
      { metric: METRIC_KEYS[0], sense: 'minimize' },
      { metric: METRIC_KEYS[1], sense: 'minimize' },
    ],
    [{ metric: METRIC_KEYS[2], max: 0.5 }],
    100,
    1,
  );

  it('maps dimension values to genes and back (unit coordinates, level indices)', () => {
    const problem = designProblem(dimensions, fakeEvaluator(), state);
    expect(problem.fields.map((f) => f.kind)).toEqual(['real', 'real', 'levels', 'levels']);
    expect(problem.fields[2]).toEqual({ kind: 'levels', count: 7 });
    const genome = problem.genomeOf([0.25, 0.1, 5, 2]);
    expect(genome[1]).toBeCloseTo(0.5, 12); // log scale: 0.1 is halfway from 0.01 to 1
    expect(Array.from(genome.subarray(2))).toEqual([2, 2]);
    const values = problem.valuesOf(genome);
    expect(values[0]).toBeCloseTo(0.25, 12);
    expect(values[1]).toBeCloseTo(0.1, 12);
    expect(Array.from(values.subarray(2))).toEqual([5, 2]);
  });

  it('evolves through the evaluator, one task per generation, scored by the sweep rules', async () => {
    const evaluator = fakeEvaluator();
    const results: number[] = [];
    const problem = designProblem(dimensions, evaluator, state, (result) => {
      results.push(result.count);
    });
    const run = await evolve(problem, { seed: 3, evaluations: 1000, population: 40 });
    expect(evaluator.tasks).toBe(25);
    expect(results.reduce((a, b) => a + b, 0)).toBe(1000);
    for (const member of run.population) {
      const values = problem.valuesOf(member.genome);
      expect(values[1]).toBeLessThanOrEqual(0.5); // the constraint holds for every survivor
      expect(member.violation).toBe(0);
    }
    // Exact front: g = 1.01, f2 = 1.01·(1 − √(f1/1.01)); every survivor is on or above it, and the
    // hypervolume to (1, 1.1) comes within 5 % of the front's (midpoint rule on 10^5 cells).
    let exact = 0;
    for (let k = 0; k < 100_000; k++) {
      const f1 = (k + 0.5) / 100_000;
      exact += (1.1 - 1.01 * (1 - Math.sqrt(f1 / 1.01))) / 100_000;
    }
    const hv = hypervolume(
      run.population.map((m) => m.objectives),
      [1, 1.1],
    );
    expect(hv).toBeLessThanOrEqual(exact + 1e-6);
    expect(hv).toBeGreaterThan(0.95 * exact);
  });
});

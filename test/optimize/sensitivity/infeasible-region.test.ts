/**
 * Sobol indices where part of the space is infeasible or cannot be built: the feasibility indicator's indices
 * and a metric's indices over complete blocks, against exact solutions derived from the definition of the
 * indices (the variance decomposition of Sobol 1993 [sobol1993]; derived here by hand) for functions whose
 * variance decomposition is found in closed form. The evaluator is a stand-in with known functions, so
 * the checks are of the estimators and the handling of null rows, not of the coil model.
 */
import { describe, expect, it } from 'vitest';
import { METRIC_KEYS, metricIndex } from '../../../core/metrics.ts';
import type { SpaceDefinition } from '../../../optimize/design-space.ts';
import type { Dimension } from '../../../optimize/design-tree.ts';
import { type BatchEvaluator, STATUS_OK, STATUS_PROBLEM } from '../../../optimize/evaluate-batch.ts';
import { type IndexEstimate, type SensitivityPlan, spaceSensitivity } from '../../../optimize/sensitivity/index.ts';

const unitRange = (name: string): Dimension => ({
  kind: 'range',
  path: ['x', name],
  quantity: 'dimensionless',
  from: 0,
  to: 1,
  scale: 'linear',
  integer: false,
  step: null,
});

const definition: SpaceDefinition = {
  tree: {},
  dimensions: [unitRange('u1'), unitRange('u2'), unitRange('u3')],
  method: 'sobol',
  samples: 1,
  seed: 11,
  gridLevels: null,
};

const METRIC = 'spark_length';
const BOUNDED = 'overall_height';
const c = [1, 2, 3];
const a = 0.6; // u1 > a: the design cannot be built
const b = 0.7; // u2 > b: built, but misses its constraint

/** A stand-in evaluator: metric = Σ cᵢuᵢ, BOUNDED = u2 (max b); rows with u1 > limit cannot be built. */
const standIn = (limit: number): BatchEvaluator => ({
  async evaluate(task) {
    if (task.kind !== 'values') throw new Error('values tasks only');
    const width = METRIC_KEYS.length;
    const metrics = new Float64Array(task.count * width).fill(Number.NaN);
    const status = new Uint8Array(task.count);
    for (let row = 0; row < task.count; row++) {
      const u = task.values.subarray(row * 3, row * 3 + 3);
      if (u[0] > limit) {
        status[row] = STATUS_PROBLEM;
        continue;
      }
      status[row] = STATUS_OK;
      metrics[row * width + metricIndex(METRIC)] = c[0] * u[0] + c[1] * u[1] + c[2] * u[2];
      metrics[row * width + metricIndex(BOUNDED)] = u[1];
    }
    const reasons: [number, string][] = [];
    for (let row = 0; row < task.count; row++) if (status[row] !== STATUS_OK) reasons.push([row, 'x.u1: too large']);
    const values = task.values;
    return {
      start: -1,
      count: task.count,
      values,
      metrics,
      status,
      reasons,
      warningMasks: new Uint32Array(task.count),
    };
  },
  async close() {},
});

function expectWithin(estimate: IndexEstimate | undefined, exact: number, slack = 0) {
  expect(estimate).toBeDefined();
  expect((estimate?.low ?? Number.NaN) - slack).toBeLessThanOrEqual(exact);
  expect((estimate?.high ?? Number.NaN) + slack).toBeGreaterThanOrEqual(exact);
}

describe('Sobol indices with an infeasible region', () => {
  const N = 4096;
  const plan: SensitivityPlan = {
    definition,
    samples: N,
    metrics: [METRIC],
    constraints: [{ metric: BOUNDED, max: b }],
    required: [METRIC],
  };
  const result = spaceSensitivity(plan, standIn(a), { resamples: 300, seed: 5, batchSize: 512 });

  it('gives the feasibility indicator [u1 < a]·[u2 < b] its exact indices, over all N samples', async () => {
    // Exact solution (derived from the definition of the indices; independent uniform inputs): with p1 = a,
    // p2 = b, V = p1p2(1 − p1p2); V1 = p2²·p1(1 − p1), V2 = p1²·p2(1 − p2); VT1 = p2·p1(1 − p1),
    // VT2 = p1·p2(1 − p2); u3 does not enter: S3 = ST3 = 0.
    const { feasibility } = await result;
    const v = a * b * (1 - a * b);
    const s1 = [(b * b * a * (1 - a)) / v, (a * a * b * (1 - b)) / v, 0];
    const st = [(b * a * (1 - a)) / v, (a * b * (1 - b)) / v, 0];
    expect(feasibility.points).toBe(2 * N);
    // The first 2^m Sobol points stratify each coordinate: the shares are far closer than binomial noise.
    expect(Math.abs(feasibility.feasible / feasibility.points - a * b)).toBeLessThan(0.01);
    expect(Math.abs(feasibility.impossible / feasibility.points - (1 - a))).toBeLessThan(0.01);
    for (let i = 0; i < 3; i++) {
      expectWithin(feasibility.indices?.first[i], s1[i]);
      expectWithin(feasibility.indices?.total[i], st[i]);
    }
    expect(feasibility.indices?.total[2].value).toBe(0); // exactly: the indicator never reads u3
  });

  it('gives a metric null where u1 > a the exact indices conditioned on the box u1 < a (complete blocks)', async () => {
    // Sample j is kept when A_j and B_j both have u1 < a (AB⁽ⁱ⁾ takes u1 from one of them), so the kept
    // samples are a Saltelli design of u1 ~ U(0, a), u2, u3 ~ U(0, 1), independent. Exact for the additive
    // f = Σ cᵢuᵢ: Sᵢ = STᵢ = cᵢ² Var(uᵢ)/Σ cⱼ² Var(uⱼ), Var(u1) = a²/12, Var(u2) = Var(u3) = 1/12.
    const metric = (await result).metrics[0];
    expect(metric.basis).toBe('complete-blocks');
    expect(Math.abs(metric.kept / N - a * a)).toBeLessThan(0.01);
    const variances = [(a * a) / 12, 1 / 12, 1 / 12];
    const total = c.reduce((sum, ci, i) => sum + ci * ci * variances[i], 0);
    for (let i = 0; i < 3; i++) {
      const exact = (c[i] * c[i] * variances[i]) / total;
      expectWithin(metric.indices?.first[i], exact);
      expectWithin(metric.indices?.total[i], exact);
    }
    // The unconditioned index of u1, c1²/Σc² = 1/14, lies outside the interval: the conditioning is seen.
    expect(metric.indices?.total[0].high).toBeLessThan(1 / 14);
    // Designs that are built but miss the constraint (u2 > b) keep their metric: without that the share
    // kept would be near (a·b)², and u2's index would be that of u2 ~ U(0, b).
    expect(metric.kept / N).toBeGreaterThan(a * a - 0.01);
  });

  it('says "all" when every sample has the metric, and gives the exact indices of the whole space', async () => {
    // Nothing impossible: Sᵢ = STᵢ = cᵢ²/Σcⱼ² for uniform inputs (exact, additive function).
    const whole = await spaceSensitivity({ ...plan, samples: 4096 }, standIn(1), { resamples: 300, seed: 5 });
    const metric = whole.metrics[0];
    expect(metric.basis).toBe('all');
    expect(metric.kept).toBe(4096);
    expect(whole.feasibility.impossible).toBe(0);
    const total = c.reduce((sum, ci) => sum + ci * ci, 0);
    for (let i = 0; i < 3; i++) {
      expectWithin(metric.indices?.first[i], (c[i] * c[i]) / total);
      expectWithin(metric.indices?.total[i], (c[i] * c[i]) / total);
    }
    // The conditioned index of u1 (first check) is far from this one: the handling of null rows matters.
    const conditioned = (c[0] * c[0] * a * a) / (c[0] * c[0] * a * a + c[1] * c[1] + c[2] * c[2]);
    expect(metric.indices?.total[0].low).toBeGreaterThan(conditioned);
  });
});

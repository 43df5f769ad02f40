import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { spaceDefinitionOf } from '../../cli/sweep-command.ts';
import { DesignSpace } from '../../optimize/design-space.ts';
import { evaluateBatchTask, inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { SweepState } from '../../optimize/sweep-state.ts';
import { unpackRow } from '../../optimize/packed-row.ts';
import { METRIC_KEYS } from '../../core/metrics.ts';
import { must } from '../../core/must.ts';

const demo = () => parse(readFileSync('examples/sweeps/science-centre-ceiling.yaml', 'utf8')) as Record<string, any>;

describe('DesignSpace.designAt(index)', () => {
  const spec = sweepFromValue(demo(), 'demo.yaml');
  const space = new DesignSpace(spaceDefinitionOf(spec));

  it('is a pure function of the index: the same design on a second space, in any order', () => {
    const other = new DesignSpace(spaceDefinitionOf(sweepFromValue(demo(), 'again.yaml')));
    for (const index of [17, 3, 4095, 0, 17])
      expect(other.designAt(index).design).toEqual(space.designAt(index).design);
  });

  it('keeps every value inside its range, on its integers and in its set', () => {
    for (let index = 0; index < 500; index++) {
      const { values, design } = space.designAt(index);
      expect(design).not.toBeNull();
      expect([0, 1, 2]).toContain(values[0]);
      expect([0, 1, 2]).toContain(values[1]);
      expect(Number.isInteger(values[2])).toBe(true);
      expect(values[2]).toBeGreaterThanOrEqual(600);
      expect(values[2]).toBeLessThanOrEqual(1400);
      expect(values[3]).toBeGreaterThanOrEqual(0.4);
      expect(values[3]).toBeLessThanOrEqual(0.9);
      expect(must(must(design).secondary).turns).toBe(values[2]);
      expect(must(must(design).secondary).formDiameter).toBe([0.16, 0.2, 0.25][values[0]]);
    }
  });

  it('a grid visits every combination of levels exactly once, ends included', () => {
    const value = demo();
    value.design.secondary.turns = { from: 800, to: 802, integer: true };
    value.design.secondary.base_height = { from: '400 mm', to: '900 mm', step: '250 mm' };
    value.design.topload.outer_diameter = '600 mm';
    value.design.topload.tube_diameter = '150 mm';
    value.sweep = { method: 'grid' };
    const grid = sweepFromValue(value, 'grid.yaml');
    const gridSpace = new DesignSpace(spaceDefinitionOf(grid));
    expect(grid.samples).toBe(3 * 3 * 3 * 3);
    const seen = new Set<string>();
    for (let index = 0; index < grid.samples; index++) seen.add(Array.from(gridSpace.designAt(index).values).join(','));
    expect(seen.size).toBe(grid.samples);
    const heights = new Set([...seen].map((key) => Number(key.split(',')[3])));
    expect([...heights].sort()).toEqual([0.4, 0.65, 0.9]);
  });
});

describe('SweepState.offerBatch(result)', () => {
  const spec = sweepFromValue({ ...demo(), sweep: { method: 'sobol', samples: 240, seed: 9 } }, 'demo.yaml');
  const space = new DesignSpace(spaceDefinitionOf(spec));
  const batches = [0, 60, 120, 180].map((start) => evaluateBatchTask(space, { kind: 'indices', start, count: 60 }));

  const fill = (order: number[]) => {
    const state = new SweepState(spec.objectives, spec.constraints, 50, spec.seed);
    for (const b of order) state.offerBatch(batches[b], spec.dimensions.length);
    return state;
  };

  it('counts every design once: evaluated = feasible + infeasible + impossible + failed', () => {
    const { counts } = fill([0, 1, 2, 3]);
    expect(counts.evaluated).toBe(240);
    expect(counts.feasible + counts.infeasible + counts.impossible + counts.failed).toBe(240);
  });

  it('gives the same state in any arrival order, and the same after a JSON round trip', () => {
    const a = fill([0, 1, 2, 3]);
    const b = fill([3, 1, 0, 2]);
    expect(JSON.stringify(b.toJSON())).toBe(JSON.stringify(a.toJSON()));
    const restored = SweepState.restore(
      JSON.parse(JSON.stringify(a.toJSON())),
      spec.objectives,
      spec.constraints,
      50,
      spec.seed,
    );
    expect(JSON.stringify(restored.toJSON())).toBe(JSON.stringify(a.toJSON()));
  });

  it('merging two halves equals one state of the whole (cluster shards)', () => {
    const whole = fill([0, 1, 2, 3]);
    const first = fill([0, 1]);
    first.merge(fill([2, 3]));
    expect(JSON.stringify(first.pool.ranked(50).map((e) => e.item.index))).toBe(
      JSON.stringify(whole.pool.ranked(50).map((e) => e.item.index)),
    );
    expect(first.counts).toEqual(whole.counts);
    expect(first.rejectedBy).toEqual(whole.rejectedBy);
  });

  it('ranks only designs meeting every constraint as feasible (Deb 2000: feasible before infeasible)', () => {
    const state = fill([0, 1, 2, 3]);
    const ranked = state.pool.ranked(240);
    let seenInfeasible = false;
    for (const entry of ranked) {
      const metrics = unpackRow(entry.payload).metrics;
      // The stored row equals the evaluation of that sample.
      const batch = batches[Math.floor(entry.item.index / 60)];
      const offset = (entry.item.index % 60) * METRIC_KEYS.length;
      expect(metrics).toEqual(
        Array.from(batch.metrics.subarray(offset, offset + METRIC_KEYS.length), (v) => (Number.isFinite(v) ? v : null)),
      );
      const ok = spec.constraints.every((c) => {
        const value = metrics[METRIC_KEYS.indexOf(c.metric)];
        return (
          value !== null &&
          value !== undefined &&
          (c.min === undefined || value >= c.min) &&
          (c.max === undefined || value <= c.max)
        );
      });
      expect(ok).toBe(entry.item.violation === 0);
      if (entry.item.violation > 0) seenInfeasible = true;
      else expect(seenInfeasible).toBe(false);
    }
  });

  it('the in-process evaluator gives the same rows as evaluating the batch directly', async () => {
    const evaluator = inProcessEvaluator(space);
    const result = await evaluator.evaluate({ kind: 'indices', start: 60, count: 60 });
    expect(Array.from(result.metrics)).toEqual(Array.from(batches[1].metrics));
  });
});

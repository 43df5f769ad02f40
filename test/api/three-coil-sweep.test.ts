/**
 * A sweep over a three-coil design (the invented exhibit of examples/) with the breakout point and
 * the support of the resonator's topload as constraints and objectives: each candidate's metrics
 * are those its own design evaluates to, and a constraint on them is honoured. Machinery, not
 * physics: the figures themselves are checked in test/core/three-coil/three-coil-topload-parts.test.ts.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { parse as parseYaml } from 'yaml';
import { evaluateDesign, readDesign, sweep } from '../../api/index.ts';
import { REPO } from '../cli/sweep-harness.ts';

describe('a sweep of a three-coil design on its breakout point and support', () => {
  it('ranks on breakout_margin under a support_field_margin and breakout_point_voltage constraint', async () => {
    const design = parseYaml(readFileSync(join(REPO, 'examples', 'three-coil-exhibit.yaml'), 'utf8')) as Record<
      string,
      Record<string, unknown>
    >;
    const spec = {
      design: {
        ...design,
        breakout_point: { position: 'top', tip_radius: '3 mm', fire_at_fraction: { from: 0.4, to: 0.95 } },
        supports: { kind: 'column', from: 'winding_top', diameter: { from: '20 mm', to: '120 mm' } },
      },
      constraints: { support_field_margin: { min: 3 }, breakout_point_voltage: { max: '550 kV' } },
      objectives: [{ maximize: 'breakout_margin' }, { maximize: 'support_field_margin' }],
      sweep: { method: 'sobol', samples: 12, seed: 7 },
    };
    const result = await sweep(spec, { workers: 0, batchSize: 4 });
    expect(result.counts.evaluated).toBe(12);
    expect(result.candidates.length).toBeGreaterThan(0);
    // the constraints bind: some samples miss them
    expect(result.counts.feasible).toBeLessThan(12);
    for (const candidate of result.candidates) {
      const metrics = candidate.metrics;
      expect(metrics.breakout_point_voltage).not.toBeNull();
      expect(metrics.support_peak_field_per_volt).not.toBeNull();
      expect(metrics.support_field_margin ?? 0).toBeGreaterThanOrEqual(3);
      expect(metrics.breakout_point_voltage ?? Infinity).toBeLessThanOrEqual(550e3);
      expect(evaluateDesign(candidate.design ?? readDesign({})).metrics).toEqual(metrics);
    }
    // the infeasible ones miss a constraint, not the evaluation
    for (const miss of result.nearMisses) expect(miss.violation).toBeGreaterThan(0);
  });
});

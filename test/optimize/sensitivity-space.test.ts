import { readFileSync } from 'node:fs';
import { parse } from 'yaml';
import { describe, expect, it } from 'vitest';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { DesignSpace } from '../../optimize/design-space.ts';
import { inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { spaceSensitivity } from '../../optimize/sensitivity/index.ts';

describe('spaceSensitivity on the example sweep', () => {
  it('gives a total index of exactly 0 to fields a metric does not read (exact: f(A) = f(AB(i)))', async () => {
    const file = 'examples/sweeps/science-centre-ceiling.yaml';
    const spec = sweepFromValue(parse(readFileSync(file, 'utf8')), file);
    const definition = {
      tree: spec.tree,
      dimensions: spec.dimensions,
      method: spec.method,
      samples: spec.samples,
      seed: spec.seed,
      gridLevels: spec.gridLevels,
    };
    const plan = { definition, samples: 16, metrics: ['secondary_turns'], constraints: [], required: [] };
    const result = (await spaceSensitivity(plan, inProcessEvaluator(new DesignSpace(definition)), { resamples: 50 }))
      .metrics;
    const turns = spec.dimensions.findIndex((d) => d.path.join('.') === 'secondary.turns');
    const indices = result[0].indices;
    expect(result[0].kept).toBeGreaterThan(1);
    expect(indices).not.toBeNull();
    for (let d = 0; d < spec.dimensions.length; d++) {
      // The turn count metric reads only the turns field, so every other total index is exactly 0.
      if (d === turns) expect(indices?.total[d].value).toBeGreaterThan(0);
      else expect(indices?.total[d].value).toBe(0);
    }
  });
});

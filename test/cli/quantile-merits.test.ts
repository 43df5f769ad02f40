import { mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseYaml, stringify as stringifyYaml } from 'yaml';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { summaryQuantileSlots } from '../../cli/quantile-merits.ts';
import { describe, expect, it } from 'vitest';
import { sweepFromValue } from '../../cli/sweep-spec.ts';
import { metricIndex, METRIC_KEYS } from '../../core/metrics.ts';
import { DesignSpace, spaceDefinitionOf } from '../../optimize/design-space.ts';
import { evaluateBatchTask, inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { candidateTolerance, toleranceSpace } from '../../optimize/tolerance/index.ts';
import { must } from '../../core/must.ts';

const SWEEP = 'test/fixtures/sweep-tolerances.yaml';

/** The sweep fixture with one toleranced field, the turns, uniform ±2 %; the turns swept as a real number. */
function linearSweep(draws: number) {
  const value = parseYaml(readFileSync(SWEEP, 'utf8'));
  value.design.secondary.turns = { from: 800, to: 1200 };
  value.sweep.samples = 4;
  value.tolerances = { seed: 7, sweep_draws: draws, secondary: { turns: '±2 %' } };
  value.constraints = { p95: { secondary_turns: { max: 1300 } } };
  value.objectives = [{ minimize: { p05: 'secondary_turns' } }, { maximize: { p50: 'secondary_turns' } }];
  return value;
}

describe('quantile merits in a sweep', () => {
  it('reads { p05: metric } objectives and pNN constraints into build_quantile slots, objectives first', () => {
    const spec = sweepFromValue(linearSweep(64), 'q.yaml');
    expect(spec.objectives).toEqual([
      { metric: 'build_quantile_1', sense: 'minimize' },
      { metric: 'build_quantile_2', sense: 'maximize' },
    ]);
    expect(spec.constraints).toEqual([{ metric: 'build_quantile_3', max: 1300 }]);
    expect(must(spec.robust, 'robust').quantiles).toEqual([
      { metric: 'secondary_turns', p: 0.05 },
      { metric: 'secondary_turns', p: 0.5 },
      { metric: 'secondary_turns', p: 0.95 },
    ]);
    // The robust merits themselves are not constraints of a build.
    expect(must(spec.robust, 'robust').constraints).toEqual([]);
  });

  it('gives the exact quantiles of a metric linear in one uniformly spread field, within the stratification bound', () => {
    // Exact solution: secondary_turns = N (1 + 0.02 z), z = 2u − 1 with u uniform on (0, 1), so its p quantile
    // is N (1 + 0.02 (2p − 1)). The first n = 64 points of a scrambled Sobol coordinate lie one in each
    // cell [k/n, (k+1)/n), so order statistic k of u lies in that cell and the definition-7 interpolation at
    // h = (n − 1)p lies in [⌊h⌋/n, (⌊h⌋ + 2)/n): within 2/n of p in u, 2·0.02·N·2/n ≈ 1.2 turns at N = 1000.
    // (Independent draws would have a standard error of √(p(1 − p)/n) ≈ 0.027 in u at p = 0.05: 1.1 turns.)
    const n = 64;
    const spec = sweepFromValue(linearSweep(n), 'q.yaml');
    const space = new DesignSpace(spaceDefinitionOf(spec));
    const result = evaluateBatchTask(space, { kind: 'indices', start: 0, count: 4 });
    const turnsDimension = space.definition.dimensions.findIndex((d) => d.path.join('.') === 'secondary.turns');
    let checked = 0;
    for (let row = 0; row < result.count; row++) {
      if (result.status[row] !== 0) continue;
      const nominal = result.values[row * space.dimensionCount + turnsDimension];
      const metrics = result.metrics.subarray(row * METRIC_KEYS.length, (row + 1) * METRIC_KEYS.length);
      expect(metrics[metricIndex('secondary_turns')]).toBeCloseTo(nominal, 9);
      for (const [slot, p] of [
        ['build_quantile_1', 0.05],
        ['build_quantile_2', 0.5],
        ['build_quantile_3', 0.95],
      ] as const) {
        const h = (n - 1) * p;
        const low = nominal * (1 + 0.02 * (2 * (Math.floor(h) / n) - 1));
        const high = nominal * (1 + 0.02 * (2 * ((Math.floor(h) + 2) / n) - 1));
        const value = metrics[metricIndex(slot)];
        expect(value).toBeGreaterThanOrEqual(low);
        expect(value).toBeLessThanOrEqual(high);
        expect(Math.abs(value - nominal * (1 + 0.02 * (2 * p - 1)))).toBeLessThan(0.02 * nominal * (4 / n));
      }
      // Every draw stays below 1.02 N ≤ 1224 < 1300: the yield under the p95 constraint is the whole.
      expect(metrics[metricIndex('build_yield')]).toBe(1);
      checked++;
    }
    expect(checked).toBeGreaterThan(0);
  });

  it('equals the quantile coilfront tolerance computes over the same draws (common random numbers)', async () => {
    const value = linearSweep(16);
    value.tolerances.secondary = {
      turns: '±2 %',
      base_height: { spread: '±20 mm', distribution: 'normal', sigmas: 2 },
    };
    value.tolerances.tank = { capacitance: '±10 %' };
    value.objectives = [{ minimize: { p05: 'resonant_frequency' } }, { maximize: { p95: 'breakout_voltage' } }];
    const spec = sweepFromValue(value, 'q.yaml');
    const robust = must(spec.robust, 'robust');
    const space = new DesignSpace(spaceDefinitionOf(spec));
    const result = evaluateBatchTask(space, { kind: 'indices', start: 0, count: 2 });
    const tolerance = toleranceSpace(spaceDefinitionOf({ ...spec, robust: undefined }), robust.tolerance.fields);
    const evaluator = inProcessEvaluator(new DesignSpace(tolerance.definition));
    for (let row = 0; row < result.count; row++) {
      if (result.status[row] !== 0) continue;
      const values = result.values.subarray(row * space.dimensionCount, (row + 1) * space.dimensionCount);
      const study = await candidateTolerance(tolerance, evaluator, values, {
        draws: 16,
        seed: robust.seed,
        constraints: [],
        required: [],
        metrics: ['resonant_frequency', 'breakout_voltage'],
      });
      const offset = row * METRIC_KEYS.length;
      expect(result.metrics[offset + metricIndex('build_quantile_1')]).toBe(study.quantiles[0].p05);
      expect(result.metrics[offset + metricIndex('build_quantile_2')]).toBe(study.quantiles[1].p95);
    }
  });

  const bad: Array<[string, (v: Record<string, unknown>) => void, RegExp]> = [
    [
      'an unknown metric',
      (v) => {
        v.objectives = [{ minimize: { p05: 'breakout_marginn' } }];
      },
      /^q\.yaml: objectives\[0\]\.minimize\.p05: unknown metric 'breakout_marginn' \(did you mean 'breakout_margin'\?\)/,
    ],
    [
      'p00',
      (v) => {
        v.objectives = [{ minimize: { p00: 'wire_mass' } }];
      },
      /^q\.yaml: objectives\[0\]\.minimize: expected a metric name or one quantile such as \{ p05: metric \}/,
    ],
    [
      'a quantile of build_yield',
      (v) => {
        v.objectives = [{ maximize: { p50: 'build_yield' } }];
      },
      /objectives\[0\]\.maximize\.p50: 'build_yield' is itself a merit over the draws/,
    ],
    [
      'a slot named directly',
      (v) => {
        v.objectives = [{ minimize: 'build_quantile_1' }];
      },
      /objectives\[0\]\.minimize: write a quantile merit as \{ p05: metric \}/,
    ],
    [
      'five quantile merits',
      (v) => {
        v.objectives = [{ minimize: { p05: 'wire_mass' } }, { minimize: { p10: 'wire_mass' } }];
        v.constraints = {
          p20: { wire_mass: { max: 1 } },
          p30: { wire_mass: { max: 1 } },
          p40: { wire_mass: { max: 1 } },
        };
      },
      /constraints\.p40\.wire_mass: at most 4 quantile merits in one sweep/,
    ],
    [
      'a bound of the wrong kind',
      (v) => {
        v.constraints = { p95: { overall_height: { max: '3 kHz' } } };
      },
      /constraints\.p95\.overall_height\.max: /,
    ],
    [
      'no sweep_draws',
      (v) => {
        v.tolerances = { secondary: { turns: '±1 %' } };
      },
      /^q\.yaml: tolerances\.sweep_draws: required for build_yield or a quantile merit/,
    ],
  ];
  for (const [what, change, message] of bad) {
    it(`refuses ${what} with one line naming the field`, () => {
      const value = linearSweep(8);
      change(value);
      expect(() => sweepFromValue(value, 'q.yaml')).toThrow(message);
    });
  }

  it('reads a quantile bound with units into SI', () => {
    const value = linearSweep(8);
    value.constraints = { p95: { overall_height: { max: '2.3 m' } }, wire_length: { max: '900 m' } };
    const spec = sweepFromValue(value, 'q.yaml');
    expect(spec.constraints).toEqual([
      { metric: 'wire_length', max: 900 },
      { metric: 'build_quantile_3', max: 2.3 },
    ]);
  });
});

describe('the build_quantile columns in summary.json and on the console', () => {
  it('records what each column holds (summary.json version 2) and names it where the front is listed', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coilfront-qslots-'));
    writeFileSync(join(dir, 'q.yaml'), stringifyYaml(linearSweep(4)));
    const out: string[] = [];
    const io: CliIo = { out: (t) => out.push(t), err: () => undefined, isTty: false };
    const run = join(dir, 'run');
    expect(await runCli(['sweep', join(dir, 'q.yaml'), '--out', run, '--workers', '0'], io)).toBe(0);
    const summary = JSON.parse(readFileSync(join(run, 'summary.json'), 'utf8'));
    expect(summary.version).toBe(2);
    expect(summary.build_quantiles).toEqual([
      { column: 'build_quantile_1', metric: 'secondary_turns', quantile: 0.05, label: 'secondary_turns p05' },
      { column: 'build_quantile_2', metric: 'secondary_turns', quantile: 0.5, label: 'secondary_turns p50' },
      { column: 'build_quantile_3', metric: 'secondary_turns', quantile: 0.95, label: 'secondary_turns p95' },
    ]);
    expect(summaryQuantileSlots(summary)).toEqual(summary.build_quantiles);
    expect(out.join('')).toContain('build_quantile_1 = secondary_turns p05 over the tolerance draws');
    // A version 1 summary (written before the mapping was recorded) reads as no known mapping.
    expect(summaryQuantileSlots({ ...summary, version: 1 })).toEqual([]);
  }, 60_000);
});

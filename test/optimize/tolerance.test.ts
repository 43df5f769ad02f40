import { quantileSorted } from 'simple-statistics';
import { describe, expect, it } from 'vitest';
import { METRIC_KEYS, metricIndex } from '../../core/metrics.ts';
import { DesignSpace, type SpaceDefinition } from '../../optimize/design-space.ts';
import { fillSlots, type NormalTree } from '../../optimize/design-tree.ts';
import {
  type BatchEvaluator,
  type BatchResult,
  type BatchTask,
  inProcessEvaluator,
} from '../../optimize/evaluate-batch.ts';
import { wilsonInterval } from '../../optimize/sensitivity/wilson.ts';
import {
  candidateTolerance,
  deviateCdf,
  drawRow,
  normalCdf,
  sortedQuantile,
  ToleranceDraws,
  type ToleranceField,
  ToleranceSetupError,
  toleranceSpace,
} from '../../optimize/tolerance/index.ts';

const field = (path: [string, string], extra: Partial<ToleranceField> = {}): ToleranceField => ({
  path,
  mode: 'relative',
  spread: 0.02,
  centre: 0,
  distribution: 'uniform',
  sigmas: 1,
  fallback: null,
  createSection: false,
  ...extra,
});

// A small real design (invented demo scenario): secondary and toroid alone, no primary.
const TREE: NormalTree = {
  secondary: { form_diameter: 0.11, wire: { awg: 28 }, turns: 900, base_height: 0.3 },
  topload: { shape: 'toroid', outer_diameter: 0.3, tube_diameter: 0.075, height_above_winding: 0.05 },
};

const singleDesign = (tree: NormalTree): SpaceDefinition => ({
  tree,
  dimensions: [],
  method: 'random',
  samples: 1,
  seed: 1,
  gridLevels: null,
});

/**
 * An evaluator standing in for the model: metric `overall_height` is the value of tolerance column
 * `column` of each row (a metric exactly linear in one toleranced field), every other metric NaN. It
 * records the rows it is given.
 */
function linearEvaluator(width: number, column: number, seen: number[][] = []): BatchEvaluator {
  const metricCount = METRIC_KEYS.length;
  const height = metricIndex('overall_height');
  return {
    evaluate: async (task: BatchTask): Promise<BatchResult> => {
      if (task.kind !== 'values') throw new Error('values only');
      const metrics = new Float64Array(task.count * metricCount).fill(Number.NaN);
      for (let row = 0; row < task.count; row++) {
        const values = Array.from(task.values.subarray(row * width, (row + 1) * width));
        seen.push(values);
        metrics[row * metricCount + height] = values[column];
      }
      return {
        start: -1,
        count: task.count,
        values: task.values,
        metrics,
        status: new Uint8Array(task.count),
        reasons: [],
        warningMasks: new Uint32Array(task.count),
      };
    },
    close: async () => {},
  };
}

describe('common random numbers', () => {
  it('gives two candidates of a sweep the same deviations at every draw', async () => {
    const base: SpaceDefinition = {
      ...singleDesign({ ...TREE, secondary: { ...TREE.secondary, base_height: { slot: 0 } } }),
      dimensions: [
        {
          kind: 'range',
          path: ['secondary', 'base_height'],
          quantity: 'length',
          from: 0.2,
          to: 0.8,
          scale: 'linear',
          integer: false,
          step: null,
        },
      ],
    };
    const space = toleranceSpace(base, [
      field(['secondary', 'base_height'], { spread: 0.05, distribution: 'normal', sigmas: 3 }),
      field(['topload', 'outer_diameter'], { mode: 'absolute', spread: 0.01 }),
    ]);
    const rows: number[][][] = [[], []];
    const settings = { draws: 64, seed: 9, constraints: [], required: [], metrics: ['overall_height'] };
    await candidateTolerance(space, linearEvaluator(3, 1, rows[0]), [0.3], settings);
    await candidateTolerance(space, linearEvaluator(3, 1, rows[1]), [0.7], settings);
    expect(rows[0].length).toBe(64);
    for (let j = 0; j < 64; j++) {
      // Relative deviation of the range field, absolute deviation of the fixed one: equal for both.
      expect(rows[0][j][1] / 0.3).toBeCloseTo(rows[1][j][1] / 0.7, 12);
      expect(rows[0][j][2]).toBe(rows[1][j][2]);
    }
    // Different draws differ (the deviations are not all one value).
    expect(new Set(rows[0].map((r) => r[2])).size).toBe(64);
  });

  it('draws the same deviations for the same seed and other ones for another seed', () => {
    const fields = [field(['secondary', 'turns'])];
    const a = new Float64Array(1);
    const b = new Float64Array(1);
    const c = new Float64Array(1);
    new ToleranceDraws(fields, 3).deviatesAt(5, a);
    new ToleranceDraws(fields, 3).deviatesAt(5, b);
    new ToleranceDraws(fields, 4).deviatesAt(5, c);
    expect(a[0]).toBe(b[0]);
    expect(c[0]).not.toBe(a[0]);
  });

  it('keeps the stratification of the Sobol points: 2^m uniform draws put one in each 2^-m interval', () => {
    const draws = new ToleranceDraws([field(['secondary', 'turns'])], 11);
    const z = new Float64Array(1);
    const cells = new Set<number>();
    for (let j = 0; j < 64; j++) {
      draws.deviatesAt(j, z);
      cells.add(Math.floor(((z[0] + 1) / 2) * 64));
    }
    expect(cells.size).toBe(64);
  });
});

describe('the yield', () => {
  it('is exactly 1 for a design with no spread that meets its constraints, and exactly 0 for one that misses (real model)', async () => {
    const space = toleranceSpace(singleDesign(TREE), [field(['secondary', 'turns'], { spread: 0 })]);
    const evaluator = inProcessEvaluator(new DesignSpace(space.definition));
    const meets = await candidateTolerance(space, evaluator, [], {
      draws: 6,
      seed: 1,
      constraints: [{ metric: 'overall_height', max: 5 }],
      required: [],
      metrics: ['overall_height'],
    });
    expect(meets.passing).toBe(6);
    expect(meets.yield.estimate).toBe(1);
    expect(meets.quantiles[0].p05).toBe(meets.quantiles[0].p95);
    const misses = await candidateTolerance(space, evaluator, [], {
      draws: 6,
      seed: 1,
      constraints: [{ metric: 'overall_height', max: 0.5 }],
      required: [],
      metrics: ['overall_height'],
    });
    expect(misses.passing).toBe(0);
    expect(misses.yield.estimate).toBe(0);
  });

  it.each([
    ['uniform', 1],
    ['normal', 2],
    ['truncated_normal', 1.5],
  ] as const)(
    'of a bound on a metric linear in one %s field equals the exact probability within its Wilson interval',
    async (distribution, sigmas) => {
      // P(h ≤ max) with h = h0·(1 + s·z): P(z ≤ (max/h0 − 1)/s), the distribution function of z (exact).
      const space = toleranceSpace(singleDesign(TREE), [
        field(['topload', 'tube_diameter'], { mode: 'absolute', spread: 0.004 }),
        field(['secondary', 'base_height'], { spread: 0.1, distribution, sigmas }),
      ]);
      const draws = 1024;
      const result = await candidateTolerance(space, linearEvaluator(2, 1), [], {
        draws,
        seed: 5,
        constraints: [{ metric: 'overall_height', max: 0.31 }],
        required: [],
        metrics: ['overall_height'],
      });
      const exact = deviateCdf({ distribution, sigmas }, (0.31 / 0.3 - 1) / 0.1);
      expect(result.yield.low).toBeLessThanOrEqual(exact);
      expect(result.yield.high).toBeGreaterThanOrEqual(exact);
      // Quasi-random points do far better than the binomial interval: within 1/draws·4 here.
      expect(Math.abs(result.yield.estimate - exact)).toBeLessThan(4 / draws);
      expect(result.yield).toEqual(wilsonInterval(result.passing, draws));
    },
  );

  it('uses the normal law with the spread as k standard deviations (P(z ≤ 0.5) = Φ(k/2))', () => {
    expect(deviateCdf({ distribution: 'normal', sigmas: 2 }, 0.5)).toBeCloseTo(normalCdf(1), 15);
    expect(deviateCdf({ distribution: 'truncated_normal', sigmas: 2 }, 1)).toBe(1);
    expect(deviateCdf({ distribution: 'uniform', sigmas: 1 }, 0)).toBe(0.5);
  });

  it('keeps truncated normal draws inside the spread and normal ones outside it at the expected rate', () => {
    const z = new Float64Array(2);
    const draws = new ToleranceDraws(
      [
        field(['secondary', 'turns'], { distribution: 'truncated_normal', sigmas: 1 }),
        field(['topload', 'outer_diameter'], { distribution: 'normal', sigmas: 1 }),
      ],
      2,
    );
    let outside = 0;
    for (let j = 0; j < 4096; j++) {
      draws.deviatesAt(j, z);
      expect(Math.abs(z[0])).toBeLessThanOrEqual(1);
      if (Math.abs(z[1]) > 1) outside++;
    }
    // Beyond one standard deviation: 2·Q(1) = 0.3173 (A&S Table 26.1).
    expect(outside / 4096).toBeCloseTo(0.3173, 2);
  });
});

describe('the quantiles', () => {
  it('are those of simple-statistics (definition 7) on sorted values', () => {
    const values = [3.1, -2, 7.5, 0, 0, 12, 4.25, 9, -8, 1].sort((a, b) => a - b);
    for (const p of [0, 0.05, 0.1, 0.5, 0.95, 1])
      expect(sortedQuantile(values, p)).toBeCloseTo(quantileSorted(values, p), 14);
    expect(sortedQuantile([42], 0.95)).toBe(42);
    expect(() => sortedQuantile([], 0.5)).toThrow(RangeError);
  });

  it("of a candidate's builds equal simple-statistics' quantiles of the same values", async () => {
    const space = toleranceSpace(singleDesign(TREE), [
      field(['secondary', 'base_height'], { spread: 0.2, distribution: 'normal', sigmas: 2 }),
    ]);
    const seen: number[][] = [];
    const result = await candidateTolerance(space, linearEvaluator(1, 0, seen), [], {
      draws: 101,
      seed: 3,
      constraints: [],
      required: [],
      metrics: ['overall_height'],
    });
    const sorted = seen.map((r) => r[0]).sort((a, b) => a - b);
    expect(result.quantiles[0].kept).toBe(101);
    expect(result.quantiles[0].p05).toBeCloseTo(quantileSorted(sorted, 0.05), 14);
    expect(result.quantiles[0].p50).toBeCloseTo(quantileSorted(sorted, 0.5), 14);
    expect(result.quantiles[0].p95).toBeCloseTo(quantileSorted(sorted, 0.95), 14);
  });
});

describe('toleranceSpace', () => {
  it('finds the nominal in a fixed leaf, a set of quantities, a set of sections and a default, and fills them', () => {
    const base: SpaceDefinition = {
      ...singleDesign({
        secondary: { form_diameter: { slot: 0 }, wire: { awg: 28 }, turns: 900 },
        topload: { slot: 1 },
      }),
      dimensions: [
        { kind: 'choose', path: ['secondary', 'form_diameter'], values: [0.11, 0.16], labels: ['110 mm', '160 mm'] },
        {
          kind: 'choose',
          path: ['topload'],
          values: [
            { shape: 'toroid', outer_diameter: 0.3, tube_diameter: 0.075, height_above_winding: 0.05 },
            { shape: 'sphere', diameter: 0.25, height_above_winding: 0.1 },
          ],
          labels: ['toroid', 'sphere'],
        },
      ],
    };
    const space = toleranceSpace(base, [
      field(['secondary', 'form_diameter'], { spread: 0.1 }),
      field(['topload', 'tube_diameter'], { spread: 0.1 }),
      field(['secondary', 'base_height'], { mode: 'absolute', spread: 0.01, fallback: 0 }),
      field(['environment', 'altitude'], { mode: 'interval', centre: 750, spread: 750, createSection: true }),
    ]);
    expect(space.nominals.map((n) => n.kind)).toEqual(['choice', 'choice', 'fixed', 'none']);
    // Candidate: 160 mm form, the sphere (which has no tube); all deviations +1.
    const row = new Float64Array(6);
    drawRow(space, [1, 1], [1, 1, 1, 1], row);
    expect(Array.from(row.subarray(2))).toEqual([0.16 * 1.1, Number.NaN, 0.01, 1500]);
    const tree = fillSlots(space.definition.tree, space.definition.dimensions, row);
    expect(tree.secondary).toMatchObject({ form_diameter: 0.16 * 1.1, base_height: 0.01 });
    expect(tree.topload).toEqual({ shape: 'sphere', diameter: 0.25, height_above_winding: 0.1 });
    expect(tree.environment).toEqual({ altitude: 1500 });
    // The toroid choice gets its tube perturbed inside the chosen section.
    drawRow(space, [0, 0], [-1, -1, 0, 0], row);
    const toroid = fillSlots(space.definition.tree, space.definition.dimensions, row);
    expect((toroid.topload as Record<string, unknown>).tube_diameter).toBeCloseTo(0.075 * 0.9, 15);
  });

  it('refuses a spread on a field the design does not give and that has no default', () => {
    expect(() => toleranceSpace(singleDesign(TREE), [field(['secondary', 'winding_length'])])).toThrow(
      ToleranceSetupError,
    );
    expect(() => toleranceSpace(singleDesign(TREE), [field(['tank', 'capacitance'])])).toThrow(/no tank section/);
    expect(() => toleranceSpace(singleDesign(TREE), [field(['topload', 'shape'])])).toThrow(/only numeric fields/);
  });
});

describe('the yield through the physics core', () => {
  it('of a ceiling over a topload alone, whose height is linear in its centre height, is Φ(0.5) within its Wilson interval', async () => {
    // overall_height = center_height + tube_diameter/2 exactly (geometry); centre ±20 mm at 2σ (σ = 10 mm),
    // ceiling 5 mm above the nominal top: P = Φ(0.5) = 0.691462 (A&S Table 26.1).
    const tree: NormalTree = {
      topload: { shape: 'toroid', outer_diameter: 0.3, tube_diameter: 0.075, center_height: 1 },
    };
    const space = toleranceSpace(singleDesign(tree), [
      field(['topload', 'center_height'], { mode: 'absolute', spread: 0.02, distribution: 'normal', sigmas: 2 }),
    ]);
    const result = await candidateTolerance(space, inProcessEvaluator(new DesignSpace(space.definition)), [], {
      draws: 128,
      seed: 1,
      constraints: [{ metric: 'overall_height', max: 1 + 0.0375 + 0.005 }],
      required: [],
      metrics: ['overall_height'],
    });
    expect(result.impossible).toBe(0);
    expect(result.yield.low).toBeLessThanOrEqual(0.691462);
    expect(result.yield.high).toBeGreaterThanOrEqual(0.691462);
    expect(result.quantiles[0].p50).toBeCloseTo(1.0375, 3);
  });
});

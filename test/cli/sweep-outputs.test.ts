import { cpSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { beforeAll, describe, expect, it } from 'vitest';
import { METRIC_DISPLAY } from '../../cli/display-units.ts';
import { METRICS } from '../../core/metrics.ts';
import { must } from '../../core/must.ts';
import { cli } from './in-process.ts';

// The worker pool runs the built JS (dist/): `npm test` builds first. The fixture is machinery test
// data (an invented scenario), not a physics check; the checks below are the ones a user runs on the
// files: constraints recomputed from the columns, non-domination, counts, an independent hypervolume.

const root = mkdtempSync(join(tmpdir(), 'coilfront-outputs-'));
const run = join(root, 'run');
type Row = Record<string, string>;
const readRows = (file: string): Row[] => parseCsv(readFileSync(file, 'utf8'), { columns: true }) as Row[];

/** A metric's value in SI from a CSV row (the column carries the display unit). */
function si(row: Row, metric: string): number {
  const info = must(METRICS.find((m) => m.key === metric));
  const display = METRIC_DISPLAY[metric];
  const column = display
    ? `${metric}_${display.label}`
    : info.unit === '' || info.unit === 'count'
      ? metric
      : `${metric}_${info.unit}`;
  expect(row).toHaveProperty(column);
  return Number(row[column]) * (display ? display.divisor : 1);
}

/** Exact 2-D hypervolume of minimisation points (independent of optimize/: sort and sum rectangles). */
function hypervolume2d(points: number[][], reference: number[]): number {
  const sorted = points
    .filter((p) => p[0] < reference[0] && p[1] < reference[1])
    .sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  let area = 0;
  let lastY = reference[1];
  for (const [x, y] of sorted) {
    if (must(y) >= lastY) continue;
    area += (reference[0] - must(x)) * (lastY - must(y));
    lastY = must(y);
  }
  return area;
}

const spec = { breakout: { metric: 'breakout_voltage', sense: -1 }, mass: { metric: 'wire_mass', sense: 1 } };

beforeAll(async () => {
  const result = await cli([
    'sweep',
    'test/fixtures/sweep-small.yaml',
    '--out',
    run,
    '--workers',
    '2',
    '--quiet',
    // full precision, so that the checks below recompute from the columns exactly
    '--digits',
    '17',
  ]);
  expect(result.err).toBe('');
  expect(result.code).toBe(0);
}, 120_000);

describe('the files of a sweep, checked from their own columns', () => {
  it('every candidate meets every constraint of the sweep file', () => {
    const rows = readRows(join(run, 'candidates.csv'));
    expect(rows.length).toBeGreaterThan(0);
    for (const row of rows) {
      expect(row.feasible).toBe('1');
      expect(si(row, 'overall_height')).toBeLessThanOrEqual(2.4 * (1 + 1e-12));
      expect(si(row, 'resonant_frequency')).toBeGreaterThanOrEqual(90e3 * (1 - 1e-12));
      expect(si(row, 'resonant_frequency')).toBeLessThanOrEqual(300e3 * (1 + 1e-12));
      expect(si(row, 'wire_length')).toBeLessThanOrEqual(900 * (1 + 1e-12));
    }
  });

  it('ranks run 1, 2, 3 … with Pareto ranks that never decrease', () => {
    const rows = readRows(join(run, 'candidates.csv'));
    for (const [i, row] of rows.entries()) expect(Number(row.rank)).toBe(i + 1);
    for (let i = 1; i < rows.length; i++)
      expect(Number(rows[i].pareto_rank)).toBeGreaterThanOrEqual(Number(rows[i - 1].pareto_rank));
  });

  it('front.csv is non-dominated and is exactly the Pareto-rank-1 candidates', () => {
    const front = readRows(join(run, 'front.csv')).map((row) => [-si(row, 'breakout_voltage'), si(row, 'wire_mass')]);
    for (const a of front) {
      for (const b of front) {
        const dominates = b[0] <= a[0] && b[1] <= a[1] && (b[0] < a[0] || b[1] < a[1]);
        expect(dominates).toBe(false);
      }
    }
    const rankOne = readRows(join(run, 'candidates.csv')).filter((row) => row.pareto_rank === '1');
    expect(rankOne.length).toBe(front.length);
  });

  it('summary.json counts add up, and its hypervolume equals an independent computation', () => {
    const summary = JSON.parse(readFileSync(join(run, 'summary.json'), 'utf8'));
    const c = summary.counts;
    expect(c.evaluated).toBe(256);
    expect(c.feasible + c.infeasible + c.impossible + c.failed).toBe(c.evaluated);
    for (const constraint of summary.constraints)
      expect(constraint.rejected).toBeLessThanOrEqual(c.evaluated - c.feasible);
    const front = readRows(join(run, 'front.csv')).map((row) => [
      spec.breakout.sense * si(row, 'breakout_voltage'),
      spec.mass.sense * si(row, 'wire_mass'),
    ]);
    const independent = hypervolume2d(front, summary.hypervolume.reference_point);
    expect(summary.hypervolume.value).toBeGreaterThan(0);
    expect(Math.abs(summary.hypervolume.value - independent) / independent).toBeLessThan(1e-9);
  });

  it('show RANK gives a design file whose evaluation reproduces the row', async () => {
    const rows = readRows(join(run, 'candidates.csv'));
    for (const rank of [1, Math.ceil(rows.length / 2), rows.length]) {
      const shown = await cli(['show', run, String(rank)]);
      expect(shown.code).toBe(0);
      expect(shown.out).toMatch(/^# candidate/);
      const file = join(root, `rank-${rank}.yaml`);
      writeFileSync(file, shown.out);
      const evaluated = JSON.parse((await cli(['evaluate', file, '--json'])).out);
      const row = rows[rank - 1];
      for (const metric of [
        'breakout_voltage',
        'wire_mass',
        'resonant_frequency',
        'secondary_inductance',
        'coupling',
        'peak_voltage',
      ]) {
        const value = si(row, metric);
        expect(Math.abs(evaluated.metrics[metric] - value)).toBeLessThanOrEqual(Math.abs(value) * 1e-12);
      }
    }
  });
});

describe('coilfront refine RUN_DIR', () => {
  it('raises the hypervolume with feasible designs inside the ranges, and twice gives the same files', async () => {
    const second = join(root, 'run-copy');
    cpSync(run, second, { recursive: true });
    const first = await cli(['refine', run, '--evaluations', '300', '--starts', '4', '--workers', '2']);
    expect(first.code).toBe(0);
    expect((await cli(['refine', second, '--evaluations', '300', '--starts', '4', '--workers', '1'])).code).toBe(0);
    expect(readFileSync(join(second, 'refined.csv'), 'utf8')).toBe(readFileSync(join(run, 'refined.csv'), 'utf8'));
    expect(readFileSync(join(second, 'front.csv'), 'utf8')).toBe(readFileSync(join(run, 'front.csv'), 'utf8'));
    const summary = JSON.parse(readFileSync(join(run, 'summary.json'), 'utf8'));
    expect(summary.refine.hypervolume_after).toBeGreaterThan(summary.refine.hypervolume_before);
    expect(summary.refine.evaluations).toBeLessThanOrEqual(300);
    const refined = readRows(join(run, 'refined.csv'));
    expect(refined.length).toBeGreaterThan(0);
    for (const row of refined.slice(0, 3)) {
      expect(Number(row['secondary.turns'])).toBeGreaterThanOrEqual(600);
      expect(Number(row['secondary.turns'])).toBeLessThanOrEqual(1400);
      expect(Number(row['secondary.base_height_mm'])).toBeGreaterThanOrEqual(400 - 1e-9);
      expect(Number(row['secondary.base_height_mm'])).toBeLessThanOrEqual(900 + 1e-9);
      const shown = await cli(['show', run, '--refined', must(row.rank)]);
      const file = join(root, `refined-${row.rank}.yaml`);
      writeFileSync(file, shown.out);
      const metrics = JSON.parse((await cli(['evaluate', file, '--json'])).out).metrics;
      expect(metrics.overall_height).toBeLessThanOrEqual(2.4);
      expect(metrics.resonant_frequency).toBeGreaterThanOrEqual(90e3);
      expect(metrics.resonant_frequency).toBeLessThanOrEqual(300e3);
      expect(metrics.wire_length).toBeLessThanOrEqual(900);
    }
    // refined.csv holds improved, distinct designs: none dominated by the swept front, no two
    // within 1 % of the front's extent in both objectives; the trials have a file of their own.
    const sweptFront = readRows(join(second, 'front.csv'))
      .filter((row) => row.sample_index !== '')
      .map((row) => [-si(row, 'breakout_voltage'), si(row, 'wire_mass')]);
    const points = refined.map((row) => [-si(row, 'breakout_voltage'), si(row, 'wire_mass')]);
    const dominates = (a: number[], b: number[]) =>
      (a[0] ?? 0) <= (b[0] ?? 0) &&
      (a[1] ?? 0) <= (b[1] ?? 0) &&
      ((a[0] ?? 0) < (b[0] ?? 0) || (a[1] ?? 0) < (b[1] ?? 0));
    for (const p of points) for (const q of [...sweptFront, ...points]) expect(dominates(q, p)).toBe(false);
    const all = [...sweptFront, ...points];
    const extent = [0, 1].map((j) => Math.max(...all.map((p) => p[j] ?? 0)) - Math.min(...all.map((p) => p[j] ?? 0)));
    for (let i = 0; i < points.length; i++)
      for (let j = i + 1; j < points.length; j++) {
        const near = [0, 1].every(
          (d) => Math.abs((points[i]?.[d] ?? 0) - (points[j]?.[d] ?? 0)) <= 0.01 * (extent[d] ?? 1),
        );
        expect(near).toBe(false);
      }
    expect(refined.length).toBeLessThan(readRows(join(run, 'refine-trials.csv')).length);
    const byId = await cli(['show', run, 'r1']);
    expect(byId.out).toBe((await cli(['show', run, '--refined', '1'])).out);
  }, 120_000);

  it('front.csv names each swept design by its candidates.csv rank and crowding, refined ones by rN', () => {
    const candidates = readRows(join(root, 'run-copy', 'candidates.csv'));
    const bySample = new Map(candidates.map((row) => [row.sample_index, row]));
    for (const row of readRows(join(run, 'front.csv'))) {
      if (row.sample_index === '') {
        expect(row.rank === '' || /^r\d+$/.test(row.rank ?? '')).toBe(true);
        continue;
      }
      const candidate = bySample.get(row.sample_index);
      expect(row.rank).toBe(candidate?.rank);
      expect(row.crowding).toBe(candidate?.crowding);
    }
  });
});

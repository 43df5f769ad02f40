/**
 * The library entry (api/index.ts) against the command line it wraps: the same design read with units
 * evaluates to the same metrics as `coilfront evaluate --json`, and an in-memory sweep ranks the same
 * candidates, in the same order, as `coilfront sweep` writes to candidates.csv and front.csv. The
 * command line is the reference here; its physics is tested against published sources elsewhere.
 *
 * Needs the built CLI (npm test builds first; alone: npx tsc -p tsconfig.build.json).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { afterAll, describe, expect, it } from 'vitest';
import { parse as parseYaml } from 'yaml';
import { evaluateDesign, InputError, METRIC_NAMES, readDesign, refine, sweep } from '../../api/index.ts';
import { REPO, requireBuiltCli, SMALL_SWEEP, scratchArea, startCli } from '../cli/sweep-harness.ts';

const DESIGN_FILE = join(REPO, 'examples', 'tabletop-teaching-coil.yaml');
const scratch = scratchArea('api');
afterAll(() => scratch.cleanup());

/** The small sweep fixture cut to `samples` Sobol samples (invented demo data). */
function smallSweep(samples: number): Record<string, unknown> {
  const value = parseYaml(readFileSync(SMALL_SWEEP, 'utf8')) as Record<string, Record<string, unknown>>;
  return { ...value, sweep: { ...value.sweep, samples } };
}

describe('readDesign and evaluateDesign', () => {
  it('evaluates a design file text to the metrics and warnings that evaluate --json prints', async () => {
    requireBuiltCli();
    const cli = await startCli(['evaluate', DESIGN_FILE, '--json']).done;
    expect(cli.code).toBe(0);
    const expected = JSON.parse(cli.stdout) as { metrics: Record<string, number | null>; warnings: unknown[] };
    const evaluation = evaluateDesign(readDesign(readFileSync(DESIGN_FILE, 'utf8')));
    expect(evaluation.metrics).toEqual(expected.metrics);
    expect(evaluation.warnings).toEqual(expected.warnings);
    expect(Object.keys(evaluation.metrics)).toEqual([...METRIC_NAMES]);
  });

  it('reads a parsed object with units the same as its text', () => {
    const text = readFileSync(DESIGN_FILE, 'utf8');
    expect(readDesign(parseYaml(text) as object)).toEqual(readDesign(text));
  });

  it('refuses a bad field with one line naming the field and the reason', () => {
    const bad = { secondary: { form_diameter: '110 mm', wire: 'AWG 28', turns: -5, base_height: '300 mm' } };
    expect(() => readDesign(bad, { name: 'mine.yaml' })).toThrow(InputError);
    expect(() => readDesign(bad, { name: 'mine.yaml' })).toThrow(/^mine\.yaml: secondary\.turns: .*-5/);
    expect(() => readDesign('secondary: [', { name: 'broken.yaml' })).toThrow(/^broken\.yaml: .*cannot parse/);
  });

  it('refuses a primary inside the form as the command line does', () => {
    const design = readDesign(readFileSync(DESIGN_FILE, 'utf8'));
    const inside = { ...design, primary: { ...(design.primary as object), innerDiameter: 0.05 } } as typeof design;
    expect(() => evaluateDesign(inside)).toThrow(/^design: primary\.inner_diameter: /);
  });
});

describe('sweep', () => {
  it('ranks the same candidates and front, in the same order, as coilfront sweep writes them', async () => {
    requireBuiltCli();
    const spec = smallSweep(32);
    const file = scratch.dir('sweep-32.json');
    writeFileSync(file, JSON.stringify(spec));
    const out = scratch.dir('run-32');
    const cli = await startCli(['sweep', file, '--out', out, '--workers', '1', '--batch-size', '8', '--quiet']).done;
    expect(cli.code).toBe(0);
    const column = (name: string) =>
      (parseCsv(readFileSync(join(out, name), 'utf8'), { columns: true }) as Record<string, string>[]).map((row) =>
        Number(row.sample_index),
      );
    const result = await sweep(spec, { workers: 0, batchSize: 7 });
    expect(result.complete).toBe(true);
    expect(result.counts.evaluated).toBe(32);
    expect(result.candidates.map((c) => c.sampleIndex)).toEqual(column('candidates.csv'));
    expect(result.front.map((c) => c.sampleIndex)).toEqual(column('front.csv'));
    expect(result.nearMisses.map((c) => c.sampleIndex)).toEqual(column('infeasible.csv'));
    expect(result.nearMisses.every((c) => !c.feasible && c.reason !== null)).toBe(true);
    const summary = JSON.parse(readFileSync(join(out, 'summary.json'), 'utf8')) as { counts: { feasible: number } };
    expect(result.counts.feasible).toBe(summary.counts.feasible);
    // A candidate's design evaluates to its own metrics.
    const best = result.candidates[0];
    expect(best.feasible).toBe(true);
    expect(best.paretoRank).toBe(1);
    expect(evaluateDesign(best.design ?? readDesign({})).metrics).toEqual(best.metrics);
    expect(best.parameters['secondary.wire']).toMatch(/^AWG 2[246]$/);
  });

  it('gives the same result whatever the batch size', async () => {
    const a = await sweep(smallSweep(24), { workers: 0, batchSize: 5 });
    const b = await sweep(smallSweep(24), { workers: 0, batchSize: 24, keep: 1000 });
    expect(a.candidates.map((c) => c.sampleIndex)).toEqual(b.candidates.map((c) => c.sampleIndex));
  });

  it('stops on an abort with the designs evaluated so far, marked incomplete', async () => {
    const before = new AbortController();
    before.abort();
    const none = await sweep(smallSweep(32), { workers: 0, batchSize: 8, signal: before.signal });
    expect(none.complete).toBe(false);
    expect(none.counts.evaluated).toBe(0);
    expect(none.candidates).toEqual([]);

    const during = new AbortController();
    let calls = 0;
    const timer = setInterval(() => {
      if (++calls === 1) during.abort();
    }, 0);
    const some = await sweep(smallSweep(256), { workers: 0, batchSize: 8, signal: during.signal });
    clearInterval(timer);
    expect(some.complete).toBe(false);
    expect(some.counts.evaluated).toBeLessThan(256);
  });

  it('refuses a bad sweep file or option in one line', async () => {
    await expect(sweep({ design: {} }, { workers: 0 })).rejects.toThrow(InputError);
    await expect(sweep(smallSweep(8), { workers: -1 })).rejects.toThrow(/^workers: expected a whole number/);
    await expect(sweep('sweep: { samples: 8 }', { name: 'night.yaml' })).rejects.toThrow(/^night\.yaml: design: /);
    const huge = { ...smallSweep(8), sweep: { method: 'random', samples: 30_000_000, seed: 1 } };
    await expect(sweep(huge, { workers: 0 })).rejects.toThrow(/--force/);
  });
});

describe('refine', () => {
  it('refines within its budget and keeps every refined design feasible, after the samples', async () => {
    const result = await sweep(smallSweep(32), { workers: 0 });
    const refined = await refine(result, { starts: 2, evaluations: 40, workers: 0 });
    // Budget: 20 per start, as optimize/refine-run.ts shares it; the cache may save some.
    expect(refined.evaluations).toBeLessThanOrEqual(40 + 2 * 2);
    expect(refined.refined.every((c) => c.feasible && c.sampleIndex >= 32)).toBe(true);
    expect(refined.hypervolumeAfter ?? 0).toBeGreaterThanOrEqual(refined.hypervolumeBefore ?? 0);
  });

  it('rejects with the signal reason when aborted, and refuses what sweep did not return', async () => {
    const result = await sweep(smallSweep(16), { workers: 0 });
    const controller = new AbortController();
    controller.abort(new Error('enough'));
    await expect(refine(result, { workers: 0, signal: controller.signal })).rejects.toThrow('enough');
    await expect(refine({ ...result }, { workers: 0 })).rejects.toThrow(/^refine: expected the result of sweep/);
  });
});

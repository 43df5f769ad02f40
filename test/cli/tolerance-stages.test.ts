import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { loadRunSpec } from '../../cli/sweep-spec.ts';
import { DesignSpace, spaceDefinitionOf } from '../../optimize/design-space.ts';
import { inProcessEvaluator } from '../../optimize/evaluate-batch.ts';
import { candidateTolerance, toleranceSpace } from '../../optimize/tolerance/index.ts';

function capture() {
  const err: string[] = [];
  const io: CliIo = { out: () => {}, err: (t) => err.push(t), isTty: false };
  return { io, errors: () => err.join('') };
}

const SWEEP = 'test/fixtures/sweep-tolerances.yaml';

describe('coilfront tolerance --from refined', () => {
  it('studies the refined designs by their r ids, from their full-precision values, beside the sweep study', async () => {
    const run = join(mkdtempSync(join(tmpdir(), 'coilfront-tolst-')), 'run');
    expect(await runCli(['sweep', SWEEP, '--out', run, '--workers', '0', '--quiet'], capture().io)).toBe(0);
    expect(await runCli(['refine', run, '--evaluations', '24', '--starts', '1', '--workers', '0'], capture().io)).toBe(
      0,
    );
    const args = ['tolerance', run, '--from', 'refined', '--top', '2', '--draws', '4', '--workers', '0'];
    expect(await runCli(args, capture().io)).toBe(0);
    expect(existsSync(join(run, 'tolerance.csv'))).toBe(false);
    const csv = readFileSync(join(run, 'tolerance-refined.csv'), 'utf8');
    const rows = parseCsv(csv, { columns: true }) as Record<string, string>[];
    const refined = (
      JSON.parse(readFileSync(join(run, 'refined.json'), 'utf8')) as { rank: number | null; values: number[] }[]
    )
      .filter((d) => d.rank !== null)
      .sort((a, b) => (a.rank as number) - (b.rank as number));
    expect(rows.map((r) => r.rank)).toEqual(refined.slice(0, 2).map((d) => `r${d.rank}`));
    expect(rows.every((r) => r.sample_index === '')).toBe(true);
    // The same study computed directly on refined.json's values (the command's own path is the CSV and journal).
    const spec = loadRunSpec(run);
    const tolerances = spec.tolerances;
    if (!tolerances) throw new Error('fixture has tolerances');
    const space = toleranceSpace({ ...spaceDefinitionOf(spec), seed: tolerances.seed ?? spec.seed }, tolerances.fields);
    const direct = await candidateTolerance(
      space,
      inProcessEvaluator(new DesignSpace(space.definition)),
      refined[0].values,
      {
        draws: 4,
        seed: tolerances.seed ?? spec.seed,
        constraints: spec.constraints,
        required: spec.objectives.map((o) => o.metric),
        metrics: [...new Set([...spec.objectives.map((o) => o.metric), ...spec.constraints.map((c) => c.metric)])],
      },
    );
    const json = JSON.parse(readFileSync(join(run, 'tolerance-refined.json'), 'utf8'));
    expect(json.candidates[0].rank).toBe(`r${refined[0].rank}`);
    expect(json.candidates[0].passing).toBe(direct.passing);
    expect(json.candidates[0].quantiles).toEqual(direct.quantiles);
    // A rerun takes both from its own journal and writes the same file.
    const again = capture();
    expect(await runCli(args, again.io)).toBe(0);
    const n = Math.min(2, refined.length);
    expect(again.errors()).toContain(`${n} of ${n} candidates taken from the journal`);
    expect(readFileSync(join(run, 'tolerance-refined.csv'), 'utf8')).toBe(csv);
  }, 120_000);

  it('refuses an unknown list and a stage that has not run, with one line', async () => {
    const run = join(mkdtempSync(join(tmpdir(), 'coilfront-tolst-')), 'run');
    expect(await runCli(['sweep', SWEEP, '--out', run, '--workers', '0', '--quiet'], capture().io)).toBe(0);
    const bad = capture();
    expect(await runCli(['tolerance', run, '--from', 'refind', '--workers', '0'], bad.io)).toBe(2);
    expect(bad.errors()).toMatch(/--from: expected one of candidates, refined, evolved, got 'refind'/);
    const none = capture();
    expect(await runCli(['tolerance', run, '--from', 'evolved', '--workers', '0'], none.io)).toBe(2);
    expect(none.errors()).toMatch(/no evolved designs yet \(run npx coilfront evolve/);
  }, 60_000);
});

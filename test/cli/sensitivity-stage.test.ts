import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sweepSchema } from '../../cli/json-schema.ts';
import { SAFETY_CAUTIONS, SAFETY_LINE } from '../../cli/safety.ts';
import { expectOneLine, requireBuiltCli, SMALL_SWEEP, scratchArea, signalWhenJournalled } from './sweep-harness.ts';
import { cli } from './in-process.ts';

// Machinery tests of the sensitivity stage of sweep files (`- sensitivity: { samples }` in sweep.stages) on the
// invented small-sweep fixture. The reference is the same study made by hand with `coilfront sensitivity` on the
// same file: the stage must be exactly that command (its files byte for byte) with the same object as the
// `sobol` section of summary.json. The killed child runs the built JS (dist/): `npm test` builds first.

const area = scratchArea('sens-stage');
const SAMPLES = 32;
// The fixture cut to 64 samples (the stage's study, not the sweep, is under test here): the sweep file of every run.
const fixture = readFileSync(SMALL_SWEEP, 'utf8').replace(/^(sweep: \{ .*)samples: 256(.*\})$/m, '$1samples: 64$2');
const base = area.dir('base.yaml');
writeFileSync(base, fixture);
/** The fixture with `sweep.stages` set to `stages` (YAML flow text). */
function withStages(name: string, stages: string): string {
  const file = area.dir(`${name}.yaml`);
  const text = fixture.replace(/^sweep: \{ (.*) \}$/m, `sweep: { $1, stages: ${stages} }`);
  expect(text).not.toBe(fixture);
  writeFileSync(file, text);
  return file;
}
const staged = withStages('staged', `[ { sensitivity: { samples: ${SAMPLES} } } ]`);
const FILES = ['candidates.csv', 'infeasible.csv', 'front.csv', 'sensitivity.csv', 'sensitivity.json'];

function json(path: string): Record<string, unknown> {
  return JSON.parse(readFileSync(path, 'utf8')) as Record<string, unknown>;
}
/** summary.json without its timing. */
function summaryWithoutTiming(directory: string): Record<string, unknown> {
  const summary = json(join(directory, 'summary.json'));
  delete summary.timing;
  return summary;
}
function expectSameRun(actual: string, expected: string): void {
  for (const name of FILES)
    expect(readFileSync(join(actual, name), 'utf8'), name).toBe(readFileSync(join(expected, name), 'utf8'));
  expect(summaryWithoutTiming(actual)).toEqual(summaryWithoutTiming(expected));
}

const byHand = area.dir('by-hand');
const plain = area.dir('plain');
const whole = area.dir('whole');

beforeAll(async () => {
  requireBuiltCli();
  // The references: the study by the command a user would type, a sweep without stages, and the staged sweep.
  expect(fixture).toContain('samples: 64');
  const study = await cli(['sensitivity', base, '--samples', `${SAMPLES}`, '--workers', '0', '--out', byHand]);
  expect(study.code, study.err).toBe(0);
  const sweep = await cli(['sweep', base, '--out', plain, '--workers', '0', '--batch-size', '8', '--quiet']);
  expect(sweep.code, sweep.err).toBe(0);
  const run = await cli(['sweep', staged, '--out', whole, '--workers', '0', '--batch-size', '8']);
  expect(run.code, run.err).toBe(0);
  expect(run.err).toContain(
    `stage 1 of 1: npx coilfront sensitivity ${join(whole, 'spec.yaml')} --samples ${SAMPLES} --out ${whole}`,
  );
  expect(run.out).toContain(`the same indices are in the 'sobol' section of ${join(whole, 'summary.json')}`);
  expect(run.out).toContain(SAFETY_CAUTIONS[0]);
}, 120_000);
afterAll(() => area.cleanup());

describe('coilfront sweep with a sensitivity stage', () => {
  it('gives summary.json a sobol section equal to what coilfront sensitivity writes for the same file and samples', () => {
    const sobol = summaryWithoutTiming(whole).sobol as Record<string, unknown>;
    const study = json(join(byHand, 'sensitivity.json'));
    expect(study.safety).toBe(SAFETY_LINE);
    delete study.safety;
    expect(sobol).toEqual(study);
    // The section's content: per metric its basis, kept and per-field S1 and ST with intervals; the feasible share.
    const fields = sobol.fields as string[];
    expect(fields.length).toBe(6);
    expect(sobol.evaluations).toBe(SAMPLES * (fields.length + 2));
    for (const metric of sobol.metrics as { basis: string; kept: number; indices: unknown }[]) {
      expect(['all', 'complete-blocks']).toContain(metric.basis);
      expect(metric.kept).toBeLessThanOrEqual(SAMPLES);
    }
    const feasibility = sobol.feasibility as { feasible: number; points: number; share: number };
    expect(feasibility.points).toBe(2 * SAMPLES);
    expect(feasibility.share).toBe(feasibility.feasible / feasibility.points);
    // The command's own files, written into the run directory by the stage, are the same bytes.
    for (const name of ['sensitivity.csv', 'sensitivity.json'])
      expect(readFileSync(join(whole, name), 'utf8'), name).toBe(readFileSync(join(byHand, name), 'utf8'));
  });

  it('leaves the rest of summary.json as a sweep without stages writes it, and a sweep without one has no section', () => {
    const withStage = summaryWithoutTiming(whole);
    delete withStage.sobol;
    expect(withStage).toEqual(summaryWithoutTiming(plain));
    expect('sobol' in summaryWithoutTiming(plain)).toBe(false);
    expect(existsSync(join(plain, 'sensitivity-journal.log'))).toBe(false);
    for (const name of ['candidates.csv', 'infeasible.csv', 'front.csv'])
      expect(readFileSync(join(whole, name), 'utf8'), name).toBe(readFileSync(join(plain, name), 'utf8'));
  });

  it('after kill -9 in the stage, sweep --resume continues from its journal and ends in the same files', async () => {
    const directory = area.dir('killed');
    const journal = join(directory, 'sensitivity-journal.log');
    // Kill once the stage has journalled its header and at least two of its 8 batches.
    const stopped = await signalWhenJournalled(
      ['sweep', staged, '--out', directory, '--workers', '1', '--batch-size', '8', '--quiet'],
      journal,
      3,
      'SIGKILL',
    );
    expect(stopped.signal).toBe('SIGKILL');
    expect(existsSync(join(directory, 'sensitivity.csv'))).toBe(false);
    expect('sobol' in summaryWithoutTiming(directory)).toBe(false);
    const resumed = await cli(['sweep', '--resume', directory, '--workers', '1']);
    expect(resumed.code, resumed.err).toBe(0);
    expect(resumed.err).toContain('continuing with its stages');
    expect(resumed.err).toMatch(/sensitivity: \d+ of 256 rows taken from the journal/);
    expectSameRun(directory, whole);
  }, 120_000);

  it('on SIGINT in the stage prints the sweep resume hint, exits 130, and resumes to the same files', async () => {
    const directory = area.dir('interrupted');
    const journal = join(directory, 'sensitivity-journal.log');
    const stopped = await signalWhenJournalled(
      ['sweep', staged, '--out', directory, '--workers', '1', '--batch-size', '8', '--quiet'],
      journal,
      3,
      'SIGINT',
    );
    expect(stopped.code, stopped.stderr).toBe(130); // 128 + SIGINT (2), the shells' convention
    expect(stopped.stderr).toContain(
      `stopped: SIGINT was received in stage 1 of 1; the sweep's outputs are in ${directory}`,
    );
    expect(stopped.stderr).toContain(`  resume with: npx coilfront sweep --resume ${directory}`);
    expect(existsSync(join(directory, 'sensitivity.csv'))).toBe(false);
    const resumed = await cli(['sweep', '--resume', directory, '--workers', '1']);
    expect(resumed.code, resumed.err).toBe(0);
    expectSameRun(directory, whole);
  }, 120_000);

  it('refuses bad settings in one line naming the field, exit 2, and is listed by check and the JSON Schema', async () => {
    const cases: [string, string][] = [
      [
        '[ { sensitivity: { samples: 1 } } ]',
        'sweep.stages[0].sensitivity.samples: expected a whole number of at least 2',
      ],
      [
        '[ { sensitivity: { sample: 64 } } ]',
        "sweep.stages[0].sensitivity.sample: unknown key 'sample' (did you mean 'samples'?)",
      ],
      ['[ { sensitivty: {} } ]', "sweep.stages[0]: unknown stage 'sensitivty' (did you mean 'sensitivity'?)"],
    ];
    for (const [k, [stages, message]] of cases.entries()) {
      const file = withStages(`bad-${k}`, stages);
      const directory = area.dir(`bad-${k}-run`);
      const result = await cli(['sweep', file, '--out', directory]);
      expect(result.code, stages).toBe(2);
      expect(expectOneLine(result.err, 'sweep.stages')).toContain(`${file}: ${message}`);
      expect(existsSync(directory)).toBe(false);
    }
    const bare = withStages('bare', '[ sensitivity, refine ]');
    const checked = await cli(['check', bare]);
    expect(checked.code, checked.err).toBe(0);
    expect(checked.out).toContain('stages after the sweep: sensitivity (512 base samples), then refine (');
    const sweep = (sweepSchema().properties as Record<string, { properties: Record<string, unknown> }>).sweep;
    expect(JSON.stringify(sweep?.properties.stages)).toContain('"sensitivity"');
  });
});

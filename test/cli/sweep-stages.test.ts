import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sweepSchema } from '../../cli/json-schema.ts';
import { expectOneLine, requireBuiltCli, SMALL_SWEEP, scratchArea, signalWhenJournalled } from './sweep-harness.ts';
import { cli } from './in-process.ts';

// Machinery tests of the pipeline shorthand (sweep.stages) on the invented small-sweep fixture: the
// reference is the same run made by hand, the sweep followed by the evolve and refine commands, so the
// check is that the shorthand is exactly those commands (byte for byte, timing aside). The killed child
// runs the built JS (dist/): `npm test` builds first.

const area = scratchArea('stages');
const EVOLVE = { evaluations: 96, population: 16 };
const REFINE = { starts: 2, evaluations: 60 };
const fixture = readFileSync(SMALL_SWEEP, 'utf8');
/** The fixture with `sweep.stages` set to `stages` (YAML flow text). */
function withStages(name: string, stages: string): string {
  const file = area.dir(`${name}.yaml`);
  const text = fixture.replace(/^sweep: \{ (.*) \}$/m, `sweep: { $1, stages: ${stages} }`);
  expect(text).not.toBe(fixture);
  writeFileSync(file, text);
  return file;
}
const STAGES = `[ { evolve: { evaluations: ${EVOLVE.evaluations}, population: ${EVOLVE.population} } }, { refine: { starts: ${REFINE.starts}, evaluations: ${REFINE.evaluations} } } ]`;
const OUTPUTS = [
  'candidates.csv',
  'infeasible.csv',
  'front.csv',
  'evolved.csv',
  'evolved.json',
  'refined.csv',
  'refined.json',
  'refine-trials.csv',
];
/** summary.json without its timing fields (of the sweep and of each stage). */
function summaryWithoutTiming(directory: string): Record<string, unknown> {
  const summary = JSON.parse(readFileSync(join(directory, 'summary.json'), 'utf8'));
  delete summary.timing;
  for (const section of ['evolve', 'refine']) if (summary[section]) delete summary[section].timing;
  return summary;
}
function runRecordWithoutTime(directory: string): Record<string, unknown> {
  const record = JSON.parse(readFileSync(join(directory, 'run.json'), 'utf8'));
  delete record.created;
  return record;
}
function expectSameRun(actual: string, expected: string): void {
  for (const name of OUTPUTS)
    expect(readFileSync(join(actual, name), 'utf8'), name).toBe(readFileSync(join(expected, name), 'utf8'));
  expect(summaryWithoutTiming(actual)).toEqual(summaryWithoutTiming(expected));
  expect(runRecordWithoutTime(actual)).toEqual(runRecordWithoutTime(expected));
}

const byHand = area.dir('by-hand');
const staged = withStages('staged', STAGES);

beforeAll(async () => {
  requireBuiltCli();
  // The reference: the sweep (no stages), then the two commands a user would type.
  expect(
    (await cli(['sweep', SMALL_SWEEP, '--out', byHand, '--workers', '0', '--batch-size', '8', '--quiet'])).code,
  ).toBe(0);
  const evolve = ['--evaluations', `${EVOLVE.evaluations}`, '--population', `${EVOLVE.population}`];
  expect((await cli(['evolve', byHand, ...evolve, '--workers', '0'])).code).toBe(0);
  const refine = ['--starts', `${REFINE.starts}`, '--evaluations', `${REFINE.evaluations}`];
  expect((await cli(['refine', byHand, ...refine, '--workers', '0'])).code).toBe(0);
}, 120_000);
afterAll(() => area.cleanup());

describe('coilfront sweep with sweep.stages', () => {
  it('gives the files of the sweep followed by the evolve and refine commands, byte for byte', async () => {
    const directory = area.dir('staged-run');
    const result = await cli(['sweep', staged, '--out', directory, '--workers', '0', '--batch-size', '8']);
    expect(result.code, result.err).toBe(0);
    expect(result.err).toContain(
      `stage 1 of 2: npx coilfront evolve ${directory} --evaluations ${EVOLVE.evaluations} --population ${EVOLVE.population}`,
    );
    expect(result.err).toContain(`stage 2 of 2: npx coilfront refine ${directory}`);
    expect(result.out).toMatch(/evolved \d+ generations with 96 evaluations/);
    expect(result.out).toMatch(/refined 2 starts with \d+ evaluations/);
    expectSameRun(directory, byHand);
    // The stages do not change the sweep's identity: the same spec hash as the file without them.
    expect(JSON.parse(readFileSync(join(directory, 'run.json'), 'utf8')).spec_hash).toBe(
      JSON.parse(readFileSync(join(byHand, 'run.json'), 'utf8')).spec_hash,
    );
    // A resume of the finished run runs nothing again and leaves the files as they are.
    const again = await cli(['sweep', '--resume', directory, '--workers', '0', '--quiet']);
    expect(again.code, again.err).toBe(0);
    expect(again.out).toBe('');
    expectSameRun(directory, byHand);
  }, 120_000);

  it('after kill -9 in the evolve stage, sweep --resume continues there and ends in the same files', async () => {
    const directory = area.dir('killed');
    const journal = join(directory, 'evolve-journal.log');
    // Kill once the evolve stage has journalled its identity and at least two generations.
    const stopped = await signalWhenJournalled(
      ['sweep', staged, '--out', directory, '--workers', '1', '--batch-size', '8', '--quiet'],
      journal,
      3,
      'SIGKILL',
    );
    expect(stopped.signal).toBe('SIGKILL');
    expect(existsSync(join(directory, 'evolved.csv'))).toBe(false);
    const resumed = await cli(['sweep', '--resume', directory, '--workers', '1']);
    expect(resumed.code, resumed.err).toBe(0);
    expect(resumed.err).toContain('the sweep of');
    expect(resumed.err).toMatch(/resuming evolve in .*: \d+ generations from the journal/);
    expect(resumed.err).not.toMatch(/swept \d+\/256/);
    expectSameRun(directory, byHand);
  }, 120_000);

  it('on SIGINT in the evolve stage prints the sweep resume hint, exits 130, and resumes to the same files', async () => {
    const directory = area.dir('interrupted');
    const journal = join(directory, 'evolve-journal.log');
    const stopped = await signalWhenJournalled(
      ['sweep', staged, '--out', directory, '--workers', '1', '--batch-size', '8', '--quiet'],
      journal,
      3,
      'SIGINT',
    );
    expect(stopped.code, stopped.stderr).toBe(130); // 128 + SIGINT (2), the shells' convention
    const lines = stopped.stderr.trimEnd().split('\n');
    expect(lines).toEqual([
      `stopped: SIGINT was received in stage 1 of 2; the sweep's outputs are in ${directory}`,
      `  resume with: npx coilfront sweep --resume ${directory}`,
    ]);
    expect(existsSync(join(directory, 'evolved.csv'))).toBe(false);
    expect(existsSync(journal)).toBe(true);
    const resumed = await cli(['sweep', '--resume', directory, '--workers', '1']);
    expect(resumed.code, resumed.err).toBe(0);
    expect(resumed.err).toMatch(/resuming evolve in .*: \d+ generations from the journal/);
    expectSameRun(directory, byHand);
  }, 120_000);

  it('refuses bad stages in one line naming the field, exit 2, before any directory is made', async () => {
    const cases: [string, string][] = [
      [
        '[ { evolve: { evaluations: 0 } } ]',
        'sweep.stages[0].evolve.evaluations: expected a whole number of at least 1',
      ],
      ['[ { evolve: { population: 3 } } ]', 'sweep.stages[0].evolve.population: expected a whole number of at least 4'],
      ['[ { evolve: { budget: 10 } } ]', "sweep.stages[0].evolve.budget: unknown key 'budget'"],
      ['[ { refine: { toString: 1 } } ]', "sweep.stages[0].refine.toString: unknown key 'toString'"],
      ['[ evolve, { refin: {} } ]', "sweep.stages[1]: unknown stage 'refin' (did you mean 'refine'?)"],
      ['[ { refine: { starts: 1.5 } } ]', 'sweep.stages[0].refine.starts: expected a whole number of at least 1'],
      ['[ { refine: 8 } ]', 'sweep.stages[0].refine: expected a mapping of settings'],
      ['{ evolve: {} }', 'sweep.stages: expected a list of stages'],
    ];
    for (const [k, [stages, message]] of cases.entries()) {
      const file = withStages(`bad-${k}`, stages);
      const directory = area.dir(`bad-${k}-run`);
      const result = await cli(['sweep', file, '--out', directory]);
      expect(result.code, stages).toBe(2);
      expect(expectOneLine(result.err, 'sweep.stages')).toContain(`${file}: ${message}`);
      expect(existsSync(directory)).toBe(false);
      expect((await cli(['check', file])).code).toBe(2);
    }
  });

  it('is listed by check and by the JSON Schema, and a resume with other stages is refused', async () => {
    const checked = await cli(['check', staged]);
    expect(checked.code, checked.err).toBe(0);
    expect(checked.out).toContain(
      'stages after the sweep: evolve (96 evaluations, population 16), then refine (2 starts, 60 evaluations)',
    );
    const sweep = (sweepSchema().properties as Record<string, { properties: Record<string, unknown> }>).sweep;
    expect(JSON.stringify(sweep?.properties.stages)).toContain('"population"');
    const other = withStages('other', '[ refine ]');
    const refused = await cli(['sweep', other, '--resume', byHand]);
    expect(refused.code).toBe(2);
    expect(expectOneLine(refused.err, 'refused')).toContain('differ');
  });
});

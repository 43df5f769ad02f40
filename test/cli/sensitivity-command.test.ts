import { existsSync, mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { SAFETY_CAUTIONS, SAFETY_LINE } from '../../cli/safety.ts';
import { requireBuiltCli, SMALL_SWEEP, startCli, signalWhenJournalled } from './sweep-harness.ts';

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { out: (t) => out.push(t), err: (t) => err.push(t), isTty: false };
  return { io, out, err, text: () => out.join(''), errors: () => err.join('') };
}

const SWEEP = 'examples/sweeps/science-centre-ceiling.yaml';

function scratch(): string {
  return mkdtempSync(join(tmpdir(), 'coilfront-sens-'));
}

function filesOf(directory: string): string {
  return (
    readFileSync(join(directory, 'sensitivity.csv'), 'utf8') + readFileSync(join(directory, 'sensitivity.json'), 'utf8')
  );
}

describe('coilfront sensitivity', () => {
  it('writes sensitivity.csv and .json with one row per field and metric and for feasibility, and the cautions', async () => {
    const dir = scratch();
    const { io, out } = capture();
    const code = await runCli(['sensitivity', SWEEP, '--samples', '8', '--workers', '0', '--out', dir], io);
    expect(code).toBe(0);
    const rows = parseCsv(readFileSync(join(dir, 'sensitivity.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    const json = JSON.parse(readFileSync(join(dir, 'sensitivity.json'), 'utf8'));
    // One block of rows per metric, and one for the feasibility indicator (every sample: kept = N).
    expect(rows.length).toBe(json.fields.length * (json.metrics.length + 1));
    const feasible = rows.filter((r) => r.metric === 'feasible');
    expect(feasible).toHaveLength(json.fields.length);
    for (const row of feasible) expect(row.kept).toBe('8');
    expect(Object.keys(rows[0])).toEqual([
      'field',
      'metric',
      'S1',
      'S1_low',
      'S1_high',
      'ST',
      'ST_low',
      'ST_high',
      'kept',
    ]);
    expect(json.feasibility.points).toBe(16);
    expect(json.feasibility.feasible).toBeGreaterThanOrEqual(0);
    for (const metric of json.metrics) expect(['all', 'complete-blocks']).toContain(metric.basis);
    expect(out.join('')).toContain(`feasible: ${json.feasibility.feasible} of 16 independent points`);
    expect(out.join('')).toContain(SAFETY_CAUTIONS[0]);
  });

  it('gives the same files on a rerun, from its journal, and after a shard-by-shard run and --merge', async () => {
    const whole = scratch();
    const args = ['sensitivity', SMALL_SWEEP, '--samples', '16', '--workers', '0'];
    expect(await runCli([...args, '--out', whole], capture().io)).toBe(0);
    const first = filesOf(whole);
    const again = capture();
    expect(await runCli([...args, '--out', whole], again.io)).toBe(0);
    expect(again.errors()).toContain('128 of 128 rows taken from the journal');
    expect(filesOf(whole)).toBe(first);

    const sharded = scratch();
    for (const k of [1, 2, 3]) {
      const shard = capture();
      expect(await runCli([...args, '--out', sharded, '--shard', `${k}/3`], shard.io)).toBe(0);
      expect(shard.text()).toContain(SAFETY_LINE);
    }
    expect(existsSync(join(sharded, 'sensitivity.csv'))).toBe(false);
    const merged = capture();
    expect(await runCli([...args, '--out', sharded, '--merge'], merged.io)).toBe(0);
    expect(filesOf(sharded)).toBe(first);

    // A missing shard, or shards of other settings, are refused with one line.
    const partial = scratch();
    expect(await runCli([...args, '--out', partial, '--shard', '2/2'], capture().io)).toBe(0);
    const missing = capture();
    expect(await runCli([...args, '--out', partial, '--merge'], missing.io)).toBe(2);
    expect(missing.errors().trim().split('\n')).toHaveLength(1);
    expect(missing.errors()).toContain('shard 1/2 is missing');
    const other = capture();
    const moreSamples = ['sensitivity', SMALL_SWEEP, '--samples', '32', '--workers', '0'];
    expect(await runCli([...moreSamples, '--out', sharded, '--merge'], other.io)).toBe(2);
    expect(other.errors()).toContain('the shard belongs to another study');
  }, 120_000);

  it('after kill -9 or Ctrl-C mid-run, the same command continues from its journal to byte-identical files', async () => {
    requireBuiltCli();
    const args = ['sensitivity', SMALL_SWEEP, '--samples', '64'];
    const whole = scratch();
    const reference = startCli([...args, '--workers', '0', '--out', whole]);
    expect((await reference.done).code).toBe(0);
    const killed = scratch();
    const journal = join(killed, 'sensitivity-journal.log');
    // Kill once the header and at least three batches are journaled (16 batches in all).
    const stopped = await signalWhenJournalled([...args, '--workers', '1', '--out', killed], journal, 4, 'SIGKILL');
    expect(stopped.signal).toBe('SIGKILL');
    expect(existsSync(join(killed, 'sensitivity.csv'))).toBe(false);
    const resumed = startCli([...args, '--workers', '1', '--out', killed]);
    const finished = await resumed.done;
    expect(finished.code, finished.stderr).toBe(0);
    expect(finished.stderr).toMatch(/sensitivity: \d+ of 512 rows taken from the journal/);
    expect(filesOf(killed)).toBe(filesOf(whole));

    // Ctrl-C: stops between batches with no output half-written, names what is kept and the resume
    // command, exits 130 (128 + SIGINT's number 2, POSIX shell convention); that command finishes it.
    const interrupted = scratch();
    const stopJournal = join(interrupted, 'sensitivity-journal.log');
    const intArgs = [...args, '--workers', '1', '--out', interrupted];
    const halted = await signalWhenJournalled(intArgs, stopJournal, 4, 'SIGINT');
    expect(halted.code, halted.stderr).toBe(130);
    expect(halted.stderr).toContain(`every finished batch is kept in ${stopJournal}`);
    expect(halted.stderr).toContain(`npx coilfront sensitivity ${SMALL_SWEEP} --samples 64 --out ${interrupted}`);
    expect(existsSync(join(interrupted, 'sensitivity.csv'))).toBe(false);
    const again = await startCli(intArgs).done;
    expect(again.code, again.stderr).toBe(0);
    expect(filesOf(interrupted)).toBe(filesOf(whole));
  }, 180_000);

  it('bad --samples: one line naming the option, exit 2', async () => {
    const { io, err } = capture();
    const code = await runCli(['sensitivity', SWEEP, '--samples', '1', '--workers', '0'], io);
    expect(code).toBe(2);
    expect(err.join('').trim().split('\n')).toHaveLength(1);
    expect(err.join('')).toContain('--samples');
    const both = capture();
    expect(await runCli(['sensitivity', SWEEP, '--shard', '1/2', '--merge', '--workers', '0'], both.io)).toBe(2);
    expect(both.errors()).toContain('--shard and --merge do not go together');
  });
});

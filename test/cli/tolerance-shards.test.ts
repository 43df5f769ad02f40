/**
 * Shards of a tolerance study: `--shard k/N` studies a contiguous block of the candidates (the sweep's shard
 * rule, run/shard.ts) into its own directory, and `--merge` gives files byte-identical to the study run
 * whole. Machinery checks on the invented sweep fixture, not physics.
 */
import { cpSync, mkdtempSync, readFileSync, statSync, truncateSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { SAFETY_LINE } from '../../cli/safety.ts';

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { out: (t) => out.push(t), err: (t) => err.push(t), isTty: false };
  return { io, text: () => out.join(''), errors: () => err.join('') };
}

const SWEEP = 'test/fixtures/sweep-tolerances.yaml';
const STUDY = ['--top', '5', '--draws', '6', '--workers', '0'];

let root = '';
let run = '';
let whole = '';

/** tolerance.csv and tolerance.json, with the run's own directory (named in tolerance.json's source) as RUN. */
function filesOf(directory: string): string {
  const text =
    readFileSync(join(directory, 'tolerance.csv'), 'utf8') + readFileSync(join(directory, 'tolerance.json'), 'utf8');
  return text.replaceAll(directory, 'RUN');
}

function copyOfRun(name: string): string {
  const copy = join(root, name);
  cpSync(run, copy, { recursive: true });
  return copy;
}

beforeAll(async () => {
  root = mkdtempSync(join(tmpdir(), 'coilfront-tolshard-'));
  run = join(root, 'run');
  expect(await runCli(['sweep', SWEEP, '--out', run, '--workers', '0', '--quiet'], capture().io)).toBe(0);
  const wholeRun = copyOfRun('whole');
  expect(await runCli(['tolerance', wholeRun, ...STUDY], capture().io)).toBe(0);
  whole = filesOf(wholeRun);
}, 120_000);

describe('coilfront tolerance --shard and --merge', () => {
  it('gives, merged from 3 shards, tolerance.csv and tolerance.json byte-identical to the whole study', async () => {
    const sharded = copyOfRun('sharded');
    for (const k of [1, 2, 3]) {
      const shard = capture();
      expect(await runCli(['tolerance', sharded, ...STUDY, '--shard', `${k}/3`], shard.io)).toBe(0);
      // Shard k of 3 over 5 candidates holds [⌊(k−1)·5/3⌋, ⌊k·5/3⌋): 1, 2 and 2 candidates.
      expect(shard.text()).toContain(`${[1, 2, 2][k - 1]} of 5 candidates studied`);
      expect(shard.text()).toContain(SAFETY_LINE);
    }
    const merged = capture();
    expect(await runCli(['tolerance', sharded, ...STUDY, '--merge'], merged.io)).toBe(0);
    expect(filesOf(sharded)).toBe(whole);
    // The merged journal is the whole study's: a rerun takes every candidate from it.
    const rerun = capture();
    expect(await runCli(['tolerance', sharded, ...STUDY], rerun.io)).toBe(0);
    expect(rerun.errors()).toContain('5 of 5 candidates taken from the journal');
    expect(filesOf(sharded)).toBe(whole);
  }, 120_000);

  it('refuses a missing, an unfinished or a foreign shard with one line, exit 2', async () => {
    const dir = copyOfRun('refusals');
    const shards = join(dir, 'tolerance-shards');
    expect(await runCli(['tolerance', dir, ...STUDY, '--shard', '1/2'], capture().io)).toBe(0);
    const missing = capture();
    expect(await runCli(['tolerance', dir, ...STUDY, '--merge'], missing.io)).toBe(2);
    expect(missing.errors().trim().split('\n')).toHaveLength(1);
    expect(missing.errors()).toContain('shard 2/2 is missing');

    expect(await runCli(['tolerance', dir, ...STUDY, '--shard', '2/2'], capture().io)).toBe(0);
    // A kill during the last write of shard 2: its torn record is dropped, so one candidate is missing.
    const journal = join(shards, '2-of-2', 'tolerance-journal.log');
    truncateSync(journal, statSync(journal).size - 5);
    const unfinished = capture();
    expect(await runCli(['tolerance', dir, ...STUDY, '--merge'], unfinished.io)).toBe(2);
    expect(unfinished.errors()).toMatch(/2-of-2: shard 2\/2 is not finished .*--shard 2\/2/);
    // Run again, the shard finishes from its journal and the merge goes through.
    const again = capture();
    expect(await runCli(['tolerance', dir, ...STUDY, '--shard', '2/2'], again.io)).toBe(0);
    expect(again.errors()).toContain('2 of 3 candidates taken from the journal');

    // Shards of other settings (more draws) belong to another study.
    const foreign = capture();
    const other = ['--top', '5', '--draws', '7', '--workers', '0'];
    expect(await runCli(['tolerance', dir, ...other, '--merge'], foreign.io)).toBe(2);
    expect(foreign.errors()).toContain('the shard belongs to another study');
    expect(await runCli(['tolerance', dir, ...STUDY, '--merge'], capture().io)).toBe(0);
    expect(filesOf(dir)).toBe(whole);

    const both = capture();
    expect(await runCli(['tolerance', dir, ...STUDY, '--merge', '--shard', '1/2'], both.io)).toBe(2);
    expect(both.errors()).toContain('--shard and --merge do not go together');
    const bad = capture();
    expect(await runCli(['tolerance', dir, ...STUDY, '--shard', '3/2'], bad.io)).toBe(2);
    expect(bad.errors()).toContain('--shard: expected k/N');
  }, 120_000);
});

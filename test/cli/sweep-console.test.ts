/**
 * What a sweep prints at the end (real processes on the machinery fixture, invented demo data): the
 * front sorted by the first objective, each design named by its rank in candidates.csv with units,
 * every output file; and, when nothing is feasible, what rejected the designs and exit status 3.
 */
import { execFileSync, spawnSync } from 'node:child_process';
import { readFileSync, writeFileSync } from 'node:fs';
import { afterAll, describe, expect, it } from 'vitest';
import { parse } from 'csv-parse/sync';
import { CLI, requireBuiltCli, scratchArea, SMALL_SWEEP } from './sweep-harness.ts';

const area = scratchArea('console');
afterAll(() => area.cleanup());

describe('the console after a sweep', () => {
  it('lists the front by the first objective, best first, with candidates.csv ranks and units', () => {
    requireBuiltCli();
    const out = area.dir('run');
    const text = execFileSync('node', [CLI, 'sweep', SMALL_SWEEP, '--out', out, '--workers', '1'], {
      encoding: 'utf8',
    });
    expect(text).toMatch(
      /the front: \d+ designs; .* by breakout_voltage \(highest first\), each with its rank in candidates\.csv:/,
    );
    const rows = parse(readFileSync(`${out}/candidates.csv`, 'utf8'), { columns: true }) as Array<
      Record<string, string>
    >;
    const listed = [...text.matchAll(/^ {2}#(\d+) {2}breakout_voltage ([\d.]+) kV, wire_mass ([\d.]+) kg$/gm)];
    expect(listed.length).toBeGreaterThan(0);
    let previous = Number.POSITIVE_INFINITY;
    for (const [, rank, kilovolts] of listed) {
      const row = rows[Number(rank) - 1];
      expect(row?.pareto_rank).toBe('1');
      const value = Number(row?.breakout_voltage_kV);
      expect(Number(kilovolts)).toBeCloseTo(value, -Math.floor(Math.log10(value)) + 3);
      expect(value).toBeLessThanOrEqual(previous);
      previous = value;
    }
    expect(text).toMatch(/secondary\.base_height=[\d.]+ mm/);
    for (const file of ['candidates.csv', 'front.csv', 'infeasible.csv', 'summary.json']) expect(text).toContain(file);
    expect(text).not.toContain('journal-');
  });

  it('with nothing feasible: the constraints that rejected the most, a pointer to infeasible.csv, exit 3', () => {
    const spec = area.dir('impossible.yaml');
    writeFileSync(
      spec,
      readFileSync(SMALL_SWEEP, 'utf8').replace('overall_height: { max: 2.4 m }', 'overall_height: { max: 0.5 m }'),
    );
    const out = area.dir('none');
    const result = spawnSync('node', [CLI, 'sweep', spec, '--out', out, '--workers', '1'], { encoding: 'utf8' });
    expect(result.status).toBe(3);
    expect(result.stdout).toContain('no design met every constraint');
    expect(result.stdout).toMatch(/^ {2}\d+ outside overall_height ≤ 0\.5 m$/m);
    expect(result.stdout).toContain(`${out}/infeasible.csv`);
    const summary = JSON.parse(readFileSync(`${out}/summary.json`, 'utf8')) as { counts: { feasible: number } };
    expect(summary.counts.feasible).toBe(0);
  });
});

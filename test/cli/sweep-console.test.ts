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
    // Each parameter sits beside its own name (a set of wires adds a bare-diameter cell in the CSV).
    for (const line of text.split('\n').filter((l) => l.includes('secondary.turns='))) {
      expect(line).toMatch(
        /secondary\.form_diameter=(160|200|250) mm secondary\.wire=AWG (22|24|26) \([\d.]+ mm\) secondary\.turns=\d+ /,
      );
      const turns = Number(/secondary\.turns=(\d+)/.exec(line)?.[1]);
      expect(turns).toBeGreaterThanOrEqual(600);
      expect(turns).toBeLessThanOrEqual(1400);
    }
    for (const file of ['candidates.csv', 'front.csv', 'infeasible.csv', 'summary.json']) expect(text).toContain(file);
    expect(text).not.toContain('journal-');
    // The reasons designs could not be built: the three largest counts of summary.json's impossible_by.
    const summary = JSON.parse(readFileSync(`${out}/summary.json`, 'utf8')) as {
      counts: { impossible: number };
      impossible_by: Record<string, number>;
    };
    const reasons = Object.entries(summary.impossible_by).slice(0, 3);
    expect(text.includes('could not be built because')).toBe(summary.counts.impossible > 0);
    for (const [reason, count] of reasons) expect(text).toContain(`\n  ${count} ${reason}\n`);
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

  it('candidates.csv is spreadsheet-clean: sets of quantities are numbers, wires get a bare diameter, no text in numeric columns', () => {
    const text = readFileSync(`${area.dir('run')}/candidates.csv`, 'utf8');
    const rows = parse(text, { columns: true }) as Array<Record<string, string>>;
    const header = Object.keys(rows[0] ?? {});
    expect(header).toContain('secondary.form_diameter_mm');
    expect(header).toContain('secondary.wire');
    expect(header).toContain('secondary.wire_bare_diameter_mm');
    // ASTM B258: d = 0.127 mm × 92^((36 − n)/39) (refs §7.1): AWG 22 0.6438 mm, 24 0.5106 mm, 26 0.4049 mm.
    const bare: Record<string, number> = { 'AWG 22': 0.6438, 'AWG 24': 0.5106, 'AWG 26': 0.4049 };
    for (const row of rows) {
      expect([160, 200, 250]).toContain(Number(row['secondary.form_diameter_mm']));
      const wire = row['secondary.wire'] ?? '';
      expect(Number(row['secondary.wire_bare_diameter_mm'])).toBeCloseTo(bare[wire] ?? Number.NaN, 3);
      expect(['0', '1']).toContain(row.feasible);
      for (const [column, cell] of Object.entries(row)) {
        if (column === 'secondary.wire' || column === 'reason' || column === 'warnings') continue;
        if (cell !== '') expect(Number.isFinite(Number(cell)), `${column}: ${cell}`).toBe(true);
      }
    }
    expect(text).not.toMatch(/,inf,|,true,|,false,/);
  });
});

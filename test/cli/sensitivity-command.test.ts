import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { parse as parseCsv } from 'csv-parse/sync';
import { describe, expect, it } from 'vitest';
import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';
import { SAFETY_CAUTIONS } from '../../cli/safety.ts';

function capture() {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = { out: (t) => out.push(t), err: (t) => err.push(t), isTty: false };
  return { io, out, err };
}

const SWEEP = 'examples/sweeps/science-centre-ceiling.yaml';

describe('coilfront sensitivity', () => {
  it('writes sensitivity.csv and .json with one row per field and metric, and the cautions', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'coilfront-sens-'));
    const { io, out } = capture();
    const code = await runCli(['sensitivity', SWEEP, '--samples', '8', '--workers', '0', '--out', dir], io);
    expect(code).toBe(0);
    const rows = parseCsv(readFileSync(join(dir, 'sensitivity.csv'), 'utf8'), { columns: true }) as Record<
      string,
      string
    >[];
    const json = JSON.parse(readFileSync(join(dir, 'sensitivity.json'), 'utf8'));
    expect(rows.length).toBe(json.fields.length * json.metrics.length);
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
    expect(out.join('')).toContain(SAFETY_CAUTIONS[0]);
  });

  it('bad --samples: one line naming the option, exit 2', async () => {
    const { io, err } = capture();
    const code = await runCli(['sensitivity', SWEEP, '--samples', '1', '--workers', '0'], io);
    expect(code).toBe(2);
    expect(err.join('').trim().split('\n')).toHaveLength(1);
    expect(err.join('')).toContain('--samples');
  });
});

import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program.ts';
import type { CliIo } from '../../cli/io.ts';

// The worker pool runs the built JS (dist/): `npm test` builds first.
async function run(args: string[]) {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

describe('coilfront evaluate --batch FILE.jsonl', () => {
  const base = {
    secondary: { form_diameter: '160 mm', wire: 'AWG 26', turns: 1100, base_height: '450 mm' },
    topload: { shape: 'toroid', outer_diameter: '610 mm', tube_diameter: '150 mm', height_above_winding: '40 mm' },
  };
  const lines: string[] = [];
  for (let i = 0; i < 40; i++)
    lines.push(JSON.stringify({ ...base, secondary: { ...base.secondary, turns: 600 + 10 * i } }));
  lines.splice(3, 0, '{ not json');
  lines.splice(7, 0, JSON.stringify({ secondary: { ...base.secondary, turns: -5 } }));
  const file = join(mkdtempSync(join(tmpdir(), 'coilfront-batch-')), 'designs.jsonl');
  writeFileSync(file, `${lines.join('\n')}\n`);

  it('answers one JSON line per input line, in input order, bad lines with their error, exit 2', async () => {
    const result = await run(['evaluate', '--batch', file, '--workers', '2']);
    expect(result.code).toBe(2);
    const answers = result.out
      .trimEnd()
      .split('\n')
      .map((line) => JSON.parse(line));
    expect(answers.map((a) => a.line)).toEqual(lines.map((_, i) => i + 1));
    expect(answers[3].error).toMatch(/line 4: not JSON/);
    expect(answers[7].error).toMatch(/line 8: secondary\.turns: expected a positive number, got -5/);
    const good = answers.filter((a) => a.metrics);
    expect(good).toHaveLength(40);
    expect(good.map((a) => a.metrics.secondary_turns)).toEqual(Array.from({ length: 40 }, (_, i) => 600 + 10 * i));
  });

  it('gives the same metrics as evaluating each design alone', async () => {
    const single = join(mkdtempSync(join(tmpdir(), 'coilfront-batch-')), 'one.json');
    writeFileSync(single, lines[0]);
    const alone = JSON.parse((await run(['evaluate', single, '--json'])).out);
    const batch = JSON.parse((await run(['evaluate', '--batch', file, '--workers', '1'])).out.split('\n')[0]);
    expect(batch.metrics).toEqual(alone.metrics);
  });
});

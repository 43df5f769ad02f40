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

  it('answers a design that cannot be built with its field and reason, not as bad input (exit 0)', async () => {
    // A toroid whose tube reaches below the top of the winding: a design problem, not a malformed line.
    const inside = { ...base, topload: { ...base.topload, outer_diameter: '300 mm', height_above_winding: '10 mm' } };
    const path = join(mkdtempSync(join(tmpdir(), 'coilfront-batch-')), 'impossible.jsonl');
    writeFileSync(path, `${JSON.stringify(base)}\n${JSON.stringify(inside)}\n`);
    const result = await run(['evaluate', '--batch', path, '--workers', '1']);
    expect(result.code).toBe(0);
    const [first, second] = result.out
      .trimEnd()
      .split('\n')
      .map((line) => JSON.parse(line));
    expect(first.metrics).toBeDefined();
    expect(second.line).toBe(2);
    expect(second.impossible.field).toBe('topload.height_above_winding');
    expect(second.impossible.reason).toMatch(/intersects the winding/);
    expect(second.error).toContain(`line 2: topload.height_above_winding: ${second.impossible.reason}`);
    expect(second.design.topload.height_above_winding).toBeCloseTo(0.01, 12);
    expect(second.metrics).toBeUndefined();
  });

  it('gives the same metrics as evaluating each design alone', async () => {
    const single = join(mkdtempSync(join(tmpdir(), 'coilfront-batch-')), 'one.json');
    writeFileSync(single, lines[0]);
    const alone = JSON.parse((await run(['evaluate', single, '--json'])).out);
    const batch = JSON.parse((await run(['evaluate', '--batch', file, '--workers', '1'])).out.split('\n')[0]);
    expect(batch.metrics).toEqual(alone.metrics);
  });
});

import { spawn } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../../cli/program.ts';
import type { CliIo } from '../../cli/io.ts';
import { CLI, requireBuiltCli } from './sweep-harness.ts';

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

describe('coilfront evaluate --batch - through one open pipe', () => {
  const base = {
    secondary: { form_diameter: '160 mm', wire: 'AWG 26', turns: 1100, base_height: '450 mm' },
    topload: { shape: 'toroid', outer_diameter: '610 mm', tube_diameter: '150 mm', height_above_winding: '40 mm' },
  };
  const design = (turns: number) => JSON.stringify({ ...base, secondary: { ...base.secondary, turns } });

  it('answers each batch while stdin stays open, then a second batch, then exits 0 on end of input', async () => {
    requireBuiltCli();
    const child = spawn(process.execPath, [CLI, 'evaluate', '--batch', '-', '--workers', '1'], {
      stdio: ['pipe', 'pipe', 'pipe'],
    });
    const stdin = child.stdin;
    const stdout = child.stdout;
    if (!stdin || !stdout) throw new Error('no pipes');
    let received = '';
    let waiting: { count: number; resolve: (lines: string[]) => void } | null = null;
    const check = () => {
      const lines = received.split('\n').filter((line) => line !== '');
      if (waiting && lines.length >= waiting.count) {
        const done = waiting;
        waiting = null;
        done.resolve(lines);
      }
    };
    stdout.setEncoding('utf8').on('data', (text: string) => {
      received += text;
      check();
    });
    const answersUpTo = (count: number) =>
      new Promise<string[]>((resolve, reject) => {
        const timer = setTimeout(() => reject(new Error(`waited for ${count} answers, got: ${received}`)), 20_000);
        waiting = {
          count,
          resolve: (lines) => {
            clearTimeout(timer);
            resolve(lines);
          },
        };
        check();
      });
    const exited = new Promise<number | null>((resolve) => child.on('close', (code) => resolve(code)));

    // First batch: three designs, written without closing stdin.
    stdin.write(`${[600, 700, 800].map(design).join('\n')}\n`);
    const first = (await answersUpTo(3)).map((line) => JSON.parse(line));
    expect(first.map((a) => a.line)).toEqual([1, 2, 3]);
    expect(first.map((a) => a.metrics.secondary_turns)).toEqual([600, 700, 800]);
    // Second batch on the same process: its answers continue the line numbering.
    stdin.write(`${[900, 1000].map(design).join('\n')}\n`);
    const both = (await answersUpTo(5)).map((line) => JSON.parse(line));
    expect(both.slice(3).map((a) => a.line)).toEqual([4, 5]);
    expect(both.slice(3).map((a) => a.metrics.secondary_turns)).toEqual([900, 1000]);
    stdin.end();
    expect(await exited).toBe(0);
  }, 30_000);
});

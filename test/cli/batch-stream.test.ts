/**
 * `evaluate --batch -` as a persistent server for an external optimiser: a client writes a batch,
 * reads every answer while stdin stays open, then writes the next batch, through one process.
 * (Real process on the built CLI; the designs are invented machinery data.)
 */
import { spawn } from 'node:child_process';
import { createInterface } from 'node:readline';
import { describe, expect, it } from 'vitest';
import { CLI, requireBuiltCli } from './sweep-harness.ts';

const design = (turns: number) =>
  JSON.stringify({
    secondary: { form_diameter: '160 mm', wire: 'AWG 26', turns, base_height: '450 mm' },
    topload: { shape: 'toroid', outer_diameter: '610 mm', tube_diameter: '150 mm', height_above_winding: '40 mm' },
  });

describe('evaluate --batch - through one open pipe', () => {
  it('answers each batch while the pipe stays open, in order, line by line', async () => {
    requireBuiltCli();
    const child = spawn('node', [CLI, 'evaluate', '--batch', '-', '--workers', '1'], {
      stdio: ['pipe', 'pipe', 'inherit'],
    });
    const answers = createInterface({ input: child.stdout })[Symbol.asyncIterator]();
    const next = async () => {
      const timeout = new Promise<never>((_, reject) =>
        setTimeout(() => reject(new Error('no answer within 20 s with the pipe open')), 20_000),
      );
      const result = await Promise.race([answers.next(), timeout]);
      if (result.done) throw new Error('stdout closed early');
      return JSON.parse(result.value) as { line: number; metrics?: Record<string, number | null> };
    };
    // First batch: three designs (fewer than a chunk), then wait with stdin open.
    child.stdin.write(`${design(800)}\n${design(900)}\n${design(1000)}\n`);
    const first = [await next(), await next(), await next()];
    expect(first.map((a) => a.line)).toEqual([1, 2, 3]);
    expect(first.every((a) => a.metrics && typeof a.metrics.secondary_turns === 'number')).toBe(true);
    expect(first.map((a) => a.metrics?.secondary_turns)).toEqual([800, 900, 1000]);
    // Second batch through the same process.
    child.stdin.write(`${design(1100)}\n{ not json\n`);
    const second = [await next(), await next()];
    expect(second.map((a) => a.line)).toEqual([4, 5]);
    expect(second[0]?.metrics?.secondary_turns).toBe(1100);
    expect(second[1]).toHaveProperty('error');
    child.stdin.end();
    const code = await new Promise<number | null>((resolve) => child.on('close', resolve));
    expect(code).toBe(2); // one bad line
  }, 60_000);
});

/** The dynamics benchmark runs and reports a time for every case (small run count, for speed). */
import { expect, test } from 'vitest';
import { benchDynamics } from '../../bench/dynamics.ts';

test('benchDynamics() returns one printable line per case', async () => {
  const lines = await benchDynamics({ runs: 40 });
  console.log(lines.join('\n'));
  expect(lines.length).toBe(8);
  for (const line of lines.slice(1)) expect(line).toMatch(/\d+(\.\d+)? µs$/);
  expect(lines.some((line) => line.includes('non-finite'))).toBe(false);
});

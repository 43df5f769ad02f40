import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { formatDuration, parseDuration } from '../../cli/duration.ts';
import { InputError } from '../../run/input-error.ts';

describe('parseDuration(text)', () => {
  it('reads the forms of the --time-limit documentation in seconds', () => {
    // Arithmetic of the units: 1 min = 60 s, 1 h = 3600 s, 1 d = 86 400 s (SI Brochure, 9th ed.,
    // Table 8, non-SI units accepted for use with the SI).
    expect(parseDuration('90m')).toBe(5_400);
    expect(parseDuration('8h')).toBe(28_800);
    expect(parseDuration('1d')).toBe(86_400);
    expect(parseDuration('45s')).toBe(45);
    expect(parseDuration('1h30m')).toBe(5_400);
    expect(parseDuration('2.5h')).toBe(9_000);
    expect(parseDuration('500ms')).toBe(0.5);
    expect(parseDuration('1d 6h 30m 15s')).toBe(86_400 + 6 * 3_600 + 30 * 60 + 15);
    expect(parseDuration('  .5m ')).toBe(30);
  });

  it('refuses anything else with one line naming the option and the text', () => {
    const bad = [
      'x',
      '',
      '8',
      '8 hours',
      '8H',
      '-5m',
      '1h1h',
      '30m1h',
      '1.h',
      '1e3s',
      '5mo',
      'h',
      '1h+30m',
      'NaN',
      'Infinity',
    ];
    for (const text of bad) {
      let caught: unknown;
      try {
        parseDuration(text, { option: '--time-limit' });
      } catch (error) {
        caught = error;
      }
      expect(caught, text).toBeInstanceOf(InputError);
      const message = (caught as Error).message;
      expect(message).toMatch(/^--time-limit: /);
      expect(message).toContain(`'${text}'`);
      expect(message).not.toContain('\n');
    }
    expect(() => parseDuration('x', { option: '--time-limit' })).toThrow(
      "--time-limit: expected a duration like 90m, 8h or 1d, got 'x'",
    );
    expect(() => parseDuration('90')).toThrow(
      "duration: expected a duration like 90m, 8h or 1d, got '90' (add a unit: s, m, h or d)",
    );
    expect(() => parseDuration('30m1h')).toThrow(/give each unit once, largest first/);
  });

  it('refuses a zero duration unless allowed', () => {
    expect(() => parseDuration('0s', { option: '--checkpoint-every' })).toThrow(
      "--checkpoint-every: expected a duration longer than zero, got '0s'",
    );
    expect(parseDuration('0m', { allowZero: true })).toBe(0);
  });

  it('refuses a duration too long to represent', () => {
    expect(() => parseDuration(`${'9'.repeat(400)}d`)).toThrow(/too long/);
  });
});

describe('formatDuration(seconds)', () => {
  it('writes whole units largest first', () => {
    expect(formatDuration(5_400)).toBe('1h30m');
    expect(formatDuration(93_600)).toBe('1d2h');
    expect(formatDuration(45)).toBe('45s');
    expect(formatDuration(0.25)).toBe('250ms');
    expect(formatDuration(59.6)).toBe('1m');
  });

  it('is read back by parseDuration for any whole number of seconds', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 400 * 86_400 }), (seconds) => {
        expect(parseDuration(formatDuration(seconds))).toBe(seconds);
      }),
      { numRuns: 500, seed: 9 },
    );
  });

  it('refuses a negative or infinite duration', () => {
    expect(() => formatDuration(-1)).toThrow(RangeError);
    expect(() => formatDuration(Infinity)).toThrow(RangeError);
  });
});

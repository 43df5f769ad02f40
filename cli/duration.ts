/**
 * Durations on the command line (--time-limit 8h, --checkpoint-every 30s): a number and a unit, or
 * several from the largest unit down ("1h30m", "1d 6h"). Units: ms, s, m (minutes), h, d (24 h).
 */
import { type InputError, optionError } from '../run/input-error.ts';

const SECONDS_PER_UNIT: Readonly<Record<string, number>> = { d: 86_400, h: 3_600, m: 60, s: 1, ms: 0.001 };
const UNIT_ORDER = ['d', 'h', 'm', 's', 'ms'];
const PART = /(\d+(?:\.\d+)?|\.\d+)\s*(ms|d|h|m|s)(?![a-z])/y;

/** Options of {@link parseDuration}. */
export interface ParseDurationOptions {
  /** The option name that starts the error message; 'duration' unless given. */
  option?: string;
  /** Accept a zero duration ("0s"); by default a duration must be positive. */
  allowZero?: boolean;
}

/**
 * Parses a duration such as "90m", "8h", "1d", "45s", "1h30m", "2.5h" or "500ms" to seconds (a
 * number, possibly fractional). Each unit at most once, largest first; whitespace between parts is
 * allowed. Anything else is an {@link InputError} with one line, e.g.
 * "--time-limit: expected a duration like 90m, 8h or 1d, got 'x'".
 *
 * @example parseDuration('1h30m') // 5400
 * @example parseDuration('2.5h', { option: '--time-limit' }) // 9000
 */
export function parseDuration(text: string, options: ParseDurationOptions = {}): number {
  const option = options.option ?? 'duration';
  const expected = (hint = ''): InputError =>
    optionError(option, `expected a duration like 90m, 8h or 1d, got '${text}'${hint}`);
  const trimmed = text.trim();
  if (trimmed === '') throw expected();
  if (/^\d+(?:\.\d+)?$/.test(trimmed)) throw expected(' (add a unit: s, m, h or d)');
  let seconds = 0;
  let position = 0;
  let previousUnit = -1;
  while (position < trimmed.length) {
    PART.lastIndex = position;
    const match = PART.exec(trimmed);
    if (match === null) throw expected();
    const unitRank = UNIT_ORDER.indexOf(match[2]);
    if (unitRank <= previousUnit) throw expected(' (give each unit once, largest first)');
    previousUnit = unitRank;
    seconds += Number(match[1]) * SECONDS_PER_UNIT[match[2]];
    position = PART.lastIndex;
    while (trimmed[position] === ' ') position++;
  }
  if (!Number.isFinite(seconds)) throw expected(' (too long)');
  if (seconds === 0 && !options.allowZero)
    throw optionError(option, `expected a duration longer than zero, got '${text}'`);
  return seconds;
}

/**
 * Writes a number of seconds as a duration that {@link parseDuration} reads back: whole days, hours,
 * minutes and seconds, largest first, zero parts left out ("1h30m", "1d2h", "45s"); under a second
 * in milliseconds ("250ms"). Rounds to the nearest second from one second up.
 *
 * @example formatDuration(5400) // '1h30m'
 */
export function formatDuration(seconds: number): string {
  if (!Number.isFinite(seconds) || seconds < 0)
    throw new RangeError(`formatDuration needs a finite duration of 0 s or more, got ${seconds}`);
  if (seconds < 1) return `${Math.round(seconds * 1000)}ms`;
  let remaining = Math.round(seconds);
  let text = '';
  for (const unit of ['d', 'h', 'm', 's']) {
    const size = SECONDS_PER_UNIT[unit];
    const whole = Math.floor(remaining / size);
    if (whole > 0) {
      text += `${whole}${unit}`;
      remaining -= whole * size;
    }
  }
  return text;
}

/**
 * What the sweep command prints about its run on stderr: the progress line, and the words for a run
 * that failed or was stopped, each with its resume hint.
 */
import { DiskError, toDiskError } from '../../run/durable/disk-error.ts';
import type { StopSignal } from '../../run/durable/stop-signal.ts';
import type { SweepProgress, SweepRunResult } from '../../run/sweep-run.ts';
import { formatDuration } from '../duration.ts';
import type { CliIo } from '../io.ts';

/** The progress line: refreshed in place on a terminal, one line every ten seconds in a log. */
export function progressPrinter(io: CliIo): (progress: SweepProgress, final: boolean) => void {
  let last = performance.now();
  return ({ designs, total, rate, feasible }, final) => {
    const now = performance.now();
    if (!final && now - last < (io.isTty ? 500 : 10_000)) return;
    last = now;
    const eta = rate > 0 ? formatDuration(Math.max(0, (total - designs) / rate)) : '?';
    const text = `swept ${designs}/${total} designs (${((100 * designs) / Math.max(1, total)).toFixed(1)}%), ${rate.toFixed(0)} designs/s, ${feasible} feasible, ETA ${eta}`;
    if (io.isTty) io.err(`\r${text}${final ? '\n' : ''}`);
    else io.err(`${text}\n`);
  };
}

/** The lines of a sweep that failed in its loop or while writing its outputs, with the resume hint. */
export function sweepFailedText(outcome: Extract<SweepRunResult, { kind: 'failed' }>, directory: string): string {
  const resumeHint = `the last good checkpoint in ${directory} can be resumed with: npx coilfront sweep --resume ${directory}`;
  const { error } = outcome;
  if (outcome.phase === 'loop') {
    const message = error instanceof Error ? error.message : String(error);
    return `coilfront: the sweep stopped: ${message}\n  ${resumeHint}\n`;
  }
  const diskError = error instanceof DiskError ? error : toDiskError(error, directory, 'write');
  return `coilfront: ${diskError.message}\n  ${resumeHint}\n`;
}

/** Why a stop was asked, in words: `the time limit was reached`, `SIGINT was received`. */
export function stopReasonWords(stop: StopSignal): string {
  return stop.reason === 'time-limit' ? 'the time limit was reached' : `${stop.signal ?? 'a signal'} was received`;
}

/** The lines of a sweep stopped before its last design, with the resume command. */
export function sweepStoppedText(stop: StopSignal, evaluated: number, total: number, directory: string): string {
  return `stopped: ${stopReasonWords(stop)} after ${evaluated} of ${total} designs; outputs so far are in ${directory}\n  resume with: npx coilfront sweep --resume ${directory}\n`;
}

/**
 * A stop request for a long run: SIGINT (Ctrl-C) or SIGTERM (a scheduler ending the job) or a time
 * limit asks the run to finish the batches in flight, write its outputs and checkpoint, and exit; a
 * second SIGINT exits at once. The run polls `stopRequested` between batches (or listens with
 * `onStop`) and ends with `process.exitCode = stop.exitCode()`.
 *
 * Imports only node builtins, so a test can load it in a child process.
 */
import { constants } from 'node:os';

/** The signals handled unless told otherwise. */
export const STOP_SIGNALS: readonly NodeJS.Signals[] = ['SIGINT', 'SIGTERM'];

/**
 * Exit code of a run stopped by its time limit: 124, the code of the `timeout` utility of GNU
 * coreutils when its command ran out of time (common practice), so scripts can tell "not finished,
 * resumable" from success (0) and from failure.
 */
export const TIME_LIMIT_EXIT_CODE = 124;

/** Why a stop was requested. */
export type StopReason = 'signal' | 'time-limit';

/** Options of {@link installStopSignal}. */
export interface StopSignalOptions {
  /** Stop after this many seconds from installation (--time-limit); none unless given. */
  timeLimitSeconds?: number;
  /** Wall-clock time in ms since the epoch; Date.now unless given (tests inject a clock). */
  now?: () => number;
  /**
   * How often the time limit is checked, in ms; 1000 unless given. The check uses the wall clock,
   * so time spent with the machine asleep counts towards the limit.
   */
  checkIntervalMs?: number;
  /** Receives the lines the helper prints (one per event); nothing is printed unless given. */
  log?: (line: string) => void;
  /** The signals to handle; SIGINT and SIGTERM unless given. */
  signals?: readonly NodeJS.Signals[];
  /** Called for the immediate exit on a second SIGINT; process.exit unless given. */
  exit?: (code: number) => void;
}

/** A stop request being watched for. */
export interface StopSignal {
  /** True once a handled signal arrived or the time limit passed. */
  readonly stopRequested: boolean;
  /** The first handled signal that arrived, or null. */
  readonly signal: NodeJS.Signals | null;
  /** Why the stop was requested, or null while none was. */
  readonly reason: StopReason | null;
  /** The time limit's deadline in ms since the epoch, or null without one. */
  readonly deadline: number | null;
  /**
   * The exit code for the way the run ends: 0 without a stop, 128 + the signal's number after a
   * signal (SIGINT 130, SIGTERM 143, the shells' convention for a process ended by a signal), and
   * {@link TIME_LIMIT_EXIT_CODE} after the time limit.
   */
  exitCode(): number;
  /** Calls `listener` once when a stop is first requested (at once if it already was); returns an unsubscribe. */
  onStop(listener: (reason: StopReason) => void): () => void;
  /** Removes the signal handlers and the timer; the process then reacts to signals as by default. */
  dispose(): void;
}

/** The signal's number (SIGINT 2, SIGTERM 15 on POSIX). */
export function signalNumber(signal: NodeJS.Signals): number {
  return (constants.signals as Record<string, number>)[signal];
}

/**
 * Installs SIGINT/SIGTERM handlers (or `options.signals`) and an optional time limit, and returns
 * the stop request to poll. The first signal sets `stopRequested` and is recorded; a later SIGTERM
 * is ignored (the run is already stopping); a second SIGINT calls `exit(130)` at once.
 *
 * @example
 *   const stop = installStopSignal({ timeLimitSeconds: parseDuration('8h'), log: (line) => console.error(line) })
 *   while (!stop.stopRequested && more()) await runBatch()
 *   writeOutputs(); stop.dispose(); process.exitCode = stop.exitCode()
 */
export function installStopSignal(options: StopSignalOptions = {}): StopSignal {
  const now = options.now ?? Date.now;
  const log = options.log ?? (() => undefined);
  const exit = options.exit ?? ((code: number) => process.exit(code));
  const signals = options.signals ?? STOP_SIGNALS;
  if (
    options.timeLimitSeconds !== undefined &&
    !(options.timeLimitSeconds >= 0 && Number.isFinite(options.timeLimitSeconds))
  ) {
    throw new RangeError(`the time limit must be a finite number of seconds >= 0, got ${options.timeLimitSeconds}`);
  }
  const deadline = options.timeLimitSeconds === undefined ? null : now() + options.timeLimitSeconds * 1000;
  const state: StopState = { reason: null, firstSignal: null, listeners: [], timer: undefined };

  const checkDeadline = (): void => {
    if (state.reason === null && deadline !== null && now() >= deadline) {
      log('time limit reached: finishing the batches in flight, then writing outputs and the checkpoint');
      requestStop(state, 'time-limit');
    }
  };
  const handlers = installHandlers(state, signals, log, exit);
  if (deadline !== null) {
    state.timer = setInterval(checkDeadline, Math.max(1, options.checkIntervalMs ?? 1000));
    state.timer.unref();
  }
  return stopHandle(state, deadline, checkDeadline, handlers);
}

/** What a stop request being watched for holds: why and by which signal it was asked, who waits, the timer. */
interface StopState {
  reason: StopReason | null;
  firstSignal: NodeJS.Signals | null;
  listeners: Array<(reason: StopReason) => void>;
  timer: NodeJS.Timeout | undefined;
}

/** Records the first stop request, stops the timer and calls the waiting listeners once; later ones do nothing. */
function requestStop(state: StopState, why: StopReason): void {
  if (state.reason !== null) return;
  state.reason = why;
  if (state.timer !== undefined) clearInterval(state.timer);
  const waiting = state.listeners;
  state.listeners = [];
  for (const listener of waiting) listener(why);
}

/** Installs one handler per signal: the first requests the stop, a later SIGINT exits at once. */
function installHandlers(
  state: StopState,
  signals: readonly NodeJS.Signals[],
  log: (line: string) => void,
  exit: (code: number) => void,
): Map<NodeJS.Signals, () => void> {
  const handlers = new Map<NodeJS.Signals, () => void>();
  for (const signal of signals) {
    const handler = (): void => {
      if (state.reason === null) {
        state.firstSignal = signal;
        const again = signal === 'SIGINT' ? ' (press Ctrl-C again to stop at once, without the checkpoint)' : '';
        log(`received ${signal}: finishing the batches in flight, then writing outputs and the checkpoint${again}`);
        requestStop(state, 'signal');
      } else if (signal === 'SIGINT') {
        log('received SIGINT again: stopping at once; the last checkpoint written stays resumable');
        exit(128 + signalNumber('SIGINT'));
      }
    };
    handlers.set(signal, handler);
    process.on(signal, handler);
  }
  return handlers;
}

/** The stop request handed to the run: every read checks the deadline first. */
function stopHandle(
  state: StopState,
  deadline: number | null,
  checkDeadline: () => void,
  handlers: Map<NodeJS.Signals, () => void>,
): StopSignal {
  return {
    get stopRequested() {
      checkDeadline();
      return state.reason !== null;
    },
    get signal() {
      return state.firstSignal;
    },
    get reason() {
      checkDeadline();
      return state.reason;
    },
    deadline,
    exitCode() {
      checkDeadline();
      if (state.reason === 'signal' && state.firstSignal !== null) return 128 + signalNumber(state.firstSignal);
      if (state.reason === 'time-limit') return TIME_LIMIT_EXIT_CODE;
      return 0;
    },
    onStop(listener) {
      const reason = state.reason;
      if (reason !== null) {
        listener(reason);
        return () => undefined;
      }
      state.listeners.push(listener);
      return () => {
        state.listeners = state.listeners.filter((entry) => entry !== listener);
      };
    },
    dispose() {
      for (const [signal, handler] of handlers) process.off(signal, handler);
      handlers.clear();
      if (state.timer !== undefined) clearInterval(state.timer);
      state.timer = undefined;
    },
  };
}

/**
 * `coilfront evaluate --batch FILE.jsonl` (or `-` for stdin): one design (JSON) per line in, one JSON
 * result per line out, in input order, evaluated in the worker pool in chunks. A bad line gives
 * `{ "line": n, "error": "..." }` and the rest go on; the exit code is 2 if any line was bad. A design
 * that reads well but cannot be built (a winding inside the topload, a primary that cannot tune) is
 * not bad input but an answer an optimiser needs: `{ "line", "error", "impossible": { "field",
 * "reason" }, "design" }`, with the same error text as before, and it does not set exit code 2.
 * Answers stream: each chunk's lines are written as soon as it and the chunks before it are done, and
 * a partial chunk is sent when the input pauses, so a client can keep one process and exchange batches.
 */
import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import type { Design } from '../core/design.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { createDesignPool, defaultWorkerCount } from '../workers/pool.ts';
import { evaluationJson } from './evaluate-command.ts';
import { fieldError, InputError } from '../run/input-error.ts';
import type { CliIo } from './io.ts';
import { designFromValue, type LoadedDesign } from './load-design.ts';
import { fileError } from './input-errors.ts';

/** Designs per pool task. */
const CHUNK = 32;
/** Chunks evaluated or waiting to be written, per worker, before reading pauses. */
const IN_FLIGHT_PER_WORKER = 2;
/** A partial chunk is sent once no input line has arrived for this long, ms. */
const IDLE_FLUSH_MS = 5;
/** Bytes read from a file at a time (about 30 design lines). */
const READ_BYTES = 16 * 1024;
/** Lines read ahead of the evaluation before reading pauses. */
const READ_AHEAD_LINES = 2 * CHUNK;

/**
 * The input's lines, read at most READ_AHEAD_LINES (plus one read) ahead of the consumer. readline's own
 * async iterator reads up to 1024 lines ahead; lines that wait that long outlive the young generation
 * and fill the main thread's old space (measured with --trace-gc), so the reading is paced here.
 */
async function* pacedLines(input: NodeJS.ReadableStream): AsyncGenerator<string> {
  const reader = createInterface({ input, crlfDelay: Infinity });
  const queue: string[] = [];
  let ended = false;
  let wake: (() => void) | null = null;
  const notify = () => {
    const w = wake;
    wake = null;
    w?.();
  };
  reader.on('line', (line: string) => {
    queue.push(line);
    if (queue.length >= READ_AHEAD_LINES) reader.pause();
    notify();
  });
  reader.on('close', () => {
    ended = true;
    notify();
  });
  input.on('error', () => {
    ended = true;
    notify();
  });
  try {
    for (;;) {
      const line = queue.shift();
      if (line !== undefined) {
        if (queue.length < CHUNK) reader.resume();
        yield line;
        continue;
      }
      if (ended) return;
      await new Promise<void>((resolve) => {
        wake = resolve;
      });
    }
  } finally {
    reader.close();
  }
}

type Line = { line: number; error: string } | { line: number; loaded: LoadedDesign; where: string };

function readLine(text: string, lineNumber: number, where: string): Line {
  try {
    let value: unknown;
    try {
      value = JSON.parse(text);
    } catch (error) {
      throw fileError(where, `not JSON: ${(error as Error).message}`);
    }
    return { line: lineNumber, loaded: designFromValue(value, where), where };
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    return { line: lineNumber, error: error.message };
  }
}

export async function batchEvaluate(file: string, io: CliIo, options: { workers?: number } = {}): Promise<number> {
  const input = file === '-' ? process.stdin : createReadStream(file, { highWaterMark: READ_BYTES });
  let openError: NodeJS.ErrnoException | null = null;
  input.on('error', (error: NodeJS.ErrnoException) => (openError = error));
  const lines = pacedLines(input);
  const workers = options.workers ?? defaultWorkerCount();
  const pool = createDesignPool(workers);
  const limit = IN_FLIGHT_PER_WORKER * Math.max(1, workers);
  // Each chunk's answers are written as soon as it and every chunk before it are done (input order);
  // `written` is the chain of those writes, `inFlight` the chunks not yet written (for backpressure).
  let written: Promise<void> = Promise.resolve();
  const inFlight: Array<Promise<void>> = [];
  let failure: unknown = null;
  let bad = 0;
  let chunk: Line[] = [];
  let idleTimer: NodeJS.Timeout | null = null;
  const send = () => {
    if (idleTimer !== null) clearTimeout(idleTimer);
    idleTimer = null;
    if (chunk.length === 0) return;
    const sent = chunk;
    chunk = [];
    const designs: Design[] = sent.flatMap((l) => ('loaded' in l ? [l.loaded.design] : []));
    const evaluated = designs.length > 0 ? pool.evaluate(designs) : Promise.resolve([] as Evaluation[]);
    const answers = evaluated.then((evaluations) => answerLines(sent, evaluations, () => bad++));
    written = written
      .then(() => answers)
      .then((text) => io.out(text))
      .catch((error: unknown) => {
        failure ??= error;
      });
    inFlight.push(written);
  };
  // A client that writes a few lines and waits with the pipe open gets its answers: a partial chunk
  // is sent once no line has arrived for IDLE_FLUSH_MS.
  const sendWhenIdle = () => {
    if (idleTimer === null) idleTimer = setTimeout(send, IDLE_FLUSH_MS);
  };
  let lineNumber = 0;
  try {
    for await (const text of lines) {
      lineNumber++;
      if (text.trim() === '') continue;
      chunk.push(readLine(text, lineNumber, `${file === '-' ? 'stdin' : file} line ${lineNumber}`));
      if (chunk.length >= CHUNK) send();
      else sendWhenIdle();
      while (inFlight.length > limit) await inFlight.shift();
    }
    send();
    await written;
  } catch (error) {
    if (openError) throw fileError(file, `cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
    throw error;
  } finally {
    if (idleTimer !== null) clearTimeout(idleTimer);
    await written;
    await pool.close();
  }
  if (failure !== null) throw failure;
  if (openError) throw fileError(file, `cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
  return bad > 0 ? 2 : 0;
}

/** The answer lines of one chunk, in input order: a result, an impossible design, or the line's error (counted by `onBad`). */
function answerLines(sent: readonly Line[], evaluations: readonly Evaluation[], onBad: () => void): string {
  let next = 0;
  return sent
    .map((l) => {
      if (!('loaded' in l)) {
        onBad();
        return JSON.stringify({ line: l.line, error: l.error });
      }
      const evaluation = evaluations[next++];
      if (!evaluation) throw new Error(`the pool returned ${evaluations.length} evaluations for a longer chunk`);
      const problem = evaluation.problems[0];
      if (problem)
        return JSON.stringify({
          line: l.line,
          error: fieldError(l.where, { path: problem.field.split('.'), message: problem.reason }).message,
          impossible: { field: problem.field, reason: problem.reason },
          design: evaluationJson(l.loaded.tree, evaluation).design,
        });
      return JSON.stringify({ line: l.line, ...evaluationJson(l.loaded.tree, evaluation) });
    })
    .map((text) => `${text}\n`)
    .join('');
}

/**
 * `coilfront evaluate --batch FILE.jsonl` (or `-` for stdin): one design (JSON) per line in, one JSON
 * result per line out, in input order, evaluated in the worker pool in chunks. A bad line gives
 * `{ "line": n, "error": "..." }` and the rest go on; the exit code is 2 if any line was bad.
 */
import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import type { Design } from '../core/design.ts';
import type { Evaluation } from '../core/evaluate.ts';
import { createDesignPool, defaultWorkerCount } from '../workers/pool.ts';
import { evaluationJson } from './evaluate-command.ts';
import { fieldError, InputError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { designFromValue, type LoadedDesign } from './load-design.ts';

const CHUNK = 32;

type Line = { line: number; error: string } | { line: number; loaded: LoadedDesign; where: string };

function readLine(text: string, lineNumber: number, where: string): Line {
  try {
    let value: unknown;
    try {
      value = JSON.parse(text);
    } catch (error) {
      throw new InputError(`${where}: not JSON: ${(error as Error).message}`);
    }
    return { line: lineNumber, loaded: designFromValue(value, where), where };
  } catch (error) {
    if (!(error instanceof InputError)) throw error;
    return { line: lineNumber, error: error.message };
  }
}

export async function batchEvaluate(file: string, io: CliIo, options: { workers?: number } = {}): Promise<number> {
  const input = file === '-' ? process.stdin : createReadStream(file);
  let openError: NodeJS.ErrnoException | null = null;
  const lines = createInterface({ input, crlfDelay: Infinity });
  const pool = createDesignPool(options.workers ?? defaultWorkerCount());
  // Chunks in flight; past this many, reading pauses until the oldest one has been answered.
  const limit = 2 * Math.max(1, options.workers ?? defaultWorkerCount());
  let bad = 0;
  let chunk: Line[] = [];
  let inFlight = 0;
  let failure: unknown = null;
  // Answers go out in input order: each chunk's text is written as soon as it and every chunk before it
  // are done, not when the input ends, so a client can keep the pipe open and exchange batches.
  let output: Promise<void> = Promise.resolve();
  const format = (lines_: Line[], evaluations: Evaluation[]): string => {
    let next = 0;
    return lines_
      .map((l) => {
        if (!('loaded' in l)) {
          bad++;
          return JSON.stringify({ line: l.line, error: l.error });
        }
        const evaluation = evaluations[next++];
        if (evaluation.problems.length > 0) {
          bad++;
          const problem = evaluation.problems[0];
          return JSON.stringify({
            line: l.line,
            error: fieldError(l.where, { path: problem.field.split('.'), message: problem.reason }).message,
          });
        }
        return JSON.stringify({ line: l.line, ...evaluationJson(l.loaded.tree, evaluation) });
      })
      .map((text) => `${text}\n`)
      .join('');
  };
  const send = () => {
    const lines_ = chunk;
    chunk = [];
    const designs: Design[] = lines_.flatMap((l) => ('loaded' in l ? [l.loaded.design] : []));
    const evaluated = designs.length > 0 ? pool.evaluate(designs) : Promise.resolve([] as Evaluation[]);
    // A rejection is seen by the output chain below; this keeps it from being reported unhandled first.
    evaluated.catch(() => {});
    inFlight++;
    if (inFlight > limit) lines.pause();
    output = output
      .then(() => evaluated)
      .then((evaluations) => {
        if (failure === null) io.out(format(lines_, evaluations));
      })
      .catch((error: unknown) => {
        failure ??= error;
      })
      .finally(() => {
        inFlight--;
        if (inFlight <= limit) lines.resume();
      });
  };
  let lineNumber = 0;
  let flushScheduled = false;
  const where = file === '-' ? 'stdin' : file;
  try {
    await new Promise<void>((resolveRead) => {
      input.on('error', (error: NodeJS.ErrnoException) => {
        openError = error;
        resolveRead();
      });
      lines.on('close', () => resolveRead());
      lines.on('line', (text) => {
        lineNumber++;
        if (text.trim() === '') return;
        chunk.push(readLine(text, lineNumber, `${where} line ${lineNumber}`));
        if (chunk.length >= CHUNK) send();
        // Whatever a read delivered is sent once its lines are parsed, full chunk or not: a client that
        // writes a short batch and waits gets its answers without closing its end of the pipe.
        if (!flushScheduled) {
          flushScheduled = true;
          setImmediate(() => {
            flushScheduled = false;
            if (chunk.length > 0) send();
          });
        }
      });
    });
    if (chunk.length > 0) send();
    await output;
    if (failure !== null) throw failure;
  } finally {
    lines.close();
    await pool.close();
  }
  if (openError)
    throw new InputError(`${file}: cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
  return bad > 0 ? 2 : 0;
}

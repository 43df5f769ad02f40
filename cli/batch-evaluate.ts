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
  input.on('error', (error: NodeJS.ErrnoException) => (openError = error));
  const lines = createInterface({ input, crlfDelay: Infinity });
  const pool = createDesignPool(options.workers ?? defaultWorkerCount());
  const inFlight: Array<Promise<string>> = [];
  const limit = 2 * Math.max(1, options.workers ?? defaultWorkerCount());
  let bad = 0;
  let chunk: Line[] = [];
  const send = () => {
    const lines_ = chunk;
    chunk = [];
    const designs: Design[] = lines_.flatMap((l) => ('loaded' in l ? [l.loaded.design] : []));
    const evaluated = designs.length > 0 ? pool.evaluate(designs) : Promise.resolve([] as Evaluation[]);
    inFlight.push(
      evaluated.then((evaluations) => {
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
      }),
    );
  };
  const drain = async (all: boolean) => {
    while (inFlight.length > (all ? 0 : limit)) io.out(await inFlight.shift()!);
  };
  let lineNumber = 0;
  try {
    for await (const text of lines) {
      lineNumber++;
      if (text.trim() === '') continue;
      chunk.push(readLine(text, lineNumber, `${file === '-' ? 'stdin' : file} line ${lineNumber}`));
      if (chunk.length >= CHUNK) {
        send();
        await drain(false);
      }
    }
    if (chunk.length > 0) send();
    await drain(true);
  } catch (error) {
    if (openError)
      throw new InputError(`${file}: cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
    throw error;
  } finally {
    await pool.close();
  }
  if (openError)
    throw new InputError(`${file}: cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
  return bad > 0 ? 2 : 0;
}

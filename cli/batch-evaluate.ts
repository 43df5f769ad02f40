/**
 * `coilfront evaluate --batch FILE.jsonl` (or `-` for stdin): one design (JSON) per line in, one JSON
 * result per line out, in input order, evaluated in the worker pool. A bad line gives
 * `{ "line": n, "error": "..." }` and the rest go on; the exit code is 2 if any line was bad.
 */
import { createReadStream } from 'node:fs';
import { createInterface } from 'node:readline';
import { evaluateDesign } from '../core/evaluate.ts';
import { evaluationJson } from './evaluate-command.ts';
import { InputError } from './input-error.ts';
import type { CliIo } from './io.ts';
import { designFromValue } from './load-design.ts';

export async function batchEvaluate(file: string, io: CliIo): Promise<number> {
  const input = file === '-' ? process.stdin : createReadStream(file);
  let openError: Error | null = null;
  input.on('error', (error: Error) => (openError = error));
  const lines = createInterface({ input, crlfDelay: Infinity });
  let lineNumber = 0;
  let bad = 0;
  try {
    for await (const text of lines) {
      lineNumber++;
      if (text.trim() === '') continue;
      const where = `${file === '-' ? 'stdin' : file} line ${lineNumber}`;
      try {
        let value: unknown;
        try {
          value = JSON.parse(text);
        } catch (error) {
          throw new InputError(`${where}: not JSON: ${(error as Error).message}`);
        }
        const loaded = designFromValue(value, where);
        const evaluation = evaluateDesign(loaded.design);
        if (evaluation.problems.length > 0) {
          const problem = evaluation.problems[0]!;
          throw new InputError(`${where}: ${problem.field}: ${problem.reason}`);
        }
        io.out(`${JSON.stringify({ line: lineNumber, ...evaluationJson(loaded.tree, evaluation) })}\n`);
      } catch (error) {
        if (!(error instanceof InputError)) throw error;
        bad++;
        io.out(`${JSON.stringify({ line: lineNumber, error: error.message })}\n`);
      }
    }
  } catch (error) {
    if (openError) throw new InputError(`${file}: cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
    throw error;
  }
  if (openError) throw new InputError(`${file}: cannot be read (${(openError as NodeJS.ErrnoException).code ?? 'error'})`);
  return bad > 0 ? 2 : 0;
}

/**
 * Every InputError is built by a factory: run/input-error.ts for the run layer, cli/input-errors.ts
 * for the command line (on the run layer's shapes), so that the message formats are one
 * (`FILE: field.path: reason`, `--option: reason`, `subject: reason`). The rule is ours (DEVELOPERS.md).
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { commandError, fileError } from '../../cli/input-errors.ts';
import { fieldError, InputError, optionError, subjectError } from '../../run/input-error.ts';

const FACTORIES = ['run/input-error.ts', 'cli/input-errors.ts'];
/**
 * Modules of other work in progress that still build InputErrors by hand; each must move to the
 * factories, and this list only shrinks (a listed module that no longer does so fails the test).
 */
const NOT_YET_MOVED: string[] = [];

function sourceFiles(folder: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(folder)) {
    const path = join(folder, name);
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (name.endsWith('.ts')) out.push(path);
  }
  return out;
}

describe('InputError construction', () => {
  const builders = ['core', 'optimize', 'workers', 'run', 'cli', 'api']
    .flatMap(sourceFiles)
    .filter((file) => readFileSync(file, 'utf8').includes('new InputError('));

  it('happens only in the factory modules of run/ and cli/', () => {
    const outside = builders.filter((file) => !FACTORIES.includes(file) && !NOT_YET_MOVED.includes(file));
    expect(outside).toEqual([]);
  });

  it('still happens by hand in each module listed as not yet moved (the list only shrinks)', () => {
    expect(NOT_YET_MOVED.filter((file) => !builders.includes(file))).toEqual([]);
  });

  it('gives one line in the shapes file: path: reason, --option: reason and subject: reason', () => {
    expect(fieldError('a.yaml', { path: ['secondary', 'turns'], message: 'expected a whole number' }).message).toBe(
      'a.yaml: secondary.turns: expected a whole number',
    );
    expect(fieldError('a.yaml', { path: [], message: 'the file is empty' }).message).toBe('a.yaml: the file is empty');
    expect(optionError('--keep', 'expected at least 1, got 0').message).toBe('--keep: expected at least 1, got 0');
    expect(subjectError('runs/a', 'no checkpoint yet').message).toBe('runs/a: no checkpoint yet');
    expect(commandError('merge', 'give the shard directories').message).toBe('merge: give the shard directories');
    const error = fileError('runs/a', "unknown key 'x\ny'");
    expect(error).toBeInstanceOf(InputError);
    expect(error.exitCode).toBe(2);
    expect(error.message).toBe("runs/a: unknown key 'x\\ny'");
  });
});

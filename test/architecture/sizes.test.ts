/**
 * The size rules of DEVELOPERS.md, read from the source itself: no function (declaration, method,
 * arrow or expression) longer than 80 lines in the source layers, and no command file
 * (cli/*-command.ts) longer than 150 lines. The rule is ours; the count is exact (the compiler's
 * own parse, first line to last line inclusive).
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join } from 'node:path';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const LAYERS = ['core', 'optimize', 'workers', 'run', 'cli', 'api'];
const MAX_FUNCTION_LINES = 80;
const MAX_COMMAND_LINES = 150;

function sourceFiles(folder: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(folder)) {
    const path = join(folder, name);
    if (statSync(path).isDirectory()) out.push(...sourceFiles(path));
    else if (name.endsWith('.ts') && !name.endsWith('.d.ts')) out.push(path);
  }
  return out;
}

const isFunction = (node: ts.Node): boolean =>
  ts.isFunctionDeclaration(node) ||
  ts.isMethodDeclaration(node) ||
  ts.isArrowFunction(node) ||
  ts.isFunctionExpression(node) ||
  ts.isConstructorDeclaration(node) ||
  ts.isGetAccessorDeclaration(node) ||
  ts.isSetAccessorDeclaration(node);

/** `file:line name (n lines)` for every function over the limit. */
function longFunctions(file: string): string[] {
  const source = ts.createSourceFile(file, readFileSync(file, 'utf8'), ts.ScriptTarget.Latest, true);
  const found: string[] = [];
  const visit = (node: ts.Node) => {
    if (isFunction(node)) {
      const first = source.getLineAndCharacterOfPosition(node.getStart(source)).line;
      const last = source.getLineAndCharacterOfPosition(node.getEnd()).line;
      const lines = last - first + 1;
      const name = (node as { name?: ts.Node }).name?.getText(source) ?? '(anonymous)';
      if (lines > MAX_FUNCTION_LINES) found.push(`${file}:${first + 1} ${name} (${lines} lines)`);
    }
    ts.forEachChild(node, visit);
  };
  visit(source);
  return found;
}

describe('the size rules', () => {
  const files = LAYERS.flatMap((layer) => sourceFiles(layer));

  it(`no function is longer than ${MAX_FUNCTION_LINES} lines`, () => {
    expect(files.flatMap(longFunctions)).toEqual([]);
  });

  it(`no command file is longer than ${MAX_COMMAND_LINES} lines`, () => {
    const long = files
      .filter((file) => /^cli\/[^/]+-command\.ts$/.test(file))
      .map((file) => ({ file, lines: readFileSync(file, 'utf8').split('\n').length - 1 }))
      .filter(({ lines }) => lines > MAX_COMMAND_LINES)
      .map(({ file, lines }) => `${file} (${lines} lines)`);
    expect(long).toEqual([]);
  });

  it('the counter sees a long function (a check that can fail)', () => {
    const body = Array.from({ length: MAX_FUNCTION_LINES }, (_, i) => `  const v${i} = ${i};`).join('\n');
    const source = ts.createSourceFile('x.ts', `function f() {\n${body}\n}\n`, ts.ScriptTarget.Latest, true);
    let lines = 0;
    ts.forEachChild(source, (node) => {
      if (isFunction(node))
        lines =
          source.getLineAndCharacterOfPosition(node.getEnd()).line -
          source.getLineAndCharacterOfPosition(node.getStart(source)).line +
          1;
    });
    expect(lines).toBe(MAX_FUNCTION_LINES + 2);
  });
});

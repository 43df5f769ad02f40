/**
 * For tests that run our modules in a child process: Node 20 cannot load TypeScript, so the named
 * modules of run/durable/ are transpiled one by one (imports rewritten from .ts to .js) into a folder
 * marked as ESM. The modules must import only each other and node builtins.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import ts from 'typescript';

export function transpileDurableModules(names: readonly string[], directory: string): void {
  mkdirSync(directory, { recursive: true });
  writeFileSync(join(directory, 'package.json'), '{"type":"module"}');
  for (const name of names) {
    const source = readFileSync(new URL(`../../../run/durable/${name}.ts`, import.meta.url), 'utf8');
    const output = ts.transpileModule(source, {
      compilerOptions: {
        module: ts.ModuleKind.ESNext,
        target: ts.ScriptTarget.ES2022,
        rewriteRelativeImportExtensions: true,
        verbatimModuleSyntax: true,
      },
    }).outputText;
    writeFileSync(join(directory, `${name}.js`), output);
  }
}

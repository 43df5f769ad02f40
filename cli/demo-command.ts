/**
 * `coilfront demo` (`npm run demo`): the example science-centre scenario, a few thousand designs,
 * into runs/demo, then the best five and where the files are.
 */
import { fileURLToPath } from 'node:url';
import { dirname, join, resolve } from 'node:path';
import type { CliIo } from './io.ts';
import { sweepCommand } from './sweep-command.ts';

/** The repository's examples folder, from src or dist. */
export function examplesDirectory(): string {
  const here = dirname(fileURLToPath(import.meta.url));
  return here.includes(`${'/'}dist${'/'}`) || here.endsWith('/dist/cli')
    ? resolve(here, '..', '..', 'examples')
    : resolve(here, '..', 'examples');
}

export async function demoCommand(options: { workers?: number }, io: CliIo): Promise<number> {
  const spec = join(examplesDirectory(), 'sweeps', 'science-centre-ceiling.yaml');
  io.err(`demo: sweeping ${spec} into runs/demo\n`);
  return sweepCommand(
    spec,
    {
      out: 'runs/demo',
      overwrite: true,
      syncEvery: '5s',
      ...(options.workers !== undefined ? { workers: options.workers } : {}),
    },
    io,
  );
}

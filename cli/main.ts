#!/usr/bin/env node
/** Process entry of the `coilfront` command. */
import { runCli } from './program.ts';
import { processIo } from './io.ts';

// A closed pipe (`coilfront schema | head`) ends the program quietly, as other command-line tools do.
process.stdout.on('error', (error: NodeJS.ErrnoException) => {
  if (error.code === 'EPIPE') process.exit(0);
  throw error;
});

const code = await runCli(process.argv.slice(2), processIo);
process.exitCode = code;

#!/usr/bin/env node
/** Process entry of the `coilfront` command. */
import { runCli } from './program.ts';
import { processIo } from './io.ts';

const code = await runCli(process.argv.slice(2), processIo);
process.exitCode = code;

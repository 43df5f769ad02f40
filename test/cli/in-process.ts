import type { CliIo } from '../../cli/io.ts';
import { runCli } from '../../cli/program.ts';

/** Runs the command line in this process (as the built CLI would), collecting what it writes to stdout and stderr. */
export async function cli(args: string[]): Promise<{ code: number; out: string; err: string }> {
  let out = '';
  let err = '';
  const io: CliIo = { out: (t) => (out += t), err: (t) => (err += t), isTty: false };
  const code = await runCli(args, io);
  return { code, out, err };
}

/** Where a command writes: injected so that the whole CLI runs inside tests. */
export interface CliIo {
  out(text: string): void;
  err(text: string): void;
  /** Whether stderr is a terminal (progress bars) — false in tests and logs. */
  isTty: boolean;
}

/** The process's own streams. */
export const processIo: CliIo = {
  out: (text) => process.stdout.write(text),
  err: (text) => process.stderr.write(text),
  isTty: Boolean(process.stderr.isTTY),
};

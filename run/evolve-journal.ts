/**
 * The evolve stage's journal (evolve-journal.log, run/durable/journal.ts): its first record names the
 * stage's settings, each later record is one finished generation. A journal of other settings is
 * started over; one of the same settings is replayed by streaming, so memory stays flat in its length.
 */
import { existsSync, rmSync } from 'node:fs';
import type { GenerationRecord } from '../optimize/evolve-run.ts';
import { journalRecords, openJournal } from './durable/journal.ts';

/** The journal opened for appending, and the generations it already holds, to replay. */
export interface EvolveJournal {
  journal: ReturnType<typeof openJournal>;
  replay: Iterable<GenerationRecord>;
}

/**
 * Opens the evolve journal at `journalPath`: kept when its first record is `identity`, else started
 * over; opened without keeping its records, and its generations replayed by streaming. `note`
 * receives the lines to print (each ending in a newline).
 */
export function openEvolveJournal(
  journalPath: string,
  identity: object,
  directory: string,
  note: (text: string) => void,
): EvolveJournal {
  if (existsSync(journalPath)) {
    // Only the first record is read here; the generations are streamed into the stage below.
    const records = journalRecords(journalPath);
    const first = records.next();
    records.return(undefined as never);
    if (!first.done && JSON.stringify(first.value) !== JSON.stringify(identity)) {
      note(`${journalPath}: from an evolve with other settings or an earlier sweep; starting over\n`);
      rmSync(journalPath, { force: true });
    }
  }
  // Opened without keeping its records (a torn tail is cut off): memory stays flat in its length.
  const journal = openJournal(journalPath, { keepRecords: false });
  const replayCount = Math.max(0, journal.recordCount - 1);
  if (replayCount > 0) note(`resuming evolve in ${directory}: ${replayCount} generations from the journal\n`);
  if (journal.recordCount === 0) {
    journal.append(identity);
    journal.sync();
  }
  const replay: Iterable<GenerationRecord> = {
    *[Symbol.iterator]() {
      if (replayCount === 0) return;
      let index = 0;
      for (const record of journalRecords(journalPath)) {
        // The identity first, then at most the generations counted when the journal was opened.
        if (index > 0 && index <= replayCount) yield record as GenerationRecord;
        if (++index > replayCount) return;
      }
    },
  };
  return { journal, replay };
}

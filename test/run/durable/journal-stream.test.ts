import { existsSync, mkdtempSync, readdirSync, rmSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import {
  encodeJournalRecord,
  journalRecords,
  openJournal,
  readJournal,
  scanJournal,
} from '../../../run/durable/journal.ts';

// The streaming reader is checked against the whole-file reader of the same module (readJournal), on
// intact files and on files cut or damaged at every byte: the two must agree record for record.

let directory: string;
beforeEach(() => {
  directory = mkdtempSync(join(tmpdir(), 'coilfront-journal-stream-'));
});
afterEach(() => {
  rmSync(directory, { recursive: true, force: true });
});

/** Demo payloads (invented). */
const payloads: unknown[] = [
  { kind: 'start', seed: 7 },
  Uint8Array.from({ length: 40 }, (_, index) => (index * 37) % 256),
  { generation: 1, evaluated: [{ index: 3, violation: 'Infinity' }], note: 'µ ✓' },
  null,
  [1, 2, 3],
];
const bytesOf = (records: unknown[]): Buffer => Buffer.concat(records.map((r) => encodeJournalRecord(r)));

function streamed(path: string): { records: unknown[]; scan: ReturnType<typeof scanJournal> } {
  const records: unknown[] = [];
  const scan = scanJournal(path, (payload) => {
    records.push(payload);
  });
  return { records, scan };
}

describe('scanJournal and journalRecords', () => {
  it('read an intact journal record by record, as readJournal reads it whole', () => {
    const path = join(directory, 'j.log');
    writeFileSync(path, bytesOf(payloads));
    const whole = readJournal(path);
    const { records, scan } = streamed(path);
    expect(records).toEqual(whole.records);
    const { records: _whole, ...summary } = whole;
    expect(scan).toEqual({ ...summary, recordCount: payloads.length });
    expect([...journalRecords(path)]).toEqual(whole.records);
    // Without parsing, the count and the checks are the same, and nothing is decoded.
    const counted: unknown[] = [];
    expect(scanJournal(path, (p) => counted.push(p), { parse: false }).recordCount).toBe(payloads.length);
    expect(counted).toEqual(payloads.map(() => null));
  });

  it('agree with readJournal on a journal cut or damaged at any byte', () => {
    const path = join(directory, 'cut.log');
    const intact = bytesOf(payloads);
    fc.assert(
      fc.property(fc.nat({ max: intact.length }), fc.option(fc.nat({ max: intact.length - 1 })), (cut, flip) => {
        const bytes = Buffer.from(intact);
        if (flip !== null) bytes[flip] = (bytes[flip] ?? 0) ^ 0x5a;
        writeFileSync(path, bytes);
        truncateSync(path, cut);
        const whole = readJournal(path);
        const { records, scan } = streamed(path);
        expect(records).toEqual(whole.records);
        expect(scan.recordCount).toBe(whole.records.length);
        expect(scan.tornTail).toBe(whole.tornTail);
        expect(scan.validBytes).toBe(whole.validBytes);
        expect(scan.problem).toBe(whole.problem);
      }),
      { numRuns: 300 },
    );
  });

  it('openJournal with keepRecords false counts the records, keeps none and cuts a torn tail', () => {
    const path = join(directory, 'open.log');
    const intact = bytesOf(payloads);
    writeFileSync(path, intact.subarray(0, intact.length - 3));
    const journal = openJournal(path, { keepRecords: false });
    expect(journal.recordCount).toBe(payloads.length - 1);
    expect(journal.recovered.records).toEqual([]);
    expect(journal.recovered.tornTail).toBe(true);
    journal.append({ after: true });
    journal.close();
    expect(readJournal(path).records).toEqual([...payloads.slice(0, -1), { after: true }]);
  });

  it.skipIf(!existsSync('/proc/self/fd'))('leave no file open when a loop over journalRecords ends early', () => {
    const path = join(directory, 'early.log');
    writeFileSync(path, bytesOf(payloads));
    const open = () => readdirSync('/proc/self/fd').length;
    const before = open();
    for (let k = 0; k < 50; k++) {
      for (const record of journalRecords(path)) {
        expect(record).toEqual(payloads[0]);
        break;
      }
    }
    expect(open()).toBe(before);
  });
});

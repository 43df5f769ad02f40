import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { mkdtempSync, readFileSync, rmSync, statSync, truncateSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decodeJournal, encodeJournalRecord, openJournal, readJournal } from '../../../run/durable/journal.ts';
import { DiskError } from '../../../run/durable/disk-error.ts';
import { faultyFileSystem } from './faulty-disk.ts';
import { transpileDurableModules } from './child-modules.ts';
import { spawn } from 'node:child_process';
import { must } from '../../../core/must.ts';

let directory: string;
beforeEach(() => {
  directory = mkdtempSync(join(tmpdir(), 'coilfront-journal-'));
});
afterEach(() => {
  rmSync(directory, { recursive: true, force: true });
});

/** Demo payloads of the shapes a sweep journal carries (invented). */
const payloads: unknown[] = [
  { kind: 'start', specHash: 'a1b2c3', seed: 7 },
  { kind: 'batch', first: 0, count: 256, failed: [] },
  Uint8Array.from({ length: 40 }, (_, index) => (index * 37) % 256),
  { kind: 'batch', first: 256, count: 256, failed: [301], note: 'µ ✓' },
  'a bare string',
  null,
];

function writeJournal(path: string, records: unknown[]): number[] {
  const journal = openJournal(path);
  const ends: number[] = [];
  for (const record of records) {
    journal.append(record);
    ends.push(journal.byteLength);
  }
  journal.close();
  return ends;
}

describe('openJournal(path) and readJournal(path)', () => {
  it('reads back every appended record, JSON values and bytes alike', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads);
    const contents = readJournal(path);
    expect(contents.records).toEqual(payloads);
    expect(contents.records[2]).toBeInstanceOf(Uint8Array);
    expect(contents).toMatchObject({
      tornTail: false,
      problem: null,
      validBytes: ends.at(-1),
      totalBytes: ends.at(-1),
    });
    expect(statSync(path).size).toBe(ends.at(-1));
  });

  it('creates an empty journal that reads as no records', () => {
    const path = join(directory, 'journal.cfj');
    const journal = openJournal(path);
    expect(journal.recovered.records).toEqual([]);
    journal.close();
    expect(readJournal(path)).toEqual({ records: [], tornTail: false, validBytes: 0, totalBytes: 0, problem: null });
  });

  it('continues an existing journal where it ended', () => {
    const path = join(directory, 'journal.cfj');
    writeJournal(path, payloads.slice(0, 2));
    const journal = openJournal(path);
    expect(journal.recovered.records).toEqual(payloads.slice(0, 2));
    expect(journal.recordCount).toBe(2);
    journal.append(payloads[3]);
    journal.close();
    expect(readJournal(path).records).toEqual([...payloads.slice(0, 2), payloads[3]]);
  });

  it('yields exactly the records before the cut when the file is cut at any byte of its last record, and appends after it', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads);
    const whole = readFileSync(path);
    const lastStart = must(ends.at(-2));
    const cutPath = join(directory, 'cut.cfj');
    for (let cut = lastStart; cut < whole.length; cut++) {
      writeFileSync(cutPath, whole);
      truncateSync(cutPath, cut);
      const contents = readJournal(cutPath);
      expect(contents.records).toEqual(payloads.slice(0, -1));
      expect(contents.validBytes).toBe(lastStart);
      expect(contents.tornTail).toBe(cut > lastStart);
      if (cut > lastStart) expect(contents.problem).toMatch(/^record 6 at byte \d+ is cut short/);
      // resuming: the torn record is cut off and the next append follows the last complete one
      const journal = openJournal(cutPath);
      journal.append({ kind: 'resumed' });
      journal.close();
      expect(readJournal(cutPath)).toMatchObject({
        records: [...payloads.slice(0, -1), { kind: 'resumed' }],
        tornTail: false,
      });
    }
  });

  it('yields the complete records before a cut at a random offset, and never throws', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads);
    const whole = readFileSync(path);
    fc.assert(
      fc.property(fc.integer({ min: 0, max: whole.length }), (cut) => {
        const complete = ends.filter((end) => end <= cut).length;
        const contents = decodeJournal(whole.subarray(0, cut));
        expect(contents.records).toEqual(payloads.slice(0, complete));
        expect(contents.validBytes).toBe(complete === 0 ? 0 : ends[complete - 1]);
      }),
      { numRuns: 300, seed: 11 },
    );
  });

  it('catches a flipped byte anywhere in a record by its checks, keeping the records before it', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads);
    const whole = readFileSync(path);
    const starts = [0, ...ends.slice(0, -1)];
    for (let position = 0; position < whole.length; position++) {
      for (const mask of [0x01, 0x80]) {
        const damaged = Uint8Array.from(whole);
        damaged[position] ^= mask;
        const hit = ends.findIndex((end) => position < end);
        const contents = decodeJournal(damaged);
        expect(contents.records).toEqual(payloads.slice(0, hit));
        expect(contents.validBytes).toBe(starts[hit]);
        expect(contents.tornTail).toBe(true);
        expect(contents.problem).toMatch(new RegExp(`^record ${hit + 1} at byte ${starts[hit]} `));
      }
    }
  });

  it('never throws on arbitrary bytes, and reports where it stopped', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 300 }), (bytes) => {
        const contents = decodeJournal(bytes);
        expect(contents.validBytes).toBeLessThanOrEqual(bytes.length);
        expect(contents.tornTail).toBe(contents.validBytes < bytes.length);
        expect(contents.problem === null).toBe(!contents.tornTail);
      }),
      { numRuns: 500, seed: 5 },
    );
    // random bytes after a valid prefix are dropped, the prefix kept
    const prefix = encodeJournalRecord({ kind: 'start' });
    fc.assert(
      fc.property(fc.uint8Array({ minLength: 1, maxLength: 100 }), (tail) => {
        const contents = decodeJournal(Buffer.concat([prefix, tail]));
        expect(contents.records[0]).toEqual({ kind: 'start' });
      }),
      { numRuns: 200, seed: 6 },
    );
  });

  it('cuts a torn tail off on open, so appends after a crash follow the last complete record', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads.slice(0, 3));
    // a crash part-way through the fourth append: half a record on disk
    const fourth = encodeJournalRecord(payloads[3]);
    writeFileSync(path, fourth.subarray(0, 10), { flag: 'a' });
    const journal = openJournal(path);
    expect(journal.recovered.tornTail).toBe(true);
    expect(journal.recovered.records).toEqual(payloads.slice(0, 3));
    expect(statSync(path).size).toBe(ends[2]);
    journal.append(payloads[3]);
    journal.close();
    expect(readJournal(path)).toMatchObject({ records: payloads.slice(0, 4), tornTail: false });
  });

  it('cuts the file back to its last complete record when the disk fills during an append', () => {
    const path = join(directory, 'journal.cfj');
    const ends = writeJournal(path, payloads.slice(0, 2));
    const disk = faultyFileSystem({ bytesBeforeFailure: 7, code: 'ENOSPC' });
    const journal = openJournal(path, { fileSystem: disk });
    expect(() => journal.append(payloads[3])).toThrow(
      `cannot append to '${path}': no space left on the device (ENOSPC)`,
    );
    expect(journal.byteLength).toBe(ends[1]);
    expect(statSync(path).size).toBe(ends[1]);
    journal.close();
    expect(readJournal(path)).toMatchObject({ records: payloads.slice(0, 2), tornTail: false });
  });

  it('throws a DiskError when fsync fails, and when appending after close', () => {
    const path = join(directory, 'journal.cfj');
    writeJournal(path, payloads.slice(0, 1));
    const journal = openJournal(path, { fileSystem: faultyFileSystem({ failCalls: ['fsyncSync'], code: 'EIO' }) });
    journal.append(payloads[1]);
    expect(() => journal.sync()).toThrow(DiskError);
    expect(() => journal.close()).toThrow(/input\/output error on the device \(EIO\)$/);
    expect(() => journal.append(payloads[1])).toThrow(/the journal is closed/);
  });

  it('reports a missing journal as a DiskError naming the path, and an empty-file journal as empty', () => {
    expect(() => readJournal(join(directory, 'none.cfj'))).toThrow(
      `cannot read '${join(directory, 'none.cfj')}': no such file or directory (ENOENT)`,
    );
    const path = join(directory, 'empty.cfj');
    writeFileSync(path, '');
    expect(readJournal(path).records).toEqual([]);
    truncateSync(path, 0);
  });

  it('refuses a payload that is not JSON-representable', () => {
    expect(() => encodeJournalRecord(undefined)).toThrow(TypeError);
  });

  it('keeps a readable prefix of the appends when the writing process is killed with SIGKILL', async () => {
    const code = join(directory, 'code');
    transpileDurableModules(['journal', 'crc32', 'disk-error', 'file-system'], code);
    writeFileSync(
      join(code, 'writer.js'),
      `import { openJournal } from './journal.js';
const journal = openJournal(process.argv[2]);
let n = journal.recordCount;
console.log('ready');
for (;;) {
  journal.append({ n, filler: 'x'.repeat(n % 97) });
  if (n % 50 === 0) journal.sync();
  n++;
}
`,
    );
    const path = join(directory, 'killed.cfj');
    for (let round = 0; round < 2; round++) {
      await new Promise<void>((resolve, reject) => {
        const child = spawn(process.execPath, [join(code, 'writer.js'), path], {
          stdio: ['ignore', 'pipe', 'inherit'],
        });
        child.stdout.setEncoding('utf8').once('data', () => setTimeout(() => child.kill('SIGKILL'), 30 + 40 * round));
        child.on('error', reject);
        child.on('exit', () => resolve());
      });
      const contents = readJournal(path);
      expect(contents.records.length).toBeGreaterThan(0);
      contents.records.forEach((record, position) => {
        expect(record).toEqual({ n: position, filler: 'x'.repeat(position % 97) });
      });
    }
  });
});

/**
 * An append-only file of records that survives a crash at any instant: a power cut or kill -9 in the
 * middle of an append leaves a torn last record, which reading detects (short, bad magic or CRC
 * mismatch) and drops; every record before it is intact and returned.
 *
 * Record layout (all integers little-endian), our own format:
 *
 *   offset  size  field
 *   0       4     magic: the bytes 0x63 0x66 0x6a 0xd5 ("cfj" and 0xd5)
 *   4       1     kind: 1 = UTF-8 JSON, 2 = raw bytes
 *   5       4     payload length n in bytes (at most MAX_RECORD_BYTES)
 *   9       n     payload
 *   9 + n   4     CRC-32 (IEEE, see crc32.ts) of bytes 4 … 9 + n − 1 (kind, length and payload)
 *
 * The CRC covers the length, so a damaged length is caught as well as a damaged payload. Reading
 * stops at the first record that is short or fails a check; nothing after it is trusted.
 */
import { closeSync, fstatSync, openSync, readSync } from 'node:fs';
import { dirname, resolve } from 'node:path';
import { crc32 } from './crc32.ts';
import { DiskError, toDiskError } from './disk-error.ts';
import { nodeFileSystem, syncDirectorySync, type DurableFileSystem } from './file-system.ts';

const MAGIC = Uint8Array.of(0x63, 0x66, 0x6a, 0xd5);
const KIND_JSON = 1;
const KIND_BYTES = 2;
const HEADER_BYTES = 9;
const TRAILER_BYTES = 4;

/** The largest payload one record may carry (256 MiB); a longer declared length means damage. */
export const MAX_RECORD_BYTES = 256 * 1024 * 1024;

/** A record's content: any JSON value (appended as JSON), or raw bytes (appended as a Uint8Array). */
export type JournalPayload = unknown;

/** What {@link readJournal} found. */
export interface JournalContents {
  /** The payloads of the complete, intact records, in order: parsed JSON values or Uint8Arrays. */
  records: JournalPayload[];
  /** True when bytes follow the last intact record (a torn or damaged tail that was dropped). */
  tornTail: boolean;
  /** Bytes from the start of the file up to the end of the last intact record. */
  validBytes: number;
  /** Size of the file as read. */
  totalBytes: number;
  /** Why reading stopped before the end of the file, in words; null when the whole file is intact. */
  problem: string | null;
}

/** Encodes one record (header, payload, CRC) for appending. */
export function encodeJournalRecord(payload: JournalPayload): Uint8Array {
  let kind: number;
  let body: Uint8Array;
  if (payload instanceof Uint8Array) {
    kind = KIND_BYTES;
    body = payload;
  } else {
    const text = JSON.stringify(payload);
    if (text === undefined) throw new TypeError('a journal record must be a JSON value or a Uint8Array');
    kind = KIND_JSON;
    body = Buffer.from(text, 'utf8');
  }
  if (body.length > MAX_RECORD_BYTES) {
    throw new RangeError(`a journal record holds at most ${MAX_RECORD_BYTES} bytes, got ${body.length}`);
  }
  const record = new Uint8Array(HEADER_BYTES + body.length + TRAILER_BYTES);
  const view = new DataView(record.buffer);
  record.set(MAGIC, 0);
  view.setUint8(4, kind);
  view.setUint32(5, body.length, true);
  record.set(body, HEADER_BYTES);
  view.setUint32(HEADER_BYTES + body.length, crc32(record.subarray(4, HEADER_BYTES + body.length)), true);
  return record;
}

/**
 * Decodes the records of a journal's bytes, stopping at the first one that is short or damaged.
 * Never throws on any input. O(n).
 */
export function decodeJournal(bytes: Uint8Array): JournalContents {
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength);
  const records: JournalPayload[] = [];
  let offset = 0;
  let problem: string | null = null;
  const decoder = new TextDecoder('utf-8', { fatal: true });
  while (offset < bytes.length) {
    const where = `record ${records.length + 1} at byte ${offset}`;
    const remaining = bytes.length - offset;
    if (remaining < HEADER_BYTES + TRAILER_BYTES) {
      problem = `${where} is cut short (${remaining} bytes of at least ${HEADER_BYTES + TRAILER_BYTES})`;
      break;
    }
    if (!MAGIC.every((value, index) => bytes[offset + index] === value)) {
      problem = `${where} does not start with the record mark`;
      break;
    }
    const kind = view.getUint8(offset + 4);
    const length = view.getUint32(offset + 5, true);
    if (length > MAX_RECORD_BYTES) {
      problem = `${where} declares ${length} bytes, more than a record may hold`;
      break;
    }
    const end = offset + HEADER_BYTES + length + TRAILER_BYTES;
    if (end > bytes.length) {
      problem = `${where} is cut short (${remaining} bytes of ${end - offset})`;
      break;
    }
    const stored = view.getUint32(offset + HEADER_BYTES + length, true);
    if (crc32(bytes.subarray(offset + 4, offset + HEADER_BYTES + length)) !== stored) {
      problem = `${where} fails its CRC-32 check`;
      break;
    }
    const body = bytes.subarray(offset + HEADER_BYTES, offset + HEADER_BYTES + length);
    if (kind === KIND_JSON) {
      try {
        records.push(JSON.parse(decoder.decode(body)));
      } catch {
        problem = `${where} passes its check but does not hold valid JSON`;
        break;
      }
    } else if (kind === KIND_BYTES) {
      records.push(Uint8Array.from(body));
    } else {
      problem = `${where} has an unknown kind ${kind}`;
      break;
    }
    offset = end;
  }
  return { records, tornTail: offset < bytes.length, validBytes: offset, totalBytes: bytes.length, problem };
}

/** Options of {@link readJournal} and {@link openJournal}. */
export interface JournalOptions {
  /** The file operations to use (tests put a failing disk here); node:fs unless given. */
  fileSystem?: DurableFileSystem;
}

/**
 * Reads the journal at `path`: the complete records before the first short or damaged one, whether
 * a tail was dropped, and how many bytes are good. Throws a {@link DiskError} only when the file
 * cannot be read (missing, permission denied); damage inside it is reported, never thrown.
 *
 * @example const { records, tornTail, problem } = readJournal('runs/night/journal.cfj')
 */
export function readJournal(path: string, options: JournalOptions = {}): JournalContents {
  const fileSystem = options.fileSystem ?? nodeFileSystem;
  let bytes: Buffer;
  try {
    bytes = fileSystem.readFileSync(path);
  } catch (error) {
    throw toDiskError(error, path, 'read');
  }
  return decodeJournal(bytes);
}

/** An open journal, appending at its end. */
export interface Journal {
  /** The file's path. */
  readonly path: string;
  /** What the file held when it was opened (a torn tail already cut off: see `problem`). */
  readonly recovered: JournalContents;
  /** Complete records in the file now (recovered ones plus those appended). */
  readonly recordCount: number;
  /** Bytes in the file now. */
  readonly byteLength: number;
  /**
   * Appends one record (a JSON value, or a Uint8Array for raw bytes), written to the operating system
   * at once but durable only after {@link Journal.sync}. A failed write (disk full) cuts the file back
   * to its last complete record and throws a DiskError; the journal stays usable for reading.
   */
  append(payload: JournalPayload): void;
  /** Flushes everything appended so far to the disk (fsync). */
  sync(): void;
  /** Syncs and closes the file. Further appends throw. */
  close(): void;
}

/**
 * Opens the journal at `path` for appending, creating it (and syncing its directory) when missing.
 * An existing file is read first; a torn or damaged tail is cut off (the file truncated to its
 * valid bytes and synced) before anything is appended, and reported in `recovered`.
 *
 * @example
 *   const journal = openJournal('runs/night/journal.cfj')
 *   for (const record of journal.recovered.records) replay(record)
 *   journal.append({ batch: 41, first: 10496, count: 256 }); journal.sync()
 *   journal.close()
 */
export function openJournal(path: string, options: JournalOptions & { keepRecords?: boolean } = {}): Journal {
  const fileSystem = options.fileSystem ?? nodeFileSystem;
  const { fd, created } = openOrCreate(fileSystem, path);
  let recovered: JournalContents;
  let recoveredCount: number;
  try {
    ({ recovered, recoveredCount } = recoverJournal(fileSystem, fd, path, created, options.keepRecords));
  } catch (error) {
    fileSystem.closeSync(fd);
    throw toDiskError(error, path, 'open');
  }
  return journalHandle(fileSystem, fd, path, recovered, recoveredCount);
}

/** Opens the journal file for reading and writing, creating it when it does not exist. */
function openOrCreate(fileSystem: DurableFileSystem, path: string): { fd: number; created: boolean } {
  try {
    try {
      return { fd: fileSystem.openSync(path, 'r+'), created: false };
    } catch (error) {
      if ((error as { code?: string }).code !== 'ENOENT') throw error;
      return { fd: fileSystem.openSync(path, 'wx+', 0o644), created: true };
    }
  } catch (error) {
    throw toDiskError(error, path, 'open');
  }
}

/**
 * Reads what an existing journal holds and cuts a torn tail off (synced); syncs a new file and its
 * folder. With keepRecords false the file is checked record by record and `recovered.records` stays empty.
 */
function recoverJournal(
  fileSystem: DurableFileSystem,
  fd: number,
  path: string,
  created: boolean,
  keepRecords: boolean | undefined,
): { recovered: JournalContents; recoveredCount: number } {
  let recovered: JournalContents;
  let recoveredCount = 0;
  if (created) recovered = { records: [], tornTail: false, validBytes: 0, totalBytes: 0, problem: null };
  else if (keepRecords === false) {
    const { recordCount: scanned, ...scan } = scanJournal(path, () => undefined, { parse: false });
    recovered = { records: [], ...scan };
    recoveredCount = scanned;
  } else {
    recovered = readJournal(path, { fileSystem });
    recoveredCount = recovered.records.length;
  }
  if (recovered.tornTail) {
    fileSystem.ftruncateSync(fd, recovered.validBytes);
    fileSystem.fsyncSync(fd);
  }
  if (created) {
    fileSystem.fsyncSync(fd);
    syncDirectorySync(fileSystem, dirname(resolve(path)));
  }
  return { recovered, recoveredCount };
}

/** The open journal's handle: appends at the known end of its valid records, syncs, closes. */
function journalHandle(
  fileSystem: DurableFileSystem,
  fd: number,
  path: string,
  recovered: JournalContents,
  recoveredCount: number,
): Journal {
  let byteLength = recovered.validBytes;
  let recordCount = recoveredCount;
  let open = true;
  const ensureOpen = (): void => {
    if (!open) throw new DiskError('append to', path, 'EBADF', 'the journal is closed');
  };
  return {
    path,
    recovered,
    get recordCount() {
      return recordCount;
    },
    get byteLength() {
      return byteLength;
    },
    append(payload) {
      ensureOpen();
      const record = encodeJournalRecord(payload);
      try {
        // Positioned writes at the known end: the file may not be opened in append mode after a cut.
        let written = 0;
        while (written < record.length) {
          written += writeAtSync(fileSystem, fd, record, written, byteLength + written);
        }
      } catch (error) {
        try {
          fileSystem.ftruncateSync(fd, byteLength);
        } catch {
          // the reader drops a torn tail anyway
        }
        throw toDiskError(error, path, 'append to');
      }
      byteLength += record.length;
      recordCount += 1;
    },
    sync() {
      ensureOpen();
      try {
        fileSystem.fsyncSync(fd);
      } catch (error) {
        throw toDiskError(error, path, 'sync');
      }
    },
    close() {
      if (!open) return;
      open = false;
      try {
        fileSystem.fsyncSync(fd);
      } catch (error) {
        throw toDiskError(error, path, 'sync');
      } finally {
        fileSystem.closeSync(fd);
      }
    },
  };
}

/** One positioned write of record[from…] at file position `position`; returns the bytes written. */
function writeAtSync(
  fileSystem: DurableFileSystem,
  fd: number,
  record: Uint8Array,
  from: number,
  position: number,
): number {
  return fileSystem.writeSync(fd, record.subarray(from), 0, record.length - from, position);
}

/** What {@link scanJournal} found: {@link JournalContents} without the records, and how many there were. */
export type JournalScan = Omit<JournalContents, 'records'> & { recordCount: number };

/**
 * Reads the journal at `path` one record at a time, handing each intact payload to `visit` (parsed
 * JSON or a Uint8Array; with `parse: false`, nothing is decoded and `visit` gets null), and stops at
 * the first short or damaged record exactly as {@link readJournal} does. Memory holds one record,
 * never the file: for journals that grow with a run's length. Throws a {@link DiskError} only when
 * the file cannot be read.
 */
export function scanJournal(
  path: string,
  visit: (payload: JournalPayload, index: number) => void,
  options: { parse?: boolean } = {},
): JournalScan {
  const records = journalRecords(path, options);
  for (let index = 0; ; index++) {
    const next = records.next();
    if (next.done) return next.value;
    visit(next.value, index);
  }
}

/** What {@link readRecord} reads with: positioned reads of the file, a header buffer, the decoding. */
interface RecordReader {
  readAt: (into: Uint8Array, position: number) => number;
  header: Uint8Array;
  headerView: DataView;
  /** Strict UTF-8 decoding (throws on a malformed body). */
  decode: (bytes: Uint8Array) => string;
  parse: boolean;
}

/**
 * The record at `offset` (the file holds `totalBytes`): its payload (null unless parsed) and size in
 * bytes, or what is wrong with it, named as record `count + 1`.
 */
function readRecord(
  reader: RecordReader,
  offset: number,
  totalBytes: number,
  count: number,
): { payload: JournalPayload; size: number } | { problem: string } {
  const { readAt, header, headerView } = reader;
  const where = `record ${count + 1} at byte ${offset}`;
  const remaining = totalBytes - offset;
  if (remaining < HEADER_BYTES + TRAILER_BYTES) {
    return { problem: `${where} is cut short (${remaining} bytes of at least ${HEADER_BYTES + TRAILER_BYTES})` };
  }
  readAt(header, offset);
  if (!MAGIC.every((value, index) => header[index] === value)) {
    return { problem: `${where} does not start with the record mark` };
  }
  const kind = headerView.getUint8(4);
  const length = headerView.getUint32(5, true);
  if (length > MAX_RECORD_BYTES) return { problem: `${where} declares ${length} bytes, more than a record may hold` };
  const size = HEADER_BYTES + length + TRAILER_BYTES;
  if (size > remaining) return { problem: `${where} is cut short (${remaining} bytes of ${size})` };
  const record = new Uint8Array(size);
  if (readAt(record, offset) < size) return { problem: `${where} is cut short (the file shrank while it was read)` };
  const view = new DataView(record.buffer);
  if (crc32(record.subarray(4, HEADER_BYTES + length)) !== view.getUint32(HEADER_BYTES + length, true)) {
    return { problem: `${where} fails its CRC-32 check` };
  }
  if (kind !== KIND_JSON && kind !== KIND_BYTES) return { problem: `${where} has an unknown kind ${kind}` };
  if (!reader.parse) return { payload: null, size };
  const body = record.subarray(HEADER_BYTES, HEADER_BYTES + length);
  if (kind === KIND_BYTES) return { payload: Uint8Array.from(body), size };
  try {
    return { payload: JSON.parse(reader.decode(body)), size };
  } catch {
    return { problem: `${where} passes its check but does not hold valid JSON` };
  }
}

/**
 * The intact records of the journal at `path` as a generator, read one at a time (see
 * {@link scanJournal}); its return value is the scan's summary. Leaving a for-of loop early closes the file.
 */
export function* journalRecords(
  path: string,
  options: { parse?: boolean } = {},
): Generator<JournalPayload, JournalScan, undefined> {
  const parse = options.parse ?? true;
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (error) {
    throw toDiskError(error, path, 'read');
  }
  const decoder = new TextDecoder('utf-8', { fatal: true });
  const header = new Uint8Array(HEADER_BYTES);
  const headerView = new DataView(header.buffer);
  let offset = 0;
  let count = 0;
  let problem: string | null = null;
  let totalBytes = 0;
  try {
    totalBytes = fstatSync(fd).size;
    const readAt = (into: Uint8Array, position: number): number => {
      let got = 0;
      while (got < into.length) {
        const n = readSync(fd, into, got, into.length - got, position + got);
        if (n === 0) break;
        got += n;
      }
      return got;
    };
    const reader: RecordReader = { readAt, header, headerView, decode: (bytes) => decoder.decode(bytes), parse };
    while (offset < totalBytes) {
      const next = readRecord(reader, offset, totalBytes, count);
      if ('problem' in next) {
        problem = next.problem;
        break;
      }
      offset += next.size;
      count++;
      yield next.payload;
    }
  } catch (error) {
    throw toDiskError(error, path, 'read');
  } finally {
    closeSync(fd);
  }
  return { recordCount: count, tornTail: problem !== null, validBytes: offset, totalBytes, problem };
}

import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdtempSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  removeLeftoverTemporaryFiles,
  temporaryPathFor,
  writeFileAtomic,
  writeFileAtomicSync,
} from '../../../run/durable/atomic-write.ts';
import { DiskError, isOutOfSpace, toDiskError } from '../../../run/durable/disk-error.ts';
import { faultyFileSystem } from './faulty-disk.ts';

let directory: string;
beforeEach(() => {
  directory = mkdtempSync(join(tmpdir(), 'coilfront-atomic-'));
});
afterEach(() => {
  rmSync(directory, { recursive: true, force: true });
});

describe('writeFileAtomicSync(path, data)', () => {
  it('creates a file with the data, as UTF-8 for a string', () => {
    const path = join(directory, 'summary.json');
    writeFileAtomicSync(path, '{"µ":1}\n');
    expect(readFileSync(path, 'utf8')).toBe('{"µ":1}\n');
    writeFileAtomicSync(path, Uint8Array.of(1, 2, 3));
    expect([...readFileSync(path)]).toEqual([1, 2, 3]);
  });

  it('replaces an existing file and leaves no temporary file behind', () => {
    const path = join(directory, 'checkpoint.json');
    writeFileAtomicSync(path, 'old');
    writeFileAtomicSync(path, 'new');
    expect(readFileSync(path, 'utf8')).toBe('new');
    expect(readdirSync(directory)).toEqual(['checkpoint.json']);
  });

  it('leaves the previous file intact when the disk fills part-way through the write', () => {
    const path = join(directory, 'checkpoint.json');
    writeFileAtomicSync(path, 'last good checkpoint');
    const disk = faultyFileSystem({ bytesBeforeFailure: 5, code: 'ENOSPC' });
    expect(() => writeFileAtomicSync(path, 'a much longer new checkpoint', { fileSystem: disk })).toThrow(
      `cannot write '${path}': no space left on the device (ENOSPC)`,
    );
    expect(disk.bytesWritten).toBe(5);
    expect(readFileSync(path, 'utf8')).toBe('last good checkpoint');
    expect(readdirSync(directory)).toEqual(['checkpoint.json']);
  });

  it('leaves the previous file intact when fsync fails', () => {
    const path = join(directory, 'checkpoint.json');
    writeFileAtomicSync(path, 'last good');
    const disk = faultyFileSystem({ failCalls: ['fsyncSync'], code: 'EIO' });
    let caught: unknown;
    try {
      writeFileAtomicSync(path, 'next', { fileSystem: disk });
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(DiskError);
    expect((caught as DiskError).code).toBe('EIO');
    expect((caught as DiskError).message).toBe(`cannot write '${path}': input/output error on the device (EIO)`);
    expect(readFileSync(path, 'utf8')).toBe('last good');
    expect(readdirSync(directory)).toEqual(['checkpoint.json']);
  });

  it('throws a one-line DiskError for a missing directory, a file in the path and a directory as target', () => {
    expect(() => writeFileAtomicSync(join(directory, 'absent', 'x.json'), 'x')).toThrow(
      /^cannot write '.*x\.json': no such file or directory \(ENOENT\)$/,
    );
    writeFileSync(join(directory, 'plain'), '');
    expect(() => writeFileAtomicSync(join(directory, 'plain', 'x.json'), 'x')).toThrow(
      /a part of the path is not a directory \(ENOTDIR\)$/,
    );
    mkdirSync(join(directory, 'taken'));
    expect(() => writeFileAtomicSync(join(directory, 'taken'), 'x')).toThrow(/\(EISDIR\)$|\(ENOTEMPTY\)$|\(EEXIST\)$/);
    expect(readdirSync(directory).sort()).toEqual(['plain', 'taken']);
  });

  it('reports permission denied and a read-only file system when the temporary file cannot be made', () => {
    // injected: the tests run as root in CI, where a real permission check never fails
    const path = join(directory, 'x.json');
    writeFileAtomicSync(path, 'kept');
    for (const [code, reason] of [
      ['EACCES', 'permission denied'],
      ['EROFS', 'the file system is read-only'],
    ]) {
      const disk = faultyFileSystem({ failCalls: ['openSync'], code });
      expect(() => writeFileAtomicSync(path, 'x', { fileSystem: disk })).toThrow(
        `cannot write '${path}': ${reason} (${code})`,
      );
    }
    expect(readFileSync(path, 'utf8')).toBe('kept');
  });
});

describe('writeFileAtomic(path, data)', () => {
  it('writes and replaces like the sync form', async () => {
    const path = join(directory, 'front.csv');
    await writeFileAtomic(path, 'a,b\n');
    await writeFileAtomic(path, Uint8Array.of(0x41));
    expect(readFileSync(path, 'utf8')).toBe('A');
    expect(readdirSync(directory)).toEqual(['front.csv']);
  });

  it('throws a DiskError and removes nothing else when the directory is missing', async () => {
    await expect(writeFileAtomic(join(directory, 'absent', 'x.csv'), 'x')).rejects.toThrow(
      /no such file or directory \(ENOENT\)$/,
    );
  });
});

describe('removeLeftoverTemporaryFiles(directory)', () => {
  it('removes the temporary files of cut-off writes and nothing else', () => {
    const leftover = temporaryPathFor(join(directory, 'checkpoint.json'));
    writeFileSync(leftover, 'half');
    writeFileSync(join(directory, '.run.lock.0f8e2c1a-5b7d-4e3f-9a2b-1c4d5e6f7a8b.tmp'), '');
    for (const keep of ['checkpoint.json', 'notes.tmp', '.hidden', 'journal-0.log'])
      writeFileSync(join(directory, keep), '');
    expect(removeLeftoverTemporaryFiles(directory)).toEqual(
      [
        `.checkpoint.json.${leftover.split('.checkpoint.json.')[1]}`,
        '.run.lock.0f8e2c1a-5b7d-4e3f-9a2b-1c4d5e6f7a8b.tmp',
      ].sort(),
    );
    expect(readdirSync(directory).sort()).toEqual(['.hidden', 'checkpoint.json', 'journal-0.log', 'notes.tmp']);
    expect(removeLeftoverTemporaryFiles(directory)).toEqual([]);
  });

  it('throws a DiskError for a missing directory', () => {
    expect(() => removeLeftoverTemporaryFiles(join(directory, 'absent'))).toThrow(
      /^cannot read '.*absent': no such file or directory \(ENOENT\)$/,
    );
  });
});

describe('toDiskError(error, path, action)', () => {
  it('names the path and the reason for the codes a long run meets', () => {
    const cases: Array<[string, string]> = [
      ['ENOSPC', 'no space left on the device'],
      ['EDQUOT', 'the disk quota is used up'],
      ['EACCES', 'permission denied'],
      ['EROFS', 'the file system is read-only'],
    ];
    for (const [code, reason] of cases) {
      const error = toDiskError(Object.assign(new Error('raw'), { code }), 'runs/a.json', 'write');
      expect(error.message).toBe(`cannot write 'runs/a.json': ${reason} (${code})`);
      expect(error.message).not.toContain('\n');
    }
    expect(isOutOfSpace('ENOSPC') && isOutOfSpace('EDQUOT') && !isOutOfSpace('EACCES')).toBe(true);
  });

  it('keeps the first line of an unknown error and passes a DiskError through', () => {
    const unknown = toDiskError(new Error('strange\nsecond line'), 'p', 'read');
    expect(unknown.message).toBe("cannot read 'p': strange");
    expect(toDiskError(unknown, 'other', 'write')).toBe(unknown);
  });
});

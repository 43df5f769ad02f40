/**
 * The synchronous file operations the durable layer uses, gathered in one interface so tests can put
 * a failing disk (ENOSPC after so many bytes, EIO on fsync) underneath without touching a real one.
 * Production code passes nothing and gets node:fs.
 */
import * as fs from 'node:fs';

/** The subset of node:fs (sync calls) that atomic writes, the journal and the lock use. */
export interface DurableFileSystem {
  openSync: typeof fs.openSync;
  closeSync: typeof fs.closeSync;
  /** Writes buffer[offset … offset + length) at `position` (the current position when null or absent). */
  writeSync: (fd: number, buffer: Uint8Array, offset: number, length: number, position?: number | null) => number;
  fsyncSync: typeof fs.fsyncSync;
  ftruncateSync: typeof fs.ftruncateSync;
  renameSync: typeof fs.renameSync;
  unlinkSync: typeof fs.unlinkSync;
  linkSync: typeof fs.linkSync;
  readFileSync: (path: string) => Buffer;
  fstatSync: (fd: number) => { size: number };
}

/** node:fs itself. */
export const nodeFileSystem: DurableFileSystem = {
  openSync: fs.openSync,
  closeSync: fs.closeSync,
  writeSync: (fd, buffer, offset, length, position) => fs.writeSync(fd, buffer, offset, length, position ?? null),
  fsyncSync: fs.fsyncSync,
  ftruncateSync: fs.ftruncateSync,
  renameSync: fs.renameSync,
  unlinkSync: fs.unlinkSync,
  linkSync: fs.linkSync,
  readFileSync: (path) => fs.readFileSync(path),
  fstatSync: (fd) => fs.fstatSync(fd),
};

/** Writes all of `bytes` at the file's current position, looping over short writes. */
export function writeAllSync(fileSystem: DurableFileSystem, fd: number, bytes: Uint8Array): void {
  let offset = 0;
  while (offset < bytes.length) {
    offset += fileSystem.writeSync(fd, bytes, offset, bytes.length - offset);
  }
}

/**
 * Flushes a directory's entries (a new or renamed file's name) to the disk. Where a directory cannot
 * be opened or synced (Windows; some network file systems) there is nothing more to do, and the
 * call returns quietly; a real I/O error (EIO) is thrown.
 */
export function syncDirectorySync(fileSystem: DurableFileSystem, directory: string): void {
  let fd: number;
  try {
    fd = fileSystem.openSync(directory, 'r');
  } catch {
    return;
  }
  try {
    fileSystem.fsyncSync(fd);
  } catch (error) {
    const code = (error as { code?: string }).code;
    if (code !== 'EINVAL' && code !== 'EPERM' && code !== 'EISDIR' && code !== 'ENOTSUP' && code !== 'EBADF') {
      throw error;
    }
  } finally {
    fileSystem.closeSync(fd);
  }
}

/**
 * Writing a whole file so that a crash at any instant leaves either the old file or the new one,
 * never a mixture: write a temporary file in the same directory, fsync it, rename it over the
 * target (atomic on POSIX file systems), then fsync the directory so the rename itself survives a
 * power cut. Used for checkpoints, summaries and every output file of a run.
 */
import { readdirSync, unlinkSync } from 'node:fs';
import { open, rename, unlink } from 'node:fs/promises';
import { basename, dirname, join, resolve } from 'node:path';
import { toDiskError } from './disk-error.ts';
import { nodeFileSystem, syncDirectorySync, writeAllSync, type DurableFileSystem } from './file-system.ts';

/** Options of {@link writeFileAtomicSync} and {@link writeFileAtomic}. */
export interface AtomicWriteOptions {
  /** Permission bits of a newly created file; 0o644 unless given. */
  mode?: number;
  /** The file operations to use (tests put a failing disk here); node:fs unless given. */
  fileSystem?: DurableFileSystem;
}

let temporaryCounter = 0;

/**
 * The temporary name for writing `path`: in the same directory (so the rename does not cross file
 * systems), hidden, unique to this process and call, ending in `.tmp` so a leftover is recognisable.
 */
export function temporaryPathFor(path: string): string {
  temporaryCounter = (temporaryCounter + 1) % Number.MAX_SAFE_INTEGER;
  return join(dirname(path), `.${basename(path)}.${process.pid}-${temporaryCounter}.tmp`);
}

/** Matches the names {@link temporaryPathFor} makes (and the run lock's temporary files). */
const TEMPORARY_NAME = /^\..+\.(?:\d+-\d+|[0-9a-f-]{36})\.(?:tmp|stale)$/;

/**
 * Removes the temporary files that writes cut off by a crash left in `directory` (names as made by
 * {@link temporaryPathFor}: hidden, ending in `.tmp`), and returns their names. Call it only while
 * no other process writes there (under the run lock), e.g. when resuming a run.
 *
 * @example removeLeftoverTemporaryFiles('runs/night') // ['.checkpoint.json.4711-12.tmp']
 */
export function removeLeftoverTemporaryFiles(directory: string): string[] {
  const removed: string[] = [];
  let names: string[];
  try {
    names = readdirSync(directory);
  } catch (error) {
    throw toDiskError(error, directory, 'read');
  }
  for (const name of names) {
    if (!TEMPORARY_NAME.test(name)) continue;
    try {
      unlinkSync(join(directory, name));
      removed.push(name);
    } catch (error) {
      if ((error as { code?: string }).code !== 'ENOENT') throw toDiskError(error, join(directory, name), 'remove');
    }
  }
  return removed.sort();
}

function toBytes(data: string | Uint8Array): Uint8Array {
  return typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
}

/**
 * Like {@link writeFileAtomicSync}, but the content comes as a sequence of chunks (text as UTF-8, or
 * bytes) written one after another, so a large file (a checkpoint of a big front) never exists as
 * one string in memory.
 */
export function writeChunksAtomicSync(
  path: string,
  chunks: Iterable<string | Uint8Array>,
  options: AtomicWriteOptions = {},
): void {
  const fileSystem = options.fileSystem ?? nodeFileSystem;
  const temporary = temporaryPathFor(path);
  let fd: number | undefined;
  try {
    fd = fileSystem.openSync(temporary, 'wx', options.mode ?? 0o644);
    const open = fd;
    let pending: string[] = [];
    let pendingLength = 0;
    const flush = (): void => {
      if (pending.length === 0) return;
      writeAllSync(fileSystem, open, toBytes(pending.join('')));
      pending = [];
      pendingLength = 0;
    };
    for (const chunk of chunks) {
      if (typeof chunk !== 'string') {
        flush();
        writeAllSync(fileSystem, open, chunk);
        continue;
      }
      pending.push(chunk);
      pendingLength += chunk.length;
      if (pendingLength >= 1 << 20) flush();
    }
    flush();
    fileSystem.fsyncSync(fd);
    const closing = fd;
    fd = undefined;
    fileSystem.closeSync(closing);
    fileSystem.renameSync(temporary, path);
  } catch (error) {
    if (fd !== undefined) {
      try {
        fileSystem.closeSync(fd);
      } catch {
        // already failing; the first error is the one to report
      }
    }
    try {
      fileSystem.unlinkSync(temporary);
    } catch {
      // it may never have been created
    }
    throw toDiskError(error, path, 'write');
  }
  try {
    syncDirectorySync(fileSystem, dirname(resolve(path)));
  } catch (error) {
    throw toDiskError(error, dirname(resolve(path)), 'sync');
  }
}

/**
 * Replaces the file at `path` with `data` (a string is written as UTF-8) atomically and durably.
 * On failure the previous file, if any, is untouched, the temporary file is removed, and a
 * {@link DiskError} is thrown ("cannot write 'x': no space left on the device (ENOSPC)").
 *
 * @example writeFileAtomicSync('runs/night/checkpoint.json', JSON.stringify(state))
 */
export function writeFileAtomicSync(path: string, data: string | Uint8Array, options: AtomicWriteOptions = {}): void {
  writeChunksAtomicSync(path, [data], options);
}

/**
 * The asynchronous form of {@link writeFileAtomicSync}, with the same guarantees and errors
 * (node:fs/promises underneath; the directory sync is the synchronous call, it is brief).
 *
 * @example await writeFileAtomic('runs/night/summary.json', text)
 */
export async function writeFileAtomic(
  path: string,
  data: string | Uint8Array,
  options: { mode?: number } = {},
): Promise<void> {
  const temporary = temporaryPathFor(path);
  let created = false;
  try {
    const handle = await open(temporary, 'wx', options.mode ?? 0o644);
    created = true;
    try {
      await handle.writeFile(toBytes(data));
      await handle.sync();
    } finally {
      await handle.close();
    }
    await rename(temporary, path);
  } catch (error) {
    if (created) await unlink(temporary).catch(() => undefined);
    throw toDiskError(error, path, 'write');
  }
  try {
    syncDirectorySync(nodeFileSystem, dirname(resolve(path)));
  } catch (error) {
    throw toDiskError(error, dirname(resolve(path)), 'sync');
  }
}

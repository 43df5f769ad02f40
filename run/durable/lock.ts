/**
 * A run directory's lock: one file naming the process that sweeps into the directory (pid, host,
 * boot id), so a second process refuses to write there. A lock left by a run that died (its pid no
 * longer alive on this host, or the host rebooted since) is stale and taken over.
 *
 * The lock file is written completely to a temporary file and then hard-linked into place, which
 * fails if a lock exists (atomic, also on NFS), so a lock file is never seen half-written. Only the
 * process that holds the takeover guard (a second file, `run.lock.takeover`, created exclusively) may
 * remove a stale lock: it reads the lock again under the guard, removes it only if it is still the
 * stale one, drops the guard and then links its own like anyone else. So no process can remove a
 * fresh lock that replaced the stale one, and at most one lock is ever held; the process that links
 * first wins (it need not be the one that removed the stale lock).
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { hostname as osHostname } from 'node:os';
import { join } from 'node:path';
import { randomUUID } from 'node:crypto';
import { toDiskError } from './disk-error.ts';
import { nodeFileSystem, writeAllSync, type DurableFileSystem } from './file-system.ts';

/** The lock's file name inside a run directory. */
export const RUN_LOCK_FILE = 'run.lock';

/** Who holds a lock, as written in the lock file (JSON). */
export interface RunLockHolder {
  pid: number;
  hostname: string;
  /** Linux's /proc/sys/kernel/random/boot_id at the time of locking, or null elsewhere. */
  bootId: string | null;
  /** ISO 8601 time the lock was taken. */
  startedAt: string;
  /** Random; tells this lock from a later one of the same pid. */
  token: string;
}

/** A lock held by this process. */
export interface RunLock {
  /** The lock file's path. */
  readonly path: string;
  readonly holder: RunLockHolder;
  /** The holder of the stale lock this one replaced, or null. */
  readonly tookOverFrom: RunLockHolder | null;
  /** Removes the lock file if it is still this lock; safe to call twice. */
  release(): void;
}

/** Options of {@link acquireRunLock}; the defaults describe this process. */
export interface RunLockOptions {
  pid?: number;
  hostname?: string;
  bootId?: string | null;
  /** Whether a pid is alive on this host; by signal 0 unless given. */
  isProcessAlive?: (pid: number) => boolean;
  now?: () => Date;
  fileSystem?: DurableFileSystem;
}

/** The directory is locked by another live (or unknown) run. One-line message, with what to do. */
export class RunLockError extends Error {
  readonly lockPath: string;
  readonly holder: RunLockHolder | null;
  constructor(message: string, lockPath: string, holder: RunLockHolder | null) {
    super(message);
    this.name = 'RunLockError';
    this.lockPath = lockPath;
    this.holder = holder;
  }
}

/** True when `pid` names a live process on this host (EPERM: alive, someone else's). */
export function isProcessAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
  } catch (error) {
    return (error as { code?: string }).code === 'EPERM';
  }
  // A killed process that its parent has not reaped yet (a zombie, state Z in /proc on Linux) still
  // answers signal 0, but it will never write again: its lock is stale.
  try {
    const stat = readFileSync(`/proc/${pid}/stat`, 'utf8');
    const state = stat.slice(stat.lastIndexOf(')') + 2, stat.lastIndexOf(')') + 3);
    if (state === 'Z' || state === 'X') return false;
  } catch {
    // No /proc (not Linux) or the process just went away: trust signal 0.
  }
  return true;
}

/** This boot's id on Linux, or null where there is none. */
export function currentBootId(): string | null {
  try {
    return readFileSync('/proc/sys/kernel/random/boot_id', 'utf8').trim() || null;
  } catch {
    return null;
  }
}

function parseHolder(text: string): RunLockHolder | null {
  try {
    const value = JSON.parse(text) as Partial<RunLockHolder>;
    if (typeof value.pid !== 'number' || typeof value.hostname !== 'string' || typeof value.token !== 'string')
      return null;
    return {
      pid: value.pid,
      hostname: value.hostname,
      bootId: typeof value.bootId === 'string' ? value.bootId : null,
      startedAt: typeof value.startedAt === 'string' ? value.startedAt : '?',
      token: value.token,
    };
  } catch {
    return null;
  }
}

/** Reads the holder of the lock in `directory`, or null when there is no (readable) lock. */
export function readRunLock(directory: string): RunLockHolder | null {
  try {
    return parseHolder(readFileSync(join(directory, RUN_LOCK_FILE), 'utf8'));
  } catch {
    return null;
  }
}

function readText(fileSystem: DurableFileSystem, path: string): string | null {
  try {
    return fileSystem.readFileSync(path).toString('utf8');
  } catch (error) {
    if ((error as { code?: string }).code === 'ENOENT') return null;
    throw error;
  }
}

/**
 * Takes the lock of run directory `directory` (created if missing) for this process. Throws a
 * {@link RunLockError} when another live run holds it, or a run on another host (whose liveness
 * cannot be checked from here), or the lock file is unreadable; a DiskError when the directory
 * cannot be written. A stale lock (same host, and its pid is gone or the host rebooted) is taken
 * over and reported in `tookOverFrom`.
 *
 * @example
 *   const lock = acquireRunLock('runs/night')
 *   try { await sweep() } finally { lock.release() }
 */
export function acquireRunLock(directory: string, options: RunLockOptions = {}): RunLock {
  const fileSystem = options.fileSystem ?? nodeFileSystem;
  const alive = options.isProcessAlive ?? isProcessAlive;
  const path = join(directory, RUN_LOCK_FILE);
  const holder = holderOfThisProcess(options);
  const text = `${JSON.stringify(holder)}\n`;
  const temporary = join(directory, `.${RUN_LOCK_FILE}.${holder.token}.tmp`);
  try {
    mkdirSync(directory, { recursive: true });
    createDurably(fileSystem, temporary, text);
  } catch (error) {
    throw toDiskError(error, path, 'lock');
  }
  try {
    let tookOverFrom: RunLockHolder | null = null;
    for (let attempt = 0; attempt < 16; attempt++) {
      try {
        createLockFile(fileSystem, temporary, path, text);
        return makeLock(fileSystem, path, holder, tookOverFrom);
      } catch (error) {
        if ((error as { code?: string }).code !== 'EEXIST') throw toDiskError(error, path, 'lock');
      }
      const existingText = readText(fileSystem, path);
      if (existingText === null) continue; // released meanwhile: try again
      const existing = takeOverStale(fileSystem, directory, path, holder, existingText, alive);
      if (existing === null) {
        pause(1 + attempt); // another process is taking it over: give it a moment
        continue;
      }
      tookOverFrom = existing;
    }
    throw new RunLockError(
      `'${directory}': could not take the lock '${path}' (it keeps changing); try again`,
      path,
      null,
    );
  } finally {
    try {
      fileSystem.unlinkSync(temporary);
    } catch {
      // already gone
    }
  }
}

/** Blocks this thread for `milliseconds` (the lock is taken synchronously). */
function pause(milliseconds: number): void {
  Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, milliseconds);
}

/** This process as the lock's holder (the options stand in for the process in tests). */
function holderOfThisProcess(options: RunLockOptions): RunLockHolder {
  return {
    pid: options.pid ?? process.pid,
    hostname: options.hostname ?? osHostname(),
    bootId: options.bootId === undefined ? currentBootId() : options.bootId,
    startedAt: (options.now ?? (() => new Date()))().toISOString(),
    token: randomUUID(),
  };
}

/**
 * Whether a lock or guard file written by `writer` belongs to a process that is gone: same host as
 * `holder` (another host's liveness cannot be told), and the host rebooted since or the pid is dead.
 */
function isStale(writer: RunLockHolder, holder: RunLockHolder, alive: (pid: number) => boolean): boolean {
  if (writer.hostname !== holder.hostname) return false;
  const rebooted = writer.bootId !== null && holder.bootId !== null && writer.bootId !== holder.bootId;
  return rebooted || !alive(writer.pid);
}

/**
 * Moves the lock file holding `existingText` out of the way when its holder is stale, and returns that
 * holder; null when another process is taking it over or it changed meanwhile (try again). Throws a
 * RunLockError when the file cannot be read, its holder is alive (or on another host), or a takeover
 * guard was left by a process that died.
 */
function takeOverStale(
  fileSystem: DurableFileSystem,
  directory: string,
  path: string,
  holder: RunLockHolder,
  existingText: string,
  alive: (pid: number) => boolean,
): RunLockHolder | null {
  const existing = parseHolder(existingText);
  if (existing === null) {
    throw new RunLockError(
      `'${directory}' holds a lock file that cannot be read; if no sweep runs there, delete '${path}'`,
      path,
      null,
    );
  }
  if (!isStale(existing, holder, alive)) {
    const where = existing.hostname === holder.hostname ? '' : ` on host ${existing.hostname}`;
    throw new RunLockError(
      `'${directory}' is in use by process ${existing.pid}${where} since ${existing.startedAt}; wait for it to finish, or if that run is gone, delete '${path}'`,
      path,
      existing,
    );
  }
  const guard = `${path}.takeover`;
  try {
    createDurably(fileSystem, guard, `${JSON.stringify(holder)}\n`);
  } catch (error) {
    if ((error as { code?: string }).code !== 'EEXIST') throw toDiskError(error, guard, 'lock');
    refuseStaleGuard(fileSystem, directory, guard, holder, alive);
    return null; // another process is taking the stale lock over: try again
  }
  try {
    // Under the guard no other process removes the lock file, and its dead holder never will.
    if (readText(fileSystem, path) !== existingText) return null;
    fileSystem.unlinkSync(path);
    return existing;
  } catch (error) {
    if ((error as { code?: string }).code === 'ENOENT') return null;
    throw toDiskError(error, path, 'lock');
  } finally {
    fileSystem.unlinkSync(guard);
  }
}

/**
 * Throws when the takeover guard was left by a process that died in the moment between creating and
 * removing it (it is never removed automatically: two processes doing so at once could remove a
 * live guard); returns quietly while its holder lives or it cannot be read (it is being written).
 */
function refuseStaleGuard(
  fileSystem: DurableFileSystem,
  directory: string,
  guard: string,
  holder: RunLockHolder,
  alive: (pid: number) => boolean,
): void {
  const text = readText(fileSystem, guard);
  const taker = text === null ? null : parseHolder(text);
  if (taker === null || !isStale(taker, holder, alive)) return;
  throw new RunLockError(
    `'${directory}': a process that was taking over a stale lock died and left '${guard}'; if no sweep runs there, delete it`,
    guard,
    null,
  );
}

/**
 * Puts the lock file in place unless one exists (EEXIST): a hard link of the complete temporary
 * file; where the file system has no hard links, an exclusive create and write instead.
 */
function createLockFile(fileSystem: DurableFileSystem, temporary: string, path: string, text: string): void {
  try {
    fileSystem.linkSync(temporary, path);
    return;
  } catch (error) {
    const code = (error as { code?: string }).code;
    if (code !== 'EPERM' && code !== 'ENOTSUP' && code !== 'ENOSYS' && code !== 'EOPNOTSUPP') throw error;
  }
  createDurably(fileSystem, path, text);
}

/** Creates `path` (it must not exist), writes `text` and forces it to the disk. */
function createDurably(fileSystem: DurableFileSystem, path: string, text: string): void {
  const fd = fileSystem.openSync(path, 'wx', 0o644);
  try {
    writeAllSync(fileSystem, fd, Buffer.from(text, 'utf8'));
    fileSystem.fsyncSync(fd);
  } finally {
    fileSystem.closeSync(fd);
  }
}

function makeLock(
  fileSystem: DurableFileSystem,
  path: string,
  holder: RunLockHolder,
  tookOverFrom: RunLockHolder | null,
): RunLock {
  let released = false;
  return {
    path,
    holder,
    tookOverFrom,
    release() {
      if (released) return;
      released = true;
      const current = readText(fileSystem, path);
      if (current !== null && parseHolder(current)?.token === holder.token) {
        try {
          fileSystem.unlinkSync(path);
        } catch (error) {
          if ((error as { code?: string }).code !== 'ENOENT') throw toDiskError(error, path, 'unlock');
        }
      }
    },
  };
}

/**
 * A file system for tests that behaves like node:fs until told to fail: after so many bytes
 * written (a disk filling up part-way through a write), or on a given call (fsync reporting EIO).
 */
import { nodeFileSystem, type DurableFileSystem } from '../../../run/durable/file-system.ts';

export interface FaultPlan {
  /** Let this many bytes through writeSync in total, then fail with `code` (a partial write first). */
  bytesBeforeFailure?: number;
  /** Fail these calls with `code` (checked before the call is made). */
  failCalls?: ReadonlyArray<keyof DurableFileSystem>;
  /** The errno name to fail with. */
  code: string;
}

export function errnoError(code: string, syscall: string): NodeJS.ErrnoException {
  return Object.assign(new Error(`${code}: simulated failure, ${syscall}`), { code, syscall });
}

export function faultyFileSystem(plan: FaultPlan): DurableFileSystem & { bytesWritten: number } {
  const state = { bytesWritten: 0 };
  const failing = new Set(plan.failCalls ?? []);
  const wrapped = { ...nodeFileSystem } as DurableFileSystem & { bytesWritten: number };
  for (const name of Object.keys(nodeFileSystem) as (keyof DurableFileSystem)[]) {
    const original = nodeFileSystem[name] as (...args: unknown[]) => unknown;
    (wrapped as unknown as Record<string, unknown>)[name] = (...args: unknown[]) => {
      if (failing.has(name)) throw errnoError(plan.code, name);
      return original(...args);
    };
  }
  wrapped.writeSync = (fd, buffer, offset, length, position) => {
    if (failing.has('writeSync')) throw errnoError(plan.code, 'write');
    const allowance = plan.bytesBeforeFailure === undefined ? length : plan.bytesBeforeFailure - state.bytesWritten;
    if (allowance <= 0) throw errnoError(plan.code, 'write');
    const written = nodeFileSystem.writeSync(fd, buffer, offset, Math.min(length, allowance), position);
    state.bytesWritten += written;
    return written;
  };
  Object.defineProperty(wrapped, 'bytesWritten', { get: () => state.bytesWritten });
  return wrapped;
}

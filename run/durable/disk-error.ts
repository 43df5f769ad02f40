/**
 * File-system failures of the durable layer, turned into one typed error with a one-line message
 * that names the path and the reason in words, so the runner can print it and stop cleanly.
 */

/** The reason in words for the error codes a long run meets on a disk (POSIX errno names). */
const REASONS: Readonly<Record<string, string>> = {
  ENOSPC: 'no space left on the device',
  EDQUOT: 'the disk quota is used up',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'the file system is read-only',
  ENOENT: 'no such file or directory',
  ENOTDIR: 'a part of the path is not a directory',
  EISDIR: 'it is a directory',
  EEXIST: 'it already exists',
  EIO: 'input/output error on the device',
  EMFILE: 'too many open files in this process',
  ENFILE: 'too many open files on this system',
  EFBIG: 'the file is too large for the file system',
  ENAMETOOLONG: 'the file name is too long',
  EBUSY: 'the file or device is busy',
  ENOTSUP: 'the file system does not support this operation',
  EXDEV: 'the paths are on different file systems',
};

/** True for the codes that mean "the disk cannot take more data here" (worth a special hint). */
export function isOutOfSpace(code: string | undefined): boolean {
  return code === 'ENOSPC' || code === 'EDQUOT' || code === 'EFBIG';
}

/**
 * A failed file operation. `message` is one line: `cannot ACTION 'PATH': REASON (CODE)`, e.g.
 * "cannot write 'runs/night/journal.cfj': no space left on the device (ENOSPC)".
 */
export class DiskError extends Error {
  /** The errno name (ENOSPC, EACCES, …), or 'UNKNOWN'. */
  readonly code: string;
  /** The path the operation was on. */
  readonly path: string;
  /** What was being done, as a verb: 'write', 'read', 'sync', 'lock', … */
  readonly action: string;
  /** The reason in words. */
  readonly reason: string;

  constructor(action: string, path: string, code: string, reason: string, options?: { cause?: unknown }) {
    super(`cannot ${action} '${path}': ${reason}${code === 'UNKNOWN' ? '' : ` (${code})`}`, options);
    this.name = 'DiskError';
    this.code = code;
    this.path = path;
    this.action = action;
    this.reason = reason;
  }
}

/**
 * Turns whatever a file operation threw into a DiskError naming `path` and the reason; a DiskError
 * passes through unchanged.
 *
 * @example toDiskError(Object.assign(new Error('x'), { code: 'ENOSPC' }), 'a.json', 'write').message
 *   // "cannot write 'a.json': no space left on the device (ENOSPC)"
 */
export function toDiskError(error: unknown, path: string, action: string): DiskError {
  if (error instanceof DiskError) return error;
  const code =
    typeof error === 'object' && error !== null && typeof (error as { code?: unknown }).code === 'string'
      ? (error as { code: string }).code
      : 'UNKNOWN';
  const known = REASONS[code];
  const reason = known ?? (error instanceof Error ? firstLine(error.message) : firstLine(String(error)));
  return new DiskError(action, path, code, reason, { cause: error });
}

function firstLine(text: string): string {
  const line = text.split('\n', 1)[0].trim();
  return line === '' ? 'unknown error' : line;
}

/**
 * Error factories for the refinement engine, so each message is written once and all read the
 * same way: "<what> requires <what it needs>, got <what it got>" (the simple-statistics form).
 * Entry points (constructors, `tell`, the drivers) throw these; the arithmetic inside never does.
 */

/** A RangeError in the engine's one format: `${subject} requires ${requirement}, got ${received}`. */
export function refineRangeError(subject: string, requirement: string, received: unknown): RangeError {
  return new RangeError(`${subject} requires ${requirement}, got ${describeReceived(received)}`);
}

/** A plain Error for a call made in the wrong state, in the same format. */
export function refineStateError(subject: string, requirement: string, received: unknown): Error {
  return new Error(`${subject} requires ${requirement}, got ${describeReceived(received)}`);
}

function describeReceived(received: unknown): string {
  if (typeof received === 'number') return Number.isNaN(received) ? 'NaN' : String(received);
  if (typeof received === 'string') return received;
  if (ArrayBuffer.isView(received) || Array.isArray(received)) {
    return `[${Array.from(received as ArrayLike<unknown>).join(', ')}]`;
  }
  return String(received);
}

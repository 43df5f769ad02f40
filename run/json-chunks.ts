/**
 * JSON text of a value as a sequence of chunks: long arrays are written element by element (an array
 * of plain values, such as a row of numbers, in slices of PRIMITIVE_SLICE elements), so a large
 * checkpoint is never one giant string. Concatenated, the chunks equal JSON.stringify(value) (no
 * indentation), including its treatment of undefined, NaN, toJSON and typed arrays.
 */
/** Elements of an array of plain values written as one string. */
export const PRIMITIVE_SLICE = 4096;

/** A value JSON.stringify writes without recursion or toJSON (in an array, undefined and functions become null). */
function isPlainValue(item: unknown): boolean {
  return item === null || (typeof item !== 'object' && typeof item !== 'bigint');
}

export function* jsonChunks(value: unknown, arrayChunk = 64): Generator<string> {
  if (value !== null && typeof value === 'object' && typeof (value as { toJSON?: unknown }).toJSON === 'function') {
    yield* jsonChunks((value as { toJSON: () => unknown }).toJSON(), arrayChunk);
    return;
  }
  if (Array.isArray(value)) {
    if (value.length <= arrayChunk) {
      yield JSON.stringify(value);
      return;
    }
    if (value.every(isPlainValue)) {
      // One string per slice instead of one per element: a generator step per number made the final
      // snapshot of a sweep (10⁴ sample rows of ~10² numbers) cost about a second of the main thread.
      for (let i = 0; i < value.length; i += PRIMITIVE_SLICE) {
        const text = JSON.stringify(value.slice(i, i + PRIMITIVE_SLICE));
        yield `${i === 0 ? '[' : ','}${text.slice(1, -1)}${i + PRIMITIVE_SLICE >= value.length ? ']' : ''}`;
      }
      return;
    }
    yield '[';
    for (let i = 0; i < value.length; i++) {
      if (i > 0) yield ',';
      const item = value[i];
      yield* jsonChunks(
        item === undefined || typeof item === 'function' || typeof item === 'symbol' ? null : item,
        arrayChunk,
      );
    }
    yield ']';
    return;
  }
  if (value !== null && typeof value === 'object' && !ArrayBuffer.isView(value)) {
    yield '{';
    let first = true;
    for (const [key, item] of Object.entries(value)) {
      if (item === undefined || typeof item === 'function' || typeof item === 'symbol') continue;
      yield `${first ? '' : ','}${JSON.stringify(key)}:`;
      first = false;
      yield* jsonChunks(item, arrayChunk);
    }
    yield '}';
    return;
  }
  yield JSON.stringify(value) ?? 'null';
}

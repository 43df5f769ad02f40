/**
 * JSON text of a value as a sequence of chunks: long arrays are written element by element, so a
 * large checkpoint is never one giant string. Concatenated, the chunks equal JSON.stringify(value)
 * (no indentation), including its treatment of undefined, NaN, toJSON and typed arrays.
 */
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

/**
 * A harness for fuzzing input-file parsers: hostile values and texts, mutations of a valid input at
 * random places, and the contract every reader of user files keeps: it returns, or throws an
 * InputError whose message is one line that starts with the file name, never anything else.
 */
import fc from 'fast-check';
import { expect } from 'vitest';
import { InputError } from '../../run/input-error.ts';

/** A path into a plain value: keys of mappings and indices of lists. */
export type ValuePath = ReadonlyArray<string | number>;

/** Values a user file can hold where a number, quantity, range or set is expected, and should not. */
export const hostileLeaf: fc.Arbitrary<unknown> = fc.oneof(
  fc.constantFrom(
    Number.NaN,
    Number.POSITIVE_INFINITY,
    Number.NEGATIVE_INFINITY,
    -0,
    Number.MAX_VALUE,
    -Number.MAX_VALUE,
    Number.MIN_VALUE,
    1e308,
    2 ** 53 + 1,
    null,
    true,
    false,
    '',
    ' ',
    'NaN',
    'Infinity',
    '-inf',
    '1e999 mm',
    '30 nF',
    '14 kV',
    '120 Hz',
    '3 parsecs',
    'mm',
    '160 mm mm',
    '0x1F',
    '__proto__',
    'constructor',
    [],
    {},
    [1, 2],
    { from: 10, to: 1 },
    { from: '900 mm', to: '300 mm' },
    { from: 1, to: 1 },
    { from: 'a', to: 'b' },
    { from: 1 },
    { to: 2 },
    { from: 1, to: 2, scale: 'log' },
    { from: -1, to: 2, scale: 'log' },
    { from: 1, to: 2, scale: 'cubic' },
    { from: 1.5, to: 2.5, integer: true },
    { from: 1, to: 10, step: 0 },
    { from: 1, to: 10, step: -1 },
    { choose: [] },
    { choose: 'AWG 26' },
    { choose: [null, Number.NaN] },
    { choose: [{ choose: [1, 2] }] },
    { from: 1, to: 2, choose: [1] },
    { form_diameter: 1 },
  ),
  fc.double(),
  fc.integer(),
  fc.string({ maxLength: 12 }),
  fc.array(fc.oneof(fc.double(), fc.string({ maxLength: 4 })), { maxLength: 3 }),
  fc.dictionary(fc.string({ maxLength: 6 }), fc.oneof(fc.double(), fc.string({ maxLength: 4 })), { maxKeys: 3 }),
);

/** Keys that have tripped parsers that index plain objects. */
export const hostileKey: fc.Arbitrary<string> = fc.oneof(
  fc.constantFrom('__proto__', 'constructor', 'prototype', 'toString', 'hasOwnProperty', '', ' ', 'ü', '0', 'length'),
  fc.string({ maxLength: 10 }),
);

/** Every path to a place inside `value` (mappings and lists, the root included as []). */
export function pathsOf(value: unknown, prefix: ValuePath = []): ValuePath[] {
  const paths: ValuePath[] = [prefix];
  if (Array.isArray(value)) {
    for (const [index, item] of value.entries()) paths.push(...pathsOf(item, [...prefix, index]));
  } else if (typeof value === 'object' && value !== null) {
    for (const [key, item] of Object.entries(value)) paths.push(...pathsOf(item, [...prefix, key]));
  }
  return paths;
}

function clone<T>(value: T): T {
  return structuredClone(value);
}

function parentAndKey(
  root: unknown,
  path: ValuePath,
): { parent: Record<string | number, unknown>; key: string | number } | null {
  if (path.length === 0) return null;
  let parent = root as Record<string | number, unknown>;
  for (const part of path.slice(0, -1)) parent = parent[part] as Record<string | number, unknown>;
  return { parent, key: path[path.length - 1] };
}

/** One change to a value at one path. */
export type Mutation =
  | { kind: 'replace'; path: ValuePath; value: unknown }
  | { kind: 'delete'; path: ValuePath }
  | { kind: 'add-key'; path: ValuePath; key: string; value: unknown }
  | { kind: 'wrap-in-list'; path: ValuePath };

/** Applies a mutation to a copy of `value`; the original is untouched. */
export function applyMutation(value: unknown, mutation: Mutation): unknown {
  const copy = clone(value);
  const place = parentAndKey(copy, mutation.path);
  const current = place ? place.parent[place.key] : copy;
  switch (mutation.kind) {
    case 'replace':
      if (!place) return mutation.value;
      place.parent[place.key] = mutation.value;
      return copy;
    case 'delete':
      if (!place) return undefined;
      if (Array.isArray(place.parent)) place.parent.splice(Number(place.key), 1);
      else delete place.parent[place.key];
      return copy;
    case 'add-key':
      if (typeof current === 'object' && current !== null && !Array.isArray(current)) {
        Object.defineProperty(current, mutation.key, {
          value: mutation.value,
          enumerable: true,
          configurable: true,
          writable: true,
        });
      }
      return copy;
    case 'wrap-in-list':
      if (!place) return [copy];
      place.parent[place.key] = [current];
      return copy;
  }
}

/** Random mutations of `base` (one to three at random paths), as [mutated value, mutations]. */
export function mutationsOf(base: unknown): fc.Arbitrary<{ value: unknown; mutations: Mutation[] }> {
  const paths = pathsOf(base);
  const one: fc.Arbitrary<Mutation> = fc.oneof(
    fc.record({ kind: fc.constant('replace' as const), path: fc.constantFrom(...paths), value: hostileLeaf }),
    fc.record({ kind: fc.constant('delete' as const), path: fc.constantFrom(...paths) }),
    fc.record({
      kind: fc.constant('add-key' as const),
      path: fc.constantFrom(...paths),
      key: hostileKey,
      value: hostileLeaf,
    }),
    fc.record({ kind: fc.constant('wrap-in-list' as const), path: fc.constantFrom(...paths) }),
  );
  return fc.array(one, { minLength: 1, maxLength: 3 }).map((mutations) => {
    let value: unknown = base;
    for (const mutation of mutations) {
      // a path may have vanished under an earlier mutation; then the mutation is skipped
      try {
        value = applyMutation(value, mutation);
      } catch {
        // keep value
      }
    }
    return { value, mutations };
  });
}

/** Texts that are not valid files, or barely: edits of `text`, and classic parser traps. */
export function hostileTexts(text: string): fc.Arbitrary<string> {
  const edit = fc
    .tuple(fc.nat({ max: text.length }), fc.nat({ max: 8 }), fc.string({ maxLength: 6 }))
    .map(([at, remove, insert]) => text.slice(0, at) + insert + text.slice(at + remove));
  return fc.oneof(
    edit,
    fc.constantFrom(
      '',
      '\n',
      '---\n---\n',
      '[',
      '{',
      '{"design": ',
      'design: [',
      '\t- tab',
      'a: &x [*x]',
      'a: &a [1,1,1,1,1,1,1,1]\nb: &b [*a,*a,*a,*a,*a,*a,*a,*a]\nc: &c [*b,*b,*b,*b,*b,*b,*b,*b]\nd: [*c,*c,*c,*c,*c,*c,*c,*c]\n',
      'design: !!binary aGVsbG8=',
      'design: !!js/function "function(){}"',
      'key: value\nkey: again\n',
      '\u0000\u0001\u0002',
      '\ufeffdesign: 1',
      '- 1\n- 2\n',
      '42',
      '"a string"',
      'null',
      `${'['.repeat(2000)}${']'.repeat(2000)}`,
    ),
    fc.string({ maxLength: 60 }),
  );
}

/**
 * Runs `read` and checks the reader contract: it returns normally, or throws an InputError whose
 * message is one non-empty line starting with `${file}: ` (no stack trace, no "undefined", no
 * "[object Object]"). Returns the message, or null when `read` returned.
 */
export function expectReaderContract(read: () => unknown, file: string): string | null {
  try {
    read();
    return null;
  } catch (error) {
    if (!(error instanceof InputError)) {
      throw new Error(
        `the reader threw ${error instanceof Error ? `${error.name}: ${error.message}` : String(error)} instead of an InputError`,
        { cause: error },
      );
    }
    const message = error.message;
    expect(message.startsWith(`${file}: `), message).toBe(true);
    expect(message, message).not.toMatch(/\n/);
    expect(message, message).not.toMatch(/\bundefined\b|\[object Object\]|\bat .*\.ts:\d+/);
    expect(message.length, message).toBeLessThan(600);
    return message;
  }
}

/**
 * The one place where a value the code has just established (a map entry it set, an element of a
 * list it knows is not empty, a field a branch above has checked) is read as present. It replaces
 * the non-null assertion `x!`, which the compiler trusts silently: here a broken assumption stops
 * at once with a message instead of travelling on as `undefined` into the arithmetic.
 */
export function must<T>(value: T | null | undefined, what = 'a value the code established'): T {
  if (value === undefined || value === null) throw new Error(`internal error: ${what} is missing`);
  return value;
}

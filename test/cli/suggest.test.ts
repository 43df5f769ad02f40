import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { damerauLevenshteinDistance, suggest } from '../../cli/suggest.ts';

/**
 * An independent reference for the unrestricted Damerau–Levenshtein distance, straight from its
 * definition: breadth-first search over all strings reachable by single insertions, deletions,
 * substitutions and adjacent transpositions (alphabet: the characters of both words; lengths up to
 * two past the longer word, which is more than an optimal edit sequence ever needs).
 */
function distanceBySearch(source: string, target: string): number {
  const alphabet = [...new Set([...source, ...target])];
  const maxLength = Math.max(source.length, target.length) + 2;
  const seen = new Set([source]);
  let frontier = [source];
  for (let steps = 0; ; steps++) {
    if (frontier.includes(target)) return steps;
    const next: string[] = [];
    const visit = (word: string): void => {
      if (word.length <= maxLength && !seen.has(word)) {
        seen.add(word);
        next.push(word);
      }
    };
    for (const word of frontier) {
      for (let i = 0; i <= word.length; i++) {
        for (const letter of alphabet) visit(word.slice(0, i) + letter + word.slice(i));
        if (i < word.length) {
          visit(word.slice(0, i) + word.slice(i + 1));
          for (const letter of alphabet) visit(word.slice(0, i) + letter + word.slice(i + 1));
        }
        if (i + 1 < word.length) visit(word.slice(0, i) + word[i + 1] + word[i] + word.slice(i + 2));
      }
    }
    frontier = next;
  }
}

describe('damerauLevenshteinDistance(source, target)', () => {
  it('gives the worked examples of the literature', () => {
    // 'CA' → 'ABC' is 2 by the unrestricted distance (transpose, then insert) and 3 by the restricted
    // "optimal string alignment" variant: the standard example separating the two (Wikipedia,
    // "Damerau–Levenshtein distance", section "Algorithm").
    expect(damerauLevenshteinDistance('CA', 'ABC')).toBe(2);
    // kitten → sitting = 3: the classic Levenshtein example (no transposition helps).
    expect(damerauLevenshteinDistance('kitten', 'sitting')).toBe(3);
    // One adjacent transposition is one edit (Damerau 1964, Comm. ACM 7(3): the four error kinds).
    expect(damerauLevenshteinDistance('abcdef', 'abdcef')).toBe(1);
  });

  it('is the length of the other word when one is empty', () => {
    expect(damerauLevenshteinDistance('', '')).toBe(0);
    expect(damerauLevenshteinDistance('', 'turns')).toBe(5);
    expect(damerauLevenshteinDistance('pitch', '')).toBe(5);
  });

  it('counts code points, not UTF-16 units', () => {
    expect(damerauLevenshteinDistance('µH', 'uH')).toBe(1);
    expect(damerauLevenshteinDistance('a😀b', 'ab')).toBe(1);
  });

  it('equals the shortest edit sequence found by exhaustive search (exact definition)', () => {
    const word = fc.string({ unit: fc.constantFrom('a', 'b', 'c'), maxLength: 5 });
    fc.assert(
      fc.property(word, word, (source, target) => {
        expect(damerauLevenshteinDistance(source, target)).toBe(distanceBySearch(source, target));
      }),
      { numRuns: 150, seed: 20261201 },
    );
  });

  it('is a metric: symmetric, zero only for equal words, and obeys the triangle inequality', () => {
    const word = fc.string({ unit: fc.constantFrom('a', 'b', 'c', 'd'), maxLength: 7 });
    fc.assert(
      fc.property(word, word, word, (x, y, z) => {
        const xy = damerauLevenshteinDistance(x, y);
        expect(xy).toBe(damerauLevenshteinDistance(y, x));
        expect(xy === 0).toBe(x === y);
        expect(damerauLevenshteinDistance(x, z)).toBeLessThanOrEqual(xy + damerauLevenshteinDistance(y, z));
      }),
      { numRuns: 300, seed: 7 },
    );
  });
});

describe('suggest(word, candidates)', () => {
  const sectionKeys = ['secondary', 'topload', 'primary', 'tank', 'driver', 'environment'];
  const fieldKeys = ['form_diameter', 'wire', 'turns', 'base_height', 'winding_length', 'pitch'];

  it('offers the key a typo was meant to be', () => {
    expect(suggest('secondry', sectionKeys)).toBe('secondary');
    expect(suggest('topload_', sectionKeys)).toBe('topload');
    expect(suggest('tunrs', fieldKeys)).toBe('turns');
    expect(suggest('wier', fieldKeys)).toBe('wire');
    expect(suggest('basehieght', fieldKeys)).toBe('base_height');
  });

  it('reads case, hyphens and spaces as the same key', () => {
    expect(suggest('Form-Diameter', fieldKeys)).toBe('form_diameter');
    expect(suggest('winding length', fieldKeys)).toBe('winding_length');
  });

  it('offers nothing for a word far from every candidate', () => {
    expect(suggest('colour', fieldKeys)).toBeNull();
    expect(suggest('x', ['y', 'z'])).toBeNull();
    expect(suggest('anything', [])).toBeNull();
  });

  it('scales the threshold with the length of the word', () => {
    // three edits are allowed for a long word, two for a middle one, one for a short one
    expect(suggest('wndng_lenght', fieldKeys)).toBe('winding_length');
    expect(suggest('tirns', ['turns'])).toBe('turns');
    expect(suggest('trns', ['turns'])).toBe('turns');
    expect(suggest('tp', ['tank'])).toBeNull();
    expect(suggest('tnk', ['tank'])).toBe('tank');
  });

  it('takes an explicit largest distance', () => {
    expect(suggest('tirns', ['turns'], { maxDistance: 0 })).toBeNull();
    expect(suggest('turns', ['turns'], { maxDistance: 0 })).toBe('turns');
  });

  it('gives ties to the candidate listed first, and the closest one otherwise', () => {
    expect(suggest('cat', ['car', 'cap'])).toBe('car');
    expect(suggest('cat', ['cap', 'car'])).toBe('cap');
    expect(suggest('pitsh', ['patch', 'pitch'])).toBe('pitch');
  });
});

/**
 * "Did you mean …?" for unknown keys, options and names: the closest candidate by Damerau–Levenshtein
 * distance, when it is close enough to be a likely typo.
 */

/**
 * Damerau–Levenshtein distance: the least number of single-character insertions, deletions,
 * substitutions and transpositions of two adjacent characters that turn `source` into `target`
 * (the unrestricted form, where a transposed pair may be edited again; it is a metric).
 *
 * Computed by the algorithm of Lowrance and Wagner, "An extension of the string-to-string correction
 * problem", J. ACM 22(2), 1975, pp. 177–183, with unit costs. Compares Unicode code points, case as
 * given. Cost O(|source|·|target|) time and memory.
 *
 * @example damerauLevenshteinDistance('CA', 'ABC') // 2 (transpose CA → AC, insert B)
 */
export function damerauLevenshteinDistance(source: string, target: string): number {
  const a = Array.from(source);
  const b = Array.from(target);
  const rows = a.length;
  const columns = b.length;
  if (rows === 0) return columns;
  if (columns === 0) return rows;
  const infinity = rows + columns;
  // distance[i + 1][j + 1] is the distance between the first i characters of a and the first j of b;
  // row 0 and column 0 hold a sentinel larger than any real distance.
  const width = columns + 2;
  const distance = new Int32Array((rows + 2) * width);
  const at = (i: number, j: number): number => i * width + j;
  distance[at(0, 0)] = infinity;
  for (let i = 0; i <= rows; i++) {
    distance[at(i + 1, 0)] = infinity;
    distance[at(i + 1, 1)] = i;
  }
  for (let j = 0; j <= columns; j++) {
    distance[at(0, j + 1)] = infinity;
    distance[at(1, j + 1)] = j;
  }
  // The last row (1-based) of a in which each character was seen, for transpositions across a gap.
  const lastRowOf = new Map<string, number>();
  for (let i = 1; i <= rows; i++) {
    let lastMatchingColumn = 0;
    for (let j = 1; j <= columns; j++) {
      const previousRow = lastRowOf.get(b[j - 1]) ?? 0;
      const previousColumn = lastMatchingColumn;
      const substitutionCost = a[i - 1] === b[j - 1] ? 0 : 1;
      if (substitutionCost === 0) lastMatchingColumn = j;
      const substitution = distance[at(i, j)] + substitutionCost;
      const insertion = distance[at(i + 1, j)] + 1;
      const deletion = distance[at(i, j + 1)] + 1;
      // Transpose a[previousRow-1] with a[i-1], deleting what lies between in a and inserting
      // what lies between in b.
      const transposition =
        distance[at(previousRow, previousColumn)] + (i - previousRow - 1) + 1 + (j - previousColumn - 1);
      distance[at(i + 1, j + 1)] = Math.min(substitution, insertion, deletion, transposition);
    }
    lastRowOf.set(a[i - 1], i);
  }
  return distance[at(rows + 1, columns + 1)];
}

/** Options of {@link suggest}. */
export interface SuggestOptions {
  /** Largest distance still offered; by default 1 for words up to 3 characters, 2 up to 7, else 3. */
  maxDistance?: number;
}

/** The spelling that typos are compared in: lower case, with '-' and spaces read as '_'. */
function normalizedSpelling(word: string): string {
  return word
    .trim()
    .toLowerCase()
    .replace(/[\s-]+/g, '_');
}

/** The default largest distance for a word of this many characters (common practice, our own steps). */
function defaultMaxDistance(length: number): number {
  if (length <= 3) return 1;
  if (length <= 7) return 2;
  return 3;
}

/**
 * The candidate closest to `word` by Damerau–Levenshtein distance, compared in lower case with '-'
 * and spaces read as '_', or null when none is close enough: within the length-scaled threshold
 * ({@link SuggestOptions.maxDistance}) and differing in fewer than half of the longer word's
 * characters (so 'a' is never offered for 'b'). Ties go to the candidate listed first. A word equal
 * to a candidate but for case or separators gets that candidate.
 *
 * @example suggest('tunrs', ['turns', 'pitch', 'wire']) // 'turns'
 * @example suggest('colour', ['turns', 'pitch'])        // null
 */
export function suggest(word: string, candidates: readonly string[], options: SuggestOptions = {}): string | null {
  const spelled = normalizedSpelling(word);
  const wordLength = Array.from(spelled).length;
  const maxDistance = options.maxDistance ?? defaultMaxDistance(wordLength);
  let best: string | null = null;
  let bestDistance = Infinity;
  for (const candidate of candidates) {
    const candidateSpelled = normalizedSpelling(candidate);
    const distance = damerauLevenshteinDistance(spelled, candidateSpelled);
    const longer = Math.max(wordLength, Array.from(candidateSpelled).length);
    const closeEnough = distance <= maxDistance && (distance === 0 || distance < longer / 2);
    if (closeEnough && distance < bestDistance) {
      best = candidate;
      bestDistance = distance;
    }
  }
  return best;
}

/**
 * Sobol direction numbers of S. Joe and F. Y. Kuo, "Constructing Sobol sequences with better
 * two-dimensional projections", SIAM J. Sci. Comput. 30(5), 2635-2654 (2008): the first lines of their
 * file new-joe-kuo-6.21201 (published at https://web.maths.unsw.edu.au/~fkuo/sobol/), which covers
 * 21201 dimensions; coilfront embeds dimensions 2 to 64.
 *
 * Each row is one line of that file: `[d, s, a, m_1 ... m_s]` with d the dimension (the file starts at
 * d = 2; dimension 1 is the van der Corput sequence, all m = 1), s the degree of the primitive polynomial,
 * a its interior coefficients as a binary number (the leading and constant coefficients are 1 and left
 * out), and m_1..m_s the initial direction numbers (m_k odd, m_k < 2^k).
 *
 * Provenance: the rows were decoded from the copy of the same file that scipy ships
 * (scipy/stats/_sobol_direction_numbers.npz, arrays `poly` and `vinit`, scipy 1.17.1) and compared
 * line by line with a public verbatim copy of the file's lines 2-31; test/reference/sobol.test.ts checks
 * the generated points against scipy's output.
 */
export const JOE_KUO_DIRECTION_ROWS: readonly (readonly number[])[] = [
  [2, 1, 0, 1],
  [3, 2, 1, 1, 3],
  [4, 3, 1, 1, 3, 1],
  [5, 3, 2, 1, 1, 1],
  [6, 4, 1, 1, 1, 3, 3],
  [7, 4, 4, 1, 3, 5, 13],
  [8, 5, 2, 1, 1, 5, 5, 17],
  [9, 5, 4, 1, 1, 5, 5, 5],
  [10, 5, 7, 1, 1, 7, 11, 19],
  [11, 5, 11, 1, 1, 5, 1, 1],
  [12, 5, 13, 1, 1, 1, 3, 11],
  [13, 5, 14, 1, 3, 5, 5, 31],
  [14, 6, 1, 1, 3, 3, 9, 7, 49],
  [15, 6, 13, 1, 1, 1, 15, 21, 21],
  [16, 6, 16, 1, 3, 1, 13, 27, 49],
  [17, 6, 19, 1, 1, 1, 15, 7, 5],
  [18, 6, 22, 1, 3, 1, 15, 13, 25],
  [19, 6, 25, 1, 1, 5, 5, 19, 61],
  [20, 7, 1, 1, 3, 7, 11, 23, 15, 103],
  [21, 7, 4, 1, 3, 7, 13, 13, 15, 69],
  [22, 7, 7, 1, 1, 3, 13, 7, 35, 63],
  [23, 7, 8, 1, 3, 5, 9, 1, 25, 53],
  [24, 7, 14, 1, 3, 1, 13, 9, 35, 107],
  [25, 7, 19, 1, 3, 1, 5, 27, 61, 31],
  [26, 7, 21, 1, 1, 5, 11, 19, 41, 61],
  [27, 7, 28, 1, 3, 5, 3, 3, 13, 69],
  [28, 7, 31, 1, 1, 7, 13, 1, 19, 1],
  [29, 7, 32, 1, 3, 7, 5, 13, 19, 59],
  [30, 7, 37, 1, 1, 3, 9, 25, 29, 41],
  [31, 7, 41, 1, 3, 5, 13, 23, 1, 55],
  [32, 7, 42, 1, 3, 7, 3, 13, 59, 17],
  [33, 7, 50, 1, 3, 1, 3, 5, 53, 69],
  [34, 7, 55, 1, 1, 5, 5, 23, 33, 13],
  [35, 7, 56, 1, 1, 7, 7, 1, 61, 123],
  [36, 7, 59, 1, 1, 7, 9, 13, 61, 49],
  [37, 7, 62, 1, 3, 3, 5, 3, 55, 33],
  [38, 8, 14, 1, 3, 1, 15, 31, 13, 49, 245],
  [39, 8, 21, 1, 3, 5, 15, 31, 59, 63, 97],
  [40, 8, 22, 1, 3, 1, 11, 11, 11, 77, 249],
  [41, 8, 38, 1, 3, 1, 11, 27, 43, 71, 9],
  [42, 8, 47, 1, 1, 7, 15, 21, 11, 81, 45],
  [43, 8, 49, 1, 3, 7, 3, 25, 31, 65, 79],
  [44, 8, 50, 1, 3, 1, 1, 19, 11, 3, 205],
  [45, 8, 52, 1, 1, 5, 9, 19, 21, 29, 157],
  [46, 8, 56, 1, 3, 7, 11, 1, 33, 89, 185],
  [47, 8, 67, 1, 3, 3, 3, 15, 9, 79, 71],
  [48, 8, 70, 1, 3, 7, 11, 15, 39, 119, 27],
  [49, 8, 84, 1, 1, 3, 1, 11, 31, 97, 225],
  [50, 8, 97, 1, 1, 1, 3, 23, 43, 57, 177],
  [51, 8, 103, 1, 3, 7, 7, 17, 17, 37, 71],
  [52, 8, 115, 1, 3, 1, 5, 27, 63, 123, 213],
  [53, 8, 122, 1, 1, 3, 5, 11, 43, 53, 133],
  [54, 9, 8, 1, 3, 5, 5, 29, 17, 47, 173, 479],
  [55, 9, 13, 1, 3, 3, 11, 3, 1, 109, 9, 69],
  [56, 9, 16, 1, 1, 1, 5, 17, 39, 23, 5, 343],
  [57, 9, 22, 1, 3, 1, 5, 25, 15, 31, 103, 499],
  [58, 9, 25, 1, 1, 1, 11, 11, 17, 63, 105, 183],
  [59, 9, 44, 1, 1, 5, 11, 9, 29, 97, 231, 363],
  [60, 9, 47, 1, 1, 5, 15, 19, 45, 41, 7, 383],
  [61, 9, 52, 1, 3, 7, 7, 31, 19, 83, 137, 221],
  [62, 9, 55, 1, 1, 1, 3, 23, 15, 111, 223, 83],
  [63, 9, 59, 1, 1, 5, 13, 31, 15, 55, 25, 161],
  [64, 9, 62, 1, 1, 3, 13, 25, 47, 39, 87, 257],
];

/** The number of dimensions the embedded table supports (dimension 1 plus the rows above). */
export const JOE_KUO_MAX_DIMENSIONS = JOE_KUO_DIRECTION_ROWS.length + 1;

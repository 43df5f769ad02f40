import { describe, expect, it } from 'vitest';
import { SobolSampler, sobolDirectionNumbers } from '../../optimize/sampling/sobol-sampler.ts';
import { JOE_KUO_DIRECTION_ROWS, JOE_KUO_MAX_DIMENSIONS } from '../../optimize/sampling/joe-kuo-directions.ts';

// Sources:
// [JK] S. Joe and F. Y. Kuo, SIAM J. Sci. Comput. 30, 2635-2654 (2008), direction-number file
//      new-joe-kuo-6.21201 (https://web.maths.unsw.edu.au/~fkuo/sobol/); lines quoted from a public
//      verbatim copy of its first lines.
// [SP] scipy 1.17.1, scipy.stats.qmc.Sobol(d=64, scramble=False, bits=32).random(n), which implements
//      the same file and Gray-code order; values are the 32-bit integers x·2^32, computed once with scipy.

function pointsOf(sampler: SobolSampler, count: number): Float64Array[] {
  return Array.from({ length: count }, (_, i) => {
    const out = new Float64Array(sampler.dimensions);
    sampler.pointAt(i, out);
    return out;
  });
}

describe('JOE_KUO_DIRECTION_ROWS against the published file [JK]', () => {
  const publishedLines = [
    '2       1       0       1',
    '3       2       1       1 3',
    '4       3       1       1 3 1',
    '5       3       2       1 1 1',
    '6       4       1       1 1 3 3',
    '7       4       4       1 3 5 13',
    '8       5       2       1 1 5 5 17',
    '9       5       4       1 1 5 5 5',
    '10      5       7       1 1 7 11 19',
    '11      5       11      1 1 5 1 1',
    '12      5       13      1 1 1 3 11',
    '13      5       14      1 3 5 5 31',
    '14      6       1       1 3 3 9 7 49',
    '20      7       1       1 3 7 11 23 15 103',
    '31      7       41      1 3 5 13 23 1 55',
  ];
  it.each(publishedLines)('row for line "%s" matches', (line) => {
    const fields = line.trim().split(/\s+/).map(Number);
    expect(JOE_KUO_DIRECTION_ROWS[fields[0] - 2]).toEqual(fields);
  });

  it('covers dimensions 2 to 64 in order, with odd m_k < 2^k and the degree s as the count of m', () => {
    expect(JOE_KUO_MAX_DIMENSIONS).toBe(64);
    JOE_KUO_DIRECTION_ROWS.forEach((row, i) => {
      expect(row[0]).toBe(i + 2);
      const degree = row[1];
      expect(row.length).toBe(3 + degree);
      row.slice(3).forEach((m, k) => {
        expect(m % 2).toBe(1);
        expect(m).toBeLessThan(2 ** (k + 1));
      });
    });
  });
});

describe('SobolSampler unscrambled against the published sequence', () => {
  const sampler = new SobolSampler(5, 0, false);
  const points = pointsOf(sampler, 8);
  // First 8 points of dimensions 1..5 [SP]; dimension 1 is van der Corput in Gray-code order.
  const expected = [
    [0, 0.5, 0.75, 0.25, 0.375, 0.875, 0.625, 0.125],
    [0, 0.5, 0.25, 0.75, 0.375, 0.875, 0.125, 0.625],
    [0, 0.5, 0.25, 0.75, 0.625, 0.125, 0.875, 0.375],
    [0, 0.5, 0.25, 0.75, 0.875, 0.375, 0.625, 0.125],
    [0, 0.5, 0.75, 0.25, 0.375, 0.875, 0.625, 0.125],
  ];
  it.each([0, 1, 2, 3, 4])('pointAt(0..7) in dimension %i equals scipy', (d) => {
    expect(points.map((p) => p[d])).toEqual(expected[d]);
  });

  const rows: [number, number[]][] = [
    [
      1000,
      [
        943718400, 415236096, 2227175424, 2906652672, 1203765248, 3896508416, 197132288, 3862953984, 2151677952,
        297795584, 364904448, 1094713344, 692060160, 1648361472, 616562688, 1589641216, 3091202048, 1480589312,
        4257218560, 3116367872, 2243952640, 2361393152, 4081057792, 2319450112, 2503999488, 3896508416, 171966464,
        4206886912, 255852544, 1463812096, 633339904, 624951296, 1270874112, 2545942528, 3443523584, 3309305856,
        3644850176, 3569352704, 1321205760, 2059403264, 3921674240, 1094713344, 4123000832, 3015704576, 3611295744,
        398458880, 3745513472, 3946840064, 4290772992, 2059403264, 1514143744, 2218786816, 3233808384, 1883242496,
        541065216, 3829399552, 1950351360, 339738624, 3795845120, 2453667840, 1916796928, 2587885568, 1111490560,
        1916796928,
      ],
    ],
    [
      12345,
      [
        2752774144, 3493593088, 688652288, 2262564864, 3816030208, 252968960, 546570240, 486801408, 3443785728,
        1845231616, 319029248, 2571894784, 3998482432, 4045144064, 148111360, 2752249856, 268697600, 218890240,
        1371799552, 1475084288, 855900160, 348913664, 2607022080, 3705405440, 1895563264, 1270087680, 1572077568,
        2070151168, 376700928, 1737228288, 1232338944, 2843475968, 2158755840, 2840330240, 817102848, 3910926336,
        11272192, 1384382464, 4122738688, 4072407040, 925630464, 3438018560, 3273392128, 2458648576, 1240727552,
        2049179648, 4217110528, 1029963776, 2848194560, 2632187904, 3313238016, 1947467776, 38010880, 2644770816,
        3720085504, 2366898176, 1916010496, 4177264640, 1985216512, 4164681728, 464257024, 2695626752, 4165730304,
        1999896576,
      ],
    ],
    [
      1048580,
      [
        1610618880, 402683904, 234387456, 895268864, 3316709376, 3280009216, 2854160384, 4126382080, 1171986432,
        600274944, 3228907520, 645863424, 1849300992, 2753898496, 1181988864, 3986466816, 176826368, 705587200,
        2576771072, 2994980864, 975886336, 2232141824, 964048896, 1382508544, 3755517952, 4127258624, 2181396480,
        3231037440, 4109273088, 1253013504, 485066752, 505075712, 3412531200, 2477774848, 495577088, 283752448,
        1635997696, 1407715328, 23201792, 3087460352, 1571678208, 1156700160, 2285205504, 1157826560, 607094784,
        1434138624, 1862756352, 3072026624, 4010010624, 1396369408, 1716705280, 2063099904, 2623547392, 3961526272,
        3617597440, 3736606720, 2218276864, 866654208, 709769216, 1061566464, 216139776, 1322915840, 3978967040,
        393349120,
      ],
    ],
  ];
  it.each(rows)('integerPointAt(%i) in 64 dimensions equals scipy bit for bit', (index, integers) => {
    const full = new SobolSampler(64, 0, false);
    const out = new Uint32Array(64);
    full.integerPointAt(index, out);
    expect(Array.from(out)).toEqual(integers);
    const floats = new Float64Array(64);
    full.pointAt(index, floats);
    expect(Array.from(floats)).toEqual(integers.map((v) => v / 2 ** 32));
  });

  it('sobolDirectionNumbers gives dimension 1 as 2^(31-k) and dimension 2 as m_k of the recurrence (v_1 = 2^31, v_2 = 3·2^30)', () => {
    const table = sobolDirectionNumbers(2);
    for (let k = 0; k < 32; k++) expect(table[k]).toBe(2 ** (31 - k));
    // Dimension 2 (s = 1, a = 0, m_1 = 1): m_k = 2 m_{k-1} XOR m_{k-1}, i.e. 1, 3, 5, 15, 17, 51 [JK recurrence].
    expect(Array.from(table.subarray(32, 38)).map((v, k) => v / 2 ** (31 - k))).toEqual([1, 3, 5, 15, 17, 51]);
  });
});

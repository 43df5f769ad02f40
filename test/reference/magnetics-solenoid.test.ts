/**
 * Single-layer solenoid inductance: Nagaoka's coefficient, Wheeler, Lundin, Rosa's corrections and
 * the exact loop sum, against the published and independently computed values of refs §2.
 */
import { describe, expect, test } from 'vitest';
import { currentSheetInductance, nagaokaCoefficient } from '../../core/inductance/nagaoka.ts';
import { wheelerLongCoilInductance, wheelerNagaokaCoefficient } from '../../core/inductance/wheeler.ts';
import { lundinNagaokaCoefficient } from '../../core/inductance/lundin.ts';
import {
  rosaMutualCorrection,
  rosaMutualCorrectionSum,
  rosaSelfCorrection,
  roundWireSolenoidInductance,
} from '../../core/inductance/rosa.ts';
import { loopSumSolenoidInductance } from '../../core/inductance/filament-sum.ts';

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

/** D/l from 10⁻³ to 10³, log-spaced. */
function logSpaced(count: number, from: number, to: number): number[] {
  const values: number[] = [];
  for (let i = 0; i < count; i++) values.push(from * (to / from) ** (i / (count - 1)));
  return values;
}

describe('nagaokaCoefficient (exact elliptic form)', () => {
  // refs §2.1 [X]: mpmath, confirmed by integrating Maxwell's filament formula over the sheet.
  const table: Array<[number, string]> = [
    [0.01, '0.9957683680'],
    [0.1, '0.9588071242'],
    [0.2, '0.9200926708'],
    [0.25, '0.90164933'],
    [0.5, '0.8181357519'],
    [0.8, '0.73507906'],
    [1, '0.6884226073'],
    [1.25, '0.63809362'],
    [2, '0.5255100243'],
    [5, '0.3198254678'],
    [10, '0.2033235175'],
    [100, '0.03496024577'],
  ];
  test.each(table)('D/l = %d: K_N = %s to all printed digits', (x, printed) => {
    const decimals = printed.split('.')[1].length;
    expect(Math.abs(nagaokaCoefficient(x) - Number(printed))).toBeLessThanOrEqual(0.5 * 10 ** -decimals);
  });

  // Leading terms 1 − 4x/(3π): refs §2.1 (Knight; follows from Lundin's form). The x²/8 term
  // is from memory (the standard long-coil expansion; Lundin's f1 ≈ 1 + 0.12495 x² agrees).
  test('long-coil limit K_N → 1 − 4(D/l)/(3π) + (D/l)²/8, and no loss of digits as D/l → 0', () => {
    for (const x of [1e-3, 1e-4, 1e-5, 1e-6]) {
      expect(Math.abs(nagaokaCoefficient(x) - (1 - (4 * x) / (3 * Math.PI) + (x * x) / 8))).toBeLessThan(
        x ** 3 + 4e-16,
      );
    }
  });

  test('short-coil limit: K_N → (2/π)(l/D)(ln(4D/l) − ½) (Lundin’s short branch, f1 → 1, f2 → 0)', () => {
    const x = 1e5;
    const u = 1 / x;
    expect(relativeError(nagaokaCoefficient(x), (2 / Math.PI) * u * (Math.log(4 / u) - 0.5))).toBeLessThan(1e-6);
  });

  test('non-positive or non-finite D/l gives NaN', () => {
    expect(nagaokaCoefficient(0)).toBeNaN();
    expect(nagaokaCoefficient(-1)).toBeNaN();
    expect(nagaokaCoefficient(Number.POSITIVE_INFINITY)).toBeNaN();
  });
});

describe('lundinNagaokaCoefficient', () => {
  test('within 1e-5 (stated 2.5e-6) of the exact coefficient over D/l in [1e-3, 1e3] (refs §2.3 [X])', () => {
    let worst = 0;
    for (const x of logSpaced(601, 1e-3, 1e3))
      worst = Math.max(worst, relativeError(lundinNagaokaCoefficient(x), nagaokaCoefficient(x)));
    expect(worst).toBeLessThan(1e-5);
    expect(worst).toBeGreaterThan(1e-7); // it is an approximation, not the same formula
  });

  test('regression: 4/(3π) in place of 2/π in the short branch would be wrong by exactly 1/3 (refs §2.3)', () => {
    const x = 4;
    const u = 1 / x;
    const f1 = (1 + 0.383901 * u * u + 0.017108 * u ** 4) / (1 + 0.258952 * u * u);
    const f2 = 0.093842 * u * u + 0.002029 * u ** 4 - 0.000801 * u ** 6;
    const wrong = (4 / (3 * Math.PI)) * u * ((Math.log(4 / u) - 0.5) * f1 + f2);
    expect(wrong / lundinNagaokaCoefficient(x)).toBeCloseTo(2 / 3, 14);
    expect(relativeError(lundinNagaokaCoefficient(x), nagaokaCoefficient(x))).toBeLessThan(1e-5);
  });
});

describe('Wheeler’s long-coil formula', () => {
  test('K_W = 1/(1 + 0.45 D/l) stays inside the computed error band (refs §2.2 [X])', () => {
    // the printed maxima (0.31 %, 0.33 %, 0.84 %, 2.3 %) plus half a unit of their last digit
    const band = (x: number) => (x <= 1 ? 0.00315 : x <= 2.5 ? 0.00335 : x <= 3 ? 0.00845 : 0.0235);
    for (const x of logSpaced(400, 1e-3, 4)) {
      expect(relativeError(wheelerNagaokaCoefficient(x), nagaokaCoefficient(x)), `D/l = ${x}`).toBeLessThanOrEqual(
        band(x) + 1e-6,
      );
    }
    // point values of the same scan: D/l = 1 → 0.689655 (+0.18 %), 0.2 → 0.917431 (−0.29 %)
    expect(wheelerNagaokaCoefficient(1)).toBeCloseTo(0.689655, 6);
    expect(wheelerNagaokaCoefficient(0.2)).toBeCloseTo(0.917431, 6);
    expect(wheelerNagaokaCoefficient(10) / nagaokaCoefficient(10) - 1).toBeCloseTo(-0.106, 3);
  });

  test('the inch formula equals the SI current sheet with K_W divided by 1.0027 (refs §2.2, Knight)', () => {
    const radius = 0.1;
    const length = 0.5;
    const turns = 800;
    const wheeler = wheelerLongCoilInductance(radius, length, turns);
    const si =
      (4e-7 * Math.PI * turns ** 2 * Math.PI * radius ** 2 * wheelerNagaokaCoefficient((2 * radius) / length)) / length;
    // the printed 1.0027 is within 1e-4 of the exact factor μ0 π × 0.0254 m/in × 10 × 10⁶ µH/H = 4π² × 0.0254 = 1.002745
    expect(Math.abs(si / wheeler - 1.0027)).toBeLessThan(1e-4);
    expect(relativeError(si / wheeler, 4 * Math.PI ** 2 * 0.0254)).toBeLessThan(1e-12);
  });
});

describe('Rosa’s corrections', () => {
  // refs §2.4: exact GMD sum [X] and Grover 1946 p. 150 table [P2] (as reproduced by Knight).
  const table: Array<[number, number, number | null]> = [
    [1, 0, 0],
    [2, 0.11370564, 0.1137],
    [3, 0.16626125, 0.1663],
    [4, 0.19727588, 0.1973],
    [5, 0.21799463, 0.218],
    [10, 0.26640811, 0.2664],
    [20, 0.29636948, 0.2964],
    [30, 0.30795314, 0.3079],
    [50, 0.31822008, 0.3182],
    [100, 0.32689335, 0.3269],
    [1000, 0.33639493, null],
  ];
  test.each(table)('k_m(%d) = %d (exact sum), Grover %s', (turns, exact, grover) => {
    expect(Math.abs(rosaMutualCorrectionSum(turns) - exact)).toBeLessThan(5e-9);
    // Grover prints 4 decimals; his 0.3079 at N = 30 is 5.3e-5 below the exact sum (truncated, not rounded)
    if (grover !== null)
      expect(Math.abs(rosaMutualCorrectionSum(turns) - grover)).toBeLessThan(turns === 30 ? 6e-5 : 5e-5);
    if (turns >= 5) expect(Math.abs(rosaMutualCorrection(turns) - rosaMutualCorrectionSum(turns))).toBeLessThan(1e-8);
    else expect(rosaMutualCorrection(turns)).toBe(rosaMutualCorrectionSum(turns));
  });

  test('k_m tends to ln(2π) − 3/2 = 0.3378770664 (refs §2.4 [X])', () => {
    expect(rosaMutualCorrection(1e9)).toBeCloseTo(0.3378770664, 8);
  });

  test('k_m is continuous and increasing in fractional N', () => {
    let previous = rosaMutualCorrection(1);
    for (let n = 1.05; n < 12; n += 0.05) {
      const value = rosaMutualCorrection(n);
      expect(value).toBeGreaterThan(previous);
      expect(value - previous).toBeLessThan(0.01);
      previous = value;
    }
    expect(rosaMutualCorrection(0.5)).toBeNaN();
    expect(rosaMutualCorrectionSum(2.5)).toBeNaN();
  });

  test('k_s = 5/4 − ln(2p/d) (DC) and 3/2 − ln(2p/d) (HF), negative for thin spaced wire (refs §2.4)', () => {
    expect(rosaSelfCorrection(0.8e-3, 0.7e-3, 'uniform')).toBeCloseTo(0.423321, 6);
    expect(rosaSelfCorrection(0.8e-3, 0.7e-3, 'surface') - rosaSelfCorrection(0.8e-3, 0.7e-3, 'uniform')).toBeCloseTo(
      0.25,
      15,
    );
    expect(rosaSelfCorrection(1e-3, 0.5e-3, 'uniform')).toBeLessThan(0); // d < 0.573 p
  });
});

describe('round-wire solenoid: Nagaoka + Rosa against the exact loop sum (refs §2.4 validation [X])', () => {
  // direct sum of round-wire loops vs L_s − μ0 a N (k_s + k_m)
  const rows: Array<[number, number, number, number, string, string, number]> = [
    // N, a, p, d, loop sum µH, Nagaoka+Rosa µH (as printed), printed relative difference
    [10, 0.05, 2e-3, 1e-3, '15.7002', '15.7010', 5e-5],
    [100, 0.05, 1e-3, 0.8e-3, '675.288', '675.295', 1e-5],
  ];
  test.each(rows)(
    'N = %d, a = %d m, p = %d m, d = %d m: %s µH by the sum, %s µH by Rosa',
    (turns, radius, pitch, diameter, loopSum, rosa, difference) => {
      const halfUnit = (printed: string) => 0.5 * 10 ** -printed.split('.')[1].length;
      const byRosa = roundWireSolenoidInductance({ radius, turns, pitch, bareDiameter: diameter }, 'uniform');
      const bySum = loopSumSolenoidInductance(radius, turns, pitch, diameter / 2, 'uniform');
      expect(Math.abs(bySum * 1e6 - Number(loopSum))).toBeLessThanOrEqual(halfUnit(loopSum));
      expect(Math.abs(byRosa * 1e6 - Number(rosa))).toBeLessThanOrEqual(halfUnit(rosa));
      expect(Math.abs(byRosa / bySum - 1 - difference)).toBeLessThan(0.5 * difference);
    },
  );

  test('N = 5, a = 20 mm, p = 4 mm, d = 1.5 mm: Rosa exceeds the sum by 1.3e-3', () => {
    const byRosa = roundWireSolenoidInductance(
      { radius: 0.02, turns: 5, pitch: 4e-3, bareDiameter: 1.5e-3 },
      'uniform',
    );
    const bySum = loopSumSolenoidInductance(0.02, 5, 4e-3, 0.75e-3, 'uniform');
    expect(byRosa / bySum - 1).toBeCloseTo(1.3e-3, 4);
  });

  test('the HF pair (surface-current loops, k_s with 3/2) agrees as well', () => {
    const byRosa = roundWireSolenoidInductance(
      { radius: 0.05, turns: 100, pitch: 1e-3, bareDiameter: 0.8e-3 },
      'surface',
    );
    const bySum = loopSumSolenoidInductance(0.05, 100, 1e-3, 0.4e-3, 'surface');
    expect(relativeError(byRosa, bySum)).toBeLessThan(3e-5);
  });

  test('worked secondary example: D = 0.20 m, l = 0.80 m, N = 1000, d = 0.70 mm (refs §2.4 [X])', () => {
    const radius = 0.1;
    expect(nagaokaCoefficient(0.25)).toBeCloseTo(0.90164933, 8);
    expect(Math.abs(currentSheetInductance(radius, 0.8, 1000) * 1e3 - 44.4946)).toBeLessThan(5e-5);
    expect(rosaMutualCorrection(1000)).toBeCloseTo(0.336395, 6);
    const inductance = roundWireSolenoidInductance(
      { radius, turns: 1000, pitch: 0.8e-3, bareDiameter: 0.7e-3 },
      'uniform',
    );
    expect(Math.abs(inductance * 1e3 - 44.3991)).toBeLessThan(5e-5);
    const bySum = loopSumSolenoidInductance(radius, 1000, 0.8e-3, 0.35e-3, 'uniform');
    expect(relativeError(bySum, inductance)).toBeLessThan(1e-4);
  });
});

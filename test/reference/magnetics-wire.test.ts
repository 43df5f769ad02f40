/**
 * Wire: AWG diameters, copper resistance, mass, skin depth, enamel build, helical length,
 * against published rules and tables.
 */
import { describe, expect, test } from 'vitest';
import {
  awgDiameter,
  copperMass,
  copperResistivity,
  helicalWireLength,
  insulatedDiameter,
  insulationIncrease,
  skinDepth,
  wireDcResistance,
} from '../../core/wire.ts';

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}

describe('awgDiameter (ASTM B258 rule)', () => {
  test('fixed points of the series: 36 AWG = 0.005 in, 0000 AWG (n = −3) = 0.4600 in (ASTM B258)', () => {
    expect(relativeError(awgDiameter(36), 0.005 * 0.0254)).toBeLessThan(1e-15);
    expect(relativeError(awgDiameter(-3), 0.46 * 0.0254)).toBeLessThan(1e-14);
  });

  // refs §7.1: d (mm) [X] from the rule, R20 (Ω/km) [X] with ρ = 1/58 µΩ·m (IEC 60028);
  // NEMA nominal bare (in) [P2] from a manufacturer's table based on NEMA MW 1000.
  const table: Array<[number, number, number, number]> = [
    [10, 2.5882, 3.2771, 0.1019],
    [12, 2.0525, 5.2108, 0.0808],
    [14, 1.6277, 8.2855, 0.0641],
    [16, 1.2908, 13.1745, 0.0508],
    [18, 1.0237, 20.9482, 0.0403],
    [20, 0.8118, 33.309, 0.032],
    [22, 0.6438, 52.9634, 0.0253],
    [24, 0.5106, 84.2151, 0.0201],
    [26, 0.4049, 133.907, 0.0159],
    [28, 0.3211, 212.921, 0.0126],
    [30, 0.2546, 338.557, 0.01],
    [36, 0.127, 1361.05, 0.005],
  ];
  test.each(table)(
    'AWG %d: diameter %d mm, %d Ω/km at 20 °C, NEMA nominal %d in',
    (gauge, diameterMm, ohmsPerKm, nemaInches) => {
      const diameter = awgDiameter(gauge);
      expect(Math.abs(diameter * 1e3 - diameterMm)).toBeLessThan(6e-5); // 4 decimals printed
      expect(relativeError(wireDcResistance(1000, diameter, 293.15), ohmsPerKm)).toBeLessThan(5e-5);
      expect(Math.abs(diameter / 0.0254 - nemaInches)).toBeLessThan(6e-5); // NEMA rounds to 0.0001 in
    },
  );

  test('gauges outside −3 … 56 give NaN', () => {
    expect(awgDiameter(-4)).toBeNaN();
    expect(awgDiameter(57)).toBeNaN();
    expect(awgDiameter(Number.NaN)).toBeNaN();
  });
});

describe('copper (IEC 60028)', () => {
  test('ρ(20 °C) = 1/58 Ω·mm²/m and ρ(100 °C) = 2.2662e-8 Ω·m (refs §7.2 [X], α = 0.00393 /K from memory)', () => {
    expect(relativeError(copperResistivity(293.15), 1 / 58e6)).toBeLessThan(1e-15);
    expect(relativeError(copperResistivity(373.15), 2.2662e-8)).toBeLessThan(3e-5);
  });

  test('mass of 1 km of 1 mm wire is 8.89 g/cm³ × 0.785398 cm² × 1e5 cm = 6.9822 kg (IEC 60028 density, from memory)', () => {
    expect(relativeError(copperMass(1000, 1e-3), 6.98219)).toBeLessThan(1e-5);
  });
});

describe('skinDepth (δ = √(ρ/(π f μ0)), refs §7.4 [X] for copper at 20 °C)', () => {
  // values as printed; each is checked to half a unit of its last printed digit
  const table: Array<[number, string]> = [
    [50, '9.346'],
    [1e3, '2.090'],
    [1e4, '0.6609'],
    [5e4, '0.2955'],
    [1e5, '0.2090'],
    [2e5, '0.1478'],
    [3e5, '0.1207'],
    [5e5, '0.0935'],
    [1e6, '0.0661'],
    [1e7, '0.0209'],
  ];
  test.each(table)('%d Hz: %s mm', (frequency, printed) => {
    const depth = skinDepth(frequency, copperResistivity(293.15));
    const decimals = printed.split('.')[1].length;
    expect(Math.abs(depth * 1e3 - Number(printed))).toBeLessThanOrEqual(0.5 * 10 ** -decimals);
  });
});

describe('insulatedDiameter (IEC 60317-0-1 grades via IS 13730-0-1, refs §7.3 [P2])', () => {
  // At a table row the figure is the midpoint of [d + minimum increase, maximum overall diameter].
  const rows: Array<[number, 'grade1' | 'grade2' | 'grade3', number, number]> = [
    [1.626, 'grade1', 0.039, 1.698],
    [1.016, 'grade2', 0.065, 1.113],
    [0.711, 'grade3', 0.085, 0.822],
    [0.508, 'grade2', 0.047, 0.578],
    [0.315, 'grade1', 0.019, 0.349],
    [0.315, 'grade3', 0.053, 0.384],
  ];
  test.each(rows)(
    '%d mm %s: midpoint of %d mm increase and %d mm overall',
    (diameterMm, grade, minimumIncrease, maximumOverall) => {
      const expected = (diameterMm + minimumIncrease + maximumOverall) / 2;
      expect(Math.abs(insulatedDiameter(diameterMm * 1e-3, grade) * 1e3 - expected)).toBeLessThan(1e-12);
    },
  );

  test('between rows the build lies inside the two rows’ windows and grows with the grade', () => {
    const diameter = 0.6e-3; // between the 0.508 and 0.711 mm rows
    const g1 = insulationIncrease(diameter, 'grade1');
    const g2 = insulationIncrease(diameter, 'grade2');
    const g3 = insulationIncrease(diameter, 'grade3');
    expect(g1).toBeGreaterThan(0.025e-3);
    expect(g1).toBeLessThan(0.055e-3);
    expect(g2).toBeGreaterThan(g1);
    expect(g3).toBeGreaterThan(g2);
    expect(insulatedDiameter(diameter, 'none')).toBe(diameter);
  });

  test('outside the table the build is extrapolated, positive and monotone in diameter', () => {
    const small = insulationIncrease(0.127e-3, 'grade2');
    const table = insulationIncrease(0.315e-3, 'grade2');
    const large = insulationIncrease(2.5e-3, 'grade2');
    expect(small).toBeGreaterThan(0);
    expect(small).toBeLessThan(table);
    expect(large).toBeGreaterThan(insulationIncrease(1.626e-3, 'grade2'));
    expect(insulationIncrease(0, 'grade1')).toBeNaN();
  });
});

describe('helicalWireLength (arc length of a circular helix)', () => {
  test('refs §2.4 worked example: 1000 turns on D = 0.20 m at 0.8 mm pitch ≈ NπD = 628.32 m', () => {
    const length = helicalWireLength(1000, 0.1, 0.8e-3);
    expect(Math.abs(length - 628.32)).toBeLessThan(0.005);
    // exact helix: N √((2πr)² + p²) exceeds NπD by N p²/(4πr) to first order
    expect(length - 1000 * Math.PI * 0.2).toBeCloseTo((1000 * 0.8e-3 ** 2) / (4 * Math.PI * 0.1), 9);
  });

  test('pitch equal to the circumference gives √2 × the circle (45° helix)', () => {
    expect(relativeError(helicalWireLength(1, 1, 2 * Math.PI), 2 * Math.PI * Math.SQRT2)).toBeLessThan(1e-15);
  });
});

describe('wireDcResistance', () => {
  test('refs §2.4 worked example: 628.32 m of 0.70 mm copper at 20 °C is 28.149 Ω', () => {
    expect(Math.abs(wireDcResistance(helicalWireLength(1000, 0.1, 0.8e-3), 0.7e-3, 293.15) - 28.149)).toBeLessThan(
      0.0006,
    );
  });
});

/**
 * Peek's corona-onset law and the relative air density, against their published forms.
 */
import { describe, expect, test } from 'vitest';
import { relativeAirDensity, standardAtmospherePressure } from '../../core/breakdown/air-density.ts';
import { breakoutVoltage, peekCylinderOnsetField, peekSphereOnsetField } from '../../core/breakdown/peek.ts';

describe('standardAtmospherePressure (ICAO standard atmosphere, troposphere)', () => {
  // ISA table values, from memory: 1000 m 89 874.6 Pa, 2000 m 79 495.2 Pa, 5000 m 54 019.9 Pa.
  test.each([
    [0, 101325],
    [1000, 89874.6],
    [2000, 79495.2],
    [5000, 54019.9],
  ])('at %f m is %f Pa within 0.01 %', (altitude, pressure) => {
    expect(Math.abs(standardAtmospherePressure(altitude) / pressure - 1)).toBeLessThan(1e-4);
  });
  test('is NaN above the troposphere (11 km)', () => {
    expect(standardAtmospherePressure(12000)).toBeNaN();
  });
});

describe('relativeAirDensity (Peek; Kuffel & Zaengl — refs §6.1)', () => {
  test('is 1 at sea level and 25 °C, Peek’s reference (δ = 3.92 b/(273 + t) with b = 76 cmHg, t = 25: 0.9997)', () => {
    expect(relativeAirDensity(0, 298.15)).toBeCloseTo(1, 12);
    expect(Math.abs((3.92 * 76) / (273 + 25) - relativeAirDensity(0, 298.15))).toBeLessThan(1e-3);
  });
  test('follows Peek’s cmHg form δ = 3.92 b/(273 + t) at 20 °C and at 1500 m, 5 °C to 0.1 %', () => {
    for (const [altitude, celsius] of [
      [0, 20],
      [1500, 5],
    ]) {
      const barometerCmHg = (76 * standardAtmospherePressure(altitude)) / 101325;
      const peek = (3.92 * barometerCmHg) / (273 + celsius);
      expect(Math.abs(relativeAirDensity(altitude, celsius + 273.15) / peek - 1)).toBeLessThan(1e-3);
    }
  });
  test('falls with altitude and with temperature', () => {
    expect(relativeAirDensity(2000, 293.15)).toBeLessThan(relativeAirDensity(0, 293.15));
    expect(relativeAirDensity(0, 313.15)).toBeLessThan(relativeAirDensity(0, 293.15));
  });
});

describe('peekCylinderOnsetField: g = 30 m δ (1 + 0.301/√(δ r)) kV/cm (Peek 1929; Kuffel & Zaengl p. 366)', () => {
  test('r = 10 cm, δ = 1, m = 1 gives 32.86 kV/cm (refs §6.1 [X] worked example)', () => {
    expect(peekCylinderOnsetField(0.1, 1, 1) / 1e5).toBeCloseTo(32.86, 2);
  });
  test('applies δ inside the root and m outside: r = 1 cm, δ = 0.8, m = 0.9 (published form evaluated by hand: 28.869 kV/cm)', () => {
    expect(peekCylinderOnsetField(0.01, 0.8, 0.9) / 1e5).toBeCloseTo(21.6 * (1 + 0.301 / Math.sqrt(0.8)), 9);
    expect(peekCylinderOnsetField(0.01, 0.8, 0.9) / 1e5).toBeCloseTo(28.869, 3);
  });
  test('tends to 30 m δ kV/cm for large radii', () => {
    expect(peekCylinderOnsetField(100, 1, 1) / 3e6).toBeCloseTo(1 + 0.301 / 100, 9); // r = 10⁴ cm
    expect(peekCylinderOnsetField(1e4, 1, 1) / 3e6).toBeCloseTo(1, 3);
  });
  test('is NaN for a non-positive radius', () => {
    expect(peekCylinderOnsetField(0, 1, 1)).toBeNaN();
  });
});

describe('peekSphereOnsetField: g = 27.2 m δ (1 + 0.54/√(δ R)) kV/cm (constants from memory, refs §6.1 [M])', () => {
  test('R = 10 cm, δ = 1: 31.84 kV/cm', () => {
    expect(peekSphereOnsetField(0.1, 1, 1) / 1e5).toBeCloseTo(27.2 * (1 + 0.54 / Math.sqrt(10)), 9);
    expect(peekSphereOnsetField(0.1, 1, 1) / 1e5).toBeCloseTo(31.845, 2);
  });
});

describe('breakoutVoltage = onset field / peak field per volt', () => {
  test('reproduces the refs §6.1 [X] example: r = 0.1 m, R/r = 3 isolated (0.456 V/r) ≈ 720 kV', () => {
    expect(breakoutVoltage(peekCylinderOnsetField(0.1, 1, 1), 0.456 / 0.1) / 1e3).toBeCloseTo(720.5, 0);
  });
});

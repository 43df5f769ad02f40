/**
 * Safety gap: the spacing at which a gap fires at a chosen voltage.
 *
 * Sphere gaps: the disruptive-discharge voltages of IEC 60052 (Table 1: one sphere earthed;
 * alternating, direct of either polarity and full negative standard impulse voltages; peak kV at the
 * standard reference atmosphere 20 °C, 101.3 kPa) [iec60052]. THE TABLE VALUES BELOW ARE TYPED FROM
 * MEMORY of the standard's table ([iec60052] in docs/references.md marks them so): check the spacing against the standard
 * itself before relying on it. Between tabulated spacings the voltage is interpolated linearly in
 * the spacing; between tabulated diameters linearly in the diameter; outside the table, null.
 * The air-density correction of IEC 60052 (with IEC 60060-1): U = δ·U₀ with
 * δ = (p / 101.3 kPa)·(293.15 K / T), the pressure from the standard atmosphere at the altitude
 * (core/breakdown/air-density.ts); the standard's own refinement outside 0.95 < δ < 1.05 is not
 * applied (a note in the docs).
 *
 * Other (rounded-electrode) gaps: about 3 kV per millimetre at standard density (common practice,
 * [gap-practice]), only a rough guide; a sphere gap is the calibrated choice.
 */
import { SEA_LEVEL_PRESSURE, standardAtmospherePressure } from './air-density.ts';

/** One column of the table: sphere diameter (m) and [spacing m, peak breakdown V] points. */
interface SphereColumn {
  diameter: number;
  points: ReadonlyArray<readonly [number, number]>;
}

const cmKv = (rows: ReadonlyArray<readonly [number, number]>) => rows.map(([cm, kv]) => [cm / 100, kv * 1000] as const);

/** IEC 60052 Table 1 points, FROM MEMORY ([gap-practice]): spacing cm → peak kV. */
export const SPHERE_GAP_TABLE: readonly SphereColumn[] = [
  {
    diameter: 0.0625,
    points: cmKv([
      [0.5, 17.2],
      [1.0, 31.9],
      [1.5, 45.5],
      [2.0, 58.5],
      [2.5, 69.5],
      [3.0, 79.5],
    ]),
  },
  {
    diameter: 0.125,
    points: cmKv([
      [0.5, 16.8],
      [1.0, 31.7],
      [1.5, 45.5],
      [2.0, 59.0],
      [2.5, 72.5],
      [3.0, 85.0],
      [4.0, 108],
      [5.0, 129],
      [6.0, 146],
    ]),
  },
  {
    diameter: 0.25,
    points: cmKv([
      [1.0, 31.7],
      [1.5, 45.5],
      [2.0, 59.0],
      [2.5, 72.5],
      [3.0, 86.0],
      [4.0, 112],
      [5.0, 137],
      [6.0, 161],
      [8.0, 203],
      [10.0, 244],
      [12.5, 283],
    ]),
  },
  {
    diameter: 0.5,
    points: cmKv([
      [2.0, 59.0],
      [3.0, 86.0],
      [4.0, 112],
      [5.0, 138],
      [6.0, 164],
      [8.0, 214],
      [10.0, 263],
      [12.5, 320],
      [15.0, 373],
    ]),
  },
];

/** Reference temperature of IEC 60052's table, K (20 °C). */
export const SPHERE_GAP_REFERENCE_TEMPERATURE = 293.15;
/** Rounded-electrode rule: breakdown field, V/m (common practice, [gap-practice]: about 3 kV/mm). */
export const ELECTRODE_GAP_FIELD = 3e6;

/** Relative air density of IEC 60052 / IEC 60060-1, (p/p0)·(293.15 K/T). */
export function sphereGapAirDensity(altitude: number, temperature: number): number {
  if (!(temperature > 0)) return Number.NaN;
  return (standardAtmospherePressure(altitude) / SEA_LEVEL_PRESSURE) * (SPHERE_GAP_REFERENCE_TEMPERATURE / temperature);
}

function columnVoltage(column: SphereColumn, spacing: number): number | null {
  const points = column.points;
  if (!(spacing >= points[0][0]) || !(spacing <= points[points.length - 1][0])) return null;
  for (let i = 1; i < points.length; i++) {
    const [d0, v0] = points[i - 1];
    const [d1, v1] = points[i];
    if (spacing <= d1) return v0 + ((v1 - v0) * (spacing - d0)) / (d1 - d0);
  }
  return null;
}

/**
 * Peak breakdown voltage of a sphere gap at the reference atmosphere, V; null outside the table.
 * @param diameter sphere diameter, m (within the tabulated diameters)
 * @param spacing gap between the spheres, m
 */
export function sphereGapVoltage(diameter: number, spacing: number): number | null {
  const table = SPHERE_GAP_TABLE;
  for (let i = 0; i < table.length; i++) {
    if (Math.abs(diameter - table[i].diameter) <= 1e-9) return columnVoltage(table[i], spacing);
  }
  for (let i = 1; i < table.length; i++) {
    const a = table[i - 1];
    const b = table[i];
    if (diameter > a.diameter && diameter < b.diameter) {
      const va = columnVoltage(a, spacing);
      const vb = columnVoltage(b, spacing);
      if (va === null || vb === null) return null;
      return va + ((vb - va) * (diameter - a.diameter)) / (b.diameter - a.diameter);
    }
  }
  return null;
}

/**
 * Spacing at which a sphere gap fires at `voltage` (peak, in the actual air), m: the inverse of
 * δ·sphereGapVoltage by bisection (the table is increasing in the spacing); null outside the table.
 */
export function sphereGapSpacing(diameter: number, voltage: number, airDensity: number): number | null {
  if (!(voltage > 0) || !(airDensity > 0)) return null;
  const target = voltage / airDensity;
  let low = 0;
  let high = 0;
  for (const column of SPHERE_GAP_TABLE) {
    low = low === 0 ? column.points[0][0] : Math.min(low, column.points[0][0]);
    high = Math.max(high, column.points[column.points.length - 1][0]);
  }
  // find a bracket among where the voltage is defined
  const f = (spacing: number) => sphereGapVoltage(diameter, spacing);
  let lowValue: number | null = null;
  const samples = 400;
  let previous: [number, number] | null = null;
  for (let n = 0; n <= samples; n++) {
    const spacing = low + ((high - low) * n) / samples;
    const value = f(spacing);
    if (value === null) continue;
    if (lowValue === null) lowValue = value;
    if (value >= target) {
      if (previous === null) return value === target ? spacing : null; // below the table
      let a = previous[0];
      let b = spacing;
      for (let iteration = 0; iteration < 80; iteration++) {
        const middle = 0.5 * (a + b);
        const v = f(middle);
        if (v !== null && v < target) a = middle;
        else b = middle;
      }
      return 0.5 * (a + b);
    }
    previous = [spacing, value];
  }
  return null; // beyond the table
}

/** Spacing of a rounded-electrode gap firing at `voltage`, m (common practice, [gap-practice]). */
export function electrodeGapSpacing(voltage: number, airDensity: number): number | null {
  if (!(voltage > 0) || !(airDensity > 0)) return null;
  return voltage / (ELECTRODE_GAP_FIELD * airDensity);
}

/** Default firing multiple of the charge voltage: 1.3, inside the common-practice 1.2–1.5 ([gap-practice]). */
export const DEFAULT_FIRE_AT = 1.3;

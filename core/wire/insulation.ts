/**
 * Overall (insulated) diameter of enamelled round copper wire by IEC 60317-0-1 build grade.
 *
 * IEC 60317-0-1 gives, for each nominal diameter and grade, a minimum increase in diameter due to
 * the enamel and a maximum overall diameter. The figure used here as *the* overall diameter is the
 * midpoint of that window: d + (minimum increase + maximum increase) / 2, where the maximum
 * increase is (maximum overall diameter − d). Both increases are interpolated linearly in the
 * nominal diameter between the rows below; outside the rows they are extrapolated as a power of the
 * diameter fitted to the two end rows (an extrapolation of ours, not a published value).
 *
 * Table rows: a manufacturer's table "basis IS 13730-0-1" (the Indian adoption of IEC 60317-0-1),
 * as reproduced in the project's reference notes; not checked against the IEC original.
 */
import type { InsulationGrade } from '../design.ts';

/** One row of the build table: nominal bare diameter and, per grade, the increase window, m. */
interface BuildRow {
  diameter: number;
  /** [grade1, grade2, grade3] minimum increase in diameter, m. */
  minimumIncrease: readonly [number, number, number];
  /** [grade1, grade2, grade3] maximum overall diameter, m. */
  maximumOverall: readonly [number, number, number];
}

const MM = 1e-3;

function row(diameterMm: number, g1: [number, number], g2: [number, number], g3: [number, number]): BuildRow {
  return {
    diameter: diameterMm * MM,
    minimumIncrease: [g1[0] * MM, g2[0] * MM, g3[0] * MM],
    maximumOverall: [g1[1] * MM, g2[1] * MM, g3[1] * MM],
  };
}

/** IEC 60317-0-1 grades via IS 13730-0-1 (manufacturer's table): min increase / max overall, mm. */
const BUILD_TABLE: readonly BuildRow[] = [
  row(0.315, [0.019, 0.349], [0.035, 0.367], [0.053, 0.384]),
  row(0.508, [0.025, 0.554], [0.047, 0.578], [0.071, 0.601]),
  row(0.711, [0.03, 0.766], [0.056, 0.795], [0.085, 0.822]),
  row(1.016, [0.034, 1.08], [0.065, 1.113], [0.098, 1.144]),
  row(1.626, [0.039, 1.698], [0.073, 1.735], [0.11, 1.77]),
];

/** Bare diameters covered by the build table, m; outside it the build is extrapolated. */
export const INSULATION_TABLE_RANGE = {
  minimum: BUILD_TABLE[0].diameter,
  maximum: BUILD_TABLE[BUILD_TABLE.length - 1].diameter,
} as const;

/** The mean enamel increase of a grade (index 0..2) at a table row, m. */
function meanIncrease(buildRow: BuildRow, gradeIndex: number): number {
  const maximumIncrease = buildRow.maximumOverall[gradeIndex] - buildRow.diameter;
  return (buildRow.minimumIncrease[gradeIndex] + maximumIncrease) / 2;
}

/** Power-law extrapolation of the mean increase from two rows (log–log straight line). */
function extrapolate(a: BuildRow, b: BuildRow, gradeIndex: number, diameter: number): number {
  const increaseA = meanIncrease(a, gradeIndex);
  const increaseB = meanIncrease(b, gradeIndex);
  const exponent = Math.log(increaseB / increaseA) / Math.log(b.diameter / a.diameter);
  return increaseA * (diameter / a.diameter) ** exponent;
}

/**
 * Mean increase in diameter due to the enamel of a grade, m (see the file comment for the figure).
 * @param bareDiameter nominal copper diameter, m, > 0
 * @param grade 'none' (bare wire, 0) or an IEC 60317-0-1 grade
 * @returns the increase, m; NaN for a non-positive diameter
 * Source: IEC 60317-0-1 grades via IS 13730-0-1 (manufacturer's table), interpolated.
 */
export function insulationIncrease(bareDiameter: number, grade: InsulationGrade): number {
  if (!(bareDiameter > 0)) return Number.NaN;
  if (grade === 'none') return 0;
  const gradeIndex = grade === 'grade1' ? 0 : grade === 'grade2' ? 1 : 2;
  const last = BUILD_TABLE.length - 1;
  if (bareDiameter <= BUILD_TABLE[0].diameter)
    return extrapolate(BUILD_TABLE[0], BUILD_TABLE[1], gradeIndex, bareDiameter);
  if (bareDiameter >= BUILD_TABLE[last].diameter) {
    return extrapolate(BUILD_TABLE[last - 1], BUILD_TABLE[last], gradeIndex, bareDiameter);
  }
  let upper = 1;
  while (BUILD_TABLE[upper].diameter < bareDiameter) upper++;
  const lower = BUILD_TABLE[upper - 1];
  const higher = BUILD_TABLE[upper];
  const fraction = (bareDiameter - lower.diameter) / (higher.diameter - lower.diameter);
  return (
    meanIncrease(lower, gradeIndex) + fraction * (meanIncrease(higher, gradeIndex) - meanIncrease(lower, gradeIndex))
  );
}

/**
 * Overall diameter of enamelled wire, m: bare diameter + the grade's mean enamel increase.
 * @param bareDiameter nominal copper diameter, m
 * @param grade insulation build grade ('none' gives the bare diameter)
 * Source: IEC 60317-0-1 grades via IS 13730-0-1 (manufacturer's table), midpoint of the window.
 */
export function insulatedDiameter(bareDiameter: number, grade: InsulationGrade): number {
  return bareDiameter + insulationIncrease(bareDiameter, grade);
}

/**
 * Part of the breakout point (topload-parts.ts): a point at the top of a toroid with a centre disc
 * stands on the disc's centre, on the axis, and is solved as a body of the design's own field solve
 * (bodies.ts `attachmentPanels`: the rod's cylinder and hemispherical cap joined to the disc at the
 * topload's potential, with the winding, the grounded rings and the floor as in the design's
 * solve, and the winding's voltage shape of the design's solve). Its tip field per volt is the
 * apex density of that solve (σ/ε0, breakout-rod.ts `apexField`), so no enhancement model enters:
 * the checks are the exact hemisphere-on-plane factor 3 for l = a on the flat disc ([jackson1999]),
 * the sphere-and-rod model of breakout-rod.ts for the same machinery on a sphere, and the
 * convergence with panel count (test/reference/center-disc.test.ts).
 *
 * The base field (`breakout_point_base_field_per_volt`) is the field just above the disc's centre
 * in the design's solve without the rod (point-field.ts at 10⁻⁴ of the disc radius above it), and
 * the enhancement reported is the solved tip field over it. The topload's own metrics
 * (capacitance, peak field, breakout voltage) stay those of the bare topload with its disc.
 */
import type { EvalContext } from '../context.ts';
import type { BreakoutPointSpec } from '../design.ts';
import { sizePointLength } from '../breakdown/breakout-point.ts';
import { centerDiscRadius, type ToroidBody } from '../electrostatics/bodies.ts';
import { apexField, MAX_ROD_ASPECT } from '../electrostatics/breakout-rod.ts';
import { type FieldArrangement, solveField, type SurfaceFields } from '../electrostatics/field-solve.ts';
import { fieldAtPoint } from '../electrostatics/point-field.ts';
import { formatQuantity } from '../outcome/warnings.ts';

/** Height above the disc's centre, as a share of its radius, at which the base field is read. */
const BASE_FIELD_OFFSET = 1e-4;
/** Convergence of the length sizing: |ln V − ln target| below this. */
const SIZING_TOLERANCE = 1e-5;
const SIZING_ITERATIONS = 40;

/** What the solve of a point on the centre disc gives. */
export interface AxisPoint {
  length: number;
  /** Field just above the bare disc's centre per volt at the top, 1/m. */
  baseFieldPerVolt: number;
  /** Solved apex field per volt at the top, 1/m. */
  tipFieldPerVolt: number;
  /** Top voltage at which the tip reaches onset, V. */
  firingVoltage: number;
}

function mm(metres: number): string {
  return `${Number((metres * 1000).toFixed(1))} mm`;
}

/** Whether the point of a design stands on a toroid's centre disc (on the axis). */
export function standsOnCenterDisc(arrangement: FieldArrangement, point: BreakoutPointSpec): boolean {
  const topload = arrangement.topload;
  return point.position === 'top' && topload?.shape === 'toroid' && topload.centerDisc === true;
}

/** The apex field per volt of a rod of `length` on the disc, solved with the whole arrangement; NaN when singular. */
function tipFieldPerVolt(
  arrangement: FieldArrangement,
  topload: ToroidBody,
  context: EvalContext,
  length: number,
  tipRadius: number,
): number {
  const withRod: FieldArrangement = {
    ...arrangement,
    topload: { ...topload, axisRod: { height: length, tipRadius } },
  };
  const winding = arrangement.winding;
  // The design's solve used the distributed model's voltage shape when it computed one.
  if (winding && context.resonator) withRod.winding = { ...winding, profile: context.resonator.shape };
  const solution = solveField(withRod);
  if (!solution) return Number.NaN;
  return apexField(solution.layout, solution.density, solution.layout.count - 1);
}

/**
 * The point on the centre disc: its length (given, or sized for the target voltage by regula falsi
 * with the Illinois step on ln V over ln l, starting from the flat-plane model's length), base
 * and tip fields and firing voltage; null with a problem pushed when it cannot be built or sized.
 */
export function axisPoint(
  context: EvalContext,
  arrangement: FieldArrangement,
  surface: SurfaceFields,
  point: BreakoutPointSpec,
  onset: number,
  target: { field: string; voltage: number } | null,
): AxisPoint | null {
  const { problems } = context;
  const topload = arrangement.topload;
  if (topload?.shape !== 'toroid') return null;
  const tipRadius = point.tipRadius;
  const discRadius = centerDiscRadius(topload);
  if (!(tipRadius < 0.5 * discRadius)) {
    problems.push({
      field: 'breakout_point.tip_radius',
      reason: `the tip radius (${mm(tipRadius)}) is not below half the centre disc's radius (${mm(discRadius)})`,
    });
    return null;
  }
  const base = fieldAtPoint(
    surface.layout,
    surface.density,
    arrangement.floor,
    0,
    topload.centerZ + BASE_FIELD_OFFSET * discRadius,
  ).axial;
  if (!(base > 0)) {
    problems.push({
      field: 'breakout_point.position',
      reason: 'no surface field on the centre disc where the point stands',
    });
    return null;
  }
  const tipAt = (length: number) => tipFieldPerVolt(arrangement, topload, context, length, tipRadius);
  if (point.length !== undefined) {
    const length = point.length;
    if (!(length >= tipRadius) || !(length <= MAX_ROD_ASPECT * tipRadius)) {
      problems.push({
        field: 'breakout_point.length',
        reason: `the rod (${mm(length)}) must be at least its tip radius (${mm(tipRadius)}) and at most ${MAX_ROD_ASPECT} tip radii long`,
      });
      return null;
    }
    const tip = tipAt(length);
    return tip > 0
      ? { length, baseFieldPerVolt: base, tipFieldPerVolt: tip, firingVoltage: onset / tip }
      : singular(context);
  }
  if (!target) return null;
  return sizeOnDisc(context, target, tipRadius, base, onset, tipAt);
}

function singular(context: EvalContext): null {
  context.problems.push({
    field: 'breakout_point',
    reason: 'the field solve with the rod on the centre disc found no solution (singular system)',
  });
  return null;
}

/**
 * Sizes the rod on the disc for the target voltage: the secant method on ln V over ln l (nearly
 * straight), from the flat-plane model's length and a second point 5 % longer, each step kept inside
 * [a, MAX_ROD_ASPECT·a]; a step that reaches an end evaluates that end, and a target beyond what the
 * end can do is a problem naming the field. Usually three or four solves.
 */
function sizeOnDisc(
  context: EvalContext,
  target: { field: string; voltage: number },
  tipRadius: number,
  base: number,
  onset: number,
  tipAt: (length: number) => number,
): AxisPoint | null {
  const low = Math.log(tipRadius);
  const high = Math.log(tipRadius * MAX_ROD_ASPECT);
  const lengthOf = (u: number) => Math.min(tipRadius * MAX_ROD_ASPECT, Math.max(tipRadius, Math.exp(u)));
  const goal = Math.log(target.voltage);
  let tip = Number.NaN;
  const residual = (u: number) => {
    tip = tipAt(lengthOf(u));
    return Math.log(onset / tip) - goal;
  };
  const model = sizePointLength(target.voltage, tipRadius, base, onset);
  const clamp = (u: number) => Math.min(high, Math.max(low, u));
  let u0 = clamp(model.ok ? Math.log(model.length) : 0.5 * (low + high));
  let f0 = residual(u0);
  let u1 = clamp(u0 + (f0 > 0 ? 0.05 : -0.05));
  let f1 = Math.abs(f0) < SIZING_TOLERANCE ? f0 : residual(u1);
  if (Math.abs(f0) < SIZING_TOLERANCE) u1 = u0;
  for (let iteration = 0; iteration < SIZING_ITERATIONS && Math.abs(f1) >= SIZING_TOLERANCE; iteration++) {
    if (!Number.isFinite(f1)) return singular(context);
    // At an end that cannot reach the target: no rod in the model's range fires there.
    if ((u1 === low && f1 < 0) || (u1 === high && f1 > 0))
      return outOfReach(context, target, tipRadius, onset / tip, u1 === low);
    const slope = (f1 - f0) / (u1 - u0);
    const next = clamp(Number.isFinite(slope) && slope < 0 ? u1 - f1 / slope : u1 + (f1 > 0 ? 0.5 : -0.5));
    u0 = u1;
    f0 = f1;
    u1 = next;
    f1 = residual(u1);
  }
  if (!Number.isFinite(f1) || !(Math.abs(f1) < SIZING_TOLERANCE)) return singular(context);
  return { length: lengthOf(u1), baseFieldPerVolt: base, tipFieldPerVolt: tip, firingVoltage: onset / tip };
}

/** The problem of a firing target no rod of 1 to MAX_ROD_ASPECT tip radii reaches. */
function outOfReach(
  context: EvalContext,
  target: { field: string; voltage: number },
  tipRadius: number,
  limitVoltage: number,
  shortest: boolean,
): null {
  context.problems.push({
    field: target.field,
    reason: shortest
      ? `no rod on the centre disc fires as late as ${formatQuantity(target.voltage, 'V')}: even a bare hemisphere of ${mm(tipRadius)} radius fires at ${formatQuantity(limitVoltage, 'V')} (a smaller tip radius raises its onset field)`
      : `no rod on the centre disc fires as early as ${formatQuantity(target.voltage, 'V')}: even one ${MAX_ROD_ASPECT} tip radii long fires at ${formatQuantity(limitVoltage, 'V')} (a larger tip radius allows a longer rod)`,
  });
  return null;
}

/**
 * A design evaluated together with its solved electrostatic field, for pictures: the evaluation,
 * the stages' geometry (winding, primary rings and tap) and one field solve of the arrangement with
 * the winding at its voltage profile (the distributed model's fundamental when computed, else the
 * assumed shape), per volt at the top. The potential at any point follows from the solved density
 * (electrostatics/field-potential.ts). In a three-coil system the secondary is solved without the
 * topload, as in the evaluation (stages/electrostatics-stage.ts), and the resonator with the topload,
 * its breakout point and supports is solved on its own axis (stages/resonator-stage.ts).
 */
import type { EvalContext, PrimaryGeometry, SecondaryGeometry } from './context.ts';
import type { Design } from './design.ts';
import { arrangementFromDesign } from './electrostatics/arrangement.ts';
import { type FieldArrangement, type FieldSolution, solveField } from './electrostatics/field-solve.ts';
import { type Evaluation, evaluateDesignInDetail } from './evaluate.ts';
import { type SupportMember, supportMember } from './electrostatics/supports.ts';
import type { DistributedWinding } from './resonator/design-resonator.ts';

export interface DesignField {
  evaluation: Evaluation;
  secondary: SecondaryGeometry | null;
  primary: PrimaryGeometry | null;
  /** The arrangement of the field solve, with the winding's profile as solved; null for an impossible design. */
  arrangement: FieldArrangement | null;
  /** The field solved for 1 V at the top (on the topload alone: 1 V on it); null when impossible. */
  field: FieldSolution | null;
  /** The voltage along the winding per volt at the top, as a function of the fraction of its length. */
  profile: ((fraction: number) => number) | null;
  /** The insulating support as a straight member (r, z at both ends), when the design has one. */
  support: SupportMember | null;
  /** A three-coil system's resonator, on its own axis: its winding, field and support as above; null without one. */
  resonator: ResonatorField | null;
}

/** The resonator of a three-coil system as drawn: its axis sits `axisSpacing` from the secondary's. */
export interface ResonatorField {
  axisSpacing: number;
  winding: SecondaryGeometry;
  arrangement: FieldArrangement;
  field: FieldSolution | null;
  profile: ((fraction: number) => number) | null;
  support: SupportMember | null;
}

/** The arrangement with the winding at its voltage profile (the distributed model's when computed). */
function profiled(
  arrangement: FieldArrangement,
  distributed: DistributedWinding | undefined,
): ((fraction: number) => number) | null {
  if (!arrangement.winding) return null;
  const assumed = arrangement.winding.profile;
  const profile = distributed
    ? distributed.shape
    : assumed === 'quarter_wave'
      ? (x: number) => Math.sin((Math.PI / 2) * x)
      : (x: number) => x;
  arrangement.winding = { ...arrangement.winding, profile };
  return profile;
}

/** The resonator's own solve: its winding under the topload, with the design's support. */
function resonatorField(design: Design, context: EvalContext): ResonatorField | null {
  const parts = context.threeCoil;
  const spec = design.resonator;
  if (!parts || !spec) return null;
  const alone: Design = { secondary: spec.winding, environment: design.environment };
  if (design.topload) alone.topload = design.topload;
  const arrangement = arrangementFromDesign(alone, parts.winding, []);
  if (!arrangement) return null;
  const profile = profiled(arrangement, parts.distributed);
  const support =
    design.support && arrangement.topload
      ? supportMember(design.support, arrangement.topload, parts.winding, [])
      : null;
  return {
    axisSpacing: parts.axisSpacing,
    winding: parts.winding,
    arrangement,
    field: solveField(arrangement),
    profile,
    support,
  };
}

/** Evaluates `design` and solves its field once more with the winding at its profile. */
export function designField(design: Design): DesignField {
  const { evaluation, context } = evaluateDesignInDetail(design);
  const secondary = context.secondary ?? null;
  const primary = context.primary ?? null;
  if (evaluation.problems.length > 0) {
    return {
      evaluation,
      secondary,
      primary,
      arrangement: null,
      field: null,
      profile: null,
      support: null,
      resonator: null,
    };
  }
  const problems: EvalContext['problems'] = [];
  const threeCoil = design.resonator !== undefined && context.threeCoil !== undefined;
  // three coils: the secondary alone here, the topload on the resonator
  const driverDesign = threeCoil ? { ...design, topload: undefined } : design;
  const arrangement = arrangementFromDesign(driverDesign, context.secondary, problems);
  if (!arrangement)
    return {
      evaluation,
      secondary,
      primary,
      arrangement: null,
      field: null,
      profile: null,
      support: null,
      resonator: null,
    };
  const profile = profiled(arrangement, context.resonator);
  const support =
    !threeCoil && design.support && arrangement.topload
      ? supportMember(design.support, arrangement.topload, context.secondary, [])
      : null;
  return {
    evaluation,
    secondary,
    primary,
    arrangement,
    field: solveField(arrangement),
    profile,
    support,
    resonator: threeCoil ? resonatorField(design, context) : null,
  };
}

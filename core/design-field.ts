/**
 * A design evaluated together with its solved electrostatic field, for pictures: the evaluation,
 * the stages' geometry (winding, primary rings and tap) and one field solve of the arrangement with
 * the winding at its voltage profile (the distributed model's fundamental when computed, else the
 * assumed shape), per volt at the top. The potential at any point follows from the solved density
 * (electrostatics/field-potential.ts).
 */
import type { EvalContext, PrimaryGeometry, SecondaryGeometry } from './context.ts';
import type { Design } from './design.ts';
import { arrangementFromDesign } from './electrostatics/arrangement.ts';
import { type FieldArrangement, type FieldSolution, solveField } from './electrostatics/field-solve.ts';
import { type Evaluation, evaluateDesignInDetail } from './evaluate.ts';
import { type SupportMember, supportMember } from './electrostatics/supports.ts';

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
}

/** Evaluates `design` and solves its field once more with the winding at its profile. */
export function designField(design: Design): DesignField {
  const { evaluation, context } = evaluateDesignInDetail(design);
  const secondary = context.secondary ?? null;
  const primary = context.primary ?? null;
  if (evaluation.problems.length > 0) {
    return { evaluation, secondary, primary, arrangement: null, field: null, profile: null, support: null };
  }
  const problems: EvalContext['problems'] = [];
  const arrangement = arrangementFromDesign(design, context.secondary, problems);
  if (!arrangement)
    return { evaluation, secondary, primary, arrangement: null, field: null, profile: null, support: null };
  let profile: ((fraction: number) => number) | null = null;
  if (arrangement.winding) {
    const resonator = context.resonator;
    const assumed = arrangement.winding.profile;
    profile = resonator
      ? resonator.shape
      : assumed === 'quarter_wave'
        ? (x: number) => Math.sin((Math.PI / 2) * x)
        : (x: number) => x;
    arrangement.winding = { ...arrangement.winding, profile };
  }
  const support =
    design.support && arrangement.topload
      ? supportMember(design.support, arrangement.topload, context.secondary, [])
      : null;
  return { evaluation, secondary, primary, arrangement, field: solveField(arrangement), profile, support };
}

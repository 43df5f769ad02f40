/**
 * Insulating supports of the topload and the topload's quiet side: the geometry of a support as a
 * straight member in the meridian plane, the reasons it cannot be built, the field along it from
 * the solved charges (point-field.ts), and the band of the topload's surface with the lowest field.
 *
 * The support's own permittivity is ignored (it would raise the field in the air beside it by a
 * factor of order ε_r near contacts): the field reported is that of the solved conductors alone.
 * The limit a support is held against is common practice (SUPPORT_FIELD_LIMIT).
 */
import type { DesignProblem, SecondaryGeometry } from '../context.ts';
import type { SupportSpec } from '../design.ts';
import type { ToploadBody } from './bodies.ts';
import { PANEL_ARC, type PanelLayout } from './panels.ts';
import { fieldAtPoint } from './point-field.ts';
import { VACUUM_PERMITTIVITY } from './ring-kernel.ts';

/**
 * Surface field along an insulator in air that builders keep below, V/m: 1 MV/m (10 kV/cm), about a
 * third of the uniform-field strength of air (common practice, from memory; surface flashover along
 * an insulator comes well below the breakdown of the same gap in air alone).
 */
export const SUPPORT_FIELD_LIMIT = 1e6;

/** Points sampled along a support. */
export const SUPPORT_SAMPLES = 40;

/** A support as a straight line in the meridian plane along which the field is sampled, SI. */
export interface SupportMember {
  r0: number;
  z0: number;
  r1: number;
  z1: number;
}

/** A length as a one-line message number, mm. */
function mm(metres: number): string {
  return `${Number((metres * 1000).toFixed(1))} mm`;
}

/** Signed distance from (r, z) to the topload's surface (negative inside), m. */
export function toploadSignedDistance(r: number, z: number, body: ToploadBody): number {
  if (body.shape === 'toroid') return Math.hypot(r - body.majorRadius, z - body.centerZ) - body.minorRadius;
  if (body.shape === 'sphere') return Math.hypot(r, z - body.centerZ) - body.radius;
  return Math.hypot(Math.max(0, r - body.radius), z - body.centerZ);
}

/**
 * The support as a member, or null with the problem that makes it impossible: a column wider than
 * the coil form (through the winding), a column from the winding top without room above it, a rod
 * through the floor, across the winding's sheet or through the topload.
 */
export function supportMember(
  support: SupportSpec,
  topload: ToploadBody,
  secondary: SecondaryGeometry | undefined,
  problems: DesignProblem[],
): SupportMember | null {
  if (!(support.diameter > 0)) {
    problems.push({ field: 'supports.diameter', reason: `the diameter (${mm(support.diameter)}) must be positive` });
    return null;
  }
  if (support.kind === 'column') return columnMember(support, topload, secondary, problems);
  return rodMember(support, topload, secondary, problems);
}

/** A central column from the floor or the winding top up to the topload (see `supportMember`). */
function columnMember(
  support: Extract<SupportSpec, { kind: 'column' }>,
  topload: ToploadBody,
  secondary: SecondaryGeometry | undefined,
  problems: DesignProblem[],
): SupportMember | null {
  const rho = support.diameter / 2;
  if (secondary) {
    const formRadius = secondary.radius - secondary.overallDiameter / 2;
    if (!(rho < formRadius)) {
      problems.push({
        field: 'supports.diameter',
        reason: `the column (diameter ${mm(support.diameter)}) is not narrower than the coil form (diameter ${mm(2 * formRadius)}): it passes through the winding`,
      });
      return null;
    }
  }
  const bottom = support.from === 'floor' ? 0 : (secondary?.topZ ?? 0);
  let top: number;
  if (topload.shape === 'sphere') {
    if (!(rho < topload.radius)) {
      problems.push({
        field: 'supports.diameter',
        reason: `the column (diameter ${mm(support.diameter)}) is wider than the sphere`,
      });
      return null;
    }
    top = topload.centerZ - Math.sqrt(topload.radius ** 2 - rho ** 2);
  } else if (topload.shape === 'toroid' && Math.abs(rho - topload.majorRadius) < topload.minorRadius) {
    top = topload.centerZ - Math.sqrt(topload.minorRadius ** 2 - (rho - topload.majorRadius) ** 2);
  } else top = topload.centerZ;
  if (!(top > bottom)) {
    problems.push({
      field: 'supports.from',
      reason: `the topload comes down to ${mm(top)} on the column's line, not above its foot at ${mm(bottom)}`,
    });
    return null;
  }
  return { r0: rho, z0: bottom, r1: rho, z1: top };
}

/** A rod between two given points in a meridian plane (see `supportMember`). */
function rodMember(
  support: Extract<SupportSpec, { kind: 'rods' }>,
  topload: ToploadBody,
  secondary: SecondaryGeometry | undefined,
  problems: DesignProblem[],
): SupportMember | null {
  if (!(support.count >= 1) || !Number.isInteger(support.count)) {
    problems.push({ field: 'supports.count', reason: `${support.count} is not a whole number of rods` });
    return null;
  }
  const member: SupportMember = {
    r0: support.fromRadius,
    z0: support.fromHeight,
    r1: support.toRadius,
    z1: support.toHeight,
  };
  for (const [field, z] of [
    ['supports.from_height', member.z0],
    ['supports.to_height', member.z1],
  ] as const) {
    if (!(z >= 0)) {
      problems.push({ field, reason: `the rod goes through the floor (its end is at ${mm(z)})` });
      return null;
    }
  }
  if (!(Math.hypot(member.r1 - member.r0, member.z1 - member.z0) > 0)) {
    problems.push({ field: 'supports.to_height', reason: 'the rod has no length (its two ends coincide)' });
    return null;
  }
  if (secondary && member.r0 !== member.r1) {
    const t = (secondary.radius - member.r0) / (member.r1 - member.r0);
    const z = member.z0 + t * (member.z1 - member.z0);
    if (t > 0 && t < 1 && z > secondary.bottomZ && z < secondary.topZ) {
      problems.push({
        field: 'supports.to_radius',
        reason: `the rod crosses the winding (radius ${mm(secondary.radius)}) at ${mm(z)} above the floor`,
      });
      return null;
    }
  }
  if (
    topload.shape === 'toroid' &&
    topload.centerDisc &&
    (member.z0 - topload.centerZ) * (member.z1 - topload.centerZ) < 0
  ) {
    const t = (topload.centerZ - member.z0) / (member.z1 - member.z0);
    if (member.r0 + t * (member.r1 - member.r0) < topload.majorRadius - topload.minorRadius) {
      problems.push({ field: 'supports.to_height', reason: "the rod passes through the toroid's centre disc" });
      return null;
    }
  }
  // Ends may sit on (or in) the topload; the stretch between them may not pass through it.
  const inside: boolean[] = [];
  for (let k = 0; k <= SUPPORT_SAMPLES; k++) {
    const [r, z] = pointOn(member, k / SUPPORT_SAMPLES);
    inside.push(toploadSignedDistance(r, z, topload) < 0);
  }
  const firstOutside = inside.indexOf(false);
  const lastOutside = inside.lastIndexOf(false);
  if (firstOutside < 0) {
    problems.push({ field: 'supports.to_height', reason: 'the rod lies inside the topload' });
    return null;
  }
  if (inside.slice(firstOutside, lastOutside + 1).includes(true)) {
    problems.push({ field: 'supports.to_height', reason: 'the rod passes through the topload' });
    return null;
  }
  return member;
}

function pointOn(member: SupportMember, t: number): [number, number] {
  return [member.r0 + t * (member.r1 - member.r0), member.z0 + t * (member.z1 - member.z0)];
}

/** The largest field along a support per volt at the top and where it sits. */
export interface SupportField {
  /** Largest |E| per volt, 1/m. */
  peakPerVolt: number;
  /** Where, as the fraction of the member's length from its first end (a column: its foot). */
  position: number;
}

/**
 * |E| per volt at SUPPORT_SAMPLES points along the member (at the centres of equal pieces; points
 * inside the topload, where an end is embedded, are skipped), from the solved density.
 */
export function supportField(
  member: SupportMember,
  topload: ToploadBody,
  layout: PanelLayout,
  density: ArrayLike<number>,
  floor: boolean,
): SupportField | null {
  let best: SupportField | null = null;
  for (let k = 0; k < SUPPORT_SAMPLES; k++) {
    const t = (k + 0.5) / SUPPORT_SAMPLES;
    const [r, z] = pointOn(member, t);
    if (!(toploadSignedDistance(r, z, topload) > 0)) continue;
    const field = fieldAtPoint(layout, density, floor, r, z);
    const magnitude = Math.hypot(field.radial, field.axial);
    if (!Number.isFinite(magnitude)) continue;
    if (best === null || magnitude > best.peakPerVolt) best = { peakPerVolt: magnitude, position: t };
  }
  return best;
}

/** Share of the topload's meridian over which the quietest band is averaged. */
export const LOW_FIELD_BAND = 1 / 12;

/**
 * The band of the topload's surface (LOW_FIELD_BAND of its meridian length, a contiguous run of
 * panels, wrapping round a toroid's tube) with the lowest mean surface field per volt (σ/ε0,
 * weighted by panel length): its centre angle (as topload_peak_field_angle: around the tube or the
 * elevation, 0 at the outer equator) and that mean, 1/m.
 */
export function lowFieldBand(
  topload: ToploadBody,
  layout: PanelLayout,
  density: ArrayLike<number>,
  first: number,
  count: number,
): { angle: number; fieldPerVolt: number } | null {
  if (topload.shape === 'disc' || count < 3) return null;
  let total = 0;
  for (let k = 0; k < count; k++) total += layout.length[first + k];
  const width = LOW_FIELD_BAND * total;
  const wraps = topload.shape === 'toroid';
  let best: { angle: number; fieldPerVolt: number } | null = null;
  for (let start = 0; start < count; start++) {
    let length = 0;
    let weighted = 0;
    let angleSum = 0;
    let k = start;
    let steps = 0;
    while (length < width && steps < count) {
      if (k >= count) {
        if (!wraps) break;
        k -= count;
      }
      const j = first + k;
      const piece = layout.length[j];
      length += piece;
      weighted += (piece * Math.abs(density[j])) / VACUUM_PERMITTIVITY;
      angleSum += piece * unwrappedAngle(layout, j, first + start);
      k++;
      steps++;
    }
    if (length < width) continue;
    const mean = weighted / length;
    if (best === null || mean < best.fieldPerVolt) {
      let angle = angleSum / length;
      if (angle > Math.PI) angle -= 2 * Math.PI;
      best = { angle, fieldPerVolt: mean };
    }
  }
  return best;
}

/** Mid-angle of arc panel j, made continuous with panel `reference` (adds 2π past the wrap). */
function unwrappedAngle(layout: PanelLayout, j: number, reference: number): number {
  if (layout.kind[j] !== PANEL_ARC) return 0;
  const mid = (i: number) => 0.5 * (layout.geometry[5 * i + 3] + layout.geometry[5 * i + 4]);
  const angle = mid(j);
  return angle < mid(reference) ? angle + 2 * Math.PI : angle;
}

/**
 * The topload's surface field per volt at a given angle (as topload_peak_field_angle), 1/m: linear
 * between the panels' mid-angles; beyond the last panel of a sphere (its poles) the field is even
 * about the pole, fitted as c0 + c2·(angle − pole)² through the two nearest panels.
 */
export function toploadFieldAtAngle(
  topload: ToploadBody,
  layout: PanelLayout,
  density: ArrayLike<number>,
  first: number,
  count: number,
  angle: number,
): number | null {
  if (topload.shape === 'disc' || count < 2) return null;
  const mid = (k: number) => 0.5 * (layout.geometry[5 * (first + k) + 3] + layout.geometry[5 * (first + k) + 4]);
  const field = (k: number) => Math.abs(density[first + k]) / VACUUM_PERMITTIVITY;
  for (let k = 0; k < count - 1; k++) {
    const a0 = mid(k);
    const a1 = mid(k + 1);
    if (a0 <= angle && angle <= a1) {
      const w = (angle - a0) / (a1 - a0);
      return (1 - w) * field(k) + w * field(k + 1);
    }
  }
  if (topload.shape === 'toroid') {
    // Between the last panel and the first (across ±π).
    const a0 = mid(count - 1);
    const a1 = mid(0) + 2 * Math.PI;
    const x = angle < a0 ? angle + 2 * Math.PI : angle;
    const w = (x - a0) / (a1 - a0);
    return (1 - w) * field(count - 1) + w * field(0);
  }
  const north = angle > mid(count - 1);
  const pole = north ? Math.PI / 2 : -Math.PI / 2;
  const k0 = north ? count - 1 : 0;
  const k1 = north ? count - 2 : 1;
  const d0 = mid(k0) - pole;
  const d1 = mid(k1) - pole;
  const c2 = (field(k1) - field(k0)) / (d1 * d1 - d0 * d0);
  const d = angle - pole;
  return field(k0) + c2 * (d * d - d0 * d0);
}

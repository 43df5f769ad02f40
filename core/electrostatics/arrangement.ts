/**
 * The field-solve arrangement of a design: where the topload, the winding, the grounded rings and
 * the floor are, and the reasons a geometry cannot be built (conventions, as the README's design-file
 * reference states them: the floor is
 * z = 0; a toroid's mid-plane sits `height_above_winding` above the top of the winding, or
 * `center_height` above the floor for a topload alone; major radius R = (outer − tube)/2, minor
 * radius r = tube/2; a sphere's centre sits at the same heights).
 */
import type { DesignProblem, SecondaryGeometry } from '../context.ts';
import type { Design, ToploadSpec } from '../design.ts';
import { MAX_PRIMARY_TURNS, primaryRings } from '../primary/rings.ts';
import type { GroundedRing, SphereBody, ToploadBody, ToroidBody } from './bodies.ts';
import type { FieldArrangement } from './field-solve.ts';

/** A length as a one-line message number, mm. */
function mm(metres: number): string {
  return `${Number((metres * 1000).toFixed(1))} mm`;
}

/** Distance from (r, z) to the vertical segment r = radius, bottom ≤ z ≤ top, m. */
function distanceToWinding(r: number, z: number, secondary: SecondaryGeometry): number {
  const nearestZ = Math.min(Math.max(z, secondary.bottomZ), secondary.topZ);
  return Math.hypot(r - secondary.radius, z - nearestZ);
}

/** Distance from (r, z) to the surface of a topload body, m (≥ 0). */
function distanceToTopload(r: number, z: number, body: ToploadBody): number {
  if (body.shape === 'toroid') return Math.abs(Math.hypot(r - body.majorRadius, z - body.centerZ) - body.minorRadius);
  if (body.shape === 'sphere') return Math.abs(Math.hypot(r, z - body.centerZ) - body.radius);
  return Math.hypot(Math.max(0, r - body.radius), z - body.centerZ);
}

/** The toroid or sphere at its centre height, or null with the problem of its own dimensions. */
function shapedBody(topload: ToploadSpec, centerZ: number, problems: DesignProblem[]): ToroidBody | SphereBody | null {
  if (topload.shape === 'toroid') {
    if (!(topload.tubeDiameter > 0)) {
      problems.push({
        field: 'topload.tube_diameter',
        reason: `the tube diameter (${mm(topload.tubeDiameter)}) must be positive`,
      });
      return null;
    }
    if (!(topload.tubeDiameter < topload.outerDiameter)) {
      problems.push({
        field: 'topload.tube_diameter',
        reason: `the tube diameter (${mm(topload.tubeDiameter)}) is not smaller than the outer diameter (${mm(topload.outerDiameter)})`,
      });
      return null;
    }
    const body: ToroidBody = {
      shape: 'toroid',
      majorRadius: (topload.outerDiameter - topload.tubeDiameter) / 2,
      minorRadius: topload.tubeDiameter / 2,
      centerZ,
    };
    if (topload.centerDisc) body.centerDisc = true;
    return body;
  }
  if (!(topload.diameter > 0)) {
    problems.push({
      field: 'topload.diameter',
      reason: `the sphere diameter (${mm(topload.diameter)}) must be positive`,
    });
    return null;
  }
  return { shape: 'sphere', radius: topload.diameter / 2, centerZ };
}

/** Why the topload cuts into the winding below it, or null when it clears the winding. */
function windingClash(body: ToroidBody | SphereBody, lowest: number, secondary: SecondaryGeometry): string | null {
  if (body.shape === 'toroid') {
    if (distanceToWinding(body.majorRadius, body.centerZ, secondary) - body.minorRadius > 0) return null;
    return `the tube's inner edge (radius ${mm(body.majorRadius - body.minorRadius)}) reaches below the top of the winding (radius ${mm(secondary.radius)}) by ${mm(secondary.topZ - lowest)}`;
  }
  if (distanceToWinding(0, body.centerZ, secondary) - body.radius > 0) return null;
  return `the sphere (radius ${mm(body.radius)}) encloses part of the winding (radius ${mm(secondary.radius)})`;
}

/**
 * The topload as a field body, or the problems that make it impossible.
 * @param topload the topload spec, SI
 * @param secondary the winding's geometry, when there is one
 */
export function toploadBody(
  topload: ToploadSpec,
  secondary: SecondaryGeometry | undefined,
  problems: DesignProblem[],
): ToploadBody | null {
  const heightField = secondary ? 'topload.height_above_winding' : 'topload.center_height';
  const height = secondary ? topload.heightAboveWinding : topload.centerHeight;
  if (height === undefined || !Number.isFinite(height)) {
    problems.push({
      field: heightField,
      reason: secondary
        ? 'a topload on a secondary needs its height above the top of the winding'
        : 'a topload without a secondary needs its centre height above the floor',
    });
    return null;
  }
  const body = shapedBody(topload, (secondary ? secondary.topZ : 0) + height, problems);
  if (!body) return null;
  const lowest = body.centerZ - (body.shape === 'toroid' ? body.minorRadius : body.radius);
  const name = body.shape;
  if (!(lowest > 0)) {
    problems.push({
      field: heightField,
      reason: `the ${name} reaches the floor (its lowest point is at ${mm(lowest)})`,
    });
    return null;
  }
  const clash = secondary ? windingClash(body, lowest, secondary) : null;
  if (clash) {
    problems.push({ field: 'topload.height_above_winding', reason: `the ${name} intersects the winding: ${clash}` });
    return null;
  }
  return body;
}

/** Grounded rings: primary turns and strike rail, checked against floor, winding and topload. */
function groundedRings(
  design: Design,
  secondary: SecondaryGeometry,
  topload: ToploadBody | null,
  problems: DesignProblem[],
): GroundedRing[] {
  const rings: Array<GroundedRing & { field: string; what: string }> = [];
  if (design.primary && design.primary.turns > MAX_PRIMARY_TURNS) {
    problems.push({
      field: 'primary.turns',
      reason: `${Number(design.primary.turns.toPrecision(4))} turns is beyond the ${MAX_PRIMARY_TURNS} rings this model handles`,
    });
    return [];
  }
  if (design.primary) {
    const wireRadius = design.primary.conductorDiameter / 2;
    for (const ring of primaryRings(design.primary, secondary.bottomZ)) {
      rings.push({ r: ring.r, z: ring.z, wireRadius, field: 'primary.elevation', what: 'a primary ring' });
    }
  }
  if (design.strikeRail) {
    const rail = design.strikeRail;
    rings.push({
      r: rail.diameter / 2,
      z: secondary.bottomZ + rail.elevation,
      wireRadius: rail.conductorDiameter / 2,
      field: 'strike_rail.elevation',
      what: 'the strike rail',
    });
  }
  const accepted: GroundedRing[] = [];
  const reported = new Set<string>();
  const report = (field: string, reason: string) => {
    // One problem per field: the first ring that fails says why.
    if (!reported.has(field)) problems.push({ field, reason });
    reported.add(field);
  };
  for (const ring of rings) {
    if (!(ring.r > ring.wireRadius) || !(ring.wireRadius > 0)) {
      report(
        ring.field.replace('elevation', 'conductor_diameter'),
        `${ring.what} (radius ${mm(ring.r)}) is not a ring with a conductor of ${mm(2 * ring.wireRadius)}`,
      );
      continue;
    }
    if (!(ring.z - ring.wireRadius > 0)) {
      report(ring.field, `${ring.what} reaches the floor (its centre is at ${mm(ring.z)})`);
      continue;
    }
    if (!(distanceToWinding(ring.r, ring.z, secondary) > ring.wireRadius)) {
      report(ring.field, `${ring.what} (radius ${mm(ring.r)}) touches the winding (radius ${mm(secondary.radius)})`);
      continue;
    }
    if (topload && !(distanceToTopload(ring.r, ring.z, topload) > ring.wireRadius)) {
      report(ring.field, `${ring.what} (radius ${mm(ring.r)}, at ${mm(ring.z)}) touches the topload`);
      continue;
    }
    accepted.push({ r: ring.r, z: ring.z, wireRadius: ring.wireRadius });
  }
  return accepted;
}

/**
 * The arrangement of a design for the field solve, with the floor always present; pushes the
 * problems of impossible geometry and returns null then. Without a secondary the grounded rings are
 * left out (their heights are given relative to the winding's base).
 */
export function arrangementFromDesign(
  design: Design,
  secondary: SecondaryGeometry | undefined,
  problems: DesignProblem[],
): FieldArrangement | null {
  const before = problems.length;
  const topload = design.topload ? toploadBody(design.topload, secondary, problems) : null;
  if (problems.length > before) return null;
  const arrangement: FieldArrangement = { floor: true };
  if (topload) arrangement.topload = topload;
  if (secondary) {
    if (!(secondary.topZ > secondary.bottomZ) || !(secondary.radius > 0) || !(secondary.bottomZ >= 0)) {
      problems.push({
        field: 'secondary.base_height',
        reason: `the winding (base ${mm(secondary.bottomZ)}, top ${mm(secondary.topZ)}, radius ${mm(secondary.radius)}) is not a cylinder above the floor`,
      });
      return null;
    }
    arrangement.winding = {
      radius: secondary.radius,
      bottomZ: secondary.bottomZ,
      topZ: secondary.topZ,
      // The computed profile is found from this arrangement (core/resonator/design-resonator.ts); the
      // first solve assumes the linear one, which gives the lumped cross-check.
      profile: design.secondary?.voltageProfile === 'quarter_wave' ? 'quarter_wave' : 'linear',
    };
    arrangement.groundedRings = groundedRings(design, secondary, topload, problems);
    if (problems.length > before) return null;
  }
  return arrangement;
}

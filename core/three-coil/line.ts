/**
 * The connecting line of a three-coil system: a round conductor of radius a at height h above the
 * floor (a ground plane), parallel to it. By the method of images the exact per-length values are
 *   C' = 2π ε0 / arcosh(h/a),   L' = (μ0 / 2π) arcosh(h/a)   (so that L'C' = μ0 ε0),
 * the external inductance of the line (current on the conductor's surface, as at RF) [paul2008]
 * (ch. 4, a wire above a ground plane; section from memory). The line's ends are left out: the
 * per-length values times the length (common practice for a line long against its height).
 */
import { VACUUM_PERMEABILITY } from '../inductance/vacuum.ts';
import { VACUUM_PERMITTIVITY } from '../electrostatics/ring-kernel.ts';

/** arcosh(h/a) for a conductor of radius a at height h > a. */
function depth(height: number, radius: number): number {
  return Math.acosh(height / radius);
}

/** Capacitance of the line to the floor, F (null when the conductor touches the floor). */
export function lineCapacitance(length: number, radius: number, height: number): number | null {
  if (!(height > radius) || !(radius > 0) || !(length >= 0)) return null;
  return (2 * Math.PI * VACUUM_PERMITTIVITY * length) / depth(height, radius);
}

/** Series inductance of the line with its image in the floor, H (null when it touches the floor). */
export function lineInductance(length: number, radius: number, height: number): number | null {
  if (!(height > radius) || !(radius > 0) || !(length >= 0)) return null;
  return (VACUUM_PERMEABILITY / (2 * Math.PI)) * length * depth(height, radius);
}

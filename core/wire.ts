/**
 * Wire: AWG sizes (ASTM B258), enamel build (IEC 60317-0-1 grades), copper (IEC 60028), helical
 * length. One concept per file under core/wire/; this module re-exports them.
 */
export { awgDiameter } from './wire/awg.ts';
export { insulatedDiameter, insulationIncrease, INSULATION_TABLE_RANGE } from './wire/insulation.ts';
export {
  COPPER_DENSITY,
  COPPER_RESISTIVITY_20C,
  COPPER_TEMPERATURE_COEFFICIENT,
  copperMass,
  copperResistivity,
  skinDepth,
  wireDcResistance,
} from './wire/copper.ts';
export { helicalWireLength } from './wire/winding.ts';

/**
 * Streamer loading of the topload: common practice (no authoritative source) adds about 1 pF per
 * foot of streamer, ≈ 3.28 pF/m, to the capacitance at the top (refs §9 [C]; an electrostatic
 * estimate quoted there gives ≈ 0.8 pF/ft up to 30 in).
 */

/** Streamer loading per metre of streamer, F/m: 1 pF per foot (common practice). */
export const STREAMER_CAPACITANCE_PER_METRE = 1e-12 / 0.3048;

/**
 * Capacitance added at the top by a streamer of the given length, F (common practice, 1 pF/ft).
 * @param lengthMetres streamer length, m (≥ 0; negative or NaN gives 0)
 */
export function streamerCapacitance(lengthMetres: number): number {
  if (!(lengthMetres > 0)) return 0;
  return STREAMER_CAPACITANCE_PER_METRE * lengthMetres;
}

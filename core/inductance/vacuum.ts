/**
 * Magnetic constant used throughout the magnetics.
 *
 * μ0 = 4π·10⁻⁷ H/m, the pre-2019 exact value. The 2019 SI value (CODATA 2018,
 * 1.25663706212·10⁻⁶ H/m) differs by 5.5·10⁻¹⁰ relative, far below any inductance tolerance here,
 * and the published check values this project tests against use 4π·10⁻⁷.
 */
export const VACUUM_PERMEABILITY = 4e-7 * Math.PI;

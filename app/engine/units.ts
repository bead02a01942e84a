/**
 * Unit factors, defined once. The engine works in SI (s, rad, rad/s, N·m, N·m·s, kg·m²); the
 * scenario file and the UI use degrees, arcseconds, mN·m and mN·m·s, converted at the edge with
 * these factors. Lint (eslint.config.js) rejects raw degree/radian conversion literals elsewhere.
 */

/** Radians per degree: multiply degrees by this. */
export const RAD_PER_DEG = Math.PI / 180;
/** Degrees per radian: multiply radians by this. */
export const DEG_PER_RAD = 180 / Math.PI;
/** Radians per arcsecond. */
export const RAD_PER_ARCSEC = RAD_PER_DEG / 3600;
/** Arcseconds per radian. */
export const ARCSEC_PER_RAD = 3600 * DEG_PER_RAD;
/** SI per milli-unit: mN·m → N·m, mN·m·s → N·m·s. */
export const SI_PER_MILLI = 1e-3;
/** Milli-units per SI unit: N·m → mN·m, N·m·s → mN·m·s. */
export const MILLI_PER_SI = 1e3;
/** Seconds per day. */
export const S_PER_DAY = 86400;
/** π/2, a right angle in radians. */
export const HALF_PI = Math.PI / 2;

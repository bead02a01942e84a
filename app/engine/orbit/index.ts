/**
 * Orbit, frame and sky geometry (SGP4 through satellite.js, Sun/Moon/precession–nutation through
 * astronomy-engine). Conventions: EME2000 inertial frame (frames.ts), SI units, plan time in elapsed
 * SI seconds from a UTC epoch (time/scales.ts), qInertialFromBody attitudes (math/rotation.ts).
 */
export * from './propagate';
export * from './tle';
export * from './elements';
export * from './frames';
export * from './sites';
export * from './sky';
export * from './ephemeris';
export * from './ephemerisEval';
export * from './windows';
export * from './triad';
export * from './targets';

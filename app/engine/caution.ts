/**
 * Text every export carries: the caution (one place, used by CSV, JSON and AEM) and the
 * convention statements (design.md "Conventions"; math/rotation.ts header).
 */

export const CAUTION_TEXT =
  "Slewsmith output is a planning aid, not flight software. Verify it in your own simulations and reviews before any flight use; your mission's review board and licensed practice decide.";

export const QUATERNION_CONVENTION =
  'Hamilton quaternion, components in the order [x, y, z, w] (scalar last); q = qInertialFromBody rotates body-frame vectors into the inertial frame: v_I = q v_B q*';

/** The one inertial frame of every attitude and direction (CCSDS REF_FRAME_A; orbit/frames.ts). */
export const INERTIAL_FRAME = 'EME2000';

export const FRAME_CONVENTION = `inertial = ${INERTIAL_FRAME} (mean equator and equinox of J2000; the frame the scenario's directions are given in); body = spacecraft body axes; body rates, torques and the reference rate are in body axes`;

export const TIME_CONVENTION = 't_s = seconds from the scenario epoch (UTC); j = hybrid jump counter (logic jumps)';

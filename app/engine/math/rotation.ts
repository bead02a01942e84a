/**
 * Rotations: Hamilton quaternions, rotation matrices, axis-angle, rotation vectors, Euler
 * sequences, two-vector attitudes and uniform random attitudes.
 *
 * THE CONVENTION (written once, here; design.md):
 * - Hamilton quaternions, stored scalar-LAST `[x, y, z, w]` in Float64Array(4), as gl-matrix.
 * - An attitude quaternion `qInertialFromBody` rotates body-frame vectors into the inertial frame:
 *   v_I = q ⊗ v_B ⊗ q*. Its matrix R(q) (column-major, see mat3.ts) is body-to-inertial and
 *   R(p ⊗ q) = R(p) R(q).
 * - Kinematics: q̇ = ½ q ⊗ (ω, 0) with ω the body rate in body axes; Ṙ = R [ω]×.
 * - Attitude error (body frame): q_e = q_d* ⊗ q.
 * - Euler sequences are INTRINSIC (each rotation about the axis of the frame already rotated),
 *   angles in radians: sequence "ZYX" with angles (a, b, c) is R = R_z(a) R_y(b) R_x(c).
 *
 * Functions follow `fn(out, ...)` and return `out`; inputs are read into locals first so `out`
 * may alias an input.
 *
 * This module is the one place to import rotations from; the code lives by responsibility in
 * quaternion.ts (algebra and conversions), euler.ts (Euler sequences) and twoVector.ts (TRIAD).
 */
export * from './quaternion';
export * from './euler';
export * from './twoVector';

/**
 * Common wheel-array layouts, as WheelSpec lists to pass through makeWheelArray (which validates
 * them; these builders only do geometry and never throw).
 */
import type { WheelSpec } from './array';
import { MAX_WHEELS } from './array';

/** Per-wheel limits shared by every wheel of a preset. */
export interface WheelLimits {
  maxTorqueNm: number;
  maxMomentumNms: number;
  rotorInertiaKgm2: number;
}

/** Three wheels along body +X, +Y, +Z. */
export function orthogonalTriad(limits: WheelLimits): WheelSpec[] {
  const { maxTorqueNm, maxMomentumNms, rotorInertiaKgm2 } = limits;
  return [
    [1, 0, 0],
    [0, 1, 0],
    [0, 0, 1],
  ].map((axis) => ({ axis, maxTorqueNm, maxMomentumNms, rotorInertiaKgm2 }));
}

export interface PyramidOptions extends WheelLimits {
  /** Number of wheels, evenly spaced in azimuth (default 4). */
  count?: number;
  /** Angle β of every spin axis from the +Z symmetry axis, rad (elevation is π/2 − β). */
  cantAngleRad: number;
  /** Azimuth φ₀ of wheel 0 about +Z, measured from +X towards +Y, rad (default 0). */
  azimuthOffsetRad?: number;
}

/**
 * Pyramid: g_i = (sinβ cos φ_i, sinβ sin φ_i, cosβ), φ_i = φ₀ + 2π i / count. With count 4,
 * β = arccos(1/√3) and φ₀ = 45° the axes lie along cube diagonals (Markley et al., JGCD 33(5),
 * 2010, use this layout as a baseline). A count that is not an integer in [0, MAX_WHEELS + 1] is
 * truncated into that range so that makeWheelArray reports it rather than this builder throwing.
 */
export function pyramid(opts: PyramidOptions): WheelSpec[] {
  const { maxTorqueNm, maxMomentumNms, rotorInertiaKgm2 } = opts;
  const raw = opts.count ?? 4;
  const count = Number.isFinite(raw) ? Math.max(0, Math.min(MAX_WHEELS + 1, Math.trunc(raw))) : 0;
  const beta = opts.cantAngleRad;
  const phi0 = opts.azimuthOffsetRad ?? 0;
  const sb = Math.sin(beta),
    cb = Math.cos(beta);
  const out: WheelSpec[] = [];
  for (let i = 0; i < count; i++) {
    const phi = phi0 + (2 * Math.PI * i) / count;
    out.push({ axis: [sb * Math.cos(phi), sb * Math.sin(phi), cb], maxTorqueNm, maxMomentumNms, rotorInertiaKgm2 });
  }
  return out;
}

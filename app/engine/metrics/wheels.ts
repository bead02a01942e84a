/**
 * Wheel use over a run: peak torque and momentum as fractions of each wheel's own limit, which
 * wheel and when; when each wheel first reaches its limit and for how long it stays there; and the
 * control effort ∫‖τ_body‖ dt of the delivered body torque (trapezoidal), N·m·s.
 */
import type { RunTrace } from '../sim/types';

/** A wheel counts as at its limit from this fraction of it (the limiter stops at 100 %; common practice, no source). */
export const AT_LIMIT_FRACTION = 0.999;

export interface WheelPeak {
  fraction: number;
  /** 1-based wheel number, 0 for no wheel. */
  wheel: number;
  atS: number;
}

export interface WheelSaturation {
  /** 1-based wheel number. */
  wheel: number;
  kind: 'torque' | 'momentum';
  firstS: number;
  /** Time spent at the limit (sum of the sample intervals that start there), s. */
  totalS: number;
}

export interface WheelUse {
  torque: WheelPeak;
  momentum: WheelPeak;
  saturation: WheelSaturation[];
  effortNms: number;
}

function peakOf(data: Float64Array, limits: ArrayLike<number>, tr: RunTrace): WheelPeak {
  const N = tr.nWheels;
  const p: WheelPeak = { fraction: 0, wheel: 0, atS: 0 };
  for (let k = 0; k < tr.n; k++)
    for (let i = 0; i < N; i++) {
      const f = Math.abs(data[N * k + i]!) / limits[i]!;
      if (f > p.fraction) {
        p.fraction = f;
        p.wheel = i + 1;
        p.atS = tr.t[k]!;
      }
    }
  return p;
}

function saturationOf(data: Float64Array, limits: ArrayLike<number>, tr: RunTrace, kind: WheelSaturation['kind']): WheelSaturation[] {
  const N = tr.nWheels;
  const out: WheelSaturation[] = [];
  for (let i = 0; i < N; i++) {
    let first = -1,
      total = 0;
    for (let k = 0; k < tr.n; k++) {
      if (!(Math.abs(data[N * k + i]!) >= AT_LIMIT_FRACTION * limits[i]!)) continue;
      if (first < 0) first = tr.t[k]!;
      if (k + 1 < tr.n) total += tr.t[k + 1]! - tr.t[k]!;
    }
    if (first >= 0) out.push({ wheel: i + 1, kind, firstS: first, totalS: total });
  }
  return out;
}

export function wheelUse(tr: RunTrace, maxTorqueNm: ArrayLike<number>, maxMomentumNms: ArrayLike<number>): WheelUse {
  const tb = tr.torqueBody;
  let effort = 0,
    prev = 0;
  for (let k = 0; k < tr.n; k++) {
    const x = tb[3 * k]!,
      y = tb[3 * k + 1]!,
      z = tb[3 * k + 2]!;
    const m = Math.sqrt(x * x + y * y + z * z);
    if (k > 0) effort += 0.5 * (m + prev) * (tr.t[k]! - tr.t[k - 1]!);
    prev = m;
  }
  return {
    torque: peakOf(tr.wheelTorque, maxTorqueNm, tr),
    momentum: peakOf(tr.hWheel, maxMomentumNms, tr),
    saturation: [...saturationOf(tr.wheelTorque, maxTorqueNm, tr, 'torque'), ...saturationOf(tr.hWheel, maxMomentumNms, tr, 'momentum')],
    effortNms: effort,
  };
}

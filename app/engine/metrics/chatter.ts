/**
 * Chatter: how often the commanded body torque reverses its DIRECTION, per second, in the busiest
 * window of the run. Definition (common practice, no source; stated once here):
 * - only torques above an absolute floor count (a fraction of the wheels' torque limit, so a run
 *   whose torques are all negligible scores 0, whatever their signs);
 * - a reversal is a commanded torque pointing more than 90° away from the last one above the floor
 *   (τ_k · τ_last < 0): one event however many body axes change sign;
 * - a reversal whose span (from the last torque above the floor to this one, widened by one sample
 *   on each side) holds a planned switch of the reference (slew start, end of the acceleration,
 *   start of the deceleration, slew end) belongs to the plan and is not counted;
 * - chatter = the largest count inside any window of `windowS` seconds, divided by `windowS`.
 * A clean tracked slew scores 0; a law switching back and forth under noise scores well above.
 */
import type { RunTrace } from '../sim/types';

/** Floor below which a commanded torque does not count, as a fraction of the smallest wheel torque limit. */
export const CHATTER_FLOOR_FRACTION = 0.02;

export interface ChatterOptions {
  windowS: number;
  /** Torques at or below this magnitude are ignored, N·m. */
  floorNm: number;
  /** Planned switch instants of the reference, ascending, s. */
  plannedSwitchTimes: ArrayLike<number>;
}

export interface ChatterResult {
  /** Reversals not planned, over the whole run. */
  reversals: number;
  /** Worst-window count / windowS, 1/s. */
  perS: number;
}

/** True when a planned switch lies in [a, b] (the list is short: a linear scan). */
function plannedWithin(a: number, b: number, planned: ArrayLike<number>): boolean {
  for (let i = 0; i < planned.length; i++) if (planned[i]! >= a && planned[i]! <= b) return true;
  return false;
}

export function chatterOf(tr: RunTrace, o: ChatterOptions): ChatterResult {
  const tc = tr.torqueCmdBody;
  const t = tr.t;
  const events: number[] = [];
  let lx = 0,
    ly = 0,
    lz = 0,
    lk = -1;
  const floor2 = o.floorNm * o.floorNm;
  for (let k = 0; k < tr.n; k++) {
    const x = tc[3 * k]!,
      y = tc[3 * k + 1]!,
      z = tc[3 * k + 2]!;
    if (!(x * x + y * y + z * z > floor2)) continue;
    if (lk >= 0 && x * lx + y * ly + z * lz < 0) {
      const from = t[lk > 0 ? lk - 1 : 0]! * (1 - 1e-12);
      const to = t[k + 1 < tr.n ? k + 1 : k]! * (1 + 1e-12) + 1e-12;
      if (!plannedWithin(from, to, o.plannedSwitchTimes)) events.push(t[k]!);
    }
    lx = x;
    ly = y;
    lz = z;
    lk = k;
  }
  let most = 0;
  for (let lo = 0, hi = 0; hi < events.length; hi++) {
    while (events[hi]! - events[lo]! > o.windowS) lo++;
    most = Math.max(most, hi - lo + 1);
  }
  return { reversals: events.length, perS: most / o.windowS };
}

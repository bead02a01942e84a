/**
 * What every time axis marks: where each segment's slew starts (with the target's label) and where
 * the plan arrives at the target (slew end, hold start), from the engine's plan; and on the wheel
 * plots the intervals where a wheel sits at its torque or momentum limit, from the run trace with
 * the engine's own at-limit threshold (metrics/wheels.ts AT_LIMIT_FRACTION). Pure data, no DOM.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { AT_LIMIT_FRACTION } from '../../engine/metrics/wheels';

export interface TimeMarker {
  t: number;
  /** 'segment': a slew starts (towards `label`); 'arrival': the plan reaches the target. */
  kind: 'segment' | 'arrival';
  /** 1-based target number. */
  number: number;
  label: string;
}

/** Segment starts and planned arrivals of the plan, in time order. */
export function segmentMarkers(out: PipelineOutput): TimeMarker[] {
  const m: TimeMarker[] = [];
  for (const s of out.plan.segments) {
    m.push({ t: s.tStart, kind: 'segment', number: s.index + 1, label: s.label });
    if (s.slewTimeS > 0) m.push({ t: s.tStart + s.slewTimeS, kind: 'arrival', number: s.index + 1, label: s.label });
  }
  return m.sort((a, b) => a.t - b.t);
}

export interface LimitInterval {
  /** 1-based wheel number. */
  wheel: number;
  t0: number;
  t1: number;
}

/**
 * Intervals where |x_i| ≥ AT_LIMIT_FRACTION · limit_i for the per-wheel channel `data` (nWheels
 * values per sample). A sample at the limit covers [t_k, t_k+1) (the last sample a zero-width
 * interval at its time), the same bookkeeping as the engine's saturation totals.
 */
export function limitIntervals(run: ControllerRun, data: Float64Array, limits: ArrayLike<number>): LimitInterval[] {
  const tr = run.trace;
  const N = tr.nWheels;
  const out: LimitInterval[] = [];
  for (let i = 0; i < N; i++) {
    const lim = AT_LIMIT_FRACTION * limits[i]!;
    let open = -1;
    for (let k = 0; k < tr.n; k++) {
      const at = Math.abs(data[N * k + i]!) >= lim;
      if (at && open < 0) open = k;
      if (!at && open >= 0) {
        out.push({ wheel: i + 1, t0: tr.t[open]!, t1: tr.t[k]! });
        open = -1;
      }
    }
    if (open >= 0) out.push({ wheel: i + 1, t0: tr.t[open]!, t1: tr.t[tr.n - 1]! });
  }
  return out;
}

/** Momentum-limit intervals of a run. */
export function momentumLimitIntervals(run: ControllerRun, out: PipelineOutput): LimitInterval[] {
  return limitIntervals(run, run.trace.hWheel, out.vehicle.maxMomentumNms);
}

/** Torque-limit intervals of a run (delivered motor torque). */
export function torqueLimitIntervals(run: ControllerRun, out: PipelineOutput): LimitInterval[] {
  return limitIntervals(run, run.trace.wheelTorque, out.vehicle.maxTorqueNm);
}

/**
 * Lyapunov monitor: where does a run break the assumptions of its stability proof?
 *
 * Theory (methods §3, §4.1; Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011; Mayhew & Teel,
 * IEEE TAC 58(11), 2013): on flows W is non-increasing (Ẇ = −ω_eᵀK_ω ω_e for exact, continuous
 * torque), and each jump lowers W by at least the law's promised decrease (4k_p·δ hysteretic,
 * k_R·δ synergistic). Sampling, noise, saturation and tracking feedforward errors can break
 * either; the monitor lists every flow interval where W rises by more than a tolerance and every
 * jump whose drop falls short, with times, so the user sees where and why.
 *
 * Tolerance on a rise, in energy (J for the quaternion and synergistic laws):
 *   relTol · (the run's largest W: the energy scale of the slew) + the noise energy + absTol.
 * The noise energy is the kinetic energy of the rate noise, ½·J_max·σ_ω², plus the potential of the
 * attitude noise, k·σ_θ², a law's W moving that much from one sample to the next on noise alone
 * (estimates of scale, common practice, no source).
 *
 * A rise whose interval contains a planned switch of the reference (an acceleration step of the
 * profile) is listed apart as 'reference-step': with a zero-order hold the feedforward cannot
 * change at the switch instant itself, so W may rise once there by design. Only 'flow-rise' and
 * 'weak-jump' are violations.
 */
import type { JumpEvent, RunTrace } from '../sim/types';

export type MonitorKind = 'flow-rise' | 'weak-jump' | 'reference-step';

export interface MonitorFlag {
  kind: MonitorKind;
  tStart: number;
  tEnd: number;
  /** Rise of W over the interval (flow-rise, reference-step) or the shortfall of the drop (weak-jump). */
  amount: number;
  message: string;
}

export interface MonitorOptions {
  /** Promised decrease per jump (0 for smooth laws). */
  jumpDecrease: number;
  /** Fraction of the run's largest W a rise must exceed (default 1e-3). */
  relTol: number;
  absTol: number;
  /** Energy that sensor noise alone moves W by (default 0). */
  noiseEnergy?: number;
  /** Planned switch instants of the reference (s). */
  plannedSwitchTimes?: ArrayLike<number>;
}

/** True when a planned switch lies in [a − slack, b + slack]. */
function containsSwitch(a: number, b: number, slack: number, planned: ArrayLike<number> | undefined): boolean {
  if (!planned) return false;
  for (let i = 0; i < planned.length; i++) if (planned[i]! >= a - slack && planned[i]! <= b + slack) return true;
  return false;
}

function flowRises(trace: RunTrace, tol: number, o: MonitorOptions): MonitorFlag[] {
  const flags: MonitorFlag[] = [];
  const W = trace.lyapunov;
  const t = trace.t;
  let riseStart = -1;
  let riseMin = 0;
  const closeRise = (kEnd: number) => {
    if (riseStart >= 0) {
      const amount = W[kEnd]! - riseMin;
      if (amount > tol) {
        const slack = 1e-9 * Math.max(1, Math.abs(t[kEnd]!));
        const planned = containsSwitch(t[riseStart]!, t[kEnd]!, slack, o.plannedSwitchTimes);
        const when = `from t = ${t[riseStart]!.toFixed(2)} s to ${t[kEnd]!.toFixed(2)} s`;
        flags.push({
          kind: planned ? 'reference-step' : 'flow-rise',
          tStart: t[riseStart]!,
          tEnd: t[kEnd]!,
          amount,
          message: planned
            ? `W rose by ${amount.toPrecision(3)} ${when}, across a planned acceleration step of the reference (expected with a held command)`
            : `W rose by ${amount.toPrecision(3)} during a flow ${when}, more than the tolerance ${tol.toPrecision(3)}`,
        });
      }
    }
    riseStart = -1;
  };
  for (let k = 1; k < trace.n; k++) {
    // Flow intervals: consecutive samples with the same jump counter and segment (a new segment
    // changes the reference, so W is not comparable across it).
    if (trace.j[k] !== trace.j[k - 1] || trace.segment[k] !== trace.segment[k - 1]) {
      closeRise(k - 1);
      continue;
    }
    if (W[k]! > W[k - 1]!) {
      if (riseStart < 0) {
        riseStart = k - 1;
        riseMin = W[k - 1]!;
      }
    } else if (riseStart >= 0) closeRise(k - 1);
  }
  closeRise(trace.n - 1);
  return flags;
}

export function lyapunovMonitor(trace: RunTrace, jumps: readonly JumpEvent[], o: MonitorOptions): MonitorFlag[] {
  let wMax = 0;
  for (let k = 0; k < trace.n; k++) wMax = Math.max(wMax, Math.abs(trace.lyapunov[k]!));
  const tol = o.relTol * wMax + (o.noiseEnergy ?? 0) + o.absTol;
  const flags = flowRises(trace, tol, o);
  // Jumps: the closed loop records W with the old and the new logic value at the jump instant.
  if (o.jumpDecrease > 0)
    for (const ev of jumps) {
      if (ev.lyapunovBefore === undefined || ev.lyapunovAfter === undefined) continue;
      const drop = ev.lyapunovBefore - ev.lyapunovAfter;
      if (drop < o.jumpDecrease * (1 - 1e-9) - o.absTol)
        flags.push({
          kind: 'weak-jump',
          tStart: ev.t,
          tEnd: ev.t,
          amount: o.jumpDecrease - drop,
          message: `jump ${ev.j} at t = ${ev.t.toFixed(3)} s lowered W by ${drop.toPrecision(3)}, less than the promised ${o.jumpDecrease.toPrecision(3)}`,
        });
    }
  return flags;
}

/** The flags that break the proof's assumptions (reference steps are expected). */
export function monitorViolations(flags: readonly MonitorFlag[]): MonitorFlag[] {
  return flags.filter((f) => f.kind !== 'reference-step');
}

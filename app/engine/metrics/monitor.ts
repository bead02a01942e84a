/**
 * Lyapunov monitor: where does a run break the assumptions of its stability proof?
 *
 * Theory (methods §3, §4.1; Mayhew, Sanfelice & Teel, IEEE TAC 56(11), 2011; Mayhew & Teel,
 * IEEE TAC 58(11), 2013): on flows W is non-increasing (Ẇ = −ω_eᵀK_ω ω_e for exact, continuous
 * torque), and each jump lowers W by at least the law's promised decrease (4k_p·δ hysteretic,
 * k_R·δ synergistic). Sampling, noise, saturation and tracking feedforward errors can break
 * either; the monitor lists every flow interval where W rises by more than a tolerance and every
 * jump whose drop falls short, with times, so the user sees where and why.
 */
import type { JumpEvent, RunTrace } from '../sim/types';

export interface MonitorFlag {
  kind: 'flow-rise' | 'weak-jump';
  tStart: number;
  tEnd: number;
  /** Rise of W over the interval (flow-rise) or the shortfall of the drop (weak-jump). */
  amount: number;
  message: string;
}

export interface MonitorOptions {
  /** Promised decrease per jump (0 for smooth laws). */
  jumpDecrease: number;
  /** A rise counts when it exceeds relTol·max(W) + absTol over an interval. */
  relTol: number;
  absTol: number;
}

export function lyapunovMonitor(trace: RunTrace, jumps: readonly JumpEvent[], o: MonitorOptions): MonitorFlag[] {
  const flags: MonitorFlag[] = [];
  const n = trace.n;
  const W = trace.lyapunov;
  let wMax = 0;
  for (let k = 0; k < n; k++) wMax = Math.max(wMax, Math.abs(W[k]!));
  const tol = o.relTol * wMax + o.absTol;

  // Flow intervals: runs of consecutive samples with the same jump counter and the same segment
  // (a new segment changes the reference, so W is not comparable across it).
  let riseStart = -1;
  let riseMin = 0;
  const closeRise = (kEnd: number) => {
    if (riseStart >= 0) {
      const amount = W[kEnd]! - riseMin;
      if (amount > tol) {
        flags.push({
          kind: 'flow-rise',
          tStart: trace.t[riseStart]!,
          tEnd: trace.t[kEnd]!,
          amount,
          message: `W rose by ${amount.toPrecision(3)} during a flow from t = ${trace.t[riseStart]!.toFixed(2)} s to ${trace.t[kEnd]!.toFixed(2)} s`,
        });
      }
    }
    riseStart = -1;
  };
  for (let k = 1; k < n; k++) {
    const sameFlow = trace.j[k] === trace.j[k - 1] && trace.segment[k] === trace.segment[k - 1];
    if (!sameFlow) {
      closeRise(k - 1);
      continue;
    }
    if (W[k]! > W[k - 1]!) {
      if (riseStart < 0) {
        riseStart = k - 1;
        riseMin = W[k - 1]!;
      }
    } else if (riseStart >= 0) {
      closeRise(k - 1);
    }
  }
  closeRise(n - 1);

  // Jumps: the closed loop records W with the old and the new logic value at the jump instant.
  if (o.jumpDecrease > 0) {
    for (const ev of jumps) {
      if (ev.lyapunovBefore === undefined || ev.lyapunovAfter === undefined) continue;
      const drop = ev.lyapunovBefore - ev.lyapunovAfter;
      if (drop < o.jumpDecrease * (1 - 1e-9) - o.absTol) {
        flags.push({
          kind: 'weak-jump',
          tStart: ev.t,
          tEnd: ev.t,
          amount: o.jumpDecrease - drop,
          message: `jump ${ev.j} at t = ${ev.t.toFixed(3)} s lowered W by ${drop.toPrecision(3)}, less than the promised ${o.jumpDecrease.toPrecision(3)}`,
        });
      }
    }
  }
  return flags;
}

/**
 * Engine results → the 3D view's input (app/view3d/types.ts). Everything comes from the pipeline
 * output: the wheel axes and limits, the momentum envelope (mesh and facet planes, whose capacity
 * along a direction the engine's envelopeCapacity reads), the targets and the keep-out cones.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { envelopeCapacity } from '../../engine/wheels/envelope';
import { DEG_PER_RAD, HALF_PI } from '../../engine/units';
import type { KeepOutCone, ViewRun, ViewTarget } from '../../view3d/types';
import { runName } from '../modeNames';
import { movingCone } from './movingCones';

function viewTargets(out: PipelineOutput): ViewTarget[] {
  return out.plan.segments.map((s, i) => ({
    tStart: s.tStart,
    tEnd: s.tEnd,
    q: out.targets.slice(4 * i, 4 * i + 4),
    label: s.label,
  }));
}

export function toViewRuns(out: PipelineOutput, runs: readonly ControllerRun[]): ViewRun[] {
  const env = out.vehicle.momentumEnvelope;
  const capacity = (d: Float64Array) => envelopeCapacity(env, d);
  const targets = viewTargets(out);
  return runs.map((r) => ({
    label: runName(r),
    trace: r.trace,
    jumps: r.jumps.map((j) => ({ t: j.t, j: j.j, from: j.from, to: j.to })).sort((a, b) => a.t - b.t),
    targets,
    hasReference: r.mode === 'follow-plan',
    wheelAxes: out.vehicle.wheelAxes,
    maxMomentumNms: out.vehicle.maxMomentumNms,
    momentumEnvelope: env,
    momentumCapacity: capacity,
    logicKind: r.logicKind,
  }));
}

/** Index of the last trace sample at or before t (0 before the first). */
export function sampleAt(t: ArrayLike<number>, n: number, time: number): number {
  let lo = 0;
  let hi = n - 1;
  if (n <= 0 || !(time >= t[0]!)) return 0;
  while (lo < hi) {
    const mid = (lo + hi + 1) >> 1;
    if (t[mid]! <= time) lo = mid;
    else hi = mid - 1;
  }
  return lo;
}

/**
 * Every cone the view can draw — the `keepOut` cones and the `constraints` list's cones: against a
 * fixed inertial direction, and on orbit scenarios against the Sun, Moon, Earth centre or limb and a
 * ground station at `time` (movingCones.ts, from the output's orbit samples; without an orbit the
 * Sun and Moon, geocentric by the epoch) —
 * with `violated` from the shown run's margin at `time` (the engine's margin series; a sample
 * outside the constraint's window counts as clear). Without a run, `violated` is absent.
 */
export function constraintCones(out: PipelineOutput | null, run: ControllerRun | null, time: number): KeepOutCone[] {
  if (!out) return [];
  const info = out.constraints ?? [];
  const margins = run?.constraints?.marginRad;
  const k = run ? sampleAt(run.trace.t, run.trace.n, time) : 0;
  const violated = (i: number): boolean | undefined => {
    const m = margins?.[i]?.[k];
    return m === undefined ? undefined : m < 0;
  };
  const cones: KeepOutCone[] = out.keepOut.map((c, i) => ({
    label: c.label,
    dirInertial: c.inertialDirection,
    halfAngleRad: Math.min(HALF_PI, c.halfAngleRad),
    violated: violated(i),
  }));
  const list = out.scenario.file.constraints ?? [];
  list.forEach((c, j) => {
    const i = out.keepOut.length + j;
    const halfAngleRad = Math.min(HALF_PI, info[i]?.halfAngleRad ?? c.halfAngleDeg / DEG_PER_RAD);
    const label = c.kind === 'keep-in' ? `${c.name} (keep-in)` : c.name;
    if (c.direction.kind !== 'fixed') {
      const m = movingCone(out, c, info[i]?.halfAngleRad ?? c.halfAngleDeg / DEG_PER_RAD, time);
      if (m)
        cones.push({ label, dirInertial: m.dir, halfAngleRad: Math.min(HALF_PI, m.halfAngleRad), violated: violated(i), moving: true });
      return;
    }
    cones.push({
      label,
      dirInertial: c.direction.inertialDirection,
      halfAngleRad,
      violated: violated(i),
    });
  });
  return cones;
}

/** Moving cones are rebuilt when their axis has turned by about this much (rad): 0.25°. */
const MOVING_STEP_RAD = 0.25 / DEG_PER_RAD;

/**
 * A key that changes when the cones' colours change, or a moving cone's axis or half angle has
 * turned by about MOVING_STEP_RAD (the view rebuilds the cones only then).
 */
export function conesKey(cones: readonly KeepOutCone[]): string {
  return cones
    .map((c) => {
      const v = c.violated === undefined ? '?' : c.violated ? '1' : '0';
      if (!c.moving) return v;
      const d = c.dirInertial;
      const q = (x: number) => Math.round(x / MOVING_STEP_RAD);
      return `${v}:${q(d[0]!)},${q(d[1]!)},${q(d[2]!)},${q(c.halfAngleRad)}`;
    })
    .join('|');
}

/**
 * Engine results → the 3D view's input (app/view3d/types.ts). Everything comes from the pipeline
 * output: the wheel axes and limits, the momentum envelope (mesh and facet planes, whose capacity
 * along a direction the engine's envelopeCapacity reads), the targets and the keep-out cones.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { envelopeCapacity } from '../../engine/wheels/envelope';
import { HALF_PI } from '../../engine/units';
import type { KeepOutCone, ViewRun, ViewTarget } from '../../view3d/types';
import { runName } from '../modeNames';

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

/** Keep-out cones of the pipeline output (SI) for the view. */
export function keepOutCones(out: PipelineOutput | null): KeepOutCone[] {
  if (!out) return [];
  return out.keepOut.map((k) => ({ label: k.label, dirInertial: k.inertialDirection, halfAngleRad: Math.min(HALF_PI, k.halfAngleRad) }));
}

/**
 * Engine results → the 3D view's input (app/view3d/types.ts). The momentum capacity the view
 * asks for is the engine's zonotope capacity (wheels/envelope.ts), built once per output from
 * the vehicle the engine resolved.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { makeWheelArray } from '../../engine/wheels/array';
import { envelopeCapacity, momentumEnvelope } from '../../engine/wheels/envelope';
import type { KeepOutCone, ViewRun, ViewTarget } from '../../view3d/types';
import { RAD_PER_DEG } from '../../engine/units';

type Obj = Record<string, unknown>;

export function momentumCapacityOf(out: PipelineOutput): (d: Float64Array) => number {
  const v = out.vehicle;
  const specs = [];
  for (let i = 0; i < v.nWheels; i++)
    specs.push({
      axis: [v.wheelAxes[3 * i], v.wheelAxes[3 * i + 1], v.wheelAxes[3 * i + 2]],
      maxTorqueNm: v.maxTorqueNm[i],
      maxMomentumNms: v.maxMomentumNms[i],
      // Not used by the envelope; any positive value passes the array check.
      rotorInertiaKgm2: 1,
    });
  const arr = makeWheelArray(specs, 'vehicle.wheels');
  if (!arr.ok) return () => 0;
  const z = momentumEnvelope(arr.value);
  return (d) => envelopeCapacity(z, d);
}

export function viewTargets(out: PipelineOutput): ViewTarget[] {
  return out.plan.segments.map((s, i) => ({
    tStart: s.tStart,
    tEnd: s.tEnd,
    q: out.targets.slice(4 * i, 4 * i + 4),
    label: s.label,
  }));
}

export function toViewRuns(out: PipelineOutput, runs: readonly ControllerRun[]): ViewRun[] {
  const capacity = momentumCapacityOf(out);
  const targets = viewTargets(out);
  return runs.map((r) => ({
    label: `${r.label} (${r.mode})`,
    trace: r.trace,
    jumps: r.jumps.map((j) => ({ t: j.t, j: j.j, from: j.from, to: j.to })).sort((a, b) => a.t - b.t),
    targets,
    hasReference: r.mode === 'profiled',
    wheelAxes: out.vehicle.wheelAxes,
    maxMomentumNms: out.vehicle.maxMomentumNms,
    momentumEnvelope: out.vehicle.momentumEnvelope,
    momentumCapacity: capacity,
    logicKind: r.logicKind,
  }));
}

/** Keep-out cones of the scenario file (display units) for the view. */
export function keepOutCones(scenario: unknown): KeepOutCone[] {
  const list = (scenario as Obj | null)?.keepOut;
  if (!Array.isArray(list)) return [];
  return list
    .filter((k): k is Obj => k !== null && typeof k === 'object')
    .filter((k) => Array.isArray(k.inertialDirection) && typeof k.halfAngleDeg === 'number')
    .map((k) => ({
      label: String(k.label ?? ''),
      dirInertial: k.inertialDirection as number[],
      halfAngleRad: Math.min(Math.PI / 2, (k.halfAngleDeg as number) * RAD_PER_DEG),
    }));
}

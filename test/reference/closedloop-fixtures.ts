/**
 * Invented test vehicles and small helpers for the closed-loop checks (closedloop-*.test.ts).
 * Everything goes through the real engine: makeWheelArray → makeGyrostat → makeController →
 * runClosedLoop → computeMetrics / lyapunovMonitor. No vehicle here is a real spacecraft.
 */
import { makeGyrostat, type Gyrostat } from '../../app/engine/body/gyrostat';
import { type AttitudeController, type PlantModel } from '../../app/engine/control/index';
import { controllerFromSpec as makeController } from '../support/controller-spec';
import { computeMetrics, type RunMetrics } from '../../app/engine/metrics/metrics';
import { runClosedLoop, type ClosedLoopConfig, type ClosedLoopResult, type ReferenceSource } from '../../app/engine/sim/closedLoop';
import { PERFECT_SENSORS } from '../../app/engine/sim/sensors';
import { makeWheelArray, type WheelArray, type WheelSpec } from '../../app/engine/wheels/array';
import { orthogonalTriad, pyramid } from '../../app/engine/wheels/presets';

export interface Vehicle {
  plant: Gyrostat;
  wheels: WheelArray;
  model: PlantModel;
}

export function vehicle(Jrows: number[][], specs: WheelSpec[]): Vehicle {
  const w = makeWheelArray(specs);
  if (!w.ok) throw new Error(JSON.stringify(w.errors));
  const J = new Float64Array(9);
  for (let r = 0; r < 3; r++) for (let c = 0; c < 3; c++) J[3 * c + r] = Jrows[r]![c]!;
  const g = makeGyrostat(J, w.value);
  if (!g.ok) throw new Error(JSON.stringify(g.errors));
  return { plant: g.value, wheels: w.value, model: { Jperp: g.value.Jperp, nWheels: w.value.n, axes: w.value.axes } };
}

/**
 * A "rigid body" stand-in: three body-axis wheels with rotor inertia `js` and limits far above
 * any request. The whole-body inertia is diag(J) + js·I, so that J⊥ = J − G J_s Gᵀ is exactly
 * diag(J): the inertia the controllers and the check values use.
 */
export function triadVehicle(Jdiag: [number, number, number], js = 1e-9, maxTorqueNm = 1e6, maxMomentumNms = 1e6): Vehicle {
  const J = [
    [Jdiag[0] + js, 0, 0],
    [0, Jdiag[1] + js, 0],
    [0, 0, Jdiag[2] + js],
  ];
  return vehicle(J, orthogonalTriad({ maxTorqueNm, maxMomentumNms, rotorInertiaKgm2: js }));
}

/** Four-wheel pyramid on cube diagonals (cant arccos(1/√3), azimuths 45° + 90°k). */
export function pyramidVehicle(Jrows: number[][], maxTorqueNm: number, maxMomentumNms: number, js = 1e-4): Vehicle {
  return vehicle(
    Jrows,
    pyramid({
      cantAngleRad: Math.acos(1 / Math.sqrt(3)),
      azimuthOffsetRad: Math.PI / 4,
      maxTorqueNm,
      maxMomentumNms,
      rotorInertiaKgm2: js,
    }),
  );
}

export function law(spec: Record<string, unknown>, v: Vehicle): AttitudeController {
  const r = makeController(spec, v.model);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

/** Regulation to a fixed attitude (default the identity), one segment. */
export function fixedReference(q: ArrayLike<number> = [0, 0, 0, 1]): ReferenceSource {
  const q0 = Float64Array.from(q);
  return {
    at: (_t, qo, w, wd) => {
      qo[0] = q0[0]!;
      qo[1] = q0[1]!;
      qo[2] = q0[2]!;
      qo[3] = q0[3]!;
      w[0] = w[1] = w[2] = 0;
      wd[0] = wd[1] = wd[2] = 0;
      return 0;
    },
  };
}

export type RunSpec = Partial<ClosedLoopConfig> & Pick<ClosedLoopConfig, 'controller' | 'q0' | 'tEnd'> & { vehicle: Vehicle };

/** runClosedLoop with test defaults: at rest, empty wheels, perfect sensors, 10 Hz, hold, min-norm. */
export function fly(s: RunSpec): ClosedLoopResult {
  const { vehicle: v, ...rest } = s;
  return runClosedLoop({
    plant: v.plant,
    wheels: v.wheels,
    reference: fixedReference(),
    omega0: [0, 0, 0],
    hWheel0: new Float64Array(v.wheels.n),
    timing: 'sampled',
    controlRateHz: 10,
    rk4StepsPerSample: 1,
    sensors: PERFECT_SENSORS,
    seed: 1,
    actuation: { mode: 'hold' },
    allocation: 'min-norm',
    ...rest,
  });
}

export function metricsOf(
  r: ClosedLoopResult,
  v: Vehicle,
  target: ArrayLike<number> = [0, 0, 0, 1],
  settle = { angle: 0.01, rate: 0.001 },
): RunMetrics {
  return computeMetrics(r.trace, r.jumps, {
    settleAngleRad: settle.angle,
    settleRateRadPerS: settle.rate,
    chatterWindowS: 10,
    maxTorqueNm: v.wheels.maxTorqueNm,
    maxMomentumNms: v.wheels.maxMomentumNms,
    segmentTargets: Float64Array.from(target),
  });
}

/** Scalar part η of q_ref* ⊗ q at trace sample k (sign as it comes, continuous along a run). */
export function etaAt(r: ClosedLoopResult, k: number): number {
  const q = r.trace.q,
    d = r.trace.qRef;
  // (q_d* ⊗ q)_w = d_w q_w + d·q (Hamilton, [x, y, z, w])
  return d[4 * k + 3]! * q[4 * k + 3]! + d[4 * k]! * q[4 * k]! + d[4 * k + 1]! * q[4 * k + 1]! + d[4 * k + 2]! * q[4 * k + 2]!;
}

/** Index of the first trace sample at or after time t. */
export function sampleAt(r: ClosedLoopResult, t: number): number {
  const tt = r.trace.t;
  let k = 0;
  while (k < r.trace.n - 1 && tt[k]! < t - 1e-9) k++;
  return k;
}

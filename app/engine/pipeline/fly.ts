/**
 * Stage 5 of the pipeline, fly: one controller, one mode, one reference, on the truth vehicle,
 * through the hybrid closed loop (sim/closedLoop.ts). The pipeline's flights and a study's
 * dispersed cases are both made here, so they cannot differ in anything but their inputs.
 */
import type { SequencePlan } from '../plan/types';
import type { ResolvedScenario } from '../scenario/resolve';
import { runClosedLoop, type ClosedLoopResult, type ReferenceSource } from '../sim/closedLoop';
import { followPlanReference, stepTargetReference } from '../sim/reference';
import { trackingReference } from '../sim/trackingReference';
import type { SensorModel } from '../sim/sensors';
import type { Actuation, RunMode, RunTrace } from '../sim/types';
import type { BuiltController, Vehicle } from './types';
import { SettleWatch } from '../metrics/settle';
import { pointingAxesOf } from './pointing';
import type { SampleSink } from '../sim/sink';
import type { SensorNoiseTape } from '../sim/noiseTape';

/** Everything one flight needs (SI). */
export interface Flight {
  vehicle: Pick<Vehicle, 'plant' | 'wheels' | 'frictionFeedforward'>;
  controller: BuiltController;
  mode: RunMode;
  reference: ReferenceSource;
  initial: { q: ArrayLike<number>; omega: ArrayLike<number>; hWheel: ArrayLike<number> };
  tEnd: number;
  timing: 'sampled' | 'continuous-ideal';
  controlRateHz: number;
  rk4StepsPerSample: number;
  sensors: SensorModel;
  seed: number;
  /** Random stream (a study's case uses its own) so runs are independent and repeatable. */
  stream?: number;
  actuation: Actuation;
  /** End the flight once it has been settled this long (studies); absent: fly to tEnd. */
  earlyStop?: { settledForS: number; angleRad: number; rateRadPerS: number };
  shouldStop?: () => boolean;
  /** RK4 steps after which the run stops as truncated (budget.ts runStepCap); absent: the loop's default. */
  maxSteps?: number;
  /** Record the trace into this reused memory (sim/trace.ts traceArena); absent: new arrays. */
  traceArena?: RunTrace;
  /** Samples to this sink instead of the trace (sim/sink.ts; a study case's online metrics). */
  sink?: SampleSink;
  /** Sensor noise read from this tape (sim/noiseTape.ts; shared by a study case's laws); same values as drawn. */
  noiseTape?: SensorNoiseTape;
}

/** Stage 5: fly. */
export function fly(f: Flight): ClosedLoopResult {
  return runClosedLoop({
    plant: f.vehicle.plant,
    wheels: f.vehicle.wheels,
    controller: f.controller.controller,
    reference: f.reference,
    q0: f.initial.q,
    omega0: f.initial.omega,
    hWheel0: f.initial.hWheel,
    tEnd: f.tEnd,
    timing: f.timing,
    controlRateHz: f.controlRateHz,
    rk4StepsPerSample: f.rk4StepsPerSample,
    sensors: f.sensors,
    seed: f.seed,
    stream: f.stream,
    actuation: f.actuation,
    allocation: 'min-max',
    frictionFeedforward: f.vehicle.frictionFeedforward,
    stopRule: f.earlyStop ? new SettleWatch(f.earlyStop.angleRad, f.earlyStop.rateRadPerS, f.earlyStop.settledForS) : undefined,
    shouldStop: f.shouldStop,
    ...(f.maxSteps !== undefined ? { maxSteps: f.maxSteps } : {}),
    ...(f.traceArena ? { traceArena: f.traceArena } : {}),
    ...(f.sink ? { sink: f.sink } : {}),
    ...(f.noiseTape ? { noiseTape: f.noiseTape } : {}),
  });
}

/** When the scenario's flights end, s: simulation.durationS, else the plan's end (at least 1 s) plus the tail. */
export function flightEndS(s: ResolvedScenario, plan: SequencePlan): number {
  return s.simulation.durationS ?? Math.max(plan.totalS, 1) + s.simulation.tailS;
}

/** The scenario's reference for a mode: the planned profile, or each target at once (with each pointing-only target's axis). */
export function referenceFor(
  mode: RunMode,
  plan: SequencePlan,
  targets: Float64Array,
  qInitial: ArrayLike<number>,
  pointingAxes?: Float64Array,
): ReferenceSource {
  if (plan.tracking) return trackingReference(plan.tracking, mode);
  return mode === 'follow-plan' ? followPlanReference(plan, pointingAxes) : stepTargetReference(plan, targets, qInitial, pointingAxes);
}

/** The flight of one controller in one mode of a scenario, as the pipeline flies it. */
export function scenarioFlight(
  s: ResolvedScenario,
  v: Vehicle,
  plan: SequencePlan,
  targets: Float64Array,
  c: BuiltController,
  mode: RunMode,
  shouldStop?: () => boolean,
): Flight {
  return {
    vehicle: v,
    controller: c,
    mode,
    reference: referenceFor(mode, plan, targets, s.initial.qInertialFromBody, pointingAxesOf(s.targets) ?? undefined),
    initial: { q: s.initial.qInertialFromBody, omega: s.initial.omegaBody, hWheel: s.initial.hWheelNms },
    tEnd: flightEndS(s, plan),
    timing: s.simulation.timing,
    controlRateHz: s.vehicle.controlRateHz,
    rk4StepsPerSample: s.simulation.rk4StepsPerSample,
    sensors: {
      attitudeSigmaRad: s.vehicle.sensors.attitudeNoiseRad,
      rateSigmaRadPerS: s.vehicle.sensors.rateNoiseRadPerS,
      rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
      adversarialEta: s.vehicle.sensors.boundedNoiseEta,
      adversarialMode: s.vehicle.sensors.boundedNoiseMode,
      antipodalNoiseRad: s.vehicle.sensors.antipodalNoiseRad ?? 0,
    },
    seed: s.simulation.seed,
    actuation: s.vehicle.actuation,
    ...(mode === 'step-target' && s.simulation.endWhenSettledForS > 0
      ? {
          earlyStop: {
            settledForS: s.simulation.endWhenSettledForS,
            angleRad: s.simulation.settleAngleRad,
            rateRadPerS: s.simulation.settleRateRadPerS,
          },
        }
      : {}),
    shouldStop,
  };
}

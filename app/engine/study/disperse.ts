/**
 * A study case as a scenario: the nominal resolved scenario with one case's draw applied. The
 * case is then an ordinary scenario in every respect — the pipeline's own stages build, plan and
 * fly it (runCase.ts), and toScenarioFile writes it as a file that flies the same way.
 *
 * What a case changes (sample.ts draws it):
 *  - the TRUE inertia (the simulation flies it), while the controllers and the planner keep the
 *    nominal one as their model (vehicle.modelInertiaKgm2): an honest study flies the nominal
 *    design on a dispersed vehicle;
 *  - the wheels: degraded torque and momentum limits, one wheel lost; the controllers and the
 *    planner know the case's wheel set and limits, as wheel-health monitoring would tell them;
 *  - sensors (attitude noise, rate bias, worst-case bounded noise ē), control rate, actuation;
 *  - the start: attitude, body rate (wheel momentum of the kept wheels as nominal);
 *  - one target (the nominal first target), the study's mode, its duration and noise seed, and
 *    in step-target mode the early end once settled.
 */
import { m3FromRows } from '../math/mat3';
import type { ResolvedScenario } from '../scenario/resolve';
import type { StudyDefinition } from '../scenario/study';
import type { WheelSpec } from '../wheels/array';
import type { CaseDraw } from './sample';
import { caseTarget } from './pointingCase';

/** Quantum for quantized cases when neither the study nor the vehicle gives one, N·m (common practice, no source). */
export const FALLBACK_TORQUE_QUANTUM_NM = 1e-5;

export type CaseScenario = { ok: true; scenario: ResolvedScenario; kept: number[] } | { ok: false; reason: string };

function inertiaDispersed(def: StudyDefinition): boolean {
  return def.inertia.momentSigmaFraction > 0 || def.inertia.axisMisalignmentSigmaRad > 0;
}

/** The nominal scenario with case `d` applied, or why the case cannot be written as a vehicle. */
/**
 * `qTarget`: the case's target attitude when the nominal first target moves (an orbit track: the
 * planned attitude at which tracking starts, StudyContext.target); a study case regulates to it.
 */
export function disperseScenario(
  nom: ResolvedScenario,
  def: StudyDefinition,
  d: CaseDraw,
  controllerIds: readonly string[],
  qTarget?: ArrayLike<number>,
): CaseScenario {
  if (!d.inertiaRows) return { ok: false, reason: `no physical inertia in ${d.inertiaRejections} draws (dispersion too wide)` };
  const kept: number[] = [];
  const wheels: WheelSpec[] = [];
  nom.vehicle.wheels.forEach((w, i) => {
    if (i === d.failedWheel) return;
    kept.push(i);
    wheels.push({
      axis: [...w.axis],
      maxTorqueNm: w.maxTorqueNm * d.wheelTorqueFactor[i]!,
      maxMomentumNms: w.maxMomentumNms * d.wheelMomentumFactor[i]!,
      rotorInertiaKgm2: w.rotorInertiaKgm2,
    });
  });
  const v = nom.vehicle;
  const quantum = def.torqueQuantumNm ?? (v.actuation.mode === 'quantized' ? v.actuation.quantumNm : FALLBACK_TORQUE_QUANTUM_NM);
  const target = nom.targets[0]!;
  const changedWheels = d.failedWheel >= 0 || d.wheelTorqueFactor.some((f) => f !== 1) || d.wheelMomentumFactor.some((f) => f !== 1);
  const scenario: ResolvedScenario = {
    name: `${nom.name} - study case ${d.index}`.slice(0, 200),
    description: `Case ${d.index} of the robustness study of "${nom.name}" (seed ${def.seed}), written as a normal scenario.`,
    epoch: nom.epoch,
    vehicle: {
      ...v,
      inertiaKgm2: m3FromRows(d.inertiaRows),
      modelInertiaKgm2: inertiaDispersed(def) ? (v.modelInertiaKgm2 ?? v.inertiaKgm2) : v.modelInertiaKgm2,
      wheelLayout: changedWheels ? 'custom' : v.wheelLayout,
      wheels,
      sensors: {
        attitudeNoiseRad: d.attitudeNoiseRad,
        rateNoiseRadPerS: v.sensors.rateNoiseRadPerS,
        rateBiasRadPerS: Float64Array.from(d.rateBiasRadPerS),
        boundedNoiseEta: d.adversarialEta,
        boundedNoiseMode: v.sensors.boundedNoiseMode,
        antipodalNoiseRad: d.antipodalNoiseRad ?? 0,
      },
      controlRateHz: d.controlRateHz,
      actuation: d.actuation === 'quantized' ? { mode: 'quantized', quantumNm: quantum } : { mode: d.actuation },
    },
    initial: {
      form: 'quaternion',
      qInertialFromBody: Float64Array.from(d.q0),
      omegaBody: Float64Array.from(d.omega0RadPerS),
      hWheelNms: Float64Array.from(kept, (i) => nom.initial.hWheelNms[i]!),
    },
    // A pointing-only first target is reduced from the case's own start; otherwise the case regulates
    // to the planned attitude (for a moving target, where tracking starts).
    targets: [
      target.pointingOnly || !qTarget
        ? caseTarget(target, d.q0)
        : { label: target.label, form: 'quaternion', qInertialFromBody: Float64Array.from(qTarget), holdS: target.holdS },
    ],
    controllers: controllerIds.map((id) => nom.controllers.find((c) => c.id === id)!),
    planning: nom.planning,
    simulation: {
      ...nom.simulation,
      modes: [def.mode],
      seed: d.noiseSeed,
      durationS: def.durationS,
      endWhenSettledForS: def.mode === 'step-target' ? def.stopAfterSettledForS : 0,
    },
    keepOut: nom.keepOut,
    constraints: nom.constraints,
    study: null,
  };
  return { ok: true, scenario, kept };
}

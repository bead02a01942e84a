/**
 * A study's fixed part, built once per worker: the nominal scenario through the normal pipeline
 * (validate, resolve, vehicle, controllers with their certificates) and the study definition.
 *
 * Model split (an honest robustness study flies the NOMINAL design on a DISPERSED vehicle):
 * - the controllers are tuned on the nominal inertia and keep it (their gains, gyroscopic and
 *   feedforward terms use it); they learn only which wheels still work (as fault detection would
 *   tell the flight software), through the plant model object they share, which the case runner
 *   points at the case's wheel set;
 * - the truth plant (gyrostat), the wheel limits and the allocation use the case's inertia and
 *   wheels; in profiled mode the slew is planned on the nominal model from the dispersed start.
 */
import type { Issue, Result } from '../errors';
import { fail, issue, ok } from '../errors';
import type { Prepared } from '../pipeline/run';
import { prepareScenario } from '../pipeline/run';
import type { BuiltController } from '../pipeline/build';
import type { WheelSpec } from '../wheels/array';
import type { ActuationMode, StudyDefinition } from '../scenario/study';
import { defaultStudySpec } from '../scenario/study';
import type { NominalCase } from './sample';
import { MAX_CASE_INDEX } from './sample';

/** Command-line / UI overrides of the file's study block (validated like the file). */
export interface StudyOverrides {
  runs?: number;
  seed?: number;
  controllers?: readonly string[];
}

export interface StudyContext {
  /** The scenario JSON as flown (with the effective study block). */
  json: Record<string, unknown>;
  prepared: Prepared;
  def: StudyDefinition;
  nominal: NominalCase;
  controllers: BuiltController[];
  /** The nominal wheels as specs, to degrade and remove per case. */
  wheelSpecs: WheelSpec[];
  /** First target, [x, y, z, w]. */
  target: Float64Array;
  /** Nominal plant-model wheel data, restored after each case. */
  nominalAxes: Float64Array;
  nominalWheelCount: number;
  warnings: Issue[];
}

function isObj(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** The scenario JSON with the effective study block (file's block or defaults, then overrides). */
export function effectiveStudyJson(json: unknown, o: StudyOverrides = {}): { json: unknown; defaulted: boolean } {
  if (!isObj(json)) return { json, defaulted: false };
  const copy = JSON.parse(JSON.stringify(json)) as Record<string, unknown>;
  const sim = copy.simulation;
  const defaulted = copy.study === undefined;
  const seed0 = isObj(sim) && typeof sim.seed === 'number' ? sim.seed : 0;
  const base = defaulted ? defaultStudySpec({ simulation: { seed: seed0 } as never }) : copy.study;
  if (!isObj(base)) return { json: copy, defaulted };
  const st: Record<string, unknown> = { ...base };
  if (o.runs !== undefined) st.runs = o.runs;
  if (o.seed !== undefined) st.seed = o.seed;
  if (o.controllers !== undefined) st.controllers = [...o.controllers];
  copy.study = st;
  return { json: copy, defaulted };
}

export function makeStudyContext(json: unknown, overrides: StudyOverrides = {}): Result<StudyContext> {
  const eff = effectiveStudyJson(json, overrides);
  // Build only the study's controllers (a synergistic certificate costs ~0.1–0.5 s per worker);
  // with an unknown id build them all and let the study block's own check name the problem.
  const raw = eff.json as { study?: { controllers?: unknown }; controllers?: unknown };
  const want = raw?.study?.controllers;
  const have = Array.isArray(raw?.controllers) ? raw.controllers.map((c) => (isObj(c) ? c.id : undefined)) : [];
  const only = Array.isArray(want) && want.every((id) => have.includes(id)) ? (want as string[]) : undefined;
  const prep = prepareScenario(eff.json, only);
  if (!prep.ok) return fail(prep.errors, prep.warnings);
  const p = prep.value;
  const def = p.scenario.study;
  if (!def) return fail([issue('study', 'required', 'the scenario has no study block')], p.warnings);
  const warnings = [...p.warnings];
  if (eff.defaulted)
    warnings.push(
      issue(
        'study',
        'defaulted',
        `the scenario has no "study" block: running ${def.runs} cases with seed ${def.seed} and no dispersions except the noise realisation`,
      ),
    );
  if (def.runs - 1 > MAX_CASE_INDEX) return fail([issue('study.runs', 'max', `study.runs may be at most ${MAX_CASE_INDEX + 1}`)], warnings);

  const s = p.scenario;
  const ids = def.controllers;
  const controllers = ids ? ids.map((id) => p.controllers.find((c) => c.id === id)!).filter(Boolean) : p.controllers;
  const w = p.vehicle.wheels;
  const wheelSpecs: WheelSpec[] = [];
  for (let i = 0; i < w.n; i++) {
    wheelSpecs.push({
      axis: [w.axes[3 * i]!, w.axes[3 * i + 1]!, w.axes[3 * i + 2]!],
      maxTorqueNm: w.maxTorqueNm[i]!,
      maxMomentumNms: w.maxMomentumNms[i]!,
      rotorInertiaKgm2: w.rotorInertiaKgm2[i]!,
    });
  }
  const target = Float64Array.from(s.targets[0]!.qInertialFromBody);
  const nominal: NominalCase = {
    qInitial: s.initial.qInertialFromBody,
    qTarget: target,
    omega0: s.initial.omegaBody,
    inertia: p.vehicle.inertia.J,
    nWheels: w.n,
    attitudeNoiseRad: s.vehicle.sensors.attitudeNoiseRad,
    rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
    controlRateHz: s.vehicle.controlRateHz,
    actuation: s.vehicle.actuation.mode as ActuationMode,
  };
  return ok(
    {
      json: eff.json as Record<string, unknown>,
      prepared: p,
      def,
      nominal,
      controllers,
      wheelSpecs,
      target,
      nominalAxes: Float64Array.from(p.vehicle.plantModel.axes),
      nominalWheelCount: p.vehicle.plantModel.nWheels,
      warnings,
    },
    warnings,
  );
}

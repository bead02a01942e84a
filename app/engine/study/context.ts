/**
 * A study's fixed part, built once per worker: the nominal scenario through the pipeline's first
 * stages (validate, resolve, build, plan: controllers with their certificates) and the study
 * definition. Each case is then the nominal scenario with the case's dispersions applied
 * (disperse.ts), flown through the same stages (runCase.ts).
 */
import type { Issue, Result } from '../errors';
import { fail, issue, ok } from '../errors';
import type { Prepared } from '../pipeline/run';
import { preparePipeline } from '../pipeline/run';
import type { BuiltController } from '../pipeline/types';
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
  /** The nominal scenario through stages 1–4 (only the study's controllers built). */
  prepared: Prepared;
  def: StudyDefinition;
  nominal: NominalCase;
  /** The study's controllers on the nominal vehicle, in the study's order. */
  controllers: BuiltController[];
  /** First target, [x, y, z, w]. */
  target: Float64Array;
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
  const have: unknown[] = Array.isArray(raw?.controllers) ? raw.controllers.map((c: unknown) => (isObj(c) ? c.id : undefined)) : [];
  const only = Array.isArray(want) && want.every((id) => have.includes(id)) ? (want as string[]) : undefined;
  const prep = preparePipeline(eff.json, only);
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
  // The planned first target (for an orbit track: its attitude when tracking starts; cases regulate to it).
  const target = Float64Array.from(p.targets.subarray(0, 4));
  const nominal: NominalCase = {
    qInitial: s.initial.qInertialFromBody,
    qTarget: target,
    omega0: s.initial.omegaBody,
    inertia: p.vehicle.inertia.J,
    nWheels: p.vehicle.wheels.n,
    attitudeNoiseRad: s.vehicle.sensors.attitudeNoiseRad,
    rateBiasRadPerS: s.vehicle.sensors.rateBiasRadPerS,
    controlRateHz: s.vehicle.controlRateHz,
    actuation: s.vehicle.actuation.mode as ActuationMode,
    ...(s.targets[0]!.pointingOnly ? { pointing: s.targets[0]!.pointingOnly } : {}),
  };
  return ok({ json: eff.json as Record<string, unknown>, prepared: p, def, nominal, controllers, target, warnings }, warnings);
}

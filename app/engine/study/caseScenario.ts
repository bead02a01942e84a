/**
 * One study case, outside the study:
 * - `studyCaseScenario`: the case written as a plain scenario file (dispersed inertia, wheels as
 *   a custom layout, sensors, control rate, actuation, start as a quaternion, the first target as
 *   a quaternion, the case's noise seed), so the app or the CLI opens it as a normal run. What a
 *   scenario file cannot say is listed in its description (worst-case noise ē, the nominal-model
 *   design of the eigenaxis law and of a profiled plan, the early stop).
 * - `rerunStudyCase`: the exact study run of that case with full traces, as pipeline runs (so the
 *   normal views can show a worst case); deterministic from (seed, index), nothing is stored.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import { Eigenaxis } from '../control/eigenaxis';
import { Hysteretic, QuaternionPd, SignSwitch } from '../control/quaternionLaws';
import { Synergistic } from '../control/synergistic';
import type { BuiltController } from '../pipeline/build';
import { prepareScenario } from '../pipeline/run';
import type { ControllerRun, LogicKind } from '../pipeline/types';
import type { StudyOverrides } from './context';
import { makeStudyContext } from './context';
import type { CaseDraw } from './sample';
import { drawCase } from './sample';
import { buildCaseVehicle, caseReference, flyCase, monitorOf } from './runCase';
import { ARCSEC_PER_RAD, DEG_PER_RAD } from '../units';

function checkIndex(index: number, runs: number): Issue[] {
  if (!Number.isInteger(index) || index < 0 || index >= runs) {
    return [{ path: 'index', rule: 'range', message: `case index must be a whole number from 0 to ${runs - 1} (got ${index})` }];
  }
  return [];
}

/** The controller's gains as the study flew them (nominal design), in the file's { kp, kd } form. */
function explicitGains(c: BuiltController): { kp: number; kd: number } | null {
  const k = c.controller;
  if (k instanceof QuaternionPd || k instanceof SignSwitch || k instanceof Hysteretic) return { kp: k.kp, kd: k.Kd[0]! };
  if (k instanceof Synergistic) return { kp: k.kR, kd: k.Komega[0]! };
  if (k instanceof Eigenaxis) return { kp: k.k, kd: k.c };
  return null;
}

// eslint-disable-next-line @typescript-eslint/no-explicit-any -- loose editing of a scenario JSON copy (to be replaced by scenario/toScenarioFile)
type Obj = Record<string, any>;

/**
 * The scenario file of case `index` of the study in `json` (with the same overrides the study ran
 * with). Fails with issues for a bad scenario, an index out of range, or an unflyable case.
 */
export function studyCaseScenario(json: unknown, study: StudyOverrides | undefined, index: number): Result<Obj> {
  const c = makeStudyContext(json, study ?? {});
  if (!c.ok) return fail(c.errors, c.warnings);
  const ctx = c.value;
  const bad = checkIndex(index, ctx.def.runs);
  if (bad.length) return fail(bad);
  const d = drawCase(ctx.def, ctx.nominal, index);
  const v = buildCaseVehicle(ctx, d);
  if (!v.ok) return fail([{ path: `case ${index}`, rule: 'unflyable', message: `case ${index} cannot be flown: ${v.reason}` }]);

  const src = ctx.json as Obj;
  const out: Obj = JSON.parse(JSON.stringify(src));
  delete out.study;
  const s = ctx.prepared.scenario;
  const notes: string[] = [];
  out.name = `${s.name} - study case ${index}`.slice(0, 200);
  out.vehicle.inertiaKgm2 = d.inertiaRows;
  out.vehicle.wheels = {
    layout: 'custom',
    wheels: v.value.kept.map((_i, k) => ({
      axis: [v.value.wheels.axes[3 * k], v.value.wheels.axes[3 * k + 1], v.value.wheels.axes[3 * k + 2]],
      maxTorqueMNm: v.value.wheels.maxTorqueNm[k]! * 1e3,
      maxMomentumMNms: v.value.wheels.maxMomentumNms[k]! * 1e3,
      rotorInertiaKgm2: v.value.wheels.rotorInertiaKgm2[k],
    })),
  };
  out.vehicle.sensors = {
    ...out.vehicle.sensors,
    attitudeNoiseArcsec: d.attitudeNoiseRad * ARCSEC_PER_RAD,
    rateBiasDegPerS: d.rateBiasRadPerS.map((b) => b * DEG_PER_RAD),
  };
  out.vehicle.controlRateHz = d.controlRateHz;
  out.vehicle.actuation =
    d.actuation === 'quantized' ? { mode: 'quantized', torqueQuantumMNm: (ctx.def.torqueQuantumNm ?? 1e-5) * 1e3 } : { mode: d.actuation };
  out.initial = { attitude: { quaternion: d.q0 }, bodyRateDegPerS: d.omega0RadPerS.map((w) => w * DEG_PER_RAD) };
  if (src.initial?.wheelMomentumMNms) out.initial.wheelMomentumMNms = Array.from(v.value.hWheel0, (h) => h * 1e3);
  out.targets = [{ label: s.targets[0]!.label, attitude: { quaternion: Array.from(ctx.target) }, holdS: s.targets[0]!.holdS }];
  out.controllers = ctx.controllers.map((bc) => {
    const entry = src.controllers.find((x: Obj) => x.id === bc.id);
    const copy = JSON.parse(JSON.stringify(entry));
    const g = explicitGains(bc);
    if (g && 'bandwidthRadPerS' in copy.gains) copy.gains = g;
    return copy;
  });
  out.simulation = { ...out.simulation, mode: ctx.def.mode, seed: d.noiseSeed };

  if (d.adversarialEta > 0)
    notes.push(
      `the study's worst-case noise level ē = ${d.adversarialEta} (a scenario file has no field for it: this run has random noise only)`,
    );
  if (ctx.controllers.some((bc) => bc.law === 'eigenaxis'))
    notes.push('the eigenaxis law here models the case inertia; in the study it keeps the nominal one');
  if (ctx.def.mode === 'profiled') notes.push('the slew is planned here on the case vehicle; in the study on the nominal one');
  if (d.failedWheel >= 0) notes.push(`wheel ${d.failedWheel + 1} of the nominal array is lost in this case and left out`);
  notes.push(`the study stopped a case once settled for ${ctx.def.stopAfterSettledForS} s; this run goes on to the end`);
  out.description =
    `Case ${index} of the robustness study of "${s.name}" (seed ${ctx.def.seed}), as a normal scenario. Bandwidth gains are written as the explicit gains the study flew (tuned on the nominal vehicle). Differences from the study run: ${notes.join('; ')}.`.slice(
      0,
      4000,
    );

  // Run length: the pipeline runs max(plan, 1) + tailS; aim at the study's duration.
  out.simulation.tailS = 0;
  const p = prepareScenario(out);
  if (!p.ok) return fail(p.errors, p.warnings);
  out.simulation.tailS = Math.max(0, ctx.def.durationS - Math.max(p.value.plan.totalS, 1));
  return ok(out, p.warnings);
}

const LOGIC: Record<string, LogicKind> = {
  'quaternion-pd': 'none',
  'sign-switch': 'sign',
  eigenaxis: 'none',
  hysteretic: 'sign',
  synergistic: 'index',
};

export interface StudyCaseRerun {
  draw: CaseDraw;
  runs: ControllerRun[];
}

/** The exact study run of case `index` (all study controllers, or only `controllerId`). */
export function rerunStudyCase(
  json: unknown,
  study: StudyOverrides | undefined,
  index: number,
  controllerId?: string,
): Result<StudyCaseRerun> {
  const c = makeStudyContext(json, study ?? {});
  if (!c.ok) return fail(c.errors, c.warnings);
  const ctx = c.value;
  const bad = checkIndex(index, ctx.def.runs);
  if (controllerId !== undefined && !ctx.controllers.some((x) => x.id === controllerId)) {
    bad.push({
      path: 'controller',
      rule: 'unknown-id',
      message: `the study has no controller "${controllerId}" (have: ${ctx.controllers.map((x) => x.id).join(', ')})`,
    });
  }
  if (bad.length) return fail(bad);
  const d = drawCase(ctx.def, ctx.nominal, index);
  const v = buildCaseVehicle(ctx, d);
  if (!v.ok) return fail([{ path: `case ${index}`, rule: 'unflyable', message: `case ${index} cannot be flown: ${v.reason}` }]);
  const ref = caseReference(ctx, d, v.value);
  if (!ref.ok) return fail([{ path: `case ${index}`, rule: 'unflyable', message: `case ${index} cannot be flown: ${ref.reason}` }]);
  const runs: ControllerRun[] = [];
  for (const bc of ctx.controllers) {
    if (controllerId !== undefined && bc.id !== controllerId) continue;
    const f = flyCase(ctx, d, v.value, ref.ref, bc);
    runs.push({
      key: `${bc.id}:${ctx.def.mode}`,
      controllerId: bc.id,
      label: bc.label,
      law: bc.law,
      mode: ctx.def.mode,
      logicKind: LOGIC[bc.law] ?? 'none',
      trace: f.res.trace,
      jumps: f.res.jumps,
      outcome: f.res.outcome,
      metrics: f.metrics,
      monitor: monitorOf(f, bc),
      gainNote: bc.gainNote,
    });
  }
  return ok({ draw: d, runs });
}

/**
 * The pipeline's one orchestrator (DEVELOPERS.md has the diagram):
 *
 *   validate (scenario/validate.ts) → resolve (scenario/resolve.ts) → build (build.ts)
 *     → plan (plan.ts) → fly (fly.ts, per controller and mode) → summarise (summarise.ts)
 *
 * Shared by the CLI, the app's worker and the robustness study. Synchronous and pure (no I/O);
 * progress and cancellation through callbacks.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { SequencePlan } from '../plan/types';
import { resolveScenario, type ResolvedScenario } from '../scenario/resolve';
import type { Scenario } from '../scenario/schema';
import { validateScenario } from '../scenario/validate';
import type { RunMode } from '../sim/types';
import { buildControllers, buildVehicle } from './build';
import { fly, scenarioFlight } from './fly';
import { planManeuver } from './plan';
import { planSummaryWithSavings } from './rollFreePlan';
import { bestMarks, comparisonRow } from './comparison';
import { certificates, metricContext, scenarioSummary, summariseRun, vehicleSummary } from './summarise';
import type { BuiltController, ControllerRun, PipelineOutput, Vehicle } from './types';
import { pointingLawIssues } from './pointing';

export interface PipelineOptions {
  /** Run only these controller ids (default: all in the scenario). */
  controllers?: readonly string[];
  /** Override the scenario's simulation modes. */
  modes?: readonly RunMode[];
  /** Called after each run: (done, total, label). */
  onProgress?: (done: number, total: number, label: string) => void;
  shouldStop?: () => boolean;
}

/** Stages 1–4 and the controllers: everything but the flights. */
export interface Prepared {
  /** The validated file in the current format (null when the scenario was built in memory, e.g. a study case). */
  file: Scenario | null;
  scenario: ResolvedScenario;
  vehicle: Vehicle;
  plan: SequencePlan;
  controllers: BuiltController[];
  /** Target attitudes, 4 per segment. */
  targets: Float64Array;
  warnings: Issue[];
}

/** Stages 1–4: validate, resolve, build (vehicle and controllers), plan. */
export function preparePipeline(json: unknown, only?: readonly string[]): Result<Prepared> {
  const valid = validateScenario(json);
  if (!valid.ok) return fail(valid.errors, valid.warnings);
  const r = prepareResolved(resolveScenario(valid.value), valid.value, only);
  return r.ok ? ok(r.value, [...valid.warnings, ...r.warnings]) : fail(r.errors, [...valid.warnings, ...r.warnings]);
}

/** Stages 3–4 for a resolved scenario (from a file, or built in memory such as a study case). */
export function prepareResolved(s: ResolvedScenario, file: Scenario | null, only?: readonly string[]): Result<Prepared> {
  const warnings: Issue[] = [];
  const veh = buildVehicle(s.vehicle);
  if (!veh.ok) return fail(veh.errors, [...warnings, ...veh.warnings]);
  warnings.push(...veh.warnings);
  const v = veh.value;
  const ctrls = buildControllers(s.controllers, v.design, only);
  const plan = planManeuver(s, v);
  const errors: Issue[] = pointingLawIssues(s.controllers, s.targets, only);
  if (!ctrls.ok) errors.push(...ctrls.errors);
  warnings.push(...ctrls.warnings);
  if (!plan.ok) errors.push(...plan.errors);
  if (!ctrls.ok || !plan.ok || errors.length) return fail(errors, warnings);
  const targets = new Float64Array(4 * s.targets.length);
  s.targets.forEach((t, i) => targets.set(t.qInertialFromBody, 4 * i));
  return ok({ file, scenario: s, vehicle: v, plan: plan.value, controllers: ctrls.value, targets, warnings }, warnings);
}

export interface FlyOptions {
  shouldStop?: () => boolean;
  /** Run the Lyapunov monitor (default true; studies skip it for speed). */
  monitor?: boolean;
}

/** Stages 5 and 6 for one controller in one mode. */
export function flyAndSummarise(p: Prepared, c: BuiltController, mode: RunMode, o: FlyOptions = {}): ControllerRun {
  const flight = scenarioFlight(p.scenario, p.vehicle, p.plan, p.targets, c, mode, o.shouldStop);
  const res = fly(flight);
  return summariseRun(res, c, mode, metricContext(p.scenario, p.vehicle, p.targets, p.plan, mode, flight.sensors), o.monitor ?? true);
}

/** One pass: every controller in every mode, and the comparison. */
export function runPipeline(json: unknown, opts: PipelineOptions = {}): Result<PipelineOutput> {
  const t0 = Date.now();
  const prep = preparePipeline(json, opts.controllers);
  if (!prep.ok) return fail(prep.errors, prep.warnings);
  const p = prep.value;
  const s = p.scenario;
  const modes: RunMode[] = opts.modes ? [...opts.modes] : s.simulation.modes;
  const runs: ControllerRun[] = [];
  const total = p.controllers.length * modes.length;
  for (const c of p.controllers) {
    for (const mode of modes) {
      if (opts.shouldStop?.()) break;
      runs.push(flyAndSummarise(p, c, mode, { shouldStop: opts.shouldStop }));
      opts.onProgress?.(runs.length, total, `${c.label} (${mode})`);
    }
  }
  const comparison = runs.map(comparisonRow);
  return ok(
    {
      scenario: scenarioSummary(s, p.file!),
      vehicle: vehicleSummary(p.vehicle),
      plan: planSummaryWithSavings(p),
      targets: p.targets,
      initialQ: Float64Array.from(s.initial.qInertialFromBody),
      runs,
      comparison,
      best: bestMarks(comparison),
      certificates: certificates(p.controllers),
      keepOut: s.keepOut,
      warnings: p.warnings,
      elapsedMs: Date.now() - t0,
    },
    p.warnings,
  );
}

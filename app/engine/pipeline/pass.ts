/**
 * The pipeline's one orchestrator (DEVELOPERS.md has the diagram):
 *
 *   validate (the validator it is given) → resolve (scenario/resolve.ts) → build (build.ts)
 *     → plan (plan.ts) → fly (fly.ts, per controller and mode) → summarise (summarise.ts)
 *
 * Shared by the CLI, the app's worker and the robustness study. Synchronous and pure (no I/O);
 * progress and cancellation through callbacks.
 *
 * The validator is an argument: run.ts binds scenario/validate.ts's validateScenario (what every
 * caller but the app's pipeline worker uses), while the worker loads the validator, and with it
 * the zod schemas, only when an input is not the bundled demo, whose validation was made at build
 * time (issue 12, cold start). This file must not import validate.ts or any schema module.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { SequencePlan } from '../plan/types';
import { resolveScenario, type ResolvedScenario } from '../scenario/resolve';
import type { Scenario } from '../scenario/schema';
import type { RunMode, RunTrace } from '../sim/types';
import { copyTrace, traceArena } from '../sim/trace';
import { buildControllers, buildVehicle } from './build';
import { fly, scenarioFlight } from './fly';
import { planLimits, planManeuver } from './plan';
import { planAroundConstraints, type ConstrainedSegment } from './constrainedPlan';
import { bestMarks, comparisonRow } from './comparison';
import { certificates, metricContext, scenarioSummary, summariseRun, vehicleSummary } from './summarise';
import type { BuiltController, ControllerRun, PipelineOutput, Vehicle } from './types';
import { budgetIssues, DEFAULT_BUDGET, estimateBudget, runStepCap, type RunBudget } from './budget';
import { orbitViewSamples } from '../orbit/viewSamples';
import type { OrbitViewCache } from '../orbit/viewSamplesCache';
import { buildOrbitStage, orbitExportInfo, orbitOutput, windowErrors, type OrbitStage } from './orbit';
import {
  checkPlan,
  checkRun,
  planSummaryWithConstraints,
  runEndS,
  scenarioConstraints,
  verdictWithConstraints,
  type ConstraintReport,
  type ScenarioConstraints,
} from './constraints';
import { planSummaryWithSavings } from './rollFreePlan';
import { pointingLawIssues } from './pointing';
import { runSliceIssues, type RunSlice } from './slices';
import type { PartialPass } from './partialPass';
import { runKey, type RunCache } from './runCache';
import { DISPLAY_TRACE_LIMIT, displayTraceNotice, keepForDisplay, type DisplayTraceLimit } from './displayTrace';

export interface PipelineOptions {
  /** Run only these controller ids (default: all in the scenario). */
  controllers?: readonly string[];
  /** Override the scenario's simulation modes. */
  modes?: readonly RunMode[];
  /** Called after each run flown: (runs done, total, label). */
  onProgress?: (done: number, total: number, label: string) => void;
  shouldStop?: () => boolean;
  /** Resource limits of the pass (budget.ts); default DEFAULT_BUDGET. */
  budget?: Partial<RunBudget>;
  /**
   * Fly only every `of`-th run starting at `index` (runs numbered controller-major, then mode), so
   * that `of` workers share one pass; mergeRunSlices (slices.ts) puts the parts back together.
   */
  runSlice?: RunSlice;
  /** When a run keeps a display trace instead of its full trace (displayTrace.ts); default DISPLAY_TRACE_LIMIT. */
  displayTrace?: DisplayTraceLimit;
  /** Where the orbit view samples come from when the ephemeris was sampled before (the app's worker keeps one). */
  orbitViewCache?: OrbitViewCache;
  /**
   * An early look at the pass (partialPass.ts): after the first `afterRuns` runs, `post` gets an
   * output holding just those runs (comparison and best marks over them only) and the number of
   * runs the pass will have. The pass then goes on; its final output is the same as without it.
   */
  partial?: PartialPass;
  /**
   * The runs of earlier passes (runCache.ts, the app's worker keeps one): a run whose inputs are
   * unchanged is taken from it instead of flown; the output is the same. `onProgress`, `partial`
   * and the generator's steps then count the runs flown (a pass of cached runs only has no step).
   */
  runCache?: RunCache;
}

/** Stages 1–4 and the controllers: everything but the flights. */
export interface Prepared {
  /** The validated file in the current format (null when the scenario was built in memory, e.g. a study case). */
  file: Scenario | null;
  scenario: ResolvedScenario;
  vehicle: Vehicle;
  plan: SequencePlan;
  controllers: BuiltController[];
  /** Target attitudes, 4 per segment (a moving target: its attitude when tracking starts). */
  targets: Float64Array;
  /** The scenario's attitude constraints over the run (constraints.ts), and the plan's check (null: none declared). */
  constraints: ScenarioConstraints;
  planConstraints: ConstraintReport | null;
  /** Slews planned around the constraints (constrainedPlan.ts); empty when every shortest slew was clear. */
  constrainedSegments: ConstrainedSegment[];
  warnings: Issue[];
  /** The orbit stage (ephemeris, sites, passes, eclipses) of a scenario with an orbit block, else null. */
  orbit?: OrbitStage | null;
}

/** Validation of a scenario file (stage 1): scenario/validate.ts validateScenario, or what answers for it. */
export type ScenarioValidator = (json: unknown) => Result<Scenario>;

/** Stages 1–4: validate, resolve, build (vehicle and controllers), plan. */
export function prepareWith(validate: ScenarioValidator, json: unknown, only?: readonly string[]): Result<Prepared> {
  const valid = validate(json);
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
  let orbit: OrbitStage | null = null;
  if (s.orbit) {
    const st = buildOrbitStage(s);
    warnings.push(...st.warnings);
    if (!st.ok) return fail(st.errors, warnings);
    orbit = st.value;
  }
  const plan = planManeuver(s, v, orbit);
  const errors: Issue[] = pointingLawIssues(s.controllers, s.targets, only);
  if (!ctrls.ok) errors.push(...ctrls.errors);
  warnings.push(...ctrls.warnings);
  if (!plan.ok) errors.push(...plan.errors);
  if (!ctrls.ok || !plan.ok || errors.length) return fail(errors, warnings);
  const ephemeris = orbit?.ephemeris ?? null;
  let sc = scenarioConstraints(s, plan.value, ephemeris);
  if (!sc.ok) return fail(sc.errors, warnings);
  let planned = plan.value;
  let planConstraints = checkPlan(planned, sc.value, runEndS(s, planned));
  let constrainedSegments: ConstrainedSegment[] = [];
  // Replanning around cones is for rest-to-rest slews; a tracking plan (orbit targets) is checked only.
  if (planConstraints && !planConstraints.clear && !planned.tracking) {
    const around = planAroundConstraints(
      planned,
      planConstraints,
      sc.value.constraints,
      s.targets.map((x) => x.holdS),
      planLimits(s, v),
    );
    if (around) {
      planned = around.plan;
      constrainedSegments = around.segments;
      sc = scenarioConstraints(s, planned, ephemeris);
      if (!sc.ok) return fail(sc.errors, warnings);
      planConstraints = checkPlan(planned, sc.value, runEndS(s, planned));
    }
  }
  const targets = new Float64Array(4 * s.targets.length);
  s.targets.forEach((t, i) => targets.set(t.qInertialFromBody, 4 * i));
  for (const e of planned.tracking?.entries ?? []) targets.set(e.qTrack, 4 * e.target);
  warnings.push(...plan.warnings);
  return ok(
    {
      file,
      scenario: s,
      vehicle: v,
      plan: planned,
      controllers: ctrls.value,
      targets,
      constraints: sc.value,
      planConstraints,
      constrainedSegments,
      warnings,
      orbit,
    },
    warnings,
  );
}

export interface FlyOptions {
  shouldStop?: () => boolean;
  /** Run the Lyapunov monitor (default true; studies skip it for speed). */
  monitor?: boolean;
  /** RK4 steps after which the run stops as truncated (budget.ts runStepCap). */
  maxSteps?: number;
  /** Keep each constraint's margin series on the run (default true; studies skip it for speed). */
  constraintSeries?: boolean;
  /** Record the full trace into this reused memory (sim/trace.ts traceArena): the caller copies what it keeps. */
  traceArena?: RunTrace;
}

/** Stages 5 and 6 for one controller in one mode. */
export function flyAndSummarise(p: Prepared, c: BuiltController, mode: RunMode, o: FlyOptions = {}): ControllerRun {
  const flight = scenarioFlight(p.scenario, p.vehicle, p.plan, p.targets, c, mode, o.shouldStop);
  const res = fly({
    ...flight,
    ...(o.maxSteps !== undefined ? { maxSteps: o.maxSteps } : {}),
    ...(o.traceArena ? { traceArena: o.traceArena } : {}),
  });
  const run = summariseRun(res, c, mode, metricContext(p.scenario, p.vehicle, p.targets, p.plan, mode, flight.sensors), o.monitor ?? true);
  if (p.plan.tracking) run.windowErrors = windowErrors(res.trace, p.plan.tracking);
  const checked = checkRun(run.trace, p.constraints, o.constraintSeries ?? true);
  return checked ? { ...run, constraints: checked, verdict: verdictWithConstraints(run.verdict, checked) } : run;
}

/** One pass: every controller in every mode, and the comparison. */
export function runWith(validate: ScenarioValidator, json: unknown, opts: PipelineOptions = {}): Result<PipelineOutput> {
  const pass = passWith(validate, json, opts);
  let step = pass.next();
  while (!step.done) step = pass.next();
  return step.value;
}

/** Where a resumable pass stopped: `done` of its `total` runs have flown. */
export interface PassStep {
  done: number;
  total: number;
}

/**
 * runWith one run at a time: the generator stops after each run (and its `partial` post) and
 * goes on at the next `next()`, so a caller can answer messages between runs (the app's worker
 * paints the first run before the rest) and resume the same pass instead of flying it again. The
 * value it returns is runWith's result; `elapsedMs` counts only the time spent inside it.
 */
export function* passWith(
  validate: ScenarioValidator,
  json: unknown,
  opts: PipelineOptions = {},
): Generator<PassStep, Result<PipelineOutput>, void> {
  let t0 = Date.now();
  const prep = prepareWith(validate, json, opts.controllers);
  if (!prep.ok) return fail(prep.errors, prep.warnings);
  const p = prep.value;
  const s = p.scenario;
  const modes: RunMode[] = opts.modes ? [...opts.modes] : s.simulation.modes;
  // The budget before any flight: a pass that would not fit is refused at once, naming its drivers.
  const display = opts.displayTrace ?? DISPLAY_TRACE_LIMIT;
  const estimate = estimateBudget(s, p.plan, p.controllers.length, modes, display);
  const overBudget = budgetIssues(estimate, s, p.plan, { ...DEFAULT_BUDGET, ...opts.budget });
  if (overBudget.length) return fail(overBudget, p.warnings);
  const maxSteps = runStepCap(estimate);
  // Runs that keep display traces record their full traces one after the other into one arena.
  const arena = estimate.display ? traceArena(s.vehicle.wheels.length, estimate.samplesPerRun + 8) : undefined;
  const slice = opts.runSlice ?? { index: 0, of: 1 };
  const badSlice = runSliceIssues(slice);
  if (badSlice.length) return fail(badSlice, p.warnings);
  // The runs of this pass (or slice), in pass order; with a run cache, those of an unchanged key
  // are taken from it and only the others are flown, in the same order as without it.
  // `claim`: a run of the cache, copied only after the changed runs have flown (and the first posted).
  const planned: {
    c: BuiltController;
    mode: RunMode;
    key: string | null;
    run: ControllerRun | null;
    claim: (() => ControllerRun) | null;
    flown?: boolean;
  }[] = [];
  let k = 0;
  for (const c of p.controllers)
    for (const mode of modes) if (k++ % slice.of === slice.index) planned.push({ c, mode, key: null, run: null, claim: null });
  const total = planned.length;
  const cache = opts.runCache;
  if (cache) {
    const settings = { modes, maxSteps, displayTraceLimit: display };
    for (const e of planned) {
      e.key = runKey(s, e.c.id, e.mode, settings);
      if (e.key !== null) e.claim = cache.claim(e.key);
    }
  }
  const runs = (): ControllerRun[] => planned.flatMap((e) => (e.run ? [e.run] : []));
  let have = planned.filter((e) => e.claim).length;
  let flown = 0;
  for (const e of planned) {
    if (e.claim) continue;
    if (opts.shouldStop?.()) break;
    // Everything that reads the full trace is done inside flyAndSummarise; a long run then keeps a
    // display trace, and the next run overwrites its full trace in the arena.
    const run = keepForDisplay(flyAndSummarise(p, e.c, e.mode, { shouldStop: opts.shouldStop, maxSteps, traceArena: arena }), display);
    // A run that ended early (short enough to keep in full) must not stay in the arena the next run overwrites.
    e.run = arena && run.traceKind !== 'display' ? { ...run, trace: copyTrace(run.trace) } : run;
    e.flown = true;
    have++;
    flown++;
    opts.onProgress?.(have, total, `${e.c.label} (${e.mode})`);
    if (opts.partial && flown === opts.partial.afterRuns && have < total) {
      // Same assembly as the end of the pass, over the runs flown so far and a copy of the warnings.
      // Runs taken from the cache are left out: they equal runs the renderer already shows (it keeps
      // the previous traces of the runs still to come), and copying them into the early reply cost
      // the page more than the flight (five of the demo's six runs cloned for a gain edit).
      const early = [...p.warnings];
      const sofar = planned.flatMap((e) => (e.run && e.flown ? [e.run] : []));
      const note = displayTraceNotice(sofar, s.simulation.durationS != null ? 'simulation.durationS' : 'targets', display);
      if (note) early.push(note);
      opts.partial.post(assembleOutput(p, sofar, early, opts, t0), total);
    }
    // Stored after the early post (its copy is not on the way to the first plot). A run cut short
    // by shouldStop is not the run its inputs give.
    if (cache && e.key !== null && !opts.shouldStop?.()) cache.put(e.key, e.run);
    const paused = Date.now();
    yield { done: have, total };
    t0 += Date.now() - paused;
  }
  for (const e of planned) if (e.claim && !e.run) e.run = e.claim();
  if (cache && have === total) cache.keepOnly(new Set(planned.flatMap((e) => (e.key === null ? [] : [e.key]))));
  const done = runs();
  const shown = displayTraceNotice(done, s.simulation.durationS != null ? 'simulation.durationS' : 'targets', display);
  if (shown) p.warnings.push(shown);
  return ok(assembleOutput(p, done, p.warnings, opts, t0), p.warnings);
}

/** The output of a pass from its prepared stages and its runs (stage 6's tail). */
function assembleOutput(p: Prepared, runs: ControllerRun[], warnings: Issue[], opts: PipelineOptions, t0: number): PipelineOutput {
  const s = p.scenario;
  const comparison = runs.map(comparisonRow);
  const orbit = p.orbit ? orbitOutput(s, p.orbit, p.plan.tracking ?? null) : null;
  const summary = scenarioSummary(s, p.file!);
  if (orbit) {
    summary.orbit = orbitExportInfo(orbit);
    summary.targets.forEach((t, i) => t.q.set(p.targets.subarray(4 * i, 4 * i + 4)));
  }
  return {
    scenario: summary,
    vehicle: vehicleSummary(p.vehicle),
    plan: planSummaryWithConstraints(planSummaryWithSavings(p), p.planConstraints, p.plan, p.constrainedSegments),
    targets: p.targets,
    initialQ: Float64Array.from(s.initial.qInertialFromBody),
    runs,
    comparison,
    best: bestMarks(comparison),
    certificates: certificates(p.controllers),
    keepOut: s.keepOut,
    constraints: p.constraints.info,
    warnings,
    elapsedMs: Date.now() - t0,
    orbit,
    orbitView: p.orbit ? (opts.orbitViewCache?.samples(p.orbit.ephemeris) ?? orbitViewSamples(p.orbit.ephemeris)) : null,
  };
}

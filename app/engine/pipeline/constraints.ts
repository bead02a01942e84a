/**
 * Attitude constraints in the pipeline: the scenario's `constraints` list and its older `keepOut`
 * cones (read as keep-out constraints against fixed directions) turned into the constraint
 * library's AttitudeConstraint list over the span of the run (constraints/directions.ts), the
 * targets checked against them, and every planned reference and every flown run checked
 * (constraints/check.ts): violation intervals, minimum margin and its time, per constraint.
 *
 * Words: a plan whose reference violates a constraint is not feasible (PlanSummary.feasible
 * false, the segment's reason names the constraint); a run that violates one keeps its settle
 * verdict and gets the violation in its verdict text; the comparison's "Constraint margin"
 * column is the smallest margin over every constraint.
 */
import { checkAttitudeHistory } from '../constraints/check';
import { constraintsOver, type ConstraintSpec, type DirectionKind, type SkyContext } from '../constraints/directions';
import type { AttitudeConstraint, HistoryCheck, ViolationInterval } from '../constraints/types';
import { attitudeViolations, prepareConstraints } from '../constraints/validate';
import { fail, issue, ok, type Issue, type Result } from '../errors';
import type { Ephemeris } from '../orbit/ephemeris';
import { evaluateReference } from '../plan/reference';
import { trackingReference } from '../sim/trackingReference';
import type { SequencePlan } from '../plan/types';
import { keepOutSpecs } from '../scenario/constraintResolve';
import type { ResolvedScenario } from '../scenario/resolve';
import type { RunTrace } from '../sim/types';
import { parseUtcIso } from '../time/iso';
import { DEG_PER_RAD, RAD_PER_DEG } from '../units';
import type { PlanSummary, RunVerdict, SegmentSummary } from './types';
import type { ConstrainedSegment } from './constrainedPlan';

/** A declared constraint as the reports show it (SI). */
export interface ConstraintInfo {
  name: string;
  /** Where it was declared: `constraints[2]` or `keepOut[0]`. */
  path: string;
  kind: 'keep-out' | 'keep-in';
  bodyAxis: [number, number, number];
  halfAngleRad: number;
  marginRad: number;
  directionKind: DirectionKind;
  window: { startS: number; endS: number } | null;
}

/** The check of one constraint over a plan or a run. */
export interface ConstraintOutcome {
  name: string;
  kind: 'keep-out' | 'keep-in';
  /** Smallest margin (rad) and when; NaN when the window holds no sample. */
  minMarginRad: number;
  minAtS: number;
  violatedS: number;
  intervals: ViolationInterval[];
}

/** Every constraint over one plan or run. */
export interface ConstraintReport {
  clear: boolean;
  /** Smallest margin over every constraint (rad); NaN when nothing was checked. */
  minimumMarginRad: number;
  constraints: ConstraintOutcome[];
}

/** A flown run's report with its margin series (rad per trace sample, NaN outside the window), in the constraints' order; empty when not asked for (studies). */
export interface RunConstraintReport extends ConstraintReport {
  marginRad: Float64Array[];
}

/** The scenario's constraints, checkable over its run. */
export interface ScenarioConstraints {
  info: ConstraintInfo[];
  constraints: AttitudeConstraint[];
}

/** Every constraint the scenario declares, in order: the `keepOut` cones first, then `constraints`. */
export function scenarioConstraintSpecs(s: ResolvedScenario): ConstraintSpec[] {
  return [...keepOutSpecs(s.keepOut), ...s.constraints];
}

/** Largest body turn between two plan samples of a slew (rad): 0.1°. */
const PLAN_SLEW_STEP_RAD = 0.1 * RAD_PER_DEG;
/** Plan samples during holds (s): the Sun and Moon turn by under 0.01° in this time. */
const PLAN_HOLD_STEP_S = 60;

/** The run's span [0, end] (s), as fly.ts sets it. */
export function runEndS(s: ResolvedScenario, plan: SequencePlan): number {
  return s.simulation.durationS ?? Math.max(plan.totalS, 1) + s.simulation.tailS;
}

/**
 * The scenario's constraints with their directions over the run, checked against every target at
 * its arrival (a target inside a keep-out cone, or outside a keep-in one, can never be held there:
 * refused, naming the target and the constraint). Sources that need the spacecraft position are
 * refused without an ephemeris. Empty when the scenario declares none.
 */
export function scenarioConstraints(
  s: ResolvedScenario,
  plan: SequencePlan,
  ephemeris: Ephemeris | null = null,
): Result<ScenarioConstraints> {
  const specs = scenarioConstraintSpecs(s);
  if (specs.length === 0) return ok({ info: [], constraints: [] });
  const epoch = parseUtcIso(s.epoch.utc, 'epochUtc');
  const ctx: SkyContext = { epochTaiS: epoch.ok ? epoch.value.taiS : NaN, ephemeris };
  const made = constraintsOver(specs, ctx, 0, runEndS(s, plan) + 1);
  if (!made.ok) return fail(made.errors);
  const prepared = prepareConstraints(made.value);
  if (!prepared.ok) return fail(prepared.errors.map((e) => relabel(e, specs)));
  const errors: Issue[] = [];
  plan.timeline.forEach((e, k) => {
    if (plan.timeline[k + 1]?.target === e.target) return; // a leg of a constrained slew: the target is reached at the last
    const q = s.targets[e.target]!.qInertialFromBody;
    const found = attitudeViolations(q, prepared.value, e.slewEndS, `targets[${e.target}].attitude`);
    for (const v of found) {
      errors.push(issue(v.path, v.rule, `${v.message}: the target "${e.label}" itself is where the constraint forbids`));
    }
  });
  if (errors.length) return fail(errors);
  const info = specs.map<ConstraintInfo>((c) => ({
    name: c.name,
    path: c.path,
    kind: c.kind,
    bodyAxis: [c.bodyAxis[0]!, c.bodyAxis[1]!, c.bodyAxis[2]!],
    halfAngleRad: c.halfAngleRad,
    marginRad: c.marginRad,
    directionKind: c.direction.kind,
    window: c.window,
  }));
  return ok({ info, constraints: made.value });
}

/** The library names constraints by index (`constraints[k]`); the file's path is what the user sees. */
function relabel(e: Issue, specs: readonly ConstraintSpec[]): Issue {
  const m = /^constraints\[(\d+)\]/.exec(e.path);
  const spec = m ? specs[Number(m[1])] : undefined;
  if (!spec) return e;
  const path = spec.path + e.path.slice(m![0].length);
  return { ...e, path, message: e.message.split(m![0]).join(spec.path) };
}

function reportOf(h: HistoryCheck): ConstraintReport {
  return {
    clear: h.clear,
    minimumMarginRad: h.minimumMarginRad,
    constraints: h.constraints.map((c) => ({
      name: c.name,
      kind: c.kind,
      minMarginRad: c.minMarginRad,
      minAtS: c.minAtS,
      violatedS: c.violatedS,
      intervals: c.intervals,
    })),
  };
}

/** Sample times of a plan's reference: each slew at ≤ 0.1° of body turn per step, holds every 60 s. */
export function planSampleTimes(plan: SequencePlan, endS: number): Float64Array {
  if (plan.tracking) return trackingSampleTimes(plan, endS);
  const t: number[] = [0];
  const push = (x: number) => {
    if (x > t[t.length - 1]!) t.push(x);
  };
  const fill = (a: number, b: number, steps: number) => {
    for (let k = 1; k <= steps; k++) push(a + ((b - a) * k) / steps);
  };
  let cursor = 0;
  for (const e of plan.timeline) {
    fill(cursor, e.slewStartS, Math.ceil((e.slewStartS - cursor) / PLAN_HOLD_STEP_S));
    fill(e.slewStartS, e.slewEndS, Math.max(8, Math.ceil(e.plan.angleRad / PLAN_SLEW_STEP_RAD)));
    fill(e.slewEndS, e.holdEndS, Math.ceil((e.holdEndS - e.slewEndS) / PLAN_HOLD_STEP_S));
    cursor = e.holdEndS;
  }
  fill(cursor, endS, Math.ceil((endS - cursor) / PLAN_HOLD_STEP_S));
  return Float64Array.from(t);
}

/**
 * Sample times of a tracking plan (orbit targets): the targets move during their holds (a site
 * pass turns the line of sight by up to about 1°/s in low orbit), so every TRACKING_STEP_S, and
 * slews every TRACKING_SLEW_STEP_S (common practice, no source: fine against the cones' degrees).
 */
function trackingSampleTimes(plan: SequencePlan, endS: number): Float64Array {
  const t: number[] = [0];
  const fill = (a: number, b: number, dt: number) => {
    const steps = Math.max(1, Math.ceil((b - a) / dt));
    for (let k = 1; k <= steps; k++) {
      const x = a + ((b - a) * k) / steps;
      if (x > t[t.length - 1]!) t.push(x);
    }
  };
  let cursor = 0;
  for (const e of plan.tracking!.entries) {
    fill(cursor, e.slewStartS, TRACKING_STEP_S);
    fill(e.slewStartS, e.trackStartS, TRACKING_SLEW_STEP_S);
    cursor = e.trackStartS;
  }
  fill(cursor, endS, TRACKING_STEP_S);
  return Float64Array.from(t);
}

const TRACKING_STEP_S = 1;
const TRACKING_SLEW_STEP_S = 0.1;

/** Check the planned reference over [0, endS] (a tracking plan through its own reference, follow-plan). */
export function checkPlan(plan: SequencePlan, sc: ScenarioConstraints, endS: number): ConstraintReport | null {
  if (sc.constraints.length === 0) return null;
  const t = planSampleTimes(plan, endS);
  const q = new Float64Array(4 * t.length);
  const qi = new Float64Array(4),
    w = new Float64Array(3),
    wd = new Float64Array(3);
  const tracking = plan.tracking ? trackingReference(plan.tracking, 'follow-plan') : null;
  t.forEach((ti, k) => {
    if (tracking) tracking.at(ti, qi, w, wd);
    else evaluateReference(plan, ti, qi, w, wd);
    q.set(qi, 4 * k);
  });
  const r = checkAttitudeHistory({ timesS: t, qInertialFromBody: q }, sc.constraints);
  return r.ok ? reportOf(r.value) : null;
}

/** Check a flown run on its own samples, with the margin series for the plots and the exports. */
export function checkRun(trace: RunTrace, sc: ScenarioConstraints, series = true): RunConstraintReport | null {
  if (sc.constraints.length === 0 || trace.n === 0) return null;
  const r = checkAttitudeHistory(
    { timesS: trace.t.subarray(0, trace.n), qInertialFromBody: trace.q.subarray(0, 4 * trace.n) },
    sc.constraints,
    { series },
  );
  if (!r.ok) return null;
  return {
    ...reportOf(r.value),
    marginRad: series ? r.value.constraints.map((c) => c.marginRad ?? new Float64Array(trace.n).fill(NaN)) : [],
  };
}

const deg = (rad: number, digits = 2) => `${(rad * DEG_PER_RAD).toFixed(digits)}°`;

/** "keep-out "Star tracker Sun exclusion" violated 12.3 s (from t = 4.0 s; margin −3.10° at t = 9.5 s)". */
export function violationText(c: ConstraintOutcome): string {
  const first = c.intervals[0]!;
  return `${c.kind} "${c.name}" violated ${c.violatedS.toFixed(1)} s (from t = ${first.startS.toFixed(1)} s; margin ${deg(c.minMarginRad)} at t = ${c.minAtS.toFixed(1)} s)`;
}

/** The verdict with the run's violations said in words (kind unchanged: settling is a separate question). */
export function verdictWithConstraints(v: RunVerdict, r: ConstraintReport | null): RunVerdict {
  if (!r || r.clear) return v;
  const bad = r.constraints.filter((c) => c.intervals.length > 0);
  return { kind: v.kind, text: `${v.text}; VIOLATES ${bad.map(violationText).join('; ')}` };
}

/**
 * The plan summary with the constraint check: a segment whose slew or hold violates a constraint is
 * not feasible and says which; the plan is feasible only when every segment is.
 */
export function planSummaryWithConstraints(
  p: PlanSummary,
  r: ConstraintReport | null,
  plan?: SequencePlan,
  around: readonly ConstrainedSegment[] = [],
): PlanSummary {
  if (!r) return p;
  const segments = p.segments.map((segIn) => {
    const seg = plan ? withLegs(segIn, plan, around) : segIn;
    const hits = r.constraints.flatMap((c) =>
      c.intervals.filter((iv) => iv.endS > seg.tStart && iv.startS < seg.tEnd).map((iv) => ({ c, iv })),
    );
    if (!hits.length) return seg;
    const words = hits.map(
      ({ c, iv }) =>
        `${c.kind} "${c.name}" violated from t = ${iv.startS.toFixed(1)} s to ${iv.endS.toFixed(1)} s (margin ${deg(iv.minMarginRad)} at t = ${iv.minAtS.toFixed(1)} s)`,
    );
    return { ...seg, feasible: false, reason: `${words.join('; ')}${seg.reason ? `; ${seg.reason}` : ''}` };
  });
  const totalTimeS = plan ? plan.totalS : p.totalTimeS;
  return {
    ...p,
    feasible: p.feasible && r.clear,
    totalTimeS,
    segments,
    constraints: r,
    ...(around.length ? { constrainedSlews: [...around] } : {}),
  };
}

/** A segment flown as several legs (a constrained slew): its slew time and end from the legs, its reason from the planner. */
function withLegs(seg: SegmentSummary, plan: SequencePlan, around: readonly ConstrainedSegment[]): SegmentSummary {
  const a = around.find((x) => x.index === seg.index);
  if (!a) return seg;
  const legs = plan.timeline.filter((e) => e.target === seg.index);
  const first = legs[0],
    last = legs[legs.length - 1];
  if (!first || !last || !seg.feasible) return { ...seg, reason: `${a.message}; ${seg.reason}` };
  return {
    ...seg,
    tStart: first.slewStartS,
    slewTimeS: last.slewEndS - first.slewStartS,
    tEnd: last.holdEndS,
    reason: `${a.message}. ${seg.reason}`,
  };
}

/**
 * The resource budget of one pipeline pass, checked before anything is flown: from the prepared
 * scenario (planned duration or simulation.durationS, control rate, RK4 steps per sample, timing,
 * wheel count) and the runs asked for (controllers × modes) it estimates the samples each run
 * records, the memory all traces hold together and the compute time, and refuses a pass that
 * would exceed any limit with one issue per limit, naming the fields that drive it and the limit.
 * The CLI and the app both run the pipeline, so both get the same refusal; README ("Resource
 * limits") states the same numbers.
 *
 * The estimate is deterministic (counts, not clocks): samples = ⌈t_end · f⌉ + 1 per run (plus two
 * per segment switch in the continuous-ideal mode, which records at each switch), trace bytes =
 * samples × the bytes of one sample of every trace channel (sim/trace.ts) for every run when runs are
 * short, but for runs that keep a display trace (displayTrace.ts) one full trace in flight plus every
 * run's display trace at its bound (the changes of j, segment and logic a display trace also keeps
 * are not known before flying and are not counted, like the jump lists), time = samples and RK4
 * steps weighted by costs measured on the project's 2-core reference machine (test/bench/pipeline.ts
 * prints the measured figures; the weights are rounded up from them). Each run also gets a step
 * cap a little above its estimate (runStepCap), so a run that somehow needs more work than
 * estimated stops as truncated ('max-steps') instead of running on.
 */
import type { Issue } from '../errors';
import type { SequencePlan } from '../plan/types';
import type { ResolvedScenario } from '../scenario/resolve';
import { TRACE_CHANNELS, channelWidth } from '../sim/trace';
import type { RunMode } from '../sim/types';
import { flightEndS } from './fly';
import { DISPLAY_TRACE_LIMIT, displaySamplesBound, type DisplayTraceLimit } from './displayTrace';

export interface RunBudget {
  /** Samples one run may record (a run's exports hold one row per sample). */
  maxSamplesPerRun: number;
  /** Bytes all traces of one pass may hold together. */
  maxTraceBytes: number;
  /** Estimated compute time of one pass, s, on the reference machine. */
  maxComputeS: number;
}

/**
 * One million samples per run (27.8 h at 10 Hz), 1 GiB of traces per pass, 15 minutes of estimated
 * compute: a 24 h run at 10 Hz with three controllers in two modes fits (one full trace of 304 MB in
 * flight plus six display traces of 7.03 MB: 346 MB, about 3 min).
 */
export const DEFAULT_BUDGET: Readonly<RunBudget> = {
  maxSamplesPerRun: 1_000_000,
  maxTraceBytes: 1024 ** 3,
  maxComputeS: 15 * 60,
};

/**
 * Cost weights, s, rounded up from test/bench/pipeline.ts (µs per trace sample) on the reference machine (2 shared cores,
 * Node 20): a recorded sample of the sampled loop (sensors, law, allocation, limits, metrics)
 * about 9–35 µs, each further RK4 step of the sampled loop about 2–3 µs, each RK4 step of the
 * continuous-ideal loop (four flow evaluations, each with the law and the wheel limits) about
 * 15–30 µs.
 */
const COST_PER_SAMPLE_S = 35e-6;
const COST_PER_SAMPLED_STEP_S = 3e-6;
const COST_PER_IDEAL_STEP_S = 30e-6;

export interface BudgetEstimate {
  /** Runs of the pass: controllers × modes. */
  runs: number;
  controllers: number;
  modes: number;
  /** Simulated time of each run, s, and the control rate, Hz. */
  durationS: number;
  rateHz: number;
  /** Samples and RK4 steps of one run (the longest). */
  samplesPerRun: number;
  stepsPerRun: number;
  /** Bytes of one trace sample and of all traces of the pass (what it holds at its peak). */
  bytesPerSample: number;
  traceBytes: number;
  /** Whether each run keeps a display trace (longer than the display limit), and the samples and bytes each run keeps. */
  display: boolean;
  keptSamplesPerRun: number;
  keptBytesPerRun: number;
  /** Estimated compute time of the pass, s. */
  computeS: number;
}

/** Bytes of one trace sample with `nWheels` wheels: every channel of sim/trace.ts plus j and segment (Int32). */
export function traceBytesPerSample(nWheels: number): number {
  let doubles = 0;
  for (const name of TRACE_CHANNELS) doubles += channelWidth(name, nWheels);
  return 8 * doubles + 2 * 4;
}

/** RK4 steps one control period takes: rk4StepsPerSample, plus one per wheel pulse edge under PWM. */
function stepsPerSample(s: ResolvedScenario): number {
  const rk = Math.max(1, Math.round(s.simulation.rk4StepsPerSample));
  return s.vehicle.actuation.mode === 'pwm' && s.simulation.timing === 'sampled' ? rk + s.vehicle.wheels.length : rk;
}

/** The estimate for flying `controllers` controllers in `modes` modes of a prepared scenario. */
export function estimateBudget(
  s: ResolvedScenario,
  plan: SequencePlan,
  controllers: number,
  modes: readonly RunMode[],
  displayLimit: DisplayTraceLimit = DISPLAY_TRACE_LIMIT,
): BudgetEstimate {
  const durationS = flightEndS(s, plan);
  const rateHz = s.vehicle.controlRateHz;
  const ideal = s.simulation.timing === 'continuous-ideal';
  const samples = Math.ceil(durationS * rateHz) + 1 + (ideal ? 2 * plan.timeline.length : 0);
  const steps = Math.ceil(durationS * rateHz) * stepsPerSample(s);
  const runs = controllers * modes.length;
  const bytesPerSample = traceBytesPerSample(s.vehicle.wheels.length);
  const kept = displaySamplesBound(samples, displayLimit);
  const display = kept < samples;
  const perRunS = samples * COST_PER_SAMPLE_S + steps * (ideal ? COST_PER_IDEAL_STEP_S : COST_PER_SAMPLED_STEP_S);
  return {
    runs,
    controllers,
    modes: modes.length,
    durationS,
    rateHz,
    samplesPerRun: samples,
    stepsPerRun: steps,
    bytesPerSample,
    // Display: one run's full trace in flight, and every run's display trace (the last one is made while its full trace is alive).
    traceBytes: display ? (samples + runs * kept) * bytesPerSample : runs * samples * bytesPerSample,
    display,
    keptSamplesPerRun: kept,
    keptBytesPerRun: kept * bytesPerSample,
    computeS: runs * perRunS,
  };
}

/** RK4 steps one run may take before it is stopped as truncated: the estimate with room for event location. */
export function runStepCap(e: BudgetEstimate): number {
  return Math.ceil(2 * e.stepsPerRun) + 10_000;
}

/** Whole numbers with thousands separators, independent of the locale. */
export function grouped(n: number): string {
  if (!Number.isFinite(n)) return String(n);
  return Math.round(n)
    .toString()
    .replace(/\B(?=(\d{3})+(?!\d))/g, ',');
}

/** Bytes for people: GB/MB with three significant digits, and GiB for the limit. */
export function bytesText(b: number): string {
  if (!Number.isFinite(b)) return String(b);
  if (b >= 1e9) return `${(b / 1e9).toPrecision(3)} GB`;
  return `${(b / 1e6).toPrecision(3)} MB`;
}

/** Seconds for people: "40 s", "12 min", "3.5 h", "2.8 days". */
export function durationText(s: number): string {
  if (!Number.isFinite(s)) return String(s);
  if (s < 120) return `${Math.ceil(s)} s`;
  if (s < 7200) return `${Math.round(s / 60)} min`;
  if (s < 172800) return `${(s / 3600).toPrecision(2)} h`;
  return s < 1000 * 86400 ? `${(s / 86400).toPrecision(2)} days` : `${grouped(s / 86400)} days`;
}

/** The field that drives the run length most: simulation.durationS when set, else the largest part of the plan. */
function durationPath(s: ResolvedScenario, plan: SequencePlan): { path: string; text: string } {
  const d = (v: number) => `${Number(v.toPrecision(6))} s`;
  if (s.simulation.durationS != null) return { path: 'simulation.durationS', text: `simulation.durationS = ${d(s.simulation.durationS)}` };
  const holds = s.targets.reduce((a, t) => a + t.holdS, 0);
  const slews = plan.timeline.reduce((a, e) => a + (e.slewEndS - e.slewStartS), 0);
  const tail = s.simulation.tailS;
  const parts = `the planned slews (${d(slews)}, see the plan) + targets[].holdS (${d(holds)}) + simulation.tailS (${d(tail)})`;
  const path = slews >= holds && slews >= tail ? 'planning' : holds >= tail ? 'targets' : 'simulation.tailS';
  return { path, text: parts };
}

/** Issues for each limit the estimate exceeds; empty when the pass fits the budget. */
export function budgetIssues(e: BudgetEstimate, s: ResolvedScenario, plan: SequencePlan, b: RunBudget = DEFAULT_BUDGET): Issue[] {
  const issues: Issue[] = [];
  const dur = durationPath(s, plan);
  const length = `${durationText(e.durationS)} of flight (${dur.text}) at vehicle.controlRateHz = ${e.rateHz} Hz`;
  const runs = `${e.runs} run${e.runs === 1 ? '' : 's'} (${e.controllers} controller${e.controllers === 1 ? '' : 's'} × ${e.modes} mode${e.modes === 1 ? '' : 's'}: controllers, simulation.mode)`;
  if (!(e.samplesPerRun <= b.maxSamplesPerRun))
    issues.push({
      path: dur.path,
      rule: 'budget-samples',
      message: `each run would record ${grouped(e.samplesPerRun)} samples: ${length}; the budget is ${grouped(b.maxSamplesPerRun)} samples per run — shorten the run or lower vehicle.controlRateHz`,
    });
  if (!(e.traceBytes <= b.maxTraceBytes)) {
    const held = e.display
      ? `one full trace of ${grouped(e.samplesPerRun)} samples in flight (${length}) plus ${e.runs} display trace${e.runs === 1 ? '' : 's'} of ${grouped(e.keptSamplesPerRun)} samples; ${e.bytesPerSample} bytes per sample with ${s.vehicle.wheels.length} wheels`
      : `${grouped(e.samplesPerRun)} samples each: ${length}; ${e.bytesPerSample} bytes per sample with ${s.vehicle.wheels.length} wheels`;
    issues.push({
      path: e.display ? dur.path : 'controllers',
      rule: 'budget-memory',
      message: `the ${runs} would hold ${bytesText(e.traceBytes)} of traces (${held}); the budget is ${bytesText(b.maxTraceBytes)} (${b.maxTraceBytes / 1024 ** 3} GiB) — ${e.display ? 'shorten the run or lower vehicle.controlRateHz' : 'fly fewer controllers or one mode, or shorten the run'}`,
    });
  }
  if (!(e.computeS <= b.maxComputeS))
    issues.push({
      path: 'simulation.rk4StepsPerSample',
      rule: 'budget-time',
      message: `the ${runs} would take about ${durationText(e.computeS)} to compute (${grouped(e.samplesPerRun)} samples and ${grouped(e.stepsPerRun)} RK4 steps each: ${length}, simulation.rk4StepsPerSample = ${s.simulation.rk4StepsPerSample}, simulation.timing = ${s.simulation.timing}); the budget is ${durationText(b.maxComputeS)} — shorten the run, lower the rate or the RK4 steps, or fly fewer runs`,
    });
  return issues;
}

/** One line for people: what the pass will cost. */
export function budgetSummary(e: BudgetEstimate): string {
  const kept = e.display ? ` (each keeps a display trace of ${grouped(e.keptSamplesPerRun)} samples)` : '';
  return `${e.runs} run${e.runs === 1 ? '' : 's'} of ${grouped(e.samplesPerRun)} samples${kept}, ${bytesText(e.traceBytes)} of traces, about ${durationText(e.computeS)} to compute`;
}

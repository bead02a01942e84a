/**
 * Display traces (issue 12, memory): a run longer than `fullUpToSamples` keeps, once everything
 * that reads its full trace has been computed (metrics, monitor, constraint margins, window
 * errors: flyAndSummarise in run.ts), only a subset of its samples (sim/displayTrace.ts says
 * which) in the same RunTrace shape, so plots, the 3D view and the sky view work unchanged. The
 * full trace is then dropped before the next run is flown: a pass holds one full trace plus the
 * display traces. The run is marked (traceKind 'display', display) and exports refuse it
 * (refly.ts displayTraceExportIssue); they fly the run again at full rate (refly.ts).
 */
import type { Issue } from '../errors';
import { displayIndices, DISPLAY_SAMPLES_PER_BUCKET } from '../sim/displayTrace';
import { subsetTrace } from '../sim/trace';
import type { ControllerRun } from './types';

export interface DisplayTraceLimit {
  /** Runs with at most this many samples keep their full trace. */
  fullUpToSamples: number;
  /** Samples a display trace aims at (its grid and bucket extremes); changes of j, segment and logic add to it. */
  displaySamples: number;
}

/**
 * 100,000 samples (2.8 h at 10 Hz) keep the full trace: every bundled example is far shorter, so
 * their runs and exports are as before. A longer run keeps about 20,000 samples (about 7 MB with 4
 * wheels): a plot 2,000 px wide still gets 10 samples per pixel column, and every peak and switch
 * (our own choice, common practice for plot decimation, no source).
 */
export const DISPLAY_TRACE_LIMIT: Readonly<DisplayTraceLimit> = { fullUpToSamples: 100_000, displaySamples: 20_000 };

/** Grid stride for a run of `n` samples: each bucket keeps at most DISPLAY_SAMPLES_PER_BUCKET samples. */
export function displayStride(n: number, l: DisplayTraceLimit): number {
  return Math.max(2, Math.ceil((DISPLAY_SAMPLES_PER_BUCKET * n) / Math.max(1, l.displaySamples)));
}

/**
 * Samples a display trace holds at most from its grid and bucket extremes, for a run of `n`
 * samples: DISPLAY_SAMPLES_PER_BUCKET per bucket and the last sample (the budget counts this).
 */
export function displaySamplesBound(n: number, l: DisplayTraceLimit): number {
  if (n <= l.fullUpToSamples) return n;
  return Math.min(n, DISPLAY_SAMPLES_PER_BUCKET * Math.ceil(n / displayStride(n, l)) + 1);
}

/** The run with a display trace when it is longer than the limit; else the run as it is. */
export function keepForDisplay(run: ControllerRun, l: DisplayTraceLimit = DISPLAY_TRACE_LIMIT): ControllerRun {
  const n = run.trace.n;
  if (n <= l.fullUpToSamples) return run;
  const stride = displayStride(n, l);
  const idx = displayIndices(run.trace, stride);
  const trace = subsetTrace(run.trace, idx);
  const c = run.constraints;
  const constraints = c && { ...c, marginRad: c.marginRad.map((m) => pick(m, idx)) };
  return {
    ...run,
    trace,
    ...(constraints ? { constraints } : {}),
    traceKind: 'display',
    display: { fullSamples: n, stride, kept: idx.length },
  };
}

function pick(a: Float64Array, idx: Int32Array): Float64Array {
  const out = new Float64Array(idx.length);
  for (let i = 0; i < idx.length; i++) out[i] = a[idx[i]!]!;
  return out;
}

/** A note for people when runs of the pass keep display traces (the app's run warnings, the CLI); null when none does. */
export function displayTraceNotice(runs: readonly ControllerRun[], path: string, l: DisplayTraceLimit): Issue | null {
  const d = runs.find((r) => r.traceKind === 'display')?.display;
  if (!d) return null;
  const n = (x: number) => Math.round(x).toLocaleString('en-US');
  return {
    path,
    rule: 'display-trace',
    message: `runs of more than ${n(l.fullUpToSamples)} samples keep a display trace for the plots and views (${n(d.kept)} of ${n(d.fullSamples)} samples in the first: a regular grid, each stretch's peaks of pointing error and wheel momentum, and every jump, segment and logic switch); the metrics, the comparison and the exports use every sample (an export flies the run again)`,
  };
}

/**
 * Plot contents from engine runs: which series, in which display units, with which markers.
 * Only unit conversion, de-interleaving and the per-sample arithmetic of the overlay quantities
 * (overlays.ts) happen here (design.md: the UI shows deg, deg/s, mN·m, mN·m·s); every value
 * comes from the run trace. Pure data, no DOM, so tests can check it.
 *
 * Two groups: overlays compare every ticked run on one axis (overlays.ts); the per-run plots
 * (this file) show one run in detail, the one the run picker chooses. A per-run plot the chosen
 * run has nothing for (logic, potentials, hybrid time of a smooth law) is left out, and
 * `hiddenNote` says once why.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { DEG_PER_RAD, MILLI_PER_SI } from '../../engine/units';
import { runName } from '../modeNames';
import { momentumLimitIntervals, segmentMarkers, torqueLimitIntervals, type LimitInterval } from './markers';
import { overlayPlots, type OverlayOptions } from './overlays';
import { constraintMarginPlot } from './constraintPlot';
import { AXIS_COLORS, LIMIT_COLOR, MONITOR_FILL, PALETTE, channel, times, type PlotSpec, type Series, type SeriesSpec } from './base';

export * from './base';

function bodyRatePlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  return {
    id: 'body-rate',
    title: `Body rate components — ${runName(run)}`,
    yLabel: 'ω body (deg/s)',
    series: [
      ...['ωx', 'ωy', 'ωz'].map((label, i) => ({ label, color: AXIS_COLORS[i]! })),
      ...['ωx ref', 'ωy ref', 'ωz ref'].map((label, i) => ({ label, color: AXIS_COLORS[i]!, dash: [4, 3], width: 1 })),
    ],
    data: [
      times(run),
      ...[0, 1, 2].map((c) => channel(run.trace.omega, n, 3, c, DEG_PER_RAD)),
      ...[0, 1, 2].map((c) => channel(run.trace.omegaRef, n, 3, c, DEG_PER_RAD)),
    ],
  };
}

/** Distinct per-wheel limits, for the ± limit lines. */
function distinct(values: ArrayLike<number>): number[] {
  const out: number[] = [];
  for (let i = 0; i < values.length; i++) if (!out.some((v) => Math.abs(v - values[i]!) <= 1e-12 * Math.abs(v))) out.push(values[i]!);
  return out;
}

/** A wheel colour with transparency, for its at-limit shading. */
function tint(hex: string, alpha: number): string {
  const v = Number.parseInt(hex.slice(1), 16);
  return `rgba(${(v >> 16) & 255}, ${(v >> 8) & 255}, ${v & 255}, ${alpha})`;
}

/** "wheel 2 from 45.1 s for 3.2 s; wheel 4 …", or '' when no wheel reaches its limit. */
export function limitText(intervals: readonly LimitInterval[], what: string): string {
  const per = new Map<number, { first: number; total: number }>();
  for (const iv of intervals) {
    const p = per.get(iv.wheel) ?? { first: iv.t0, total: 0 };
    p.first = Math.min(p.first, iv.t0);
    p.total += iv.t1 - iv.t0;
    per.set(iv.wheel, p);
  }
  if (per.size === 0) return `No wheel reaches its ${what} limit.`;
  const parts = [...per.entries()]
    .sort((a, b) => a[1].first - b[1].first)
    .map(([w, p]) => `wheel ${w} from ${p.first.toFixed(1)} s (${p.total.toFixed(1)} s in all)`);
  return `At the ${what} limit (shaded): ${parts.join('; ')}.`;
}

function wheelPlot(
  run: ControllerRun,
  src: Float64Array,
  limits: Float64Array,
  atLimit: LimitInterval[],
  what: { id: string; title: string; yLabel: string; sym: string; limitWord: string },
): PlotSpec {
  const n = run.trace.n;
  const N = run.trace.nWheels;
  const series: SeriesSpec[] = [];
  const data: Series[] = [times(run)];
  for (let w = 0; w < N; w++) {
    series.push({ label: `${what.sym}${w + 1}`, color: PALETTE[w % PALETTE.length]! });
    data.push(channel(src, n, N, w, MILLI_PER_SI));
  }
  for (const lim of distinct(limits)) {
    const v = lim * MILLI_PER_SI;
    series.push({ label: `+${what.sym} max`, color: LIMIT_COLOR, dash: [6, 4], width: 1 });
    data.push(new Float64Array(n).fill(v));
    series.push({ label: `−${what.sym} max`, color: LIMIT_COLOR, dash: [6, 4], width: 1 });
    data.push(new Float64Array(n).fill(-v));
  }
  return {
    id: what.id,
    title: `${what.title} — ${runName(run)}`,
    yLabel: what.yLabel,
    series,
    data,
    intervals: atLimit.map((iv) => ({
      t0: iv.t0,
      t1: iv.t1,
      label: `wheel ${iv.wheel} at its ${what.limitWord} limit`,
      color: tint(PALETTE[(iv.wheel - 1) % PALETTE.length]!, 0.2),
    })),
    note: limitText(atLimit, what.limitWord),
  };
}

function wheelMomentumPlot(run: ControllerRun, out: PipelineOutput): PlotSpec {
  return wheelPlot(run, run.trace.hWheel, out.vehicle.maxMomentumNms, momentumLimitIntervals(run, out), {
    id: 'wheel-momentum',
    title: 'Wheel momentum per wheel',
    yLabel: 'h (mN·m·s)',
    sym: 'h',
    limitWord: 'momentum',
  });
}

function wheelTorquePlot(run: ControllerRun, out: PipelineOutput): PlotSpec {
  return wheelPlot(run, run.trace.wheelTorque, out.vehicle.maxTorqueNm, torqueLimitIntervals(run, out), {
    id: 'wheel-torque',
    title: 'Wheel motor torque per wheel (delivered)',
    yLabel: 'τ (mN·m)',
    sym: 'τ',
    limitWord: 'torque',
  });
}

function logicPlot(run: ControllerRun): PlotSpec {
  return {
    id: 'logic',
    title: `Logic value — ${runName(run)}`,
    yLabel: run.logicKind === 'index' ? 'potential index q' : 'h',
    series: [{ label: run.logicKind === 'index' ? 'q' : 'h', color: PALETTE[3]!, stepped: true }],
    data: [times(run), run.trace.logic.subarray(0, run.trace.n)],
    jumpTimes: run.jumps.map((j) => j.t),
  };
}

function potentialPlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  return {
    id: 'potential',
    title: `Active potential vs family minimum — ${runName(run)}`,
    yLabel: 'potential (—)',
    series: [
      { label: 'V_q (active)', color: PALETTE[0]! },
      { label: 'min_p V_p', color: PALETTE[2]!, dash: [5, 3] },
    ],
    data: [times(run), run.trace.potential.subarray(0, n), run.trace.potentialMin.subarray(0, n)],
    bands: [{ upper: 1, lower: 2, color: 'rgba(44, 90, 160, 0.15)' }],
    jumpTimes: run.jumps.map((j) => j.t),
  };
}

function lyapunovPlot(run: ControllerRun): PlotSpec {
  return {
    id: 'lyapunov',
    title: `Lyapunov value W — ${runName(run)}`,
    yLabel: 'W (—)',
    series: [{ label: 'W', color: PALETTE[4]! }],
    data: [times(run), run.trace.lyapunov.subarray(0, run.trace.n)],
    jumpTimes: run.jumps.map((j) => j.t),
    intervals: run.monitor.map((f) => ({ t0: f.tStart, t1: f.tEnd, label: f.message, color: MONITOR_FILL })),
    note: run.monitor.length ? 'Shaded: intervals the Lyapunov monitor flags.' : undefined,
  };
}

/** Hybrid time: the jump counter j against t (a stepped hybrid time domain) with W beside it. */
function hybridTimePlot(run: ControllerRun): PlotSpec {
  const n = run.trace.n;
  const j = new Float64Array(n);
  for (let k = 0; k < n; k++) j[k] = run.trace.j[k]!;
  return {
    id: 'hybrid-time',
    title: `Hybrid time domain (t, j) — ${runName(run)}`,
    yLabel: 'W (—)',
    y2Label: 'jump counter j',
    series: [
      { label: 'W', color: PALETTE[4]! },
      { label: 'j', color: PALETTE[3]!, stepped: true, scale: 'j', width: 2 },
    ],
    data: [times(run), run.trace.lyapunov.subarray(0, n), j],
    jumpTimes: run.jumps.map((x) => x.t),
  };
}

/** The per-run plots a run has, and one sentence naming the ones it has not (or null). */
export function detailPlots(run: ControllerRun, out: PipelineOutput): { plots: PlotSpec[]; hiddenNote: string | null } {
  const plots = [bodyRatePlot(run), wheelMomentumPlot(run, out), wheelTorquePlot(run, out)];
  let hiddenNote: string | null = null;
  if (run.logicKind === 'none')
    hiddenNote = `Logic value, potentials and hybrid time are not shown: ${run.label} is a smooth law, with no logic variable and no jumps.`;
  else {
    plots.push(logicPlot(run));
    if (run.logicKind === 'index') plots.push(potentialPlot(run));
    else hiddenNote = `Potentials are not shown: ${run.label} has no potential family (synergistic laws only).`;
  }
  plots.push(lyapunovPlot(run));
  if (run.logicKind !== 'none') plots.push(hybridTimePlot(run));
  return { plots, hiddenNote };
}

/**
 * The parts of an output that buildPlots (and windowBands, boresightChoices) read, in a fixed
 * order. The store shares each with the shown output while it is unchanged (store/shareOutput.ts),
 * so equal entries by identity mean equal plots: PlotsPanel reuses its plot specs, and a chart
 * whose spec is the same object is not drawn again. The run order matters (a run's colour is its
 * place), hence the keys' text. test/unit/ui-plot-series.test.ts builds the plots from these parts
 * alone.
 */
export function plotSources(out: PipelineOutput): readonly unknown[] {
  return [
    out.runs.map((r) => r.key).join('\n'),
    out.plan,
    out.vehicle,
    out.constraints,
    out.orbit,
    out.scenario.file.targets,
    out.scenario.file.planning,
    out.scenario.targets,
  ];
}

/** An output holding only what plotSources lists (for the test that buildPlots reads nothing else). */
export function plotSourcesOnly(out: PipelineOutput): PipelineOutput {
  return {
    runs: out.runs,
    plan: out.plan,
    vehicle: out.vehicle,
    constraints: out.constraints,
    orbit: out.orbit,
    scenario: { file: { targets: out.scenario.file.targets, planning: out.scenario.file.planning }, targets: out.scenario.targets },
  } as unknown as PipelineOutput;
}

export interface PlotSet {
  /** Every ticked run on one axis each. */
  overlays: PlotSpec[];
  /** The run the per-run plots show (the first ticked run), or null. */
  detail: ControllerRun | null;
  detailPlots: PlotSpec[];
  hiddenNote: string | null;
}

function tickedRuns(out: PipelineOutput, selected: readonly string[]): ControllerRun[] {
  return selected.map((k) => out.runs.find((r) => r.key === k)).filter((r): r is ControllerRun => r !== undefined);
}

/** The overlays of buildPlots alone (every ticked run on one axis each, with the plan's markers). */
export function buildOverlays(
  out: PipelineOutput,
  selected: readonly string[],
  o: OverlayOptions,
  join: (t: Series[][]) => Series[],
): PlotSpec[] {
  const runs = tickedRuns(out, selected);
  const markers = segmentMarkers(out);
  const margin = constraintMarginPlot(out, runs, join);
  return [...overlayPlots(out, runs, o, join), ...(margin ? [margin] : [])].map((p) => ({ ...p, markers }));
}

/** The per-run plots of buildPlots alone (the first ticked run's; it reads that run, the plan and the vehicle). */
export function buildDetail(out: PipelineOutput, selected: readonly string[]): Omit<PlotSet, 'overlays'> {
  const detail = tickedRuns(out, selected)[0] ?? null;
  if (!detail) return { detail: null, detailPlots: [], hiddenNote: null };
  const markers = segmentMarkers(out);
  const d = detailPlots(detail, out);
  return { detail, detailPlots: d.plots.map((p) => ({ ...p, markers })), hiddenNote: d.hiddenNote };
}

/** Every plot for the ticked runs; the first ticked run is the one the per-run plots show. */
export function buildPlots(
  out: PipelineOutput,
  selected: readonly string[],
  o: OverlayOptions,
  join: (t: Series[][]) => Series[],
): PlotSet {
  return { overlays: buildOverlays(out, selected, o, join), ...buildDetail(out, selected) };
}

/**
 * Overlay plots: every ticked run on one axis, one colour per run (its place in the pipeline
 * output, so a run keeps its colour whatever else is ticked).
 *
 * - Attitude error angle to the reference (the engine's channel), deg, optionally on a log axis.
 * - Body-rate magnitude |ω|, deg/s, with the plan's slew-rate cap.
 * - Wheel momentum use: max over the wheels of |h_i| / h_max,i, %, with the 100 % line.
 * - Boresight pointing error of a chosen body axis (engine metrics/boresight.ts), deg.
 */
import type { ControllerRun, PipelineOutput } from '../../engine/pipeline/types';
import { boresightErrorAngles, unitAxis, type Axis3 } from '../../engine/metrics/boresight';
import { DEG_PER_RAD } from '../../engine/units';
import { runName } from '../modeNames';
import { LIMIT_COLOR, alignRuns, runColor, type PlotSpec, type Series, type SeriesSpec } from './base';

export interface BoresightChoice {
  /** Stable key for a select ('+Z', 'target-3' …). */
  key: string;
  axis: Axis3;
  /** What the axis is, for the picker and the plot title. */
  name: string;
}

export interface OverlayOptions {
  logError: boolean;
  boresight: BoresightChoice;
}

const PRINCIPAL: [string, Axis3][] = [
  ['+X', [1, 0, 0]],
  ['+Y', [0, 1, 0]],
  ['+Z', [0, 0, 1]],
  ['−X', [-1, 0, 0]],
  ['−Y', [0, -1, 0]],
  ['−Z', [0, 0, -1]],
];

function axisText(a: Axis3): string {
  const p = PRINCIPAL.find(([, v]) => v.every((x, i) => Math.abs(x - a[i]!) < 1e-12));
  return p ? p[0] : `[${a.map((x) => Number(x.toPrecision(3))).join(', ')}]`;
}

type Obj = Record<string, unknown>;

/**
 * The body axis a target points: the `pointing` form's, or a tracking target's (`track.site`,
 * `station`, `sun`: its bodyAxis; `nadir`: its bodyAxis, +Z when absent as in orbitSchema.ts).
 */
function declaredAxis(t: { attitude?: unknown; track?: unknown }): number[] | null {
  const a = t.attitude as Obj | undefined;
  const p = a?.pointing as Obj | undefined;
  if (p && Array.isArray(p.bodyAxis)) return p.bodyAxis as number[];
  const tr = t.track as Obj | undefined;
  if (!tr) return null;
  const kind = Object.keys(tr)[0];
  const b = kind ? (tr[kind] as Obj | undefined) : undefined;
  if (b && Array.isArray(b.bodyAxis)) return b.bodyAxis as number[];
  return kind === 'nadir' ? [0, 0, 1] : null;
}

/** Pointing body axes the scenario's targets declare, in target order. */
function targetAxes(out: PipelineOutput): (Axis3 | null)[] {
  return out.scenario.file.targets.map((t) => {
    const axis = declaredAxis(t as { attitude?: unknown; track?: unknown });
    return axis ? unitAxis(axis) : null;
  });
}

/**
 * The axes offered for the boresight plot: the first target's pointing axis when it has one
 * (the default), the other targets' pointing axes, then the six body axes.
 */
export function boresightChoices(out: PipelineOutput): BoresightChoice[] {
  const choices: BoresightChoice[] = [];
  targetAxes(out).forEach((a, i) => {
    if (!a) return;
    const label = out.scenario.targets[i]?.label ?? `target ${i + 1}`;
    choices.push({ key: `target-${i + 1}`, axis: a, name: `${axisText(a)}, pointing axis of target ${i + 1} (${label})` });
  });
  for (const [name, axis] of PRINCIPAL) choices.push({ key: name, axis, name: `${name} body axis` });
  return choices;
}

/** The first target's pointing body axis if it has one, else +Z. */
export function defaultBoresight(out: PipelineOutput): BoresightChoice {
  const choices = boresightChoices(out);
  const first = targetAxes(out)[0];
  return (first ? choices.find((c) => c.key === 'target-1') : undefined) ?? choices.find((c) => c.key === '+Z')!;
}

/** |ω| per sample, deg/s. */
export function rateMagnitudeDeg(run: ControllerRun): Float64Array {
  const n = run.trace.n;
  const w = run.trace.omega;
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) out[k] = Math.hypot(w[3 * k]!, w[3 * k + 1]!, w[3 * k + 2]!) * DEG_PER_RAD;
  return out;
}

/** max_i |h_i| / h_max,i per sample, in %. */
export function momentumUsePercent(run: ControllerRun, maxMomentumNms: ArrayLike<number>): Float64Array {
  const { n, nWheels: N, hWheel } = run.trace;
  const out = new Float64Array(n);
  for (let k = 0; k < n; k++) {
    let m = 0;
    for (let i = 0; i < N; i++) m = Math.max(m, Math.abs(hWheel[N * k + i]!) / maxMomentumNms[i]!);
    out[k] = 100 * m;
  }
  return out;
}

/** Log axes cannot show zero or negatives: those samples become gaps. */
function positiveOrNull(a: ArrayLike<number>): (number | null)[] {
  const out = new Array<number | null>(a.length);
  for (let i = 0; i < a.length; i++) out[i] = a[i]! > 0 ? a[i]! : null;
  return out;
}

function overlay(
  out: PipelineOutput,
  runs: readonly ControllerRun[],
  join: (t: Series[][]) => Series[],
  spec: Omit<PlotSpec, 'series' | 'data'>,
  pick: (r: ControllerRun) => ArrayLike<number | null>,
  line?: { label: string; value: number },
): PlotSpec {
  const series: SeriesSpec[] = runs.map((r) => ({ label: runName(r), color: runColor(out, r.key) }));
  if (runs.length === 0) return { ...spec, series, data: [], empty: 'Tick a run in the comparison table to plot it.' };
  const data = alignRuns(runs, pick, join);
  if (line && Number.isFinite(line.value)) {
    series.push({ label: line.label, color: LIMIT_COLOR, dash: [6, 4], width: 1 });
    data.push(new Float64Array(data[0]!.length).fill(line.value));
  }
  return { ...spec, series, data };
}

export function overlayPlots(
  out: PipelineOutput,
  runs: readonly ControllerRun[],
  o: OverlayOptions,
  join: (t: Series[][]) => Series[],
): PlotSpec[] {
  const rateCap = out.scenario.file.planning.slewRateLimitDegPerS;
  return [
    overlay(
      out,
      runs,
      join,
      { id: 'error-angle', title: 'Attitude error angle to the reference', yLabel: 'error angle (deg)', log: o.logError },
      (r) => {
        const deg = new Float64Array(r.trace.n);
        for (let k = 0; k < r.trace.n; k++) deg[k] = r.trace.errorAngle[k]! * DEG_PER_RAD;
        return o.logError ? positiveOrNull(deg) : deg;
      },
    ),
    overlay(
      out,
      runs,
      join,
      { id: 'boresight', title: `Pointing error of ${o.boresight.name}`, yLabel: 'axis error (deg)', log: o.logError },
      (r) => {
        const rad = boresightErrorAngles(new Float64Array(r.trace.n), r.trace, o.boresight.axis);
        for (let k = 0; k < rad.length; k++) rad[k] = rad[k]! * DEG_PER_RAD;
        return o.logError ? positiveOrNull(rad) : rad;
      },
    ),
    overlay(out, runs, join, { id: 'rate-magnitude', title: 'Body rate magnitude |ω|', yLabel: '|ω| (deg/s)' }, rateMagnitudeDeg, {
      label: 'slew-rate cap',
      value: rateCap,
    }),
    overlay(
      out,
      runs,
      join,
      { id: 'momentum-use', title: 'Wheel momentum use: max over wheels of |h_i| / h_max,i', yLabel: 'momentum use (%)' },
      (r) => momentumUsePercent(r, out.vehicle.maxMomentumNms),
      { label: 'limit', value: 100 },
    ),
  ];
}

/**
 * Study results per controller: shares, quantiles, histograms, worst cases, and the outcome map
 * over initial attitudes. A pure function of the finished case records (sorted by case index
 * first), so the result does not depend on how many workers ran them or in what order.
 *
 * Histogram bins (fixed, so two studies can be compared bin by bin):
 * - settle time: 20 equal bins over [0, durationS] s, settled runs only (the rest are counted as
 *   `overflow`, "did not settle in time");
 * - rotation travelled: 24 bins of 15° over [0°, 360°], overflow beyond one full turn;
 * - jumps: one bin per count 0…9, overflow ≥ 10;
 * - chatter: edges 0, 0.1, 0.2, 0.5, 1, 2, 5 events/s, overflow ≥ 5 (log-like: most runs sit
 *   near 0.2, chattering ones spread over decades);
 * - peak wheel momentum / torque: 20 bins of 5 % over [0, 100 %] of the case's (degraded) limit
 *   (the limiter keeps a run at or below 100 %, which falls in the last bin);
 * - final error: edges 0, 0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 90°, overflow up to 180°.
 * Quantiles are nearest-rank (the smallest value with at least p of the runs at or below it);
 * a settle-time quantile that falls on runs that never settled is null ("not within durationS").
 */
import type { CaseRecord, CaseRun } from './runCase';
import type { StudyDefinition } from '../scenario/study';
import type { RunMode } from '../sim/types';
import { DEG_PER_RAD } from '../units';
import { shareInterval, type ShareInterval } from '../math/stats';

export interface Histogram {
  quantity: string;
  unit: string;
  /** Bin k holds values in [edges[k], edges[k+1]); the last bin is closed. */
  edges: number[];
  counts: number[];
  /** Values above the last edge (or, for settle time, runs that never settled). */
  overflow: number;
}

export interface Spread {
  median: number | null;
  p95: number | null;
  max: number | null;
}

export interface WorstCase {
  index: number;
  status: CaseRun['status'];
  settleTimeS: number | null;
  finalErrorDeg: number;
  unwound: boolean;
  chattered: boolean;
  reason: string;
}

export interface ControllerSummary {
  controllerId: string;
  label: string;
  law: string;
  /** Cases in the study, and how many could be flown (the rest: unflyable vehicles or no plan). */
  cases: number;
  flyable: number;
  settled: number;
  unsettled: number;
  failed: number;
  unwound: number;
  longWay: number;
  chattered: number;
  /** Shares of the flyable cases, 0…1. */
  settledShare: number;
  notSettledShare: number;
  unwoundShare: number;
  longWayShare: number;
  chatteredShare: number;
  settleTimeS: Spread;
  jumps: Spread;
  chatterPerS: Spread;
  peakWheelMomentumFraction: Spread;
  peakWheelTorqueFraction: Spread;
  finalErrorDeg: Spread;
  extraRotationDeg: Spread;
  histograms: {
    settleTimeS: Histogram;
    rotationTravelledDeg: Histogram;
    jumps: Histogram;
    chatterPerS: Histogram;
    peakWheelMomentumFraction: Histogram;
    peakWheelTorqueFraction: Histogram;
    finalErrorDeg: Histogram;
  };
  worst: WorstCase[];
  /**
   * Flyable cases whose run violated an attitude constraint, and their share with its 95 %
   * interval (math/stats.ts shareInterval: Wilson, or the rule of three at 0 and n); absent when
   * the scenario declares no constraints.
   */
  constraintViolated?: number;
  constraintViolatedShare?: ShareInterval;
}

/** One point of the outcome map: the case's initial error rotation and each controller's outcome. */
export interface MapPoint {
  index: number;
  /** Unit rotation axis of the initial error q_target* ⊗ q0 (target axes; shortest rotation). */
  axis: [number, number, number];
  angleDeg: number;
  /** Scalar part of the initial error quaternion as flown (its sign is the hemisphere). */
  eta0: number;
  /** Per controller (study order): 'settled' | 'unwound' | 'chattered' | 'unsettled' | 'failed' | 'unflyable'. */
  outcome: string[];
  settleTimeS: (number | null)[];
}

export interface StudyInfo {
  scenarioName: string;
  def: StudyDefinition;
  controllers: { id: string; label: string; law: string }[];
}

export interface StudySummary {
  scenarioName: string;
  seed: number;
  runsRequested: number;
  casesDone: number;
  /** True when the study was stopped before every case ran (the summary covers the finished ones). */
  incomplete: boolean;
  durationS: number;
  mode: RunMode;
  settleDefinition: string;
  /** Inertia samples redrawn because they were not physical, over all finished cases. */
  inertiaRejections: number;
  unflyableCases: number;
  controllers: ControllerSummary[];
}

function spread(values: number[]): Spread {
  if (values.length === 0) return { median: null, p95: null, max: null };
  const s = [...values].sort((a, b) => a - b);
  const at = (p: number) => {
    const v = s[Math.min(s.length - 1, Math.max(0, Math.ceil(p * s.length) - 1))]!;
    return Number.isFinite(v) ? v : null;
  };
  return { median: at(0.5), p95: at(0.95), max: at(1) };
}

function histogram(quantity: string, unit: string, edges: number[], values: number[], extraOverflow = 0): Histogram {
  const counts = new Array(edges.length - 1).fill(0);
  let overflow = extraOverflow;
  const last = edges[edges.length - 1]!;
  for (const v of values) {
    if (!(v <= last)) {
      overflow++;
      continue;
    }
    let k = 0;
    while (k < counts.length - 1 && v >= edges[k + 1]!) k++;
    counts[k]++;
  }
  return { quantity, unit, edges, counts, overflow };
}

const range = (n: number, step: number) => Array.from({ length: n + 1 }, (_, k) => k * step);

/** Worst first: failed, then not settled (largest final error first), then the slowest settlers. */
function worstOrder(a: { i: number; r: CaseRun }, b: { i: number; r: CaseRun }): number {
  const rank = (r: CaseRun) => (r.status === 'failed' ? 0 : r.status === 'unsettled' ? 1 : 2);
  const d = rank(a.r) - rank(b.r);
  if (d !== 0) return d;
  if (a.r.status === 'settled') return (b.r.settleTimeS ?? 0) - (a.r.settleTimeS ?? 0) || a.i - b.i;
  return b.r.finalErrorDeg - a.r.finalErrorDeg || a.i - b.i;
}

export function outcomeOf(r: CaseRun): string {
  if (r.status === 'failed' || r.status === 'unflyable' || r.status === 'unsettled') return r.status;
  if (r.unwound) return 'unwound';
  if (r.chattered) return 'chattered';
  return 'settled';
}

/** Records sorted by case index (the canonical order of every output). */
export function sortRecords(records: readonly CaseRecord[]): CaseRecord[] {
  return [...records].sort((a, b) => a.draw.index - b.draw.index);
}

export function summarizeStudy(info: StudyInfo, recordsIn: readonly CaseRecord[]): StudySummary {
  const records = sortRecords(recordsIn);
  const def = info.def;
  const controllers = info.controllers.map((c, ci): ControllerSummary => {
    const runs = records.map((rec) => ({ i: rec.draw.index, r: rec.runs[ci]! }));
    const fly = runs.filter((x) => x.r.status !== 'unflyable');
    const count = (f: (r: CaseRun) => boolean) => fly.filter((x) => f(x.r)).length;
    const settled = count((r) => r.status === 'settled');
    const unsettled = count((r) => r.status === 'unsettled');
    const failed = count((r) => r.status === 'failed');
    const n = fly.length;
    const share = (k: number) => (n > 0 ? k / n : 0);
    const settleTimes = fly.map((x) => (x.r.status === 'settled' && x.r.settleTimeS !== null ? x.r.settleTimeS : Infinity));
    const of = (f: (r: CaseRun) => number) => fly.map((x) => f(x.r));
    const worst = [...fly]
      .sort(worstOrder)
      .slice(0, def.worstCases)
      .map(({ i, r }) => ({
        index: i,
        status: r.status,
        settleTimeS: r.settleTimeS,
        finalErrorDeg: r.finalErrorDeg,
        unwound: r.unwound,
        chattered: r.chattered,
        reason: r.reason,
      }));
    return {
      controllerId: c.id,
      label: c.label,
      law: c.law,
      cases: runs.length,
      flyable: n,
      settled,
      unsettled,
      failed,
      unwound: count((r) => r.unwound),
      longWay: count((r) => r.longWay),
      chattered: count((r) => r.chattered),
      settledShare: share(settled),
      notSettledShare: share(unsettled + failed),
      unwoundShare: share(count((r) => r.unwound)),
      longWayShare: share(count((r) => r.longWay)),
      chatteredShare: share(count((r) => r.chattered)),
      settleTimeS: spread(settleTimes),
      jumps: spread(of((r) => r.jumps)),
      chatterPerS: spread(of((r) => r.chatterPerS)),
      peakWheelMomentumFraction: spread(of((r) => r.peakWheelMomentumFraction)),
      peakWheelTorqueFraction: spread(of((r) => r.peakWheelTorqueFraction)),
      finalErrorDeg: spread(of((r) => r.finalErrorDeg)),
      extraRotationDeg: spread(of((r) => r.extraRotationDeg)),
      histograms: {
        settleTimeS: histogram(
          'settle time',
          's',
          range(20, def.durationS / 20),
          settleTimes.filter(Number.isFinite),
          settleTimes.filter((t) => !Number.isFinite(t)).length,
        ),
        rotationTravelledDeg: histogram(
          'rotation travelled',
          'deg',
          range(24, 15),
          of((r) => r.rotationTravelledDeg),
        ),
        jumps: histogram(
          'logic jumps',
          'count',
          range(10, 1),
          of((r) => r.jumps),
        ),
        chatterPerS: histogram(
          'chatter',
          'events/s',
          [0, 0.1, 0.2, 0.5, 1, 2, 5],
          of((r) => r.chatterPerS),
        ),
        peakWheelMomentumFraction: histogram(
          'peak wheel momentum',
          'fraction of limit',
          range(20, 0.05),
          of((r) => r.peakWheelMomentumFraction),
        ),
        peakWheelTorqueFraction: histogram(
          'peak wheel torque',
          'fraction of limit',
          range(20, 0.05),
          of((r) => r.peakWheelTorqueFraction),
        ),
        finalErrorDeg: histogram(
          'final error',
          'deg',
          [0, 0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 90],
          of((r) => r.finalErrorDeg),
        ),
      },
      worst,
      ...(fly.some((x) => x.r.constraintViolated !== undefined)
        ? {
            constraintViolated: count((r) => r.constraintViolated === true),
            constraintViolatedShare: shareInterval(
              count((r) => r.constraintViolated === true),
              n,
            ),
          }
        : {}),
    };
  });
  return {
    scenarioName: info.scenarioName,
    seed: def.seed,
    runsRequested: def.runs,
    casesDone: records.length,
    incomplete: records.length < def.runs,
    durationS: def.durationS,
    mode: def.mode,
    settleDefinition:
      def.mode === 'step-target' && def.stopAfterSettledForS > 0
        ? `error angle and rate error stay below the scenario's settle thresholds until the end of the run; a case ends early after ${def.stopAfterSettledForS} s settled`
        : "error angle and rate error (to the reference) stay below the scenario's settle thresholds until the end of the run; every case runs its full duration",
    inertiaRejections: records.reduce((s, r) => s + r.draw.inertiaRejections, 0),
    unflyableCases: records.filter((r) => r.runs.length > 0 && r.runs.every((x) => x.status === 'unflyable')).length,
    controllers,
  };
}

/** The outcome map: one point per finished case, in case order. */
export function outcomeMap(recordsIn: readonly CaseRecord[]): MapPoint[] {
  return sortRecords(recordsIn).map((rec) => ({
    index: rec.draw.index,
    axis: [rec.draw.errorAxis[0]!, rec.draw.errorAxis[1]!, rec.draw.errorAxis[2]!],
    angleDeg: rec.draw.errorAngleRad * DEG_PER_RAD,
    eta0: rec.draw.errorEta,
    outcome: rec.runs.map(outcomeOf),
    settleTimeS: rec.runs.map((r) => r.settleTimeS),
  }));
}

/**
 * Study results per controller: shares with their 95 % intervals, moments, quantiles and
 * histograms of each quantity, the worst cases, and the outcome map over initial attitudes.
 *
 * Every summary is made from the mergeable state of accumulate.ts (`studySummaryOf`): a study run
 * in one process and the same study merged from K shards go through the same function with the
 * same state bits, so their summaries are identical. `summarizeStudy(info, records)` is that path
 * for a list of finished cases (any order).
 *
 * Bins: quantities.ts. Quantiles are nearest-rank (Hyndman & Fan 1996, definition 1: the smallest
 * value with at least p of the flyable runs at or below it), located to a fine bin (a tenth of a
 * display bin; whole-number quantities exactly) and interpolated inside it; a settle-time
 * quantile that falls on runs that never settled is null ("not within durationS"), as is any
 * quantile beyond the last bin edge. Means and standard deviations are over the finite values.
 */
import type { CaseRecord, CaseRun } from './runCase';
import type { StudyDefinition } from '../scenario/study';
import type { RunMode } from '../sim/types';
import type { Histogram as Counts, ShareReport, ShareInterval } from '../math/stats';
import { histogramQuantile, momentsVariance, pairwiseTotal, shareInterval, shareReport } from '../math/stats';
import type { StudyAccumulator } from './accumulate';
import { accumulateCase, createStudyAccumulator, mapPointOf } from './accumulate';
import type { QuantityKey } from './quantities';
import { QUANTITIES } from './quantities';
import { outcomeOf } from './runCase';

export { outcomeOf };

export interface Histogram {
  quantity: string;
  unit: string;
  /** Bin k holds values in [edges[k], edges[k+1]); the last bin is closed. */
  edges: number[];
  counts: number[];
  /** Values above the last edge (or, for settle time, runs that never settled). */
  overflow: number;
  /** Values below the first edge. */
  underflow: number;
}

/** One quantity over the flyable runs of a controller. */
export interface Spread {
  /** Runs with a finite value (settle time: the runs that settled). */
  n: number;
  mean: number | null;
  /** Sample standard deviation √(M2/(n − 1)); null for n < 2. */
  sd: number | null;
  min: number | null;
  max: number | null;
  /** Nearest-rank median and 95th percentile over every flyable run, interpolated in its fine bin. */
  median: number | null;
  p95: number | null;
  /** The fine bin [low, high] holding the median / 95th percentile (the true value lies in it). */
  medianBin: [number, number] | null;
  p95Bin: [number, number] | null;
}

/** Shares of the flyable runs, each with its 95 % interval (math/stats.ts shareReport). */
export interface ControllerShares {
  settled: ShareReport;
  notSettled: ShareReport;
  unwound: ShareReport;
  longWay: ShareReport;
  chattered: ShareReport;
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
  /** Shares of the flyable cases with their 95 % intervals. */
  shares: ControllerShares;
  /** Per quantity (quantities.ts): moments and quantiles. */
  spreads: Record<QuantityKey, Spread>;
  /** Per quantity: counts in the display bins. */
  histograms: Record<QuantityKey, Histogram>;
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
  /** The scenario JSON as run (with the effective study block), when known; summary.json carries it. */
  scenario?: unknown;
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

/** Records sorted by case index (the canonical order of every output). */
export function sortRecords(records: readonly CaseRecord[]): CaseRecord[] {
  return [...records].sort((a, b) => a.draw.index - b.draw.index);
}

function spreadOf(acc: StudyAccumulator['controllers'][number], k: number): Spread {
  const m = pairwiseTotal(acc.moments[k]!);
  const v = momentsVariance(m);
  const h: Counts = acc.histograms[k]!;
  const whole = QUANTITIES[k]!.sub === 1;
  const at = (p: number) => {
    const q = histogramQuantile(h, p);
    if (!q || q.where !== 'in-range') return { value: null, bin: null };
    // Whole-number quantities: one value per bin, its lower edge, exactly.
    return { value: whole ? q.low : q.estimate, bin: [q.low!, q.high!] as [number, number] };
  };
  const med = at(0.5),
    p95 = at(0.95);
  return {
    n: m.n,
    mean: m.n > 0 ? m.mean : null,
    sd: v === null ? null : Math.sqrt(v),
    min: m.min,
    max: m.max,
    median: med.value,
    p95: p95.value,
    medianBin: med.bin,
    p95Bin: p95.bin,
  };
}

/** Fine counts summed into the display bins. */
function displayHistogram(k: number, def: StudyDefinition, fine: Counts): Histogram {
  const q = QUANTITIES[k]!;
  const edges = q.edges(def);
  const counts = new Array<number>(edges.length - 1).fill(0);
  fine.counts.forEach((c, j) => (counts[Math.floor(j / q.sub)]! += c));
  return { quantity: q.quantity, unit: q.unit, edges, counts, overflow: fine.overflow, underflow: fine.underflow };
}

function settleDefinition(def: StudyDefinition): string {
  return def.mode === 'step-target' && def.stopAfterSettledForS > 0
    ? `error angle and rate error stay below the scenario's settle thresholds until the end of the run; a case ends early after ${def.stopAfterSettledForS} s settled`
    : "error angle and rate error (to the reference) stay below the scenario's settle thresholds until the end of the run; every case runs its full duration";
}

/** The summary of a mergeable study state (the one path every summary takes). */
export function studySummaryOf(info: StudyInfo, acc: StudyAccumulator): StudySummary {
  const def = info.def;
  const controllers = info.controllers.map((c, ci): ControllerSummary => {
    const a = acc.controllers[ci]!;
    const n = a.counts;
    const share = (k: number) => shareReport(k, n.flyable);
    const spreads = {} as Record<QuantityKey, Spread>;
    const histograms = {} as Record<QuantityKey, Histogram>;
    QUANTITIES.forEach((q, k) => {
      spreads[q.key] = spreadOf(a, k);
      histograms[q.key] = displayHistogram(k, def, a.histograms[k]!);
    });
    return {
      controllerId: c.id,
      label: c.label,
      law: c.law,
      ...n,
      shares: {
        settled: share(n.settled),
        notSettled: share(n.unsettled + n.failed),
        unwound: share(n.unwound),
        longWay: share(n.longWay),
        chattered: share(n.chattered),
      },
      spreads,
      histograms,
      worst: a.worst.items.map((w) => w.payload),
      ...(n.constraintChecked > 0 ? { constraintViolatedShare: shareInterval(n.constraintViolated, n.constraintChecked) } : {}),
    };
  });
  const casesDone = acc.coverage.blocks.reduce((s, b) => s + 2 ** b.level, 0);
  return {
    scenarioName: info.scenarioName,
    seed: def.seed,
    runsRequested: def.runs,
    casesDone,
    incomplete: casesDone < def.runs,
    durationS: def.durationS,
    mode: def.mode,
    settleDefinition: settleDefinition(def),
    inertiaRejections: acc.inertiaRejections,
    unflyableCases: acc.unflyableCases,
    controllers,
  };
}

/** The mergeable state of a list of finished cases (any order; each case once). */
export function accumulateRecords(info: StudyInfo, records: readonly CaseRecord[]): StudyAccumulator {
  const acc = createStudyAccumulator(info);
  for (const r of records) {
    const a = accumulateCase(acc, r);
    if (!a.ok) throw new RangeError(a.errors[0]!.message);
  }
  return acc;
}

/** The summary of a list of finished cases, through the mergeable path. */
export function summarizeStudy(info: StudyInfo, records: readonly CaseRecord[]): StudySummary {
  return studySummaryOf(info, accumulateRecords(info, records));
}

/** The outcome map: one point per finished case, in case order. */
export function outcomeMap(recordsIn: readonly CaseRecord[]): MapPoint[] {
  return sortRecords(recordsIn).map(mapPointOf);
}

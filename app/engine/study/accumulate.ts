/**
 * The mergeable state of a study summary: what a study keeps of its finished cases so that any
 * set of them — a whole study in one process, one shard of a campaign, K shards merged in any
 * order — gives the same summary bits (the exactness rule of math/stats.ts):
 * - integer counts (cases, runs per outcome) and fixed-bin histograms (quantities.ts);
 * - moments by the pairwise update over a fixed tree of case indices (math/statsPairwise.ts);
 * - the worst cases per controller as a top-k under a total order (tier: failed, not settled,
 *   settled; then final error or settle time; then case index);
 * - the outcome-map points of the first MAP_SAMPLE_CASES case indices. Cases are independent
 *   draws from (seed, index), so the first ones are an unbiased sample of the study, and only the
 *   shards that hold them carry any.
 * Memory does not grow with the number of cases: per controller and quantity a few dozen moment
 * blocks and a few hundred bin counts, k worst cases, and at most MAP_SAMPLE_CASES map points.
 * Which case indices are covered is kept exactly (`coverage`), so counting a case twice is refused.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { Histogram as Counts, PairwiseMoments, TopK } from '../math/stats';
import {
  histogramAdd,
  histogramCreate,
  histogramMerge,
  pairwiseAdd,
  pairwiseCovered,
  pairwiseEmpty,
  pairwiseMerge,
  topKAdd,
  topKCreate,
  topKMerge,
} from '../math/stats';
import { DEG_PER_RAD } from '../units';
import { QUANTITIES, fineEdges } from './quantities';
import type { CaseRecord, CaseRun } from './runCase';
import { outcomeOf } from './runCase';
import type { MapPoint, StudyInfo, WorstCase } from './summary';

/** Outcome-map points kept: the cases with index below this (all of them in a smaller study). */
export const MAP_SAMPLE_CASES = 10_000;

/** Run counts of one controller; shares are of `flyable`. */
export interface RunCounts {
  cases: number;
  flyable: number;
  settled: number;
  unsettled: number;
  failed: number;
  unwound: number;
  longWay: number;
  chattered: number;
  /** Flyable runs checked against attitude constraints (0 when the scenario declares none), and those that violated one. */
  constraintChecked: number;
  constraintViolated: number;
}

export const RUN_COUNT_KEYS = [
  'cases',
  'flyable',
  'settled',
  'unsettled',
  'failed',
  'unwound',
  'longWay',
  'chattered',
  'constraintChecked',
  'constraintViolated',
] as const;

export interface ControllerAccumulator {
  counts: RunCounts;
  /** Per quantity (QUANTITIES order): moments of the finite values of flyable runs. */
  moments: PairwiseMoments[];
  /** Per quantity: fine-bin counts of flyable runs (fineEdges of the display bins). */
  histograms: Counts[];
  worst: TopK<WorstCase>;
}

export interface StudyAccumulator {
  /** Case indices seen (values unused): refuses a case counted twice; its size is casesDone. */
  coverage: PairwiseMoments;
  /** Inertia samples redrawn, summed over the cases. */
  inertiaRejections: number;
  /** Cases where no controller could fly (every run unflyable). */
  unflyableCases: number;
  /** Map points of the cases with index < MAP_SAMPLE_CASES, in case order. */
  map: MapPoint[];
  controllers: ControllerAccumulator[];
}

function must<T>(r: Result<T>): T {
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.value;
}

function emptyCounts(): RunCounts {
  return {
    cases: 0,
    flyable: 0,
    settled: 0,
    unsettled: 0,
    failed: 0,
    unwound: 0,
    longWay: 0,
    chattered: 0,
    constraintChecked: 0,
    constraintViolated: 0,
  };
}

/** Fine bin edges of every quantity for this study (display edges cut by each quantity's `sub`). */
export function studyFineEdges(info: StudyInfo): number[][] {
  return QUANTITIES.map((q) => fineEdges(q.edges(info.def), q.sub));
}

export function createStudyAccumulator(info: StudyInfo): StudyAccumulator {
  const edges = studyFineEdges(info);
  return {
    coverage: pairwiseEmpty(),
    inertiaRejections: 0,
    unflyableCases: 0,
    map: [],
    controllers: info.controllers.map(() => ({
      counts: emptyCounts(),
      moments: QUANTITIES.map(() => pairwiseEmpty()),
      histograms: edges.map((e) => must(histogramCreate(e))),
      worst: topKCreate<WorstCase>(info.def.worstCases),
    })),
  };
}

/** Worst first: failed (tier 2), then not settled (1), each by final error; then the slowest settlers. */
function worstItem(index: number, r: CaseRun) {
  const payload: WorstCase = {
    index,
    status: r.status,
    settleTimeS: r.settleTimeS,
    finalErrorDeg: r.finalErrorDeg,
    unwound: r.unwound,
    chattered: r.chattered,
    reason: r.reason,
  };
  const tier = r.status === 'failed' ? 2 : r.status === 'unsettled' ? 1 : 0;
  return { key: index, tier, score: tier === 0 ? (r.settleTimeS ?? 0) : r.finalErrorDeg, payload };
}

export function mapPointOf(rec: CaseRecord): MapPoint {
  const d = rec.draw;
  return {
    index: d.index,
    axis: [d.errorAxis[0]!, d.errorAxis[1]!, d.errorAxis[2]!],
    angleDeg: d.errorAngleRad * DEG_PER_RAD,
    eta0: d.errorEta,
    outcome: rec.runs.map(outcomeOf),
    settleTimeS: rec.runs.map((r) => r.settleTimeS),
  };
}

/** Add one finished case, in place. Refused (and nothing changed) when the case was already added. */
export function accumulateCase(acc: StudyAccumulator, rec: CaseRecord): Result<StudyAccumulator> {
  const index = rec.draw.index;
  if (rec.runs.length !== acc.controllers.length)
    return fail([
      {
        path: `case ${index}`,
        rule: 'controllers',
        message: `case ${index} has ${rec.runs.length} runs for ${acc.controllers.length} controllers`,
      },
    ]);
  const cov = pairwiseAdd(acc.coverage, index, null);
  if (!cov.ok) return fail(cov.errors);
  acc.inertiaRejections += rec.draw.inertiaRejections;
  if (rec.runs.length > 0 && rec.runs.every((r) => r.status === 'unflyable')) acc.unflyableCases++;
  if (index < MAP_SAMPLE_CASES) insertMapPoint(acc.map, mapPointOf(rec));
  rec.runs.forEach((r, ci) => {
    const c = acc.controllers[ci]!;
    c.counts.cases++;
    const flyable = r.status !== 'unflyable';
    QUANTITIES.forEach((q, k) => {
      // An unflyable run covers its case without a value, so every controller covers the same cases.
      const v = flyable ? q.value(r) : null;
      must(pairwiseAdd(c.moments[k]!, index, v));
      if (v !== null) histogramAdd(c.histograms[k]!, v);
    });
    if (!flyable) return;
    const n = c.counts;
    n.flyable++;
    if (r.status === 'settled') n.settled++;
    else if (r.status === 'unsettled') n.unsettled++;
    else if (r.status === 'failed') n.failed++;
    if (r.unwound) n.unwound++;
    if (r.longWay) n.longWay++;
    if (r.chattered) n.chattered++;
    if (r.constraintViolated !== undefined) n.constraintChecked++;
    if (r.constraintViolated === true) n.constraintViolated++;
    topKAdd(c.worst, worstItem(index, r));
  });
  return ok(acc);
}

function insertMapPoint(map: MapPoint[], p: MapPoint): void {
  let lo = 0,
    hi = map.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (map[mid]!.index < p.index) lo = mid + 1;
    else hi = mid;
  }
  map.splice(lo, 0, p);
}

/** The union of two map samples (disjoint case sets), in case order. */
function mergeMaps(a: readonly MapPoint[], b: readonly MapPoint[]): MapPoint[] {
  const out: MapPoint[] = [];
  let i = 0,
    j = 0;
  while (i < a.length || j < b.length) {
    const x = a[i],
      y = b[j];
    if (y === undefined || (x !== undefined && x.index < y.index)) {
      out.push(x!);
      i++;
    } else {
      out.push(y);
      j++;
    }
  }
  return out;
}

/**
 * a ∪ b (a new state; a and b are left as they were, payloads shared). Both must come from the
 * same study (same controllers and bins: the caller checks the study itself) and cover disjoint
 * cases; a case covered by both is refused, naming it.
 */
export function mergeStudyAccumulators(a: StudyAccumulator, b: StudyAccumulator): Result<StudyAccumulator> {
  if (a.controllers.length !== b.controllers.length)
    return fail([{ path: 'controllers', rule: 'same-study', message: 'the two partial results have different controller counts' }]);
  const coverage = pairwiseMerge(a.coverage, b.coverage);
  if (!coverage.ok) return fail(coverage.errors);
  const issues: Issue[] = [];
  const controllers = a.controllers.map((ca, ci): ControllerAccumulator => {
    const cb = b.controllers[ci]!;
    const counts = emptyCounts();
    for (const k of RUN_COUNT_KEYS) counts[k] = ca.counts[k] + cb.counts[k];
    const take = <T>(r: Result<T>, fallback: T): T => {
      if (r.ok) return r.value;
      issues.push(...r.errors.map((e) => ({ ...e, path: `controllers[${ci}].${e.path}` })));
      return fallback;
    };
    return {
      counts,
      moments: ca.moments.map((m, k) => take(pairwiseMerge(m, cb.moments[k]!), m)),
      histograms: ca.histograms.map((h, k) => take(histogramMerge(h, cb.histograms[k]!), h)),
      worst: take(topKMerge(ca.worst, cb.worst), ca.worst),
    };
  });
  if (issues.length) return fail(issues);
  return ok({
    coverage: coverage.value,
    inertiaRejections: a.inertiaRejections + b.inertiaRejections,
    unflyableCases: a.unflyableCases + b.unflyableCases,
    map: mergeMaps(a.map, b.map),
    controllers,
  });
}

/** Cases covered. */
export function accumulatedCases(acc: StudyAccumulator): number {
  return pairwiseCovered(acc.coverage);
}

/**
 * The mergeable study state (accumulate.ts) as JSON and back, for shard files. Writing then
 * reading gives back the same bits (math/statsJson.ts: numbers round-trip exactly). Histograms are
 * written as counts only: their bins follow from the study definition, which the shard's header
 * carries. Reading checks everything a merge relies on and names every problem with its path.
 */
import type { Issue, Result } from '../errors';
import { describe, fail, ok } from '../errors';
import type { Histogram as Counts, PairwiseMoments, TopK } from '../math/stats';
import { pairwiseRanges } from '../math/stats';
import type { PairwiseMomentsJson, TopKJson } from '../math/statsJson';
import { pairwiseFromJson, pairwiseToJson, topKFromJson, topKToJson } from '../math/statsJson';
import type { ControllerAccumulator, RunCounts, StudyAccumulator } from './accumulate';
import { RUN_COUNT_KEYS, studyFineEdges } from './accumulate';
import { QUANTITIES } from './quantities';
import type { CaseStatus } from './runCase';
import type { MapPoint, StudyInfo, WorstCase } from './summary';

interface CountsJson {
  counts: number[];
  underflow: number;
  overflow: number;
  invalid: number;
}

export interface StudyAccumulatorJson {
  kind: 'study-state';
  coverage: PairwiseMomentsJson;
  inertiaRejections: number;
  unflyableCases: number;
  map: MapPoint[];
  controllers: {
    counts: RunCounts;
    quantities: Record<string, { moments: PairwiseMomentsJson; histogram: CountsJson }>;
    worst: TopKJson;
  }[];
}

export function accumulatorToJson(acc: StudyAccumulator): StudyAccumulatorJson {
  return {
    kind: 'study-state',
    coverage: pairwiseToJson(acc.coverage),
    inertiaRejections: acc.inertiaRejections,
    unflyableCases: acc.unflyableCases,
    map: acc.map,
    controllers: acc.controllers.map((c) => ({
      counts: c.counts,
      quantities: Object.fromEntries(
        QUANTITIES.map((q, k) => {
          const h = c.histograms[k]!;
          return [
            q.key,
            {
              moments: pairwiseToJson(c.moments[k]!),
              histogram: { counts: h.counts, underflow: h.underflow, overflow: h.overflow, invalid: h.invalid },
            },
          ];
        }),
      ),
      worst: topKToJson(c.worst),
    })),
  };
}

const isObj = (v: unknown): v is Record<string, unknown> => typeof v === 'object' && v !== null && !Array.isArray(v);
const isCount = (v: unknown): v is number => typeof v === 'number' && Number.isSafeInteger(v) && v >= 0;
const isNum = (v: unknown): v is number => typeof v === 'number' && Number.isFinite(v);
const STATUSES: readonly CaseStatus[] = ['settled', 'unsettled', 'failed', 'unflyable'];
const OUTCOMES = ['failed', 'unflyable', 'unsettled', 'unwound', 'chattered', 'settled'];

function worstFromJson(v: unknown, path: string): Result<WorstCase> {
  const o = isObj(v) ? v : {};
  const bad =
    !isObj(v) ||
    !isCount(o.index) ||
    !STATUSES.includes(o.status as CaseStatus) ||
    !(o.settleTimeS === null || isNum(o.settleTimeS)) ||
    !isNum(o.finalErrorDeg) ||
    typeof o.unwound !== 'boolean' ||
    typeof o.chattered !== 'boolean' ||
    typeof o.reason !== 'string';
  if (bad)
    return fail([
      {
        path,
        rule: 'worst-case',
        message: `${path} must be a worst case {index, status, settleTimeS, finalErrorDeg, unwound, chattered, reason}`,
      },
    ]);
  return ok(v as unknown as WorstCase);
}

function mapPointIssues(v: unknown, path: string, controllers: number): Issue[] {
  const o = isObj(v) ? v : {};
  const ok3 = Array.isArray(o.axis) && o.axis.length === 3 && o.axis.every(isNum);
  const okOutcome = Array.isArray(o.outcome) && o.outcome.length === controllers && o.outcome.every((x) => OUTCOMES.includes(x as string));
  const okSettle =
    Array.isArray(o.settleTimeS) && o.settleTimeS.length === controllers && o.settleTimeS.every((x) => x === null || isNum(x));
  if (isObj(v) && isCount(o.index) && ok3 && isNum(o.angleDeg) && isNum(o.eta0) && okOutcome && okSettle) return [];
  return [
    {
      path,
      rule: 'map-point',
      message: `${path} must be a map point {index, axis[3], angleDeg, eta0, outcome[${controllers}], settleTimeS[${controllers}]}`,
    },
  ];
}

/** Read one state written by accumulatorToJson for the study `info` (its controllers and bins). */
export function accumulatorFromJson(v: unknown, info: StudyInfo, path = 'state'): Result<StudyAccumulator> {
  const issues: Issue[] = [];
  const bad = (p: string, rule: string, message: string) => issues.push({ path: p, rule, message });
  const take = <T>(r: Result<T>): T | null => {
    if (r.ok) return r.value;
    issues.push(...r.errors);
    return null;
  };
  if (!isObj(v) || v.kind !== 'study-state')
    return fail([{ path, rule: 'kind', message: `${path} must be a study state (kind "study-state")` }]);
  const coverage = take(pairwiseFromJson(v.coverage, `${path}.coverage`));
  for (const k of ['inertiaRejections', 'unflyableCases'] as const)
    if (!isCount(v[k])) bad(`${path}.${k}`, 'count', `${path}.${k} must be a whole number ≥ 0 (got ${describe(v[k])})`);
  const nC = info.controllers.length;
  const map = Array.isArray(v.map) ? (v.map as unknown[]) : [];
  if (!Array.isArray(v.map)) bad(`${path}.map`, 'array', `${path}.map must be an array`);
  map.forEach((p, i) => issues.push(...mapPointIssues(p, `${path}.map[${i}]`, nC)));
  for (let i = 1; i < map.length && issues.length === 0; i++)
    if (!((map[i] as MapPoint).index > (map[i - 1] as MapPoint).index))
      bad(`${path}.map[${i}]`, 'order', `${path}.map must be in case order`);
  const edges = studyFineEdges(info);
  const raw = Array.isArray(v.controllers) ? (v.controllers as unknown[]) : [];
  if (raw.length !== nC) bad(`${path}.controllers`, 'length', `${path}.controllers must hold one entry per study controller (${nC})`);
  const controllers: ControllerAccumulator[] = raw.slice(0, nC).map((cv, ci) => {
    const at = `${path}.controllers[${ci}]`;
    const c = isObj(cv) ? cv : {};
    const counts = {} as RunCounts;
    const cc = isObj(c.counts) ? c.counts : {};
    for (const k of RUN_COUNT_KEYS) {
      if (!isCount(cc[k])) bad(`${at}.counts.${k}`, 'count', `${at}.counts.${k} must be a whole number ≥ 0`);
      counts[k] = isCount(cc[k]) ? cc[k] : 0;
    }
    const qs = isObj(c.quantities) ? c.quantities : {};
    const moments: PairwiseMoments[] = [];
    const histograms: Counts[] = [];
    QUANTITIES.forEach((q, k) => {
      const qa = `${at}.quantities.${q.key}`;
      const qv = isObj(qs[q.key]) ? (qs[q.key] as Record<string, unknown>) : {};
      moments.push(take(pairwiseFromJson(qv.moments, `${qa}.moments`)) ?? { blocks: [] });
      const h = isObj(qv.histogram) ? qv.histogram : {};
      const n = edges[k]!.length - 1;
      const okCounts = Array.isArray(h.counts) && h.counts.length === n && h.counts.every(isCount);
      if (!okCounts || !isCount(h.underflow) || !isCount(h.overflow) || !isCount(h.invalid))
        bad(`${qa}.histogram`, 'histogram', `${qa}.histogram must hold ${n} whole-number counts and underflow, overflow, invalid`);
      histograms.push({
        edges: edges[k]!,
        counts: okCounts ? (h.counts as number[]) : new Array<number>(n).fill(0),
        underflow: isCount(h.underflow) ? h.underflow : 0,
        overflow: isCount(h.overflow) ? h.overflow : 0,
        invalid: isCount(h.invalid) ? h.invalid : 0,
      });
    });
    const worst: TopK<WorstCase> | null = take(topKFromJson(c.worst, `${at}.worst`, worstFromJson));
    if (worst && worst.k !== info.def.worstCases)
      bad(`${at}.worst.k`, 'same-k', `${at}.worst.k must be the study's worstCases (${info.def.worstCases})`);
    return { counts, moments, histograms, worst: worst ?? { k: info.def.worstCases, items: [] } };
  });
  // Every statistic covers the same cases as the state.
  if (coverage && issues.length === 0) {
    const want = JSON.stringify(pairwiseRanges(coverage));
    controllers.forEach((c, ci) =>
      c.moments.forEach((m, k) => {
        if (JSON.stringify(pairwiseRanges(m)) !== want)
          bad(
            `${path}.controllers[${ci}].quantities.${QUANTITIES[k]!.key}.moments`,
            'coverage',
            'the moments cover other cases than the state',
          );
      }),
    );
  }
  if (issues.length || !coverage) return fail(issues);
  return ok({
    coverage,
    inertiaRejections: v.inertiaRejections as number,
    unflyableCases: v.unflyableCases as number,
    map: map as MapPoint[],
    controllers,
  });
}

/**
 * A synthetic campaign for the tests and the bench: invented per-case outcomes that depend only on
 * (seed, case index), as a real study's cases do, summarised with the mergeable statistics of
 * app/engine/math/stats.ts. Shaped like a study summary (per controller: settled share, seven
 * quantities with moments and a histogram each, a worst-case list) without running any physics.
 *
 * - `campaignState(shape, indices)`: the shard state of some cases (any order);
 * - `mergeStates(a, b)`: exact merge; `stateToJson` / `stateFromJson`: the shard file;
 * - `campaignReport(state)`: the final summary (every rounded number computed here, once).
 */
import { makeRng } from '../../app/engine/math/prng';
import {
  exactMomentsAdd,
  exactMomentsEmpty,
  exactMomentsMerge,
  exactMomentsToMoments,
  histogramAdd,
  histogramCreate,
  histogramMerge,
  histogramQuantile,
  momentsVariance,
  shareInterval,
  topKAdd,
  topKCreate,
  topKMerge,
  uniformEdges,
  type ExactMoments,
  type Histogram,
  type TopK,
} from '../../app/engine/math/stats';
import {
  exactMomentsFromJson,
  exactMomentsToJson,
  histogramFromJson,
  histogramToJson,
  topKFromJson,
  topKToJson,
} from '../../app/engine/math/statsJson';
import type { Result } from '../../app/engine/errors';

export interface CampaignShape {
  seed: number;
  cases: number;
  controllers: number;
  worst: number;
}

type Draw = ReturnType<typeof makeRng>;

/** The seven quantities of a study summary, with invented distributions and fixed edges. */
const QUANTITIES: { name: string; edges: number[]; draw: (r: Draw, settled: boolean) => number }[] = [
  { name: 'settleTimeS', edges: uniformEdges(0, 600, 20), draw: (r, s) => (s ? 20 + 40 * Math.exp(0.5 * r.normal()) : Infinity) },
  { name: 'rotationTravelledDeg', edges: uniformEdges(0, 360, 24), draw: (r) => 180 * r.next() ** 0.7 + (r.next() < 0.02 ? 360 : 0) },
  { name: 'jumps', edges: uniformEdges(0, 10, 10), draw: (r) => Math.floor(-2 * Math.log(1 - r.next())) },
  { name: 'chatterPerS', edges: [0, 0.1, 0.2, 0.5, 1, 2, 5], draw: (r) => Math.exp(r.normal() - 1.6) },
  { name: 'peakWheelMomentumFraction', edges: uniformEdges(0, 1, 20), draw: (r) => Math.min(1, r.next() ** 0.4) },
  { name: 'peakWheelTorqueFraction', edges: uniformEdges(0, 1, 20), draw: (r) => Math.min(1, 0.3 + 0.7 * r.next()) },
  {
    name: 'finalErrorDeg',
    edges: [0, 0.01, 0.03, 0.1, 0.3, 1, 3, 10, 30, 90],
    draw: (r, s) => (s ? 0.002 : 5) * Math.exp(1.5 * r.normal()),
  },
];

export interface WorstPayload {
  settled: boolean;
  finalErrorDeg: number;
}

export interface ControllerState {
  settled: number;
  moments: ExactMoments[];
  histograms: Histogram[];
  worst: TopK<WorstPayload>;
}

export interface CampaignState {
  shape: CampaignShape;
  casesDone: number;
  controllers: ControllerState[];
}

function must<T>(r: Result<T>): T {
  if (!r.ok) throw new Error(r.errors.map((e) => `${e.path}: ${e.message}`).join('; '));
  return r.value;
}

export function emptyState(shape: CampaignShape): CampaignState {
  return {
    shape,
    casesDone: 0,
    controllers: Array.from({ length: shape.controllers }, () => ({
      settled: 0,
      moments: QUANTITIES.map(() => exactMomentsEmpty()),
      histograms: QUANTITIES.map((q) => must(histogramCreate(q.edges))),
      worst: topKCreate<WorstPayload>(shape.worst),
    })),
  };
}

/** Add case `index` (its outcomes are a function of (seed, index) only). */
export function addCase(s: CampaignState, index: number): void {
  s.casesDone++;
  s.controllers.forEach((c, ci) => {
    const r = makeRng(s.shape.seed + ci, index);
    const settled = r.next() < 0.93 - 0.05 * ci;
    if (settled) c.settled++;
    let finalErrorDeg = 0;
    QUANTITIES.forEach((q, k) => {
      const v = q.draw(r, settled);
      exactMomentsAdd(c.moments[k]!, v);
      histogramAdd(c.histograms[k]!, v);
      if (q.name === 'finalErrorDeg') finalErrorDeg = v;
    });
    topKAdd(c.worst, { key: index, score: finalErrorDeg, payload: { settled, finalErrorDeg } });
  });
}

export function campaignState(shape: CampaignShape, indices: Iterable<number>): CampaignState {
  const s = emptyState(shape);
  for (const i of indices) addCase(s, i);
  return s;
}

/** Cases of shard i of K: [⌊iN/K⌋, ⌊(i+1)N/K⌋). */
export function shardIndices(i: number, k: number, n: number): number[] {
  const lo = Math.floor((i * n) / k),
    hi = Math.floor(((i + 1) * n) / k);
  return Array.from({ length: hi - lo }, (_, j) => lo + j);
}

export function mergeStates(a: CampaignState, b: CampaignState): CampaignState {
  return {
    shape: a.shape,
    casesDone: a.casesDone + b.casesDone,
    controllers: a.controllers.map((ca, ci) => {
      const cb = b.controllers[ci]!;
      return {
        settled: ca.settled + cb.settled,
        moments: ca.moments.map((m, k) => exactMomentsMerge(exactMomentsEmpty(), m, cb.moments[k]!)),
        histograms: ca.histograms.map((h, k) => must(histogramMerge(h, cb.histograms[k]!))),
        worst: must(topKMerge(ca.worst, cb.worst)),
      };
    }),
  };
}

/** The shard file's content. */
export function stateToJson(s: CampaignState): string {
  return JSON.stringify({
    format: 'slewsmith-test-campaign-shard',
    shape: s.shape,
    casesDone: s.casesDone,
    controllers: s.controllers.map((c) => ({
      settled: c.settled,
      quantities: QUANTITIES.map((q, k) => ({
        name: q.name,
        moments: exactMomentsToJson(c.moments[k]!),
        histogram: histogramToJson(c.histograms[k]!),
      })),
      worst: topKToJson(c.worst),
    })),
  });
}

export function stateFromJson(text: string): CampaignState {
  const o = JSON.parse(text);
  if (o.format !== 'slewsmith-test-campaign-shard') throw new Error('not a test campaign shard file');
  return {
    shape: o.shape,
    casesDone: o.casesDone,
    controllers: o.controllers.map((c: any, ci: number) => ({
      settled: c.settled,
      moments: c.quantities.map((q: any, k: number) =>
        must(exactMomentsFromJson(q.moments, `controllers[${ci}].quantities[${k}].moments`)),
      ),
      histograms: c.quantities.map((q: any, k: number) =>
        must(histogramFromJson(q.histogram, `controllers[${ci}].quantities[${k}].histogram`)),
      ),
      worst: must(topKFromJson<WorstPayload>(c.worst, `controllers[${ci}].worst`)),
    })),
  };
}

/** The final summary: shares with intervals, moments, quantiles, worst cases. */
export function campaignReport(s: CampaignState): string {
  return (
    JSON.stringify(
      {
        cases: s.casesDone,
        controllers: s.controllers.map((c) => ({
          settled: shareInterval(c.settled, s.casesDone),
          quantities: QUANTITIES.map((q, k) => {
            const m = exactMomentsToMoments(c.moments[k]!);
            const v = momentsVariance(m);
            const h = c.histograms[k]!;
            return {
              name: q.name,
              n: m.n,
              notFinite: m.nonFinite,
              mean: m.mean,
              sd: v === null ? null : Math.sqrt(v),
              min: m.min,
              max: m.max,
              median: histogramQuantile(h, 0.5),
              p95: histogramQuantile(h, 0.95),
              counts: h.counts,
              under: h.underflow,
              over: h.overflow,
            };
          }),
          worst: c.worst.items.map((w) => ({ case: w.key, ...w.payload })),
        })),
      },
      null,
      1,
    ) + '\n'
  );
}

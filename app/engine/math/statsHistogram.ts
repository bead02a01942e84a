/**
 * Fixed-bin histograms with nearest-rank quantiles, part of the mergeable statistics of stats.ts:
 * integer counts over declared edges, so merging is exact. −∞ counts under, +∞ over, NaN invalid;
 * −0 edges are stored as +0.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';

/**
 * Counts over declared bin edges (strictly increasing, finite): bin k holds [edges[k],
 * edges[k + 1]); the last bin is closed at its top edge. Below the first edge → `underflow`
 * (including −∞), above the last → `overflow` (including +∞), NaN → `invalid`. Counts are
 * integers, so merging is exact.
 */
export interface Histogram {
  edges: number[];
  counts: number[];
  underflow: number;
  overflow: number;
  invalid: number;
}

/** `bins` equal bins over [lo, hi]: edges lo + (hi − lo)·k/bins, the last exactly hi. */
export function uniformEdges(lo: number, hi: number, bins: number): number[] {
  const edges = Array.from({ length: bins + 1 }, (_, k) => lo + ((hi - lo) * k) / bins);
  edges[bins] = hi;
  return edges;
}

/** Problems with a list of edges (empty when fine). */
export function edgeIssues(edges: readonly number[], path = 'edges'): Issue[] {
  const out: Issue[] = [];
  if (edges.length < 2) out.push({ path, rule: 'min-length', message: `${path} needs at least two edges (one bin)` });
  edges.forEach((x, k) => {
    if (typeof x !== 'number' || !Number.isFinite(x))
      out.push({ path: `${path}[${k}]`, rule: 'finite', message: `${path}[${k}] must be a finite number` });
    else if (k > 0 && !(x > edges[k - 1]!))
      out.push({ path: `${path}[${k}]`, rule: 'increasing', message: `${path} must be strictly increasing (edge ${k} is ${x})` });
  });
  return out;
}

export function histogramCreate(edges: readonly number[]): Result<Histogram> {
  const bad = edgeIssues(edges);
  if (bad.length) return fail(bad);
  return ok({ edges: edges.map((x) => x + 0), counts: new Array<number>(edges.length - 1).fill(0), underflow: 0, overflow: 0, invalid: 0 });
}

/** Count one value; in place, returns h. */
export function histogramAdd(h: Histogram, x: number): Histogram {
  const e = h.edges;
  const last = e.length - 1;
  if (Number.isNaN(x)) h.invalid++;
  else if (x < e[0]!) h.underflow++;
  else if (x > e[last]!) h.overflow++;
  else {
    // Largest k with e[k] ≤ x, within 0…last − 1 (x = e[last] falls in the last bin).
    let lo = 0,
      hi = last - 1;
    while (lo < hi) {
      const mid = (lo + hi + 1) >>> 1;
      if (e[mid]! <= x) lo = mid;
      else hi = mid - 1;
    }
    h.counts[lo]!++;
  }
  return h;
}

function sameEdges(a: readonly number[], b: readonly number[]): boolean {
  return a.length === b.length && a.every((x, k) => x === b[k]);
}

/** a ∪ b as a new histogram; the edges must be identical. */
export function histogramMerge(a: Histogram, b: Histogram): Result<Histogram> {
  if (!sameEdges(a.edges, b.edges))
    return fail([{ path: 'edges', rule: 'same-bins', message: 'histograms with different bin edges cannot be merged' }]);
  return ok({
    edges: [...a.edges],
    counts: a.counts.map((c, k) => c + b.counts[k]!),
    underflow: a.underflow + b.underflow,
    overflow: a.overflow + b.overflow,
    invalid: a.invalid + b.invalid,
  });
}

/** Values counted in range or beyond it (NaN excluded). */
export function histogramTotal(h: Histogram): number {
  return h.counts.reduce((s, c) => s + c, h.underflow + h.overflow);
}

export interface HistogramQuantile {
  p: number;
  /** Nearest rank: the r-th smallest value, r = max(1, ⌈p·total⌉). */
  rank: number;
  total: number;
  where: 'below' | 'in-range' | 'above';
  /** The bin holding the ranked value: it lies in [low, high]; null beyond the edges. */
  low: number | null;
  high: number | null;
  /** Inside a bin: low + (high − low)·(j − ½)/c for the j-th of the bin's c values; null beyond the edges. */
  estimate: number | null;
  /** high − low: the estimate is within this of the true nearest-rank quantile; null beyond the edges. */
  resolution: number | null;
}

/**
 * The nearest-rank p-quantile (R. J. Hyndman & Y. Fan, "Sample quantiles in statistical packages",
 * Am. Stat. 50(4):361–365, 1996, definition 1: the inverse of the empirical distribution
 * function), located to its bin. Deterministic; null when the histogram is empty. p in [0, 1].
 */
export function histogramQuantile(h: Histogram, p: number): HistogramQuantile | null {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`quantile level must be in [0, 1] (got ${p})`);
  const total = histogramTotal(h);
  if (total === 0) return null;
  const rank = Math.max(1, Math.ceil(p * total));
  const beyond = (where: 'below' | 'above') => ({ p, rank, total, where, low: null, high: null, estimate: null, resolution: null });
  if (rank <= h.underflow) return beyond('below');
  let before = h.underflow;
  for (let k = 0; k < h.counts.length; k++) {
    const c = h.counts[k]!;
    if (rank <= before + c) {
      const low = h.edges[k]!,
        high = h.edges[k + 1]!;
      const j = rank - before;
      return { p, rank, total, where: 'in-range', low, high, estimate: low + ((high - low) * (j - 0.5)) / c, resolution: high - low };
    }
    before += c;
  }
  return beyond('above');
}

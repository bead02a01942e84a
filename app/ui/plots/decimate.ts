/**
 * Display-only thinning of a plot's aligned columns before uPlot draws them: per pixel column of
 * the x range, keep the first and last sample and, for every series, the samples holding its
 * smallest and largest value (the M4 aggregation of Jugel, Jerzak, Hackenbroich and Markl, "M4: A
 * Visualization-Oriented Time Series Data Aggregation", PVLDB 7(10), 2014: a line chart drawn
 * through first/last/min/max per pixel column covers the same pixels as one drawn through every
 * sample). All series share one x column (uPlot's aligned data), so the kept indices are the union
 * over the series; each series then holds a superset of its own M4 samples, all of them real
 * samples. Exports never go through here (they read the engine's traces).
 *
 * A column where some series has an explicit null (a gap uPlot must draw) keeps every sample, so
 * gaps stay exactly where they were. `undefined` (uPlot.join's alignment filler) and NaN take
 * no part in a column's extremes.
 */
import type { Series } from './base';

/** Below this many samples per column there is nothing worth removing. */
const MIN_SAMPLES_PER_COLUMN = 4;

/**
 * Indices of `x` to keep for `columns` pixel columns over [xMin, xMax], ascending. Samples
 * outside the range are dropped except the nearest one on each side (lines reach the edges) and
 * the first and last of all.
 */
export function keptIndices(x: ArrayLike<number>, ys: readonly Series[], xMin: number, xMax: number, columns: number): number[] {
  const n = x.length;
  const kept: number[] = [];
  if (n === 0) return kept;
  let i0 = 0;
  while (i0 < n && x[i0]! < xMin) i0++;
  let i1 = n - 1;
  while (i1 >= 0 && x[i1]! > xMax) i1--;
  // The very first and last samples stay too, so the data keep their full x extent (uPlot's
  // double-click reset ranges x over the data it holds); outside the range they are clipped away.
  if (i0 > 1) kept.push(0);
  if (i0 > 0) kept.push(i0 - 1);
  const tail = () => {
    if (i1 + 1 < n && i1 + 1 !== kept[kept.length - 1]) kept.push(i1 + 1);
    if (i1 + 2 < n) kept.push(n - 1);
  };
  if (i1 < i0) {
    // No sample inside the range: the neighbours on each side draw the line across it.
    tail();
    return kept;
  }
  const S = ys.length;
  const minI = new Int32Array(S);
  const maxI = new Int32Array(S);
  const minV = new Float64Array(S);
  const maxV = new Float64Array(S);
  const span = xMax - xMin;
  // Column of a sample: floor((x − xMin)·columns / (xMax − xMin)), the last column closed.
  const colOf = (k: number) => (span > 0 ? Math.min(columns - 1, Math.max(0, Math.floor(((x[k]! - xMin) * columns) / span))) : 0);
  const picks: number[] = [];
  let k = i0;
  while (k <= i1) {
    const col = colOf(k);
    const first = k;
    minI.fill(-1);
    maxI.fill(-1);
    let gap = false;
    let last = k;
    for (; k <= i1 && colOf(k) === col; k++) {
      last = k;
      for (let s = 0; s < S; s++) {
        const v = ys[s]![k];
        if (v === null) {
          gap = true;
          continue;
        }
        if (v === undefined || Number.isNaN(v)) continue;
        if (minI[s] === -1 || v < minV[s]!) {
          minI[s] = k;
          minV[s] = v;
        }
        if (maxI[s] === -1 || v > maxV[s]!) {
          maxI[s] = k;
          maxV[s] = v;
        }
      }
    }
    if (gap) {
      for (let j = first; j <= last; j++) kept.push(j);
      continue;
    }
    picks.length = 0;
    picks.push(first, last);
    for (let s = 0; s < S; s++) {
      if (minI[s]! >= 0) picks.push(minI[s]!, maxI[s]!);
    }
    picks.sort((a, b) => a - b);
    for (let j = 0; j < picks.length; j++) if (j === 0 || picks[j] !== picks[j - 1]) kept.push(picks[j]!);
  }
  tail();
  return kept;
}

function take(src: Series, idx: readonly number[]): Series {
  if (src instanceof Float64Array) {
    const out = new Float64Array(idx.length);
    for (let j = 0; j < idx.length; j++) out[j] = src[idx[j]!]!;
    return out;
  }
  const out: (number | null)[] = new Array(idx.length);
  for (let j = 0; j < idx.length; j++) out[j] = src[idx[j]!] as number | null;
  return out;
}

/**
 * The columns `data` (x first) thinned to about `columns` pixel columns over [xMin, xMax]
 * (default: the whole x extent). Returns `data` itself when thinning would keep most samples.
 */
export function decimateAligned(data: readonly Series[], columns: number, xMin?: number, xMax?: number): readonly Series[] {
  const x = data[0] as ArrayLike<number> | undefined;
  if (!x || x.length === 0 || !(columns >= 1)) return data;
  const lo = xMin ?? x[0]!;
  const hi = xMax ?? x[x.length - 1]!;
  const inRange = xMin === undefined && xMax === undefined ? x.length : countIn(x, lo, hi);
  if (inRange <= MIN_SAMPLES_PER_COLUMN * columns && inRange === x.length) return data;
  const idx = keptIndices(x, data.slice(1), lo, hi, Math.floor(columns));
  if (idx.length >= x.length) return data;
  return data.map((s) => take(s, idx));
}

function countIn(x: ArrayLike<number>, lo: number, hi: number): number {
  let c = 0;
  for (let k = 0; k < x.length; k++) if (x[k]! >= lo && x[k]! <= hi) c++;
  return c;
}

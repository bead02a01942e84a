/**
 * Display thinning of plot columns (app/ui/plots/decimate.ts), checked against the M4 aggregation
 * of Jugel, Jerzak, Hackenbroich and Markl, "M4: A Visualization-Oriented Time Series Data
 * Aggregation", PVLDB 7(10), 2014 (Sec. 4: per pixel column the first, last, smallest and largest
 * value; a line drawn through those covers the same pixels as the full series). The property
 * checked: every column's first and last x and every series' min and max over the kept samples
 * equal those over all samples, computed here independently by brute force; plus a worked example
 * by hand, explicit gaps, a zoomed range and the untouched small case.
 */
import { describe, expect, it } from 'vitest';
import { decimateAligned, keptIndices } from '../../app/ui/plots/decimate';

/** xoshiro-free LCG for test data (Numerical Recipes' 32-bit constants, from memory). */
function lcg(seed: number) {
  let s = seed >>> 0;
  return () => (s = (Math.imul(s, 1664525) + 1013904223) >>> 0) / 4294967296;
}

/** Brute-force M4 per column: [first x, last x, then min and max per series], columns without samples omitted. */
function m4(x: ArrayLike<number>, ys: ArrayLike<number | null>[], xMin: number, xMax: number, columns: number): Map<number, number[]> {
  const out = new Map<number, number[]>();
  for (let k = 0; k < x.length; k++) {
    const xv = x[k]!;
    if (xv < xMin || xv > xMax) continue;
    const col = Math.min(columns - 1, Math.floor(((xv - xMin) * columns) / (xMax - xMin)));
    const row = out.get(col);
    if (!row) {
      out.set(col, [xv, xv, ...ys.flatMap((y) => [y[k] as number, y[k] as number])]);
      continue;
    }
    row[1] = xv;
    ys.forEach((y, s) => {
      const v = y[k] as number;
      row[2 + 2 * s] = Math.min(row[2 + 2 * s]!, v);
      row[3 + 2 * s] = Math.max(row[3 + 2 * s]!, v);
    });
  }
  return out;
}

describe('plot decimation (M4, display only)', () => {
  it('worked example by hand: 10 samples into 2 columns keep first, last, min and max of each', () => {
    const x = Float64Array.from([0, 1, 2, 3, 4, 5, 6, 7, 8, 9]);
    const y = Float64Array.from([0, 5, 1, 1, -3, 2, 2, 9, 2, 2]);
    // Column 0 holds x = 0..4 (floor(x·2/9) = 0): first 0, max 5 at 1, min −3 at 4 (also last);
    // column 1 holds x = 5..9: first 5 (also the first minimum 2), max 9 at 7, last 9.
    expect(keptIndices(x, [y], 0, 9, 2)).toEqual([0, 1, 4, 5, 7, 9]);
    const d = decimateAligned([x, y], 2);
    expect(Array.from(d[0]!)).toEqual([0, 1, 4, 5, 7, 9]);
    expect(Array.from(d[1]!)).toEqual([0, 5, -3, 2, 9, 2]);
  });

  it('random walks of several series on a shared axis: per-column extremes kept exactly, far fewer samples', () => {
    const rand = lcg(7);
    const n = 6000;
    const x = new Float64Array(n);
    const ys = [new Float64Array(n), new Float64Array(n), new Float64Array(n)];
    for (let k = 0; k < n; k++) {
      x[k] = k * 0.1 + (k > 3000 ? 0.05 : 0);
      ys.forEach((y, s) => (y[k] = (k ? y[k - 1]! : 0) + (rand() - 0.5) * (s + 1)));
    }
    const columns = 600;
    const d = decimateAligned([x, ...ys], columns);
    const full = m4(x, ys, x[0]!, x[n - 1]!, columns);
    const kept = m4(d[0] as Float64Array, d.slice(1) as Float64Array[], x[0]!, x[n - 1]!, columns);
    expect(kept).toEqual(full);
    // At most first, last and two per series per column (the bound of the union of M4 sets).
    expect(d[0]!.length).toBeLessThanOrEqual(columns * (2 + 2 * ys.length));
    expect(d[0]!.length).toBeLessThan(n);
    // Every kept sample is a real sample (same x, same y at that x).
    const at = new Map(Array.from(x, (v, k) => [v, k]));
    for (let j = 0; j < d[0]!.length; j++) {
      const k = at.get(d[0]![j] as number)!;
      ys.forEach((y, s) => expect(d[1 + s]![j]).toBe(y[k]));
    }
  });

  it("a zoomed range: extremes per column inside it, one neighbour outside on each side and the extent's ends", () => {
    const n = 5000;
    const x = Float64Array.from({ length: n }, (_, k) => k);
    const y = Float64Array.from({ length: n }, (_, k) => Math.sin(k / 37) + 0.01 * ((k * 7919) % 13));
    const idx = keptIndices(x, [y], 1000, 2000, 100);
    // The whole extent's ends (uPlot's zoom reset ranges over the data held), then the neighbours.
    expect(idx.slice(0, 2)).toEqual([0, 999]);
    expect(idx.slice(-2)).toEqual([2001, n - 1]);
    const kx = idx.map((k) => x[k]!);
    const ky = idx.map((k) => y[k]!);
    expect(m4(kx, [ky], 1000, 2000, 100)).toEqual(m4(x, [y], 1000, 2000, 100));
  });

  it('a column with an explicit null (a gap) keeps every sample of that column; undefined fillers take no part', () => {
    const n = 400;
    const x = Float64Array.from({ length: n }, (_, k) => k);
    const y: (number | null)[] = Array.from({ length: n }, (_, k) => (k === 205 ? null : Math.cos(k / 10)));
    const filler: (number | null | undefined)[] = Array.from({ length: n }, (_, k) => (k % 2 ? undefined : k));
    const d = decimateAligned([x, y, filler as (number | null)[]], 10);
    const xs = Array.from(d[0]! as Float64Array);
    // Column 5 holds x = 200..239: all 40 samples kept, the null among them.
    for (let k = 200; k < 240; k++) expect(xs).toContain(k);
    expect(d[1]![xs.indexOf(205)]).toBeNull();
    expect(xs.length).toBeLessThan(n);
  });

  it('few samples per column: the data come back untouched (same object)', () => {
    const x = Float64Array.from({ length: 100 }, (_, k) => k);
    const y = x.map((v) => v * v);
    const data = [x, y];
    expect(decimateAligned(data, 600)).toBe(data);
  });
});

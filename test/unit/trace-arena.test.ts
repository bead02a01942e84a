/**
 * The trace arena, copies and subsets (sim/trace.ts traceArena, TraceBuilder's arena, copyTrace,
 * subsetTrace) and the display rule (sim/displayTrace.ts displayIndices) on hand-made traces.
 *
 * References: a trace recorded into an arena is compared with the same samples recorded by a
 * builder with fresh arrays (the reference is the plain builder itself); "bit for bit" is Object.is
 * on each number (ECMA-262 §20.1.2.13, SameValue); the kept indices are compared with the rule of
 * sim/displayTrace.ts written out again here as a brute-force scan (no outside source: the rule is
 * our own choice, documented there).
 */
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import {
  copyTrace,
  PACKED_SCALARS,
  subsetTrace,
  TRACE_CHANNELS,
  channelWidth,
  TraceBuilder,
  traceArena,
  type PackedSample,
} from '../../app/engine/sim/trace';
import { displayIndices } from '../../app/engine/sim/displayTrace';
import type { RunTrace } from '../../app/engine/sim/types';

const N = 4;

/** `n` samples of random numbers (seeded), with j, segment and logic changing now and then and −0 in places. */
function samples(n: number, seed: number): PackedSample[] {
  const rng = makeRng(seed);
  const v = (k: number) => Float64Array.from({ length: k }, () => (rng.next() < 0.05 ? -0 : rng.next() * 2 - 1));
  const out: PackedSample[] = [];
  let j = 0,
    segment = 0,
    logic = 1;
  for (let i = 0; i < n; i++) {
    if (rng.next() < 0.01) j++;
    if (rng.next() < 0.005) segment++;
    if (rng.next() < 0.01) logic = -logic;
    const scalars = v(PACKED_SCALARS);
    scalars[0] = i * 0.1; // t
    scalars[1] = logic;
    out.push({
      j,
      segment,
      scalars,
      q: v(4),
      omega: v(3),
      hWheel: v(N),
      qRef: v(4),
      omegaRef: v(3),
      torqueCmdBody: v(3),
      torqueBody: v(3),
      wheelTorqueCmd: v(N),
      wheelTorque: v(N),
      wheelTorqueNet: v(N),
    });
  }
  return out;
}

function record(s: PackedSample[], arena?: RunTrace): RunTrace {
  const b = new TraceBuilder(N, 64, s.length, arena);
  for (const x of s) b.pushPacked(x);
  return b.finish();
}

function sameBits(a: RunTrace, b: RunTrace): void {
  expect(a.n).toBe(b.n);
  expect(Array.from(a.j)).toEqual(Array.from(b.j));
  expect(Array.from(a.segment)).toEqual(Array.from(b.segment));
  for (const c of TRACE_CHANNELS) {
    expect(a[c].length, c).toBe(b[c].length);
    for (let i = 0; i < a[c].length; i++) if (!Object.is(a[c][i], b[c][i])) throw new Error(`${c}[${i}]`);
  }
}

describe('trace arena', () => {
  it('two runs recorded one after the other into one arena: each as a fresh builder records it; the second overwrites the first', () => {
    const arena = traceArena(N, 3000);
    const s1 = samples(2500, 1);
    const s2 = samples(1800, 2);
    const first = record(s1, arena);
    sameBits(first, record(s1));
    const kept = copyTrace(first);
    expect(kept.q.buffer).not.toBe(arena.q.buffer);
    const second = record(s2, arena);
    sameBits(second, record(s2));
    sameBits(kept, record(s1)); // the copy survives the next run
    expect(first.q.buffer).toBe(arena.q.buffer); // the first run's own view was overwritten
    expect(Object.is(first.q[0], s2[0]!.q[0])).toBe(true);
  });

  it('a run longer than its arena grows out of it into arrays of its own, bits unchanged', () => {
    const arena = traceArena(N, 100);
    const s = samples(1000, 3);
    const t = record(s, arena);
    sameBits(t, record(s));
    expect(t.q.buffer).not.toBe(arena.q.buffer);
  });

  it('subsetTrace copies the samples at the given indices bit for bit', () => {
    const full = record(samples(500, 4));
    const idx = Int32Array.from([0, 3, 4, 250, 499]);
    const sub = subsetTrace(full, idx);
    expect(sub.n).toBe(5);
    for (const c of TRACE_CHANNELS) {
      const w = channelWidth(c, N);
      for (let m = 0; m < idx.length; m++)
        for (let k = 0; k < w; k++) expect(Object.is(sub[c][m * w + k], full[c][idx[m]! * w + k]), c).toBe(true);
    }
    expect(Array.from(sub.j)).toEqual(Array.from(idx, (i) => full.j[i]));
  });
});

describe('displayIndices', () => {
  it('keeps exactly the grid, the bucket extremes of error angle and wheel momentum, the ends and both sides of each change', () => {
    const tr = record(samples(3000, 5));
    for (const stride of [1, 7, 64, 5000]) {
      const want = new Set<number>([0, tr.n - 1]);
      for (let b = 0; b < tr.n; b += stride) {
        const end = Math.min(tr.n, b + stride);
        let iMax = b,
          iMin = b,
          iH = b,
          hMax = -1;
        for (let i = b; i < end; i++) {
          if (tr.errorAngle[i]! > tr.errorAngle[iMax]!) iMax = i;
          if (tr.errorAngle[i]! < tr.errorAngle[iMin]!) iMin = i;
          for (let w = 0; w < N; w++)
            if (Math.abs(tr.hWheel[N * i + w]!) > hMax) {
              hMax = Math.abs(tr.hWheel[N * i + w]!);
              iH = i;
            }
        }
        [b, iMax, iMin, iH].forEach((i) => want.add(i));
      }
      for (let i = 1; i < tr.n; i++)
        if (tr.j[i] !== tr.j[i - 1] || tr.segment[i] !== tr.segment[i - 1] || tr.logic[i] !== tr.logic[i - 1]) want.add(i - 1).add(i);
      expect(Array.from(displayIndices(tr, stride)), `stride ${stride}`).toEqual([...want].sort((a, b) => a - b));
    }
    expect(displayIndices(record([]), 10).length).toBe(0);
  });
});

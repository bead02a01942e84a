/**
 * Pairwise moments over a fixed tree of case indices (app/engine/math/statsPairwise.ts):
 * - against a two-pass reference in 60-digit mathjs BigNumbers (mean = Σx/n, M2 = Σ(x − mean)²,
 *   the textbook definition; mathjs is a general-purpose reference library) and against
 *   Welford's single pass (B. P. Welford, Technometrics 4(3):419–420, 1962; statsMoments.ts):
 *   equal to 1e-12 relative, as the issue asks of moments merged pairwise;
 * - the tree is the pairwise algorithm of Chan, Golub & LeVeque (1979): for n = 2^L cases added in
 *   order, the root equals the recursive halving computed here independently;
 * - the property that makes shard merges byte-identical: any split into pieces, any order of the
 *   cases inside a piece and any merge order give the same bits (compared with Object.is).
 * Random data come from the project's seeded xoshiro128** (app/engine/math/prng.ts).
 */
import { describe, expect, it } from 'vitest';
import { all, create, type BigNumber } from 'mathjs';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import {
  momentsAdd,
  momentsEmpty,
  momentsMerge,
  pairwiseAdd,
  pairwiseCovered,
  pairwiseEmpty,
  pairwiseMerge,
  pairwiseRanges,
  pairwiseTotal,
  type Moments,
  type PairwiseMoments,
} from '../../app/engine/math/stats';
import { pairwiseFromJson, pairwiseToJson } from '../../app/engine/math/statsJson';
import type { Result } from '../../app/engine/errors';

const M = create(all!, { number: 'BigNumber', precision: 60 });
const big = (x: number) => M.bignumber(String(x)) as BigNumber;
const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

function must<T>(r: Result<T>): T {
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.value;
}

function twoPass(xs: number[]): { mean: number; m2: number } {
  const b = xs.map(big);
  const mean = b.reduce((s, x) => s.plus(x), M.bignumber(0) as BigNumber).div(xs.length);
  const m2 = b.reduce((s, x) => s.plus(x.minus(mean).times(x.minus(mean))), M.bignumber(0) as BigNumber);
  return { mean: Number(mean.toString()), m2: Number(m2.toString()) };
}

function data(rng: Rng, n: number, kind: 'normal' | 'offset' | 'lognormal'): number[] {
  return Array.from({ length: n }, () => {
    const z = rng.normal();
    if (kind === 'normal') return 3 + 250 * z;
    if (kind === 'offset') return 1e3 + z; // mean 1000 σ: cancellation-prone (condition number ≈ 1e3)
    return Math.exp(3 * z);
  });
}

function shuffle<T>(rng: Rng, xs: T[]): T[] {
  const a = [...xs];
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

/** Values xs[i] at case indices offset + i, some missing (null), added in the given order. */
function build(values: (number | null)[], offset: number, order: number[]): PairwiseMoments {
  const p = pairwiseEmpty();
  for (const i of order) must(pairwiseAdd(p, offset + i, values[i]!));
  return p;
}

const same = (a: Moments, b: Moments) =>
  a.n === b.n &&
  Object.is(a.mean, b.mean) &&
  Object.is(a.m2, b.m2) &&
  Object.is(a.min, b.min) &&
  Object.is(a.max, b.max) &&
  a.nonFinite === b.nonFinite;

describe('pairwise moments: accuracy', () => {
  it('equal the 60-digit two-pass values and Welford’s single pass to 1e-12 relative', () => {
    const rng = makeRng(31337, 5);
    for (const kind of ['normal', 'offset', 'lognormal'] as const) {
      for (const n of [2, 3, 17, 1000, 4099, 30_000]) {
        const xs = data(rng, n, kind);
        const ref = twoPass(xs);
        const single = xs.reduce(momentsAdd, momentsEmpty());
        const pw = pairwiseTotal(build(xs, 7, [...xs.keys()]));
        expect(pw.n).toBe(n);
        expect(pw.min).toBe(Math.min(...xs));
        expect(pw.max).toBe(Math.max(...xs));
        expect(rel(pw.mean, ref.mean)).toBeLessThan(1e-12);
        expect(rel(pw.m2, ref.m2)).toBeLessThan(1e-12);
        expect(rel(pw.mean, single.mean)).toBeLessThan(1e-12);
        expect(rel(pw.m2, single.m2)).toBeLessThan(1e-12);
      }
    }
  });

  it('for 2^L cases from index 0 the root is Chan–Golub–LeVeque’s recursive halving', () => {
    const rng = makeRng(8, 8);
    const xs = data(rng, 256, 'lognormal');
    const halve = (v: number[]): Moments =>
      v.length === 1
        ? momentsAdd(momentsEmpty(), v[0]!)
        : momentsMerge(momentsEmpty(), halve(v.slice(0, v.length / 2)), halve(v.slice(v.length / 2)));
    const p = build(xs, 0, [...xs.keys()]);
    expect(p.blocks.map((b) => [b.level, b.pos])).toEqual([[8, 0]]);
    expect(same(pairwiseTotal(p), halve(xs))).toBe(true);
  });
});

describe('pairwise moments: the same bits for any split and order', () => {
  it('1, 7 and 20 contiguous pieces, shuffled cases, shuffled merge order, with gaps in the values', () => {
    const rng = makeRng(2024, 9);
    for (const n of [1, 2, 5, 64, 1000, 2001]) {
      const offset = Math.floor(rng.next() * 5000);
      const values = data(rng, n, 'normal').map((x) => (rng.next() < 0.1 ? null : rng.next() < 0.02 ? Infinity : x));
      const reference = build(values, offset, [...values.keys()]);
      const total = pairwiseTotal(reference);
      for (const k of [1, 7, 20]) {
        // pieces [⌊iN/K⌋, ⌊(i+1)N/K⌋), each filled in a random order, merged in a random order
        const parts = Array.from({ length: k }, (_, i) => {
          const lo = Math.floor((i * n) / k),
            hi = Math.floor(((i + 1) * n) / k);
          return build(
            values,
            offset,
            shuffle(
              rng,
              Array.from({ length: hi - lo }, (_, j) => lo + j),
            ),
          );
        });
        let acc = pairwiseEmpty();
        for (const p of shuffle(rng, parts)) acc = must(pairwiseMerge(acc, p));
        expect(acc.blocks.map((b) => [b.level, b.pos])).toEqual(reference.blocks.map((b) => [b.level, b.pos]));
        acc.blocks.forEach((b, i) => expect(same(b.m, reference.blocks[i]!.m)).toBe(true));
        expect(same(pairwiseTotal(acc), total)).toBe(true);
        expect(pairwiseCovered(acc)).toBe(n);
        expect(pairwiseRanges(acc)).toEqual([[offset, offset + n]]);
      }
    }
  });

  it('a contiguous range carries at most 2·log2(n) blocks; separate ranges stay separate', () => {
    const p = build(new Array(1000).fill(1), 12_345, [...Array(1000).keys()]);
    expect(p.blocks.length).toBeLessThanOrEqual(2 * Math.log2(1000));
    const q = build([1, 2], 100, [1, 0]);
    const r = must(pairwiseMerge(q, build([3], 200, [0])));
    expect(pairwiseRanges(r)).toEqual([
      [100, 102],
      [200, 201],
    ]);
  });

  it('refuses a case added twice or covered by both sides of a merge', () => {
    const p = build([1, 2, 3], 10, [0, 1, 2]);
    const again = pairwiseAdd(p, 11, 5);
    expect(again.ok).toBe(false);
    if (!again.ok) expect(again.errors[0]!.rule).toBe('unique-case');
    const m = pairwiseMerge(p, build([9], 12, [0]));
    expect(m.ok).toBe(false);
    if (!m.ok) expect(m.errors[0]!.message).toMatch(/case 12 is covered by both sides/);
    expect(pairwiseAdd(p, -1, 0).ok).toBe(false);
  });
});

describe('pairwise moments as JSON', () => {
  it('round-trip bit for bit, and reading refuses what a merge would trust', () => {
    const rng = makeRng(4, 4);
    const p = build(
      data(rng, 300, 'lognormal').map((x, i) => (i % 17 === 0 ? null : x)),
      77,
      [...Array(300).keys()],
    );
    const back = must(pairwiseFromJson(JSON.parse(JSON.stringify(pairwiseToJson(p)))));
    expect(back.blocks.length).toBe(p.blocks.length);
    back.blocks.forEach((b, i) => expect(same(b.m, p.blocks[i]!.m)).toBe(true));
    const bad = (blocks: unknown) => pairwiseFromJson({ kind: 'pairwise-moments', blocks }, 'q');
    const rules = (r: Result<unknown>) => (r.ok ? [] : r.errors.map((e) => e.rule));
    expect(rules(bad([[0, 3, 2, 1, 0, 1, 1, 0]]))).toEqual(['count']); // 2 values in a 1-case block
    expect(
      rules(
        bad([
          [1, 0, 0, 0, 0, null, null, 0],
          [0, 1, 0, 0, 0, null, null, 0],
        ]),
      ),
    ).toEqual(['order']);
    expect(
      rules(
        bad([
          [0, 0, 0, 0, 0, null, null, 0],
          [0, 1, 0, 0, 0, null, null, 0],
        ]),
      ),
    ).toEqual(['maximal']);
    expect(rules(bad([[0, 0, 1, 1, -1, 1, 1, 0]]))).toEqual(['non-negative']);
    expect(rules(bad([[0, 0, 0, 0, 0, 1, null, 0]]))).toEqual(['empty-range']);
    expect(rules(bad('x'))).toEqual(['array']);
    expect(rules(pairwiseFromJson({ kind: 'moments', blocks: [] }))).toEqual(['kind']);
  });
});

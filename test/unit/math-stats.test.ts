/**
 * Mergeable statistics (app/engine/math/stats.ts, exactSum.ts) against references outside the
 * module:
 * - moments: mathjs `mean` and `variance(…, 'uncorrected')` (a two-pass algorithm) in double
 *   precision, and the same in 100-digit mathjs BigNumbers fed the exact decimal value of every
 *   double (the doubles' exact sum and M2, rounded once, is what ExactMoments must return);
 * - exact sums: IEEE 754 division (correctly rounded by the standard, §5.4.1) for p/q, and
 *   BigNumber sums as above;
 * - histograms: a linear scan over the edges and the nearest-rank quantile of the sorted data
 *   (Hyndman & Fan 1996, definition 1);
 * - top-k: sorting the union with the stated order (score descending, then index ascending).
 * Random data come from the project's seeded xoshiro128** (app/engine/math/prng.ts).
 */
import { describe, expect, it } from 'vitest';
import { all, create, mean as mjMean, variance as mjVariance, type BigNumber } from 'mathjs';
import { makeRng, type Rng } from '../../app/engine/math/prng';
import {
  exactMomentsAdd,
  exactMomentsEmpty,
  exactMomentsMerge,
  exactMomentsToMoments,
  histogramAdd,
  histogramCreate,
  histogramMerge,
  histogramQuantile,
  histogramTotal,
  momentsAdd,
  momentsEmpty,
  momentsMerge,
  momentsVariance,
  topKAdd,
  topKCreate,
  topKMerge,
  uniformEdges,
  type ExactMoments,
  type Histogram,
  type TopItem,
  type TopK,
} from '../../app/engine/math/stats';
import {
  exactAdd,
  exactCanonical,
  exactFromString,
  exactToNumber,
  exactToString,
  exactZero,
  ratioToNumber,
} from '../../app/engine/math/exactSum';

const M = create(all!, { number: 'BigNumber', precision: 100 });
type Big = BigNumber;
const big = (x: string | number): Big => M.bignumber(x) as Big;

/** The exact decimal value of a double (M·2^E = M·5^−E / 10^−E for E < 0). */
function exactBig(x: number): Big {
  if (Number.isInteger(x)) return big(BigInt(x).toString());
  let e = 0;
  let m = x;
  while (!Number.isInteger(m)) {
    m *= 2; // exact: scaling by 2 never rounds (no overflow here)
    e++;
  }
  const digits = (BigInt(m) * 5n ** BigInt(e)).toString();
  const neg = digits.startsWith('-');
  const d = (neg ? digits.slice(1) : digits).padStart(e + 1, '0');
  return big(`${neg ? '-' : ''}${d.slice(0, d.length - e)}.${d.slice(d.length - e)}`);
}

function bigMoments(xs: number[]): { mean: number; m2: number } {
  const b = xs.map(exactBig);
  const sum = b.reduce((s, x) => s.plus(x), big(0));
  const mean = sum.div(xs.length);
  const m2 = b.reduce((s, x) => s.plus(x.minus(mean).times(x.minus(mean))), big(0));
  return { mean: Number(mean.toString()), m2: Number(m2.toString()) };
}

function data(rng: Rng, n: number, kind: 'normal' | 'offset' | 'lognormal'): number[] {
  return Array.from({ length: n }, () => {
    const z = rng.normal();
    if (kind === 'normal') return 3 + 250 * z;
    if (kind === 'offset') return 1e3 + z;
    return (rng.next() < 0.5 ? -1 : 1) * Math.exp(3 * z);
  });
}

/** Random contiguous pieces of xs (at most xs.length − 1 cuts). */
function pieces<T>(rng: Rng, xs: T[], cutsWanted: number): T[][] {
  const cuts = Math.min(cutsWanted, xs.length - 1);
  const at = new Set<number>();
  while (at.size < cuts) at.add(1 + Math.floor(rng.next() * (xs.length - 1)));
  const c = [0, ...[...at].sort((a, b) => a - b), xs.length];
  return c.slice(1).map((end, i) => xs.slice(c[i]!, end));
}

function shuffle<T>(rng: Rng, xs: T[]): T[] {
  const a = [...xs];
  for (let i = a.length - 1; i > 0; i--) {
    const j = Math.floor(rng.next() * (i + 1));
    [a[i], a[j]] = [a[j]!, a[i]!];
  }
  return a;
}

/** Merge a list in a random binary tree. */
function mergeRandomTree<T>(rng: Rng, xs: T[], merge: (a: T, b: T) => T): T {
  let list = [...xs];
  while (list.length > 1) {
    const i = Math.floor(rng.next() * (list.length - 1));
    list = [...list.slice(0, i), merge(list[i]!, list[i + 1]!), ...list.slice(i + 2)];
  }
  return list[0]!;
}

const rel = (a: number, b: number) => Math.abs(a - b) / Math.max(Math.abs(b), 1e-300);

describe('Moments (Welford add, Chan–Golub–LeVeque merge)', () => {
  it('single pass and pairwise merges agree with the two-pass values (mathjs) to 1e-12 relative', () => {
    const rng = makeRng(20240611, 1);
    for (const kind of ['normal', 'lognormal'] as const) {
      for (const n of [2, 17, 1000, 20_000]) {
        const xs = data(rng, n, kind);
        const refMean = mjMean(xs) as number;
        const refM2 = (mjVariance(xs, 'uncorrected') as unknown as number) * n;
        const one = xs.reduce(momentsAdd, momentsEmpty());
        expect(rel(one.mean, refMean)).toBeLessThan(1e-12);
        expect(rel(one.m2, refM2)).toBeLessThan(1e-12);
        for (const cuts of [1, 5, Math.min(n - 1, 40)]) {
          const parts = pieces(rng, xs, cuts).map((p) => p.reduce(momentsAdd, momentsEmpty()));
          const merged = mergeRandomTree(rng, parts, (a, b) => momentsMerge(momentsEmpty(), a, b));
          expect(merged.n).toBe(n);
          expect(merged.min).toBe(Math.min(...xs));
          expect(merged.max).toBe(Math.max(...xs));
          expect(rel(merged.mean, refMean)).toBeLessThan(1e-12);
          expect(rel(merged.m2, refM2)).toBeLessThan(1e-12);
        }
      }
    }
  });

  it('merge is commutative bit for bit; n, min, max and nonFinite do not depend on grouping', () => {
    const rng = makeRng(7, 2);
    const xs = data(rng, 999, 'normal');
    const [a, b, c] = pieces(rng, xs, 2).map((p) => p.reduce(momentsAdd, momentsEmpty()));
    expect(momentsMerge(momentsEmpty(), a!, b!)).toEqual(momentsMerge(momentsEmpty(), b!, a!));
    const left = momentsMerge(momentsEmpty(), momentsMerge(momentsEmpty(), a!, b!), c!);
    const right = momentsMerge(momentsEmpty(), a!, momentsMerge(momentsEmpty(), b!, c!));
    expect([left.n, left.min, left.max, left.nonFinite]).toEqual([right.n, right.min, right.max, right.nonFinite]);
    expect(rel(left.m2, right.m2)).toBeLessThan(1e-13);
  });

  it('out may alias an input; empty sides; non-finite values are counted and left out; −0 is stored as +0', () => {
    const a = [1, 2, 3].reduce(momentsAdd, momentsEmpty());
    const copy = { ...a };
    expect(momentsMerge(a, a, momentsEmpty())).toEqual(copy);
    expect(momentsMerge(momentsEmpty(), momentsEmpty(), copy)).toEqual(copy);
    const m = [NaN, Infinity, -0, -Infinity].reduce(momentsAdd, momentsEmpty());
    expect(m.n).toBe(1);
    expect(m.nonFinite).toBe(3);
    expect(Object.is(m.min, 0)).toBe(true);
    expect(Object.is(m.mean, 0)).toBe(true);
    expect(momentsVariance(m)).toBeNull();
    expect(momentsVariance(copy)).toBe(1); // var(1, 2, 3) = 1
  });
});

describe('ExactMoments', () => {
  it('mean and M2 equal the exact values (100-digit BigNumbers) rounded once', () => {
    const rng = makeRng(99, 3);
    for (const kind of ['normal', 'offset', 'lognormal'] as const) {
      const xs = data(rng, 3000, kind);
      const e = xs.reduce(exactMomentsAdd, exactMomentsEmpty());
      const m = exactMomentsToMoments(e);
      const ref = bigMoments(xs);
      expect(m.mean).toBe(ref.mean);
      expect(m.m2).toBe(ref.m2);
    }
  });

  it('keeps its accuracy where the one-pass formula Σx² − (Σx)²/n in doubles loses every digit', () => {
    // 1e9 + {1, 2, 3}: M2 = 2 exactly (a known worked case of cancellation, common practice).
    const xs = [1e9 + 1, 1e9 + 2, 1e9 + 3];
    const naive = xs.reduce((s, x) => s + x * x, 0) - xs.reduce((s, x) => s + x, 0) ** 2 / 3;
    expect(Math.abs(naive - 2)).toBeGreaterThan(1);
    expect(exactMomentsToMoments(xs.reduce(exactMomentsAdd, exactMomentsEmpty()))).toMatchObject({ n: 3, mean: 1e9 + 2, m2: 2 });
  });

  it('any split, any merge order: the same state and the same moments, bit for bit', () => {
    const rng = makeRng(5, 4);
    const xs = data(rng, 5000, 'lognormal');
    const whole = exactMomentsToMoments(xs.reduce(exactMomentsAdd, exactMomentsEmpty()));
    for (const cuts of [1, 9, 60]) {
      const parts = shuffle(
        rng,
        pieces(rng, xs, cuts).map((p) => shuffle(rng, p).reduce(exactMomentsAdd, exactMomentsEmpty())),
      );
      const merged = mergeRandomTree(rng, parts, (a: ExactMoments, b: ExactMoments) => exactMomentsMerge(exactMomentsEmpty(), a, b));
      expect(exactMomentsToMoments(merged)).toEqual(whole);
      expect(exactToString(merged.sum)).toBe(exactToString(xs.reduce((s, x) => exactAdd(s, x), exactZero())));
    }
  });
});

describe('exact sums', () => {
  it('convert to the nearest double: p/q against IEEE division, ties to even, sums against BigNumbers', () => {
    const rng = makeRng(11, 5);
    for (let i = 0; i < 2000; i++) {
      const p = Math.floor(rng.next() * 2 ** 40) - 2 ** 39;
      const q = 1 + Math.floor(rng.next() * 2 ** 30);
      expect(ratioToNumber(BigInt(p), 0, BigInt(q))).toBe(p / q); // IEEE 754 §5.4.1: division correctly rounded
    }
    expect(ratioToNumber(2n ** 53n + 1n, 0, 1n)).toBe(2 ** 53); // tie → even
    expect(ratioToNumber(2n ** 53n + 3n, 0, 1n)).toBe(2 ** 53 + 4); // tie → even
    expect(ratioToNumber(2n ** 53n + 1n, 0, 1n) + ratioToNumber(1n, -200, 1n)).toBe(2 ** 53);
    expect(ratioToNumber(1n, -1074, 1n)).toBe(Number.MIN_VALUE);
    expect(ratioToNumber(1n, 1024, 1n)).toBe(Infinity);
    for (let t = 0; t < 20; t++) {
      const xs = data(rng, 200, 'lognormal');
      const s = xs.reduce((acc, x) => exactAdd(acc, x), exactZero());
      const ref = xs.map(exactBig).reduce((a, b) => a.plus(b), big(0));
      expect(exactToNumber(s)).toBe(Number(ref.toString()));
    }
  });

  it('text round trip through the canonical form; malformed or out-of-range text is refused', () => {
    const s = [0.1, -3.75, 1e-300, 2 ** 60].reduce((acc, x) => exactAdd(acc, x), exactZero());
    const back = exactFromString(exactToString(s))!;
    expect(back).toEqual(exactCanonical(s));
    expect(exactToNumber(back)).toBe(exactToNumber(s));
    expect(exactToString(exactZero())).toBe('0p0');
    expect(exactToString({ m: -24n, e: 0 })).toBe('-3p3'); // −24 = −3·2³
    for (const bad of ['', '1.5p0', '0x1p0', '1p', 'zzp1', '1p99999', '1p1e3', `${'f'.repeat(1201)}p0`])
      expect(exactFromString(bad)).toBeNull();
  });
});

describe('Histogram', () => {
  const linearBin = (edges: number[], x: number): number => {
    if (x < edges[0]!) return -1;
    if (x > edges[edges.length - 1]!) return edges.length - 1;
    for (let k = edges.length - 2; k >= 0; k--) if (x >= edges[k]!) return k;
    return 0;
  };

  it('bins by the stated rule (linear-scan reference), edges included below, last bin closed', () => {
    const h = histogramCreate(uniformEdges(0, 1, 10));
    expect(h.ok).toBe(true);
    if (!h.ok) return;
    expect(h.value.edges[10]).toBe(1);
    const rng = makeRng(3, 6);
    const xs = [...Array.from({ length: 5000 }, () => 1.2 * rng.next() - 0.1), ...h.value.edges, -Infinity, Infinity, NaN];
    for (const x of xs) histogramAdd(h.value, x);
    const counts = new Array(10).fill(0);
    let under = 0,
      over = 0;
    for (const x of xs) {
      if (Number.isNaN(x)) continue;
      const k = linearBin(h.value.edges, x);
      if (k < 0) under++;
      else if (k >= 10) over++;
      else counts[k]++;
    }
    expect(h.value.counts).toEqual(counts);
    expect([h.value.underflow, h.value.overflow, h.value.invalid]).toEqual([under, over, 1]);
    expect(histogramTotal(h.value)).toBe(xs.length - 1);
  });

  it('merge of any split equals the histogram of the whole; different edges are refused', () => {
    const rng = makeRng(8, 7);
    const xs = data(rng, 4000, 'normal');
    const edges = [-500, -100, -10, 0, 10, 100, 500];
    const build = (v: number[]): Histogram => {
      const h = histogramCreate(edges);
      if (!h.ok) throw new Error('edges');
      v.forEach((x) => histogramAdd(h.value, x));
      return h.value;
    };
    const whole = build(xs);
    const merged = mergeRandomTree(rng, shuffle(rng, pieces(rng, xs, 13).map(build)), (a, b) => {
      const r = histogramMerge(a, b);
      if (!r.ok) throw new Error('merge');
      return r.value;
    });
    expect(merged).toEqual(whole);
    const other = histogramCreate(uniformEdges(0, 1, 6));
    if (!other.ok) throw new Error('edges');
    const r = histogramMerge(whole, other.value);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors[0]!.rule).toBe('same-bins');
  });

  it('refuses bad edges with one issue per problem', () => {
    const r = histogramCreate([0, 1, 1, NaN]);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => `${e.path}:${e.rule}`)).toEqual(['edges[2]:increasing', 'edges[3]:finite']);
    const one = histogramCreate([3]);
    expect(one.ok).toBe(false);
  });

  it('quantiles: the nearest-rank value of the sorted data lies in the reported bin, the estimate within one bin width', () => {
    const rng = makeRng(21, 8);
    const xs = data(rng, 10_001, 'normal');
    const h = histogramCreate(uniformEdges(-1000, 1000, 80));
    if (!h.ok) throw new Error('edges');
    xs.forEach((x) => histogramAdd(h.value, x));
    const sorted = [...xs].sort((a, b) => a - b);
    for (const p of [0, 0.001, 0.05, 0.25, 0.5, 0.9, 0.95, 0.999, 1]) {
      const q = histogramQuantile(h.value, p)!;
      const exact = sorted[Math.max(1, Math.ceil(p * xs.length)) - 1]!; // Hyndman & Fan definition 1
      expect(q.rank).toBe(Math.max(1, Math.ceil(p * xs.length)));
      if (exact < -1000) expect(q.where).toBe('below');
      else if (exact > 1000) expect(q.where).toBe('above');
      else {
        expect(q.where).toBe('in-range');
        expect(exact).toBeGreaterThanOrEqual(q.low!);
        expect(exact).toBeLessThanOrEqual(q.high!);
        expect(q.resolution).toBe(25);
        expect(Math.abs(q.estimate! - exact)).toBeLessThanOrEqual(q.resolution!);
      }
    }
  });

  it('quantile worked by hand', () => {
    // Values 0.5, 1.5, 1.6, 2.5 over edges 0,1,2,3 → counts [1, 2, 1]. Median: rank ⌈0.5·4⌉ = 2,
    // the first of bin [1, 2) (c = 2, j = 1): estimate 1 + 1·(1 − ½)/2 = 1.25, resolution 1.
    const h = histogramCreate([0, 1, 2, 3]);
    if (!h.ok) throw new Error('edges');
    [0.5, 1.5, 1.6, 2.5].forEach((x) => histogramAdd(h.value, x));
    expect(histogramQuantile(h.value, 0.5)).toEqual({
      p: 0.5,
      rank: 2,
      total: 4,
      where: 'in-range',
      low: 1,
      high: 2,
      estimate: 1.25,
      resolution: 1,
    });
    const empty = histogramCreate([0, 1]);
    if (!empty.ok) throw new Error('edges');
    expect(histogramQuantile(empty.value, 0.5)).toBeNull();
    expect(() => histogramQuantile(h.value, 1.5)).toThrow(/quantile level/);
  });
});

describe('top-k of the worst cases', () => {
  const order = (a: TopItem, b: TopItem) => b.score - a.score || a.key - b.key;
  const items = (rng: Rng, n: number): TopItem<{ i: number }>[] =>
    Array.from({ length: n }, (_, i) => ({ key: i, score: Math.round(rng.next() * 50) / 10, payload: { i } })); // many ties

  it('merging the top-k of any split equals the top-k of the union (sort reference); ties go to the lower index', () => {
    const rng = makeRng(4, 9);
    const all = items(rng, 3000);
    all.push({ key: 3000, score: Infinity, payload: { i: 3000 } }, { key: 3001, score: -Infinity, payload: { i: 3001 } });
    const ref = [...all].sort(order).slice(0, 25);
    const build = (xs: TopItem<{ i: number }>[]): TopK<{ i: number }> => {
      const t = topKCreate<{ i: number }>(25);
      for (const x of xs) topKAdd(t, x);
      return t;
    };
    expect(build(shuffle(rng, all)).items).toEqual(ref);
    for (const cuts of [1, 7, 50]) {
      const parts = pieces(rng, shuffle(rng, all), cuts).map(build);
      const merged = mergeRandomTree(rng, shuffle(rng, parts), (a, b) => {
        const r = topKMerge(a, b);
        if (!r.ok) throw new Error(r.errors[0]!.message);
        return r.value;
      });
      expect(merged.items).toEqual(ref);
      expect(merged.items.length).toBe(25);
    }
  });

  it('bounded: holds at most k; rejects a worse item when full; refuses NaN, bad keys, different k, a case on both sides', () => {
    const t = topKCreate<null>(2);
    expect(topKAdd(t, { key: 5, score: 1, payload: null })).toBe(true);
    expect(topKAdd(t, { key: 3, score: 1, payload: null })).toBe(true);
    expect(topKAdd(t, { key: 9, score: 1, payload: null })).toBe(false); // tie, higher index
    expect(topKAdd(t, { key: 1, score: 1, payload: null })).toBe(true); // tie, lower index
    expect(t.items.map((x) => x.key)).toEqual([1, 3]);
    expect(() => topKAdd(t, { key: 2, score: NaN, payload: null })).toThrow(/NaN/);
    expect(() => topKAdd(t, { key: -1, score: 1, payload: null })).toThrow(/whole number/);
    expect(() => topKCreate(0)).toThrow(/k ≥ 1/);
    const u = topKCreate<null>(3);
    const k = topKMerge(t, u);
    expect(k.ok).toBe(false);
    if (!k.ok) expect(k.errors[0]!.rule).toBe('same-k');
    const v = topKCreate<null>(2);
    topKAdd(v, { key: 3, score: 0.5, payload: null });
    const d = topKMerge(t, v);
    expect(d.ok).toBe(false);
    if (!d.ok) expect(d.errors[0]!.rule).toBe('unique-key');
  });

  it('tiers rank before scores: merged top-k of any split equals the union sorted by (tier desc, score desc, index asc)', () => {
    const rng = makeRng(11, 3);
    const tiered = (a: TopItem, b: TopItem) => (b.tier ?? 0) - (a.tier ?? 0) || b.score - a.score || a.key - b.key;
    const all = items(rng, 2000).map((x) => {
      const tier = Math.floor(rng.next() * 3);
      return tier === 0 ? x : { ...x, tier };
    });
    const ref = [...all].sort(tiered).slice(0, 30);
    const build = (xs: TopItem<{ i: number }>[]): TopK<{ i: number }> => {
      const t = topKCreate<{ i: number }>(30);
      for (const x of xs) topKAdd(t, x);
      return t;
    };
    const parts = pieces(rng, shuffle(rng, all), 9).map(build);
    const merged = mergeRandomTree(rng, shuffle(rng, parts), (a, b) => {
      const r = topKMerge(a, b);
      if (!r.ok) throw new Error(r.errors[0]!.message);
      return r.value;
    });
    expect(merged.items).toEqual(ref);
    expect(merged.items[0]!.tier).toBe(2);
    expect(() => topKAdd(topKCreate(1), { key: 1, score: 0, tier: 0.5, payload: null })).toThrow(/tier/);
  });
});

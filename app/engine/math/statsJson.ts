/**
 * The statistics of stats.ts as plain JSON and back. Shard files carry these, so reading checks
 * everything (every problem reported with its path) and writing then reading gives back the same
 * numbers bit for bit: finite doubles survive JSON.stringify/JSON.parse exactly (ECMA-262 writes the
 * shortest text that reads back to the same double); ±∞ and NaN, which JSON cannot hold, are
 * written as the strings "Infinity", "-Infinity" and "NaN"; −0 never occurs (stats.ts stores +0);
 * exact sums are text "<hex mantissa>p<exponent>" (exactSum.ts); pairwise moments are one array
 * per block. Each object names its `kind`.
 */
import type { Issue, Result } from '../errors';
import { describe, fail, ok } from '../errors';
import type { ExactSum } from './exactSum';
import { exactFromString, exactToString } from './exactSum';
import type { ExactMoments, Histogram, Moments, TopItem, TopK } from './stats';
import { edgeIssues, topBefore } from './stats';
import type { PairwiseBlock, PairwiseMoments } from './statsPairwise';
import { pairwiseIssues } from './statsPairwise';

export type JsonNumber = number | 'Infinity' | '-Infinity' | 'NaN';

export function encodeNumber(x: number): JsonNumber {
  if (Number.isFinite(x)) return x + 0;
  return Number.isNaN(x) ? 'NaN' : x > 0 ? 'Infinity' : '-Infinity';
}

export interface MomentsJson {
  kind: 'moments';
  n: number;
  mean: JsonNumber;
  m2: JsonNumber;
  min: number | null;
  max: number | null;
  nonFinite: number;
}

export interface ExactMomentsJson {
  kind: 'exact-moments';
  n: number;
  sum: string;
  sumSq: string;
  min: number | null;
  max: number | null;
  nonFinite: number;
}

export interface HistogramJson {
  kind: 'histogram';
  edges: number[];
  counts: number[];
  underflow: number;
  overflow: number;
  invalid: number;
}

export interface TopKJson {
  kind: 'top-k';
  k: number;
  /** `tier` is written only when it is not 0. */
  items: { key: number; score: JsonNumber; tier?: number; payload: unknown }[];
}

export function momentsToJson(m: Moments): MomentsJson {
  return { kind: 'moments', n: m.n, mean: encodeNumber(m.mean), m2: encodeNumber(m.m2), min: m.min, max: m.max, nonFinite: m.nonFinite };
}

export function exactMomentsToJson(e: ExactMoments): ExactMomentsJson {
  return {
    kind: 'exact-moments',
    n: e.n,
    sum: exactToString(e.sum),
    sumSq: exactToString(e.sumSq),
    min: e.min,
    max: e.max,
    nonFinite: e.nonFinite,
  };
}

export function histogramToJson(h: Histogram): HistogramJson {
  return {
    kind: 'histogram',
    edges: [...h.edges],
    counts: [...h.counts],
    underflow: h.underflow,
    overflow: h.overflow,
    invalid: h.invalid,
  };
}

/** Payloads are written as they are: they must be plain JSON values. */
export function topKToJson<P>(t: TopK<P>): TopKJson {
  return {
    kind: 'top-k',
    k: t.k,
    items: t.items.map((x) =>
      x.tier
        ? { key: x.key, score: encodeNumber(x.score), tier: x.tier, payload: x.payload }
        : { key: x.key, score: encodeNumber(x.score), payload: x.payload },
    ),
  };
}

// ---------------------------------------------------------------------------------------------
// Reading

/** Collects problems while reading one object. */
class Reader {
  readonly issues: Issue[] = [];
  constructor(readonly path: string) {}
  at(key: string | number): string {
    return typeof key === 'number' ? `${this.path}[${key}]` : `${this.path}.${key}`;
  }
  bad(path: string, rule: string, message: string): void {
    this.issues.push({ path, rule, message });
  }
  object(v: unknown, kind: string): Record<string, unknown> | null {
    if (typeof v !== 'object' || v === null || Array.isArray(v)) {
      this.bad(this.path, 'object', `${this.path} must be an object (got ${describe(v)})`);
      return null;
    }
    const o = v as Record<string, unknown>;
    if (o.kind !== kind) this.bad(this.at('kind'), 'kind', `${this.at('kind')} must be "${kind}" (got ${describe(o.kind)})`);
    return o;
  }
  count(v: unknown, path: string): number {
    if (typeof v !== 'number' || !Number.isSafeInteger(v) || v < 0) {
      this.bad(path, 'count', `${path} must be a whole number ≥ 0 (got ${describe(v)})`);
      return 0;
    }
    return v;
  }
  finite(v: unknown, path: string): number {
    if (typeof v !== 'number' || !Number.isFinite(v)) {
      this.bad(path, 'finite', `${path} must be a finite number (got ${describe(v)})`);
      return 0;
    }
    return v;
  }
  /** A number or one of the strings encodeNumber writes. */
  number(v: unknown, path: string): number {
    if (typeof v === 'number' && Number.isFinite(v)) return v;
    if (v === 'Infinity') return Infinity;
    if (v === '-Infinity') return -Infinity;
    if (v === 'NaN') return NaN;
    this.bad(path, 'number', `${path} must be a number or "Infinity", "-Infinity", "NaN" (got ${describe(v)})`);
    return 0;
  }
  finiteOrNull(v: unknown, path: string): number | null {
    return v === null ? null : this.finite(v, path);
  }
  exact(v: unknown, path: string): ExactSum {
    const s = typeof v === 'string' ? exactFromString(v) : null;
    if (!s) {
      this.bad(path, 'exact-sum', `${path} must be an exact sum written as "<hex>p<exponent>" (got ${describe(v)})`);
      return { m: 0n, e: 0 };
    }
    return s;
  }
  /** min/max consistent with the count. */
  range(n: number, min: number | null, max: number | null): void {
    if ((n === 0) !== (min === null) || (n === 0) !== (max === null))
      this.bad(this.at('min'), 'empty-range', `${this.path}: min and max must be null exactly when n is 0`);
    else if (min !== null && max !== null && min > max) this.bad(this.at('min'), 'order', `${this.path}: min ${min} is above max ${max}`);
  }
  done<T>(value: T): Result<T> {
    return this.issues.length ? fail(this.issues) : ok(value);
  }
}

export function momentsFromJson(v: unknown, path = 'moments'): Result<Moments> {
  const r = new Reader(path);
  const o = r.object(v, 'moments');
  if (!o) return r.done(null as never);
  const n = r.count(o.n, r.at('n'));
  const mean = r.number(o.mean, r.at('mean'));
  const m2 = r.number(o.m2, r.at('m2'));
  if (!(m2 >= 0)) r.bad(r.at('m2'), 'non-negative', `${r.at('m2')} must be ≥ 0 (got ${m2})`);
  const min = r.finiteOrNull(o.min, r.at('min'));
  const max = r.finiteOrNull(o.max, r.at('max'));
  r.range(n, min, max);
  const nonFinite = r.count(o.nonFinite, r.at('nonFinite'));
  return r.done({ n, mean, m2, min, max, nonFinite });
}

export function exactMomentsFromJson(v: unknown, path = 'moments'): Result<ExactMoments> {
  const r = new Reader(path);
  const o = r.object(v, 'exact-moments');
  if (!o) return r.done(null as never);
  const n = r.count(o.n, r.at('n'));
  const sum = r.exact(o.sum, r.at('sum'));
  const sumSq = r.exact(o.sumSq, r.at('sumSq'));
  const min = r.finiteOrNull(o.min, r.at('min'));
  const max = r.finiteOrNull(o.max, r.at('max'));
  r.range(n, min, max);
  const nonFinite = r.count(o.nonFinite, r.at('nonFinite'));
  if (sumSq.m < 0n) r.bad(r.at('sumSq'), 'non-negative', `${r.at('sumSq')} must be ≥ 0`);
  if (n === 0 && (sum.m !== 0n || sumSq.m !== 0n)) r.bad(r.at('sum'), 'empty-sum', `${path}: sums must be 0 when n is 0`);
  return r.done({ n, sum, sumSq, min, max, nonFinite });
}

export function histogramFromJson(v: unknown, path = 'histogram'): Result<Histogram> {
  const r = new Reader(path);
  const o = r.object(v, 'histogram');
  if (!o) return r.done(null as never);
  const edges = Array.isArray(o.edges) ? (o.edges as unknown[]) : [];
  if (!Array.isArray(o.edges)) r.bad(r.at('edges'), 'array', `${r.at('edges')} must be an array of numbers`);
  r.issues.push(...edgeIssues(edges as number[], r.at('edges')));
  const counts = Array.isArray(o.counts) ? (o.counts as unknown[]).map((c, k) => r.count(c, `${r.at('counts')}[${k}]`)) : [];
  if (counts.length !== Math.max(0, edges.length - 1))
    r.bad(r.at('counts'), 'length', `${r.at('counts')} must hold one count per bin (${Math.max(0, edges.length - 1)})`);
  const underflow = r.count(o.underflow, r.at('underflow'));
  const overflow = r.count(o.overflow, r.at('overflow'));
  const invalid = r.count(o.invalid, r.at('invalid'));
  return r.done({ edges: edges as number[], counts, underflow, overflow, invalid });
}

/**
 * Read a top-k list; `payload` checks (and may convert) each item's payload, reporting problems
 * under the path it is given. The list must be in order, within k and free of repeated keys.
 */
export function topKFromJson<P = unknown>(
  v: unknown,
  path = 'top',
  payload: (p: unknown, path: string) => Result<P> = (p) => ok(p as P),
): Result<TopK<P>> {
  const r = new Reader(path);
  const o = r.object(v, 'top-k');
  if (!o) return r.done(null as never);
  const k = r.count(o.k, r.at('k'));
  if (k < 1) r.bad(r.at('k'), 'positive', `${r.at('k')} must be at least 1`);
  if (!Array.isArray(o.items)) r.bad(r.at('items'), 'array', `${r.at('items')} must be an array`);
  const raw = Array.isArray(o.items) ? (o.items as unknown[]) : [];
  if (raw.length > k) r.bad(r.at('items'), 'max-length', `${r.at('items')} holds ${raw.length} items, more than k = ${k}`);
  const items: TopItem<P>[] = [];
  const keys = new Set<number>();
  raw.forEach((x, i) => {
    const p = `${r.at('items')}[${i}]`;
    if (typeof x !== 'object' || x === null || Array.isArray(x)) {
      r.bad(p, 'object', `${p} must be an object`);
      return;
    }
    const it = x as Record<string, unknown>;
    const key = r.count(it.key, `${p}.key`);
    const score = r.number(it.score, `${p}.score`);
    if (Number.isNaN(score)) r.bad(`${p}.score`, 'not-nan', `${p}.score must not be NaN`);
    let tier = 0;
    if (it.tier !== undefined) {
      if (typeof it.tier !== 'number' || !Number.isSafeInteger(it.tier) || it.tier === 0)
        r.bad(`${p}.tier`, 'tier', `${p}.tier must be a whole number other than 0 when present (got ${describe(it.tier)})`);
      else tier = it.tier;
    }
    const pl = payload(it.payload, `${p}.payload`);
    if (!pl.ok) r.issues.push(...pl.errors);
    if (keys.has(key)) r.bad(`${p}.key`, 'unique-key', `${p}.key: case ${key} is listed twice`);
    keys.add(key);
    const prev = items[items.length - 1];
    const item: TopItem<P> = { key, score, payload: pl.ok ? pl.value : (undefined as P) };
    if (tier !== 0) item.tier = tier;
    if (prev && !topBefore(prev, item))
      r.bad(p, 'order', `${p} is out of order (tier descending, score descending, then case index ascending)`);
    items.push(item);
  });
  return r.done({ k, items });
}

// ---------------------------------------------------------------------------------------------
// Pairwise (fixed-tree) moments: one array per block, [level, pos, n, mean, m2, min, max, nonFinite]

export interface PairwiseMomentsJson {
  kind: 'pairwise-moments';
  blocks: [number, number, number, JsonNumber, JsonNumber, number | null, number | null, number][];
}

export function pairwiseToJson(p: PairwiseMoments): PairwiseMomentsJson {
  return {
    kind: 'pairwise-moments',
    blocks: p.blocks.map((b) => [b.level, b.pos, b.m.n, encodeNumber(b.m.mean), encodeNumber(b.m.m2), b.m.min, b.m.max, b.m.nonFinite]),
  };
}

export function pairwiseFromJson(v: unknown, path = 'moments'): Result<PairwiseMoments> {
  const r = new Reader(path);
  const o = r.object(v, 'pairwise-moments');
  if (!o) return r.done(null as never);
  if (!Array.isArray(o.blocks)) {
    r.bad(r.at('blocks'), 'array', `${r.at('blocks')} must be an array`);
    return r.done(null as never);
  }
  const blocks: PairwiseBlock[] = [];
  (o.blocks as unknown[]).forEach((x, k) => {
    const at = `${r.at('blocks')}[${k}]`;
    if (!Array.isArray(x) || x.length !== 8) {
      r.bad(at, 'block', `${at} must be [level, position, n, mean, m2, min, max, nonFinite]`);
      return;
    }
    const before = r.issues.length;
    const level = r.count(x[0], `${at}[0]`);
    const pos = r.count(x[1], `${at}[1]`);
    const n = r.count(x[2], `${at}[2]`);
    const mean = r.number(x[3], `${at}[3]`);
    const m2 = r.number(x[4], `${at}[4]`);
    if (!(m2 >= 0)) r.bad(`${at}[4]`, 'non-negative', `${at}[4] (m2) must be ≥ 0 (got ${m2})`);
    const min = r.finiteOrNull(x[5], `${at}[5]`);
    const max = r.finiteOrNull(x[6], `${at}[6]`);
    const nonFinite = r.count(x[7], `${at}[7]`);
    if ((n === 0) !== (min === null) || (n === 0) !== (max === null))
      r.bad(`${at}[5]`, 'empty-range', `${at}: min and max must be null exactly when n is 0`);
    else if (min !== null && max !== null && min > max) r.bad(`${at}[5]`, 'order', `${at}: min ${min} is above max ${max}`);
    if (n === 0 && (mean !== 0 || m2 !== 0)) r.bad(`${at}[3]`, 'empty-moments', `${at}: mean and m2 must be 0 when n is 0`);
    if (r.issues.length === before) blocks.push({ level, pos, m: { n, mean, m2, min, max, nonFinite } });
  });
  const p = { blocks };
  if (r.issues.length === 0) r.issues.push(...pairwiseIssues(p, path));
  return r.done(p);
}

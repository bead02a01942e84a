/**
 * Worst cases: a bounded top-k under a total order (tier descending, score descending, then case
 * index), part of
 * the mergeable statistics of stats.ts — the list is unique whatever the order of arrival, so
 * merging shards is exact.
 */
import type { Result } from '../errors';
import { fail, ok } from '../errors';

/**
 * One candidate: its case index (`key`, a whole number ≥ 0), its score (higher = worse) and data.
 * `tier` (a whole number, default 0) ranks before the score: every item of a higher tier comes
 * first (e.g. failed runs before slow ones, each tier ordered by its own score).
 */
export interface TopItem<P = unknown> {
  key: number;
  score: number;
  tier?: number;
  payload: P;
}

/**
 * The k highest-ranked items, sorted by tier descending, score descending, then key ascending (a total order on
 * distinct keys, so the list is unique whatever the order of arrival). At most k items are kept.
 * Scores may be ±∞; NaN scores are refused at `topKAdd`.
 */
export interface TopK<P = unknown> {
  k: number;
  items: TopItem<P>[];
}

export function topKCreate<P = unknown>(k: number): TopK<P> {
  if (!Number.isSafeInteger(k) || k < 1) throw new RangeError(`top-k needs k ≥ 1 (got ${k})`);
  return { k, items: [] };
}

/** True when a ranks before b. */
export function topBefore(a: TopItem<unknown>, b: TopItem<unknown>): boolean {
  const ta = a.tier ?? 0,
    tb = b.tier ?? 0;
  if (ta !== tb) return ta > tb;
  return a.score > b.score || (a.score === b.score && a.key < b.key);
}

/**
 * Offer one item; returns true when it was kept. O(log k) to find its place, O(k) to insert; an
 * item below a full list is rejected in O(1). Keys must be unique (one entry per case).
 */
export function topKAdd<P>(t: TopK<P>, item: TopItem<P>): boolean {
  if (Number.isNaN(item.score)) throw new RangeError(`top-k score of case ${item.key} is NaN`);
  if (!Number.isSafeInteger(item.key) || item.key < 0) throw new RangeError(`top-k key must be a whole number ≥ 0 (got ${item.key})`);
  if (item.tier !== undefined && !Number.isSafeInteger(item.tier))
    throw new RangeError(`top-k tier must be a whole number (got ${item.tier})`);
  const it: TopItem<P> = { key: item.key, score: item.score + 0, payload: item.payload };
  if (item.tier !== undefined && item.tier !== 0) it.tier = item.tier + 0;
  const xs = t.items;
  if (xs.length === t.k && !topBefore(it, xs[xs.length - 1]!)) return false;
  let lo = 0,
    hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (topBefore(xs[mid]!, it)) lo = mid + 1;
    else hi = mid;
  }
  xs.splice(lo, 0, it);
  if (xs.length > t.k) xs.pop();
  return true;
}

/**
 * Top-k of a ∪ b (a new list sharing the payload objects). Exact: equals the top-k of all the
 * items ever offered to a and b, as long as every key was offered to one side only. k must match;
 * a key kept on both sides is refused (a case counted twice; a key that one side already dropped
 * cannot be seen here: checking case coverage is the caller's job).
 */
export function topKMerge<P>(a: TopK<P>, b: TopK<P>): Result<TopK<P>> {
  if (a.k !== b.k) return fail([{ path: 'k', rule: 'same-k', message: `top-k lists of different k (${a.k}, ${b.k}) cannot be merged` }]);
  const keys = new Set(a.items.map((x) => x.key));
  const twice = b.items.find((x) => keys.has(x.key));
  if (twice)
    return fail([{ path: 'items', rule: 'unique-key', message: `case ${twice.key} appears in both top-k lists (counted twice?)` }]);
  const out: TopItem<P>[] = [];
  let i = 0,
    j = 0;
  while (out.length < a.k && (i < a.items.length || j < b.items.length)) {
    const x = a.items[i],
      y = b.items[j];
    if (y === undefined || (x !== undefined && topBefore(x, y))) {
      out.push(x!);
      i++;
    } else {
      out.push(y);
      j++;
    }
  }
  return ok({ k: a.k, items: out });
}

/**
 * Moments merged by Chan, Golub & LeVeque's pairwise update over a FIXED binary tree of case
 * indices, so that the result has the same bits however the cases were split into shards and in
 * whatever order shards or cases were merged. Part of the mergeable statistics of stats.ts.
 *
 * Why a fixed tree: the pairwise update (statsMoments.ts `momentsMerge`) is exact in exact
 * arithmetic but rounds in floating point, so (a ∪ b) ∪ c and a ∪ (b ∪ c) differ in the last bits.
 * The pairwise algorithm of T. F. Chan, G. H. Golub & R. J. LeVeque ("Updating formulae and a
 * pairwise algorithm for computing sample variances", Stanford STAN-CS-79-773, 1979) halves the
 * data recursively and combines the halves with that update; here the halves are the dyadic
 * blocks of case indices [p·2^L, (p + 1)·2^L). Every block's moments are computed from its two
 * half-blocks only, so a block's value is a pure function of the values of the cases in it, and
 * never of how they arrived.
 *
 * A state holds the maximal dyadic blocks of the cases it has seen (disjoint, sorted by first
 * index): adding a case, or merging two states, joins every pair of sibling blocks that are both
 * present into their parent. A contiguous range of n cases needs at most 2·log2(n) blocks, so a
 * shard carries a few dozen. The moments of the whole set fold its maximal blocks from the lowest
 * index up — a canonical order, since the set of maximal blocks depends only on which cases are
 * covered. A case that has no value for this statistic (a run that did not settle, an unflyable
 * case) is still covered: its leaf is the empty moments.
 *
 * Accuracy: the pairwise scheme's error grows like log2(n)·ε rather than n·ε (Chan, Golub &
 * LeVeque 1983, Am. Stat. 37(3):242–247), i.e. it is at least as good as Welford's single pass.
 */
import type { Moments } from './statsMoments';
import { momentsAdd, momentsEmpty, momentsMerge } from './statsMoments';
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';

/** Cases [pos·2^level, (pos + 1)·2^level) and their moments. */
export interface PairwiseBlock {
  level: number;
  pos: number;
  m: Moments;
}

/** Maximal dyadic blocks, disjoint, sorted by first case index. */
export interface PairwiseMoments {
  blocks: PairwiseBlock[];
}

/** Largest level kept: 2^53 cases is beyond any campaign, and pos·2^level stays a safe integer. */
export const PAIRWISE_MAX_LEVEL = 53;

export function pairwiseEmpty(): PairwiseMoments {
  return { blocks: [] };
}

const first = (b: PairwiseBlock) => b.pos * 2 ** b.level;
const end = (b: PairwiseBlock) => (b.pos + 1) * 2 ** b.level;

/** Are a (lower) and b (next) the two halves of one parent block? */
function siblings(a: PairwiseBlock, b: PairwiseBlock): boolean {
  return a.level === b.level && a.pos % 2 === 0 && b.pos === a.pos + 1;
}

/** The parent of two sibling blocks (lower half first, fixed order). */
function parent(a: PairwiseBlock, b: PairwiseBlock): PairwiseBlock {
  return { level: a.level + 1, pos: a.pos / 2, m: momentsMerge(momentsEmpty(), a.m, b.m) };
}

/** Push `b` on the stack of finished blocks, joining siblings as long as possible. */
function push(stack: PairwiseBlock[], b: PairwiseBlock): void {
  let cur = b;
  for (;;) {
    const top = stack[stack.length - 1];
    if (!top || !siblings(top, cur)) break;
    stack.pop();
    cur = parent(top, cur);
  }
  stack.push(cur);
}

/**
 * Blocks sorted by first index → the maximal blocks they cover (one left-to-right pass: a joined
 * parent is pushed again, so it meets its own sibling when that is complete).
 */
function coalesce(sorted: readonly PairwiseBlock[]): PairwiseBlock[] {
  const stack: PairwiseBlock[] = [];
  for (const b of sorted) push(stack, b);
  return stack;
}

/** First case index in `sorted` covered twice, or null. */
function overlap(sorted: readonly PairwiseBlock[]): number | null {
  for (let i = 1; i < sorted.length; i++) if (first(sorted[i]!) < end(sorted[i - 1]!)) return first(sorted[i]!);
  return null;
}

/**
 * Add case `index` with value `x` (null: the case is covered but has no value for this statistic;
 * a non-finite x is counted in `nonFinite`, as momentsAdd does). In place. Fails when the case
 * was already added.
 */
export function pairwiseAdd(p: PairwiseMoments, index: number, x: number | null): Result<PairwiseMoments> {
  if (!Number.isSafeInteger(index) || index < 0)
    return fail([{ path: 'index', rule: 'case-index', message: `case index must be a whole number ≥ 0 (got ${index})` }]);
  const leaf: PairwiseBlock = { level: 0, pos: index, m: x === null ? momentsEmpty() : momentsAdd(momentsEmpty(), x) };
  const bs = p.blocks;
  // Insertion point: the first block starting after `index`.
  let lo = 0,
    hi = bs.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (first(bs[mid]!) <= index) lo = mid + 1;
    else hi = mid;
  }
  const before = bs[lo - 1];
  if (before && end(before) > index)
    return fail([{ path: 'index', rule: 'unique-case', message: `case ${index} was already added (counted twice?)` }]);
  // Only the neighbours can join: re-coalesce the blocks around the insertion point.
  const stack = bs.slice(0, lo);
  push(stack, leaf);
  for (let i = lo; i < bs.length; i++) push(stack, bs[i]!);
  p.blocks = stack;
  return ok(p);
}

/** a ∪ b as a new state (shares no block objects with the inputs' moments). Fails when a case is in both. */
export function pairwiseMerge(a: PairwiseMoments, b: PairwiseMoments): Result<PairwiseMoments> {
  const all: PairwiseBlock[] = [];
  let i = 0,
    j = 0;
  while (i < a.blocks.length || j < b.blocks.length) {
    const x = a.blocks[i],
      y = b.blocks[j];
    const take = y === undefined || (x !== undefined && first(x) <= first(y)) ? (i++, x!) : (j++, y);
    all.push({ level: take.level, pos: take.pos, m: { ...take.m } });
  }
  const twice = overlap(all);
  if (twice !== null)
    return fail([{ path: 'blocks', rule: 'unique-case', message: `case ${twice} is covered by both sides (counted twice?)` }]);
  return ok({ blocks: coalesce(all) });
}

/** Is case `index` covered? */
export function pairwiseHas(p: PairwiseMoments, index: number): boolean {
  let lo = 0,
    hi = p.blocks.length;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if (first(p.blocks[mid]!) <= index) lo = mid + 1;
    else hi = mid;
  }
  const b = p.blocks[lo - 1];
  return b !== undefined && index < end(b);
}

/** Number of cases covered (with or without a value). */
export function pairwiseCovered(p: PairwiseMoments): number {
  return p.blocks.reduce((s, b) => s + 2 ** b.level, 0);
}

/** The covered case indices as sorted, disjoint [first, end) ranges (adjacent blocks joined). */
export function pairwiseRanges(p: PairwiseMoments): [number, number][] {
  const out: [number, number][] = [];
  for (const b of p.blocks) {
    const last = out[out.length - 1];
    if (last && last[1] === first(b)) last[1] = end(b);
    else out.push([first(b), end(b)]);
  }
  return out;
}

/** The moments of every covered value: the maximal blocks folded from the lowest index up. */
export function pairwiseTotal(p: PairwiseMoments): Moments {
  let acc = momentsEmpty();
  for (const b of p.blocks) acc = momentsMerge(momentsEmpty(), acc, b.m);
  return acc;
}

/** Problems with a state read from outside (block shape, order, disjointness); empty when fine. */
export function pairwiseIssues(p: PairwiseMoments, path: string): Issue[] {
  const out: Issue[] = [];
  p.blocks.forEach((b, k) => {
    const at = `${path}.blocks[${k}]`;
    if (!Number.isInteger(b.level) || b.level < 0 || b.level > PAIRWISE_MAX_LEVEL)
      out.push({ path: at, rule: 'level', message: `${at}: level must be a whole number from 0 to ${PAIRWISE_MAX_LEVEL}` });
    else if (!Number.isSafeInteger(b.pos) || b.pos < 0 || !Number.isSafeInteger(end(b)))
      out.push({ path: at, rule: 'position', message: `${at}: position must be a whole number ≥ 0 within safe integers` });
    else if (b.m.n + b.m.nonFinite > 2 ** b.level)
      out.push({ path: at, rule: 'count', message: `${at} counts more values than the ${2 ** b.level} cases it covers` });
    const prev = p.blocks[k - 1];
    if (prev && out.length === 0) {
      if (first(b) < end(prev)) out.push({ path: at, rule: 'order', message: `${at} overlaps or precedes the block before it` });
      else if (siblings(prev, b)) out.push({ path: at, rule: 'maximal', message: `${at} and the block before it should be one block` });
    }
  });
  return out;
}

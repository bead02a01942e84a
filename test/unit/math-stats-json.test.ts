/**
 * The statistics as JSON (app/engine/math/statsJson.ts): written, parsed and read back, every
 * number is the same double (Object.is, so −0/+0 and NaN would show) and writing again gives the
 * same bytes; malformed input is refused with one issue per problem, each with its path.
 * Reference for "same double": JSON.stringify writes the shortest decimal that reads back to the
 * value (ECMA-262 §6.1.6.1.20 Number::toString), which this checks rather than assumes.
 */
import { describe, expect, it } from 'vitest';
import { makeRng } from '../../app/engine/math/prng';
import {
  exactMomentsAdd,
  exactMomentsEmpty,
  histogramAdd,
  histogramCreate,
  momentsAdd,
  momentsEmpty,
  topKAdd,
  topKCreate,
  uniformEdges,
} from '../../app/engine/math/stats';
import {
  encodeNumber,
  exactMomentsFromJson,
  exactMomentsToJson,
  histogramFromJson,
  histogramToJson,
  momentsFromJson,
  momentsToJson,
  topKFromJson,
  topKToJson,
} from '../../app/engine/math/statsJson';
import { fail, ok, type Result } from '../../app/engine/errors';

/** Deep equality with Object.is on every number. */
function sameBits(a: unknown, b: unknown): boolean {
  if (typeof a === 'number' || typeof b === 'number') return Object.is(a, b);
  if (typeof a === 'bigint' || typeof b === 'bigint') return a === b;
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return a === b;
  const ka = Object.keys(a),
    kb = Object.keys(b);
  return ka.length === kb.length && ka.every((k) => sameBits((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k]));
}

const trip = (x: unknown): unknown => JSON.parse(JSON.stringify(x));

function values(n: number): number[] {
  const rng = makeRng(314, 1);
  return Array.from({ length: n }, (_, i) =>
    i % 7 === 0 ? 1e-300 : i % 11 === 0 ? -1e300 : rng.normal() * 10 ** Math.floor(rng.next() * 10 - 5),
  );
}

function value<T>(r: Result<T>): T {
  if (!r.ok) throw new Error(r.errors.map((e) => e.message).join('; '));
  return r.value;
}

describe('JSON round trips', () => {
  it('numbers survive JSON exactly; non-finite ones are written as strings', () => {
    for (const x of [...values(2000), Number.MIN_VALUE, Number.MAX_VALUE, 0.1 + 0.2, 2 ** 53 + 2]) expect(Object.is(trip(x), x)).toBe(true);
    expect([Infinity, -Infinity, NaN, -0].map(encodeNumber)).toEqual(['Infinity', '-Infinity', 'NaN', 0]);
    expect(Object.is(encodeNumber(-0), 0)).toBe(true);
  });

  it('Moments', () => {
    const m = [...values(500), -0].reduce(momentsAdd, momentsEmpty());
    const j = momentsToJson(m);
    const back = value(momentsFromJson(trip(j)));
    expect(sameBits(back, m)).toBe(true);
    expect(JSON.stringify(momentsToJson(back))).toBe(JSON.stringify(j));
    const huge = [1e308, 1e308].reduce(momentsAdd, momentsEmpty()); // the mean overflows on the way
    expect(sameBits(value(momentsFromJson(trip(momentsToJson(huge)))), huge)).toBe(true);
    expect(sameBits(value(momentsFromJson(trip(momentsToJson(momentsEmpty())))), momentsEmpty())).toBe(true);
  });

  it('ExactMoments (exact sums as text)', () => {
    const e = values(500).reduce(exactMomentsAdd, exactMomentsEmpty());
    const j = exactMomentsToJson(e);
    expect(j.sum).toMatch(/^-?[0-9a-f]+p-?\d+$/);
    const back = value(exactMomentsFromJson(trip(j)));
    expect(JSON.stringify(exactMomentsToJson(back))).toBe(JSON.stringify(j));
    expect(back.n).toBe(e.n);
  });

  it('Histogram', () => {
    const h = value(histogramCreate(uniformEdges(-0.3, 0.7, 17)));
    for (const x of [...values(300), Infinity, -Infinity, NaN]) histogramAdd(h, x);
    const back = value(histogramFromJson(trip(histogramToJson(h))));
    expect(sameBits(back, h)).toBe(true);
  });

  it('TopK, payloads checked by the caller', () => {
    const t = topKCreate<{ reason: string }>(4);
    values(50).forEach((x, i) => topKAdd(t, { key: i, score: x, payload: { reason: `case ${i}` } }));
    topKAdd(t, { key: 99, score: Infinity, payload: { reason: 'failed' } });
    const j = trip(topKToJson(t));
    const back = value(topKFromJson<{ reason: string }>(j));
    expect(sameBits(back, t)).toBe(true);
    const strict = topKFromJson(j, 'worst', (p, path) =>
      typeof p === 'object' && p !== null && typeof (p as { reason?: unknown }).reason === 'string'
        ? ok(p as { reason: string })
        : fail([{ path, rule: 'payload', message: `${path} needs a reason` }]),
    );
    expect(strict.ok).toBe(true);
    const broken = JSON.parse(JSON.stringify(j));
    broken.items[1].payload = 3;
    const r = topKFromJson(broken, 'worst', (p, path) => (typeof p === 'object' ? ok(p) : fail([{ path, rule: 'payload', message: 'x' }])));
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.errors.map((e) => e.path)).toEqual(['worst.items[1].payload']);
  });

  it('TopK with tiers: tier written only when not 0, read back, order checked with it', () => {
    const t = topKCreate<null>(5);
    values(20).forEach((x, i) => topKAdd(t, { key: i, score: x, tier: i % 3 === 0 ? 1 : 0, payload: null }));
    const j = trip(topKToJson(t));
    expect((j as { items: object[] }).items.filter((x) => 'tier' in x).length).toBe(t.items.filter((x) => x.tier).length);
    expect(sameBits(value(topKFromJson(j)), t)).toBe(true);
    const swapped = JSON.parse(JSON.stringify(j));
    swapped.items.reverse();
    const r = topKFromJson(swapped, 'worst');
    expect(r.ok).toBe(false);
    const zero = JSON.parse(JSON.stringify(j));
    zero.items[0].tier = 0;
    const z = topKFromJson(zero, 'worst');
    expect(z.ok ? [] : z.errors.map((e) => e.rule)).toContain('tier');
  });
});

describe('reading refuses malformed input, naming every problem', () => {
  const rules = (r: Result<unknown>) => (r.ok ? [] : r.errors.map((e) => `${e.path}:${e.rule}`));

  it('Moments', () => {
    expect(rules(momentsFromJson(null))).toEqual(['moments:object']);
    expect(rules(momentsFromJson({ kind: 'moments', n: 1.5, mean: 'x', m2: -1, min: 0, max: null, nonFinite: -2 }, 'm'))).toEqual([
      'm.n:count',
      'm.mean:number',
      'm.m2:non-negative',
      'm.min:empty-range', // n unreadable, taken as 0, yet min given
      'm.nonFinite:count',
    ]);
    expect(rules(momentsFromJson({ kind: 'moments', n: 2, mean: 0, m2: 0, min: 3, max: 1, nonFinite: 0 }))).toEqual(['moments.min:order']);
    expect(rules(momentsFromJson({ kind: 'moments', n: 2, mean: 0, m2: 0, min: null, max: 1, nonFinite: 0 }))).toEqual([
      'moments.min:empty-range',
    ]);
    expect(rules(momentsFromJson({ kind: 'histogram' }))[0]).toBe('moments.kind:kind');
  });

  it('ExactMoments', () => {
    expect(
      rules(exactMomentsFromJson({ kind: 'exact-moments', n: 0, sum: '1p0', sumSq: '-1p0', min: null, max: null, nonFinite: 0 })),
    ).toEqual(['moments.sumSq:non-negative', 'moments.sum:empty-sum']);
    expect(
      rules(exactMomentsFromJson({ kind: 'exact-moments', n: 1, sum: 1.5, sumSq: '1p9999999', min: 1, max: 1, nonFinite: 0 })),
    ).toEqual(['moments.sum:exact-sum', 'moments.sumSq:exact-sum']);
  });

  it('Histogram', () => {
    expect(rules(histogramFromJson({ kind: 'histogram', edges: [0, 2, 1], counts: [1], underflow: 0, overflow: -1, invalid: 0 }))).toEqual([
      'histogram.edges[2]:increasing',
      'histogram.counts:length',
      'histogram.overflow:count',
    ]);
    expect(rules(histogramFromJson({ kind: 'histogram', edges: 'no', counts: [], underflow: 0, overflow: 0, invalid: 0 }))).toContain(
      'histogram.edges:array',
    );
  });

  it('TopK', () => {
    const items = [
      { key: 4, score: 1, payload: null },
      { key: 2, score: 1, payload: null },
      { key: 4, score: 'NaN', payload: null },
    ];
    expect(rules(topKFromJson({ kind: 'top-k', k: 2, items }))).toEqual([
      'top.items:max-length',
      'top.items[1]:order',
      'top.items[2].score:not-nan',
      'top.items[2].key:unique-key',
      'top.items[2]:order', // a NaN score has no place in the order either
    ]);
    expect(rules(topKFromJson({ kind: 'top-k', k: 0, items: 'x' }))).toEqual(['top.k:positive', 'top.items:array']);
  });
});

/**
 * The worker's cache of orbit view samples (app/engine/orbit/viewSamplesCache.ts). The cached
 * values must be the samples themselves: every hit is compared element by element with a fresh
 * orbitViewSamples of the same ephemeris (whose values test/unit/orbit-view-samples.test.ts checks
 * against satellite.js and astronomy-engine), also after the renderer's transfer has detached the
 * buffers handed out before (structuredClone with `transfer`, the HTML structured-clone algorithm
 * that postMessage uses); a changed ephemeris is a miss; and a whole pass through runPipeline with
 * the cache gives the same orbit view as one without it. The scenario is the bundled invented
 * example (assets/lumen6-orbit-day.scenario.json).
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { orbitViewSamples, type OrbitViewSamples } from '../../app/engine/orbit/viewSamples';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';

const json = JSON.parse(readFileSync(new URL('../../assets/lumen6-orbit-day.scenario.json', import.meta.url), 'utf8')) as Record<
  string,
  unknown
>;
const prep = preparePipeline(json);
if (!prep.ok) throw new Error(JSON.stringify(prep.errors));
const eph = prep.value.orbit!.ephemeris;
const reference = orbitViewSamples(eph)!;

const buffers = (s: OrbitViewSamples) => [s.rM, s.vMps, s.sunM, s.moonM, s.thetaRad, s.qFrame].map((a) => a.buffer as ArrayBuffer);

describe('orbit view sample cache', () => {
  it('a hit gives the samples of a fresh computation, in buffers of its own that survive a transfer of earlier ones', () => {
    const cache = createOrbitViewCache();
    const first = cache.samples(eph)!;
    expect(first).toEqual(reference);
    // The renderer receives the first result by transfer: its buffers detach.
    structuredClone(first, { transfer: buffers(first) });
    expect(first.rM.length).toBe(0);
    const second = cache.samples(eph)!;
    expect(cache.stats).toEqual({ hits: 1, misses: 1 });
    expect(second).toEqual(reference);
    const third = cache.samples(eph)!;
    expect(third.rM.buffer).not.toBe(second.rM.buffer);
    expect(third).toEqual(reference);
  });

  it('a changed ephemeris (one orbit node moved by a metre) or another end is a miss', () => {
    const cache = createOrbitViewCache();
    cache.samples(eph);
    const moved = { ...eph, orbit: eph.orbit.slice() };
    moved.orbit[0] = moved.orbit[0]! + 1;
    const m = cache.samples(moved)!;
    expect(cache.stats).toEqual({ hits: 0, misses: 2 });
    expect(m).toEqual(orbitViewSamples(moved));
    expect(cache.samples(eph, 3600)).toEqual(orbitViewSamples(eph, 3600));
    expect(cache.stats.misses).toBe(3);
  });

  it('runPipeline with the cache: the same orbit view as without it, on the second pass from the cache', () => {
    const cache = createOrbitViewCache();
    const opts = { controllers: ['pd'] as const, modes: ['follow-plan'] as const };
    const plain = runPipeline(json, { ...opts });
    const a = runPipeline(json, { ...opts, orbitViewCache: cache });
    const b = runPipeline(json, { ...opts, orbitViewCache: cache });
    if (!plain.ok || !a.ok || !b.ok) throw new Error('pass failed');
    expect(cache.stats).toEqual({ hits: 1, misses: 1 });
    expect(a.value.orbitView).toEqual(plain.value.orbitView);
    expect(b.value.orbitView).toEqual(plain.value.orbitView);
  });
});

/**
 * The orbit view samples (viewSamples.ts) of the last few ephemerides, for the app's pipeline
 * worker: an edit that leaves the orbit, the epoch and the horizon alone (a gain, an inertia, a
 * target's hold) gives the same ephemeris, and sampling a day of it (astronomy-engine's Sun and
 * Moon series at every sample) costs far more than the comparison. orbitViewSamples is a pure
 * function of the ephemeris and the span's end, so equal inputs give equal samples.
 *
 * The worker transfers the output's buffers to the renderer (they detach), so the cache keeps its
 * own copies of both the inputs it compares and the samples, and hands out a fresh copy each time.
 */
import type { Ephemeris } from './ephemeris';
import { orbitViewSamples, type OrbitViewSamples } from './viewSamples';

export interface OrbitViewCache {
  /** orbitViewSamples(eph, endS), from the cache when an equal ephemeris and end were sampled. */
  samples(eph: Ephemeris, endS?: number): OrbitViewSamples | null;
  /** Hits and misses so far (for tests and the bench). */
  readonly stats: { hits: number; misses: number };
}

interface Entry {
  eph: Ephemeris;
  endS: number;
  samples: OrbitViewSamples | null;
}

function sameArray(a: Float64Array, b: Float64Array): boolean {
  if (a.length !== b.length) return false;
  for (let i = 0; i < a.length; i++) if (!Object.is(a[i], b[i])) return false;
  return true;
}

function sameEphemeris(a: Ephemeris, b: Ephemeris): boolean {
  return (
    Object.is(a.epochTaiS, b.epochTaiS) &&
    Object.is(a.startS, b.startS) &&
    Object.is(a.endS, b.endS) &&
    Object.is(a.orbitStepS, b.orbitStepS) &&
    a.orbitNodeCount === b.orbitNodeCount &&
    Object.is(a.bodyStartS, b.bodyStartS) &&
    Object.is(a.bodyStepS, b.bodyStepS) &&
    a.bodyNodeCount === b.bodyNodeCount &&
    sameArray(a.orbit, b.orbit) &&
    sameArray(a.bodies, b.bodies)
  );
}

function copyEphemeris(e: Ephemeris): Ephemeris {
  return { ...e, orbit: e.orbit.slice(), bodies: e.bodies.slice() };
}

function copySamples(s: OrbitViewSamples | null): OrbitViewSamples | null {
  if (!s) return null;
  return {
    ...s,
    rM: s.rM.slice(),
    vMps: s.vMps.slice(),
    sunM: s.sunM.slice(),
    moonM: s.moonM.slice(),
    thetaRad: s.thetaRad.slice(),
    qFrame: s.qFrame.slice(),
  };
}

/** A cache of the `capacity` most recently used ephemerides' samples (default 2: the edit and its undo). */
export function createOrbitViewCache(capacity = 2): OrbitViewCache {
  const entries: Entry[] = [];
  const stats = { hits: 0, misses: 0 };
  return {
    stats,
    samples(eph, endS = eph.endS) {
      const i = entries.findIndex((e) => Object.is(e.endS, endS) && sameEphemeris(e.eph, eph));
      if (i >= 0) {
        const hit = entries[i]!;
        entries.splice(i, 1);
        entries.unshift(hit);
        stats.hits++;
        return copySamples(hit.samples);
      }
      stats.misses++;
      const samples = orbitViewSamples(eph, endS);
      entries.unshift({ eph: copyEphemeris(eph), endS, samples: copySamples(samples) });
      entries.length = Math.min(entries.length, Math.max(1, capacity));
      return samples;
    },
  };
}

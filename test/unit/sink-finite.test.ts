/**
 * sim/sink.ts packedNonFiniteSum: 0 exactly when every value of every channel is finite.
 * Reference: ECMA-262 Number.isFinite (§21.1.2.2) over the same values, and IEEE 754-2019 §6.1–6.2
 * (∞·0 and NaN·0 are NaN, any NaN term makes the sum NaN; finite·0 is ±0).
 */
import { describe, expect, it } from 'vitest';
import { packedNonFiniteSum } from '../../app/engine/sim/sink';
import { PACKED_SCALARS, type PackedSample } from '../../app/engine/sim/trace';

const CHANNELS = [
  'scalars',
  'q',
  'omega',
  'hWheel',
  'qRef',
  'omegaRef',
  'torqueCmdBody',
  'torqueBody',
  'wheelTorqueCmd',
  'wheelTorque',
  'wheelTorqueNet',
] as const;

/** A sample with nWheels wheels filled with finite values of both signs, large and small. */
function sample(nWheels: number): PackedSample {
  const fill = (n: number, k: number) => Float64Array.from({ length: n }, (_, i) => (i % 2 ? -1 : 1) * 10 ** (((i + k) % 7) * 50 - 150));
  return {
    j: 0,
    segment: 0,
    scalars: fill(PACKED_SCALARS, 0),
    q: fill(4, 1),
    omega: fill(3, 2),
    hWheel: fill(nWheels, 3),
    qRef: fill(4, 4),
    omegaRef: fill(3, 5),
    torqueCmdBody: fill(3, 6),
    torqueBody: fill(3, 7),
    wheelTorqueCmd: fill(nWheels, 8),
    wheelTorque: fill(nWheels, 9),
    wheelTorqueNet: fill(nWheels, 10),
  };
}

const allFinite = (s: PackedSample) => CHANNELS.every((c) => Array.from(s[c]).every((v) => Number.isFinite(v)));

describe('packedNonFiniteSum (sample sink contract)', () => {
  it('is 0 for finite samples, extremes and −0 included', () => {
    for (const n of [1, 3, 4, 6]) {
      const s = sample(n);
      s.q[0] = -0;
      s.omega[1] = Number.MAX_VALUE;
      s.torqueBody[2] = -Number.MIN_VALUE;
      expect(allFinite(s)).toBe(true);
      expect(packedNonFiniteSum(s)).toBe(0);
    }
  });

  it('is NaN when any single value of any channel is NaN, +∞ or −∞', () => {
    for (const n of [1, 4]) {
      for (const c of CHANNELS) {
        for (let i = 0; i < sample(n)[c].length; i++) {
          for (const bad of [NaN, Infinity, -Infinity]) {
            const s = sample(n);
            s[c][i] = bad;
            expect(allFinite(s)).toBe(false);
            expect(packedNonFiniteSum(s), `${c}[${i}] = ${bad}`).toBeNaN();
          }
        }
      }
    }
  });
});

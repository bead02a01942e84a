/**
 * The closed loop's per-sample fast paths (issue 12) against what they replace or against the
 * definitions they implement:
 *  - TraceBuilder.pushPackedIfFinite (sim/trace.ts) appends exactly the samples in which
 *    firstNonFinite finds nothing, with every value copied bit for bit: checked with one
 *    non-finite value (NaN, +∞, −∞) planted in every slot of every channel. The check it rests
 *    on is IEEE 754-2019 arithmetic (§6.1: ∞ × 0 is an invalid operation giving NaN; §6.2:
 *    NaN propagates through + and ×; finite × 0 is ±0 and ±0 + ±0 compares equal to 0);
 *  - wheelFrictionTorqueAt (body/gyrostat.ts) from ω and h apart gives the same bits as
 *    wheelFrictionTorque from the packed state, and both equal the friction law written out here
 *    from its doc comment: c_i Ω_i + τ_c,i tanh(Ω_i / Ω_s), Ω_i = h_i / J_s,i − g_iᵀω (viscous plus
 *    smoothed Coulomb friction: common practice, no single source);
 *  - the limiter's fast path (wheels/limits.ts): reason 'none' and the command returned bit for
 *    bit exactly when every command lies in its interval [lo_i, hi_i] as the methods note §6
 *    defines it (lo_i = max(−τ_max,i, (−h_max,i − h_i)/dt), hi_i = min(τ_max,i, (h_max,i − h_i)/dt);
 *    a wheel beyond its limit may only come back), written out here; otherwise the general path
 *    runs and the delivered body torque is s × the request (direction kept, same note);
 *  - the trace's first capacity (sim/loop.ts): the whole expected run, ⌈tEnd·f⌉ + 8 samples, when
 *    the run is short or has no stop rule (it then flies to tEnd), 4096 samples growing otherwise
 *    (arithmetic on the run's length, no source needed).
 */
import { describe, expect, it } from 'vitest';
import { makeGyrostat, wheelFrictionTorque, wheelFrictionTorqueAt } from '../../app/engine/body/gyrostat';
import { m3Diag } from '../../app/engine/math/mat3';
import { makeRng } from '../../app/engine/math/prng';
import { bodyTorqueFromWheelTorque, createLimitInfo, limitWheelTorque, makeWheelArray, pyramid } from '../../app/engine/wheels';
import { firstNonFinite } from '../../app/engine/sim/finite';
import { LoopCore } from '../../app/engine/sim/loop';
import type { ClosedLoopConfig, StopRule } from '../../app/engine/sim/closedLoop';
import { PERFECT_SENSORS } from '../../app/engine/sim/sensors';
import { fixedReference, law, pyramidVehicle } from '../reference/closedloop-fixtures';
import { PACKED_SCALARS, TraceBuilder, type PackedSample } from '../../app/engine/sim/trace';
import type { RunTrace } from '../../app/engine/sim/types';

const N_WHEELS = 4;
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

function randomSample(seed: number): PackedSample {
  const rng = makeRng(seed, 0);
  const f = (n: number) => Float64Array.from({ length: n }, () => rng.normal() * 10 ** Math.floor(6 * rng.normal()));
  return {
    j: 3,
    segment: 1,
    scalars: f(PACKED_SCALARS),
    q: f(4),
    omega: f(3),
    hWheel: f(N_WHEELS),
    qRef: f(4),
    omegaRef: f(3),
    torqueCmdBody: f(3),
    torqueBody: f(3),
    wheelTorqueCmd: f(N_WHEELS),
    wheelTorque: f(N_WHEELS),
    wheelTorqueNet: f(N_WHEELS),
  };
}

/** The trace's sample k equals the packed sample bit for bit (Object.is: −0 and NaN told apart). */
function expectStored(tr: RunTrace, k: number, s: PackedSample): void {
  const same = (a: ArrayLike<number>, o: number, b: ArrayLike<number>) => {
    for (let i = 0; i < b.length; i++) expect(Object.is(a[o + i], b[i])).toBe(true);
  };
  same(tr.t, k, [s.scalars[0]!]);
  same(tr.logic, k, [s.scalars[1]!]);
  same(tr.errorAngle, k, [s.scalars[2]!]);
  same(tr.potential, k, [s.scalars[3]!]);
  same(tr.potentialMin, k, [s.scalars[4]!]);
  same(tr.gap, k, [s.scalars[5]!]);
  same(tr.lyapunov, k, [s.scalars[6]!]);
  expect(tr.j[k]).toBe(s.j);
  expect(tr.segment[k]).toBe(s.segment);
  for (const ch of CHANNELS) if (ch !== 'scalars') same(tr[ch], s[ch].length * k, s[ch]);
}

describe('TraceBuilder.pushPackedIfFinite agrees with firstNonFinite', () => {
  it('finite samples (huge, tiny, −0, values whose sum overflows) are all appended, bit for bit', () => {
    const b = new TraceBuilder(N_WHEELS, 16);
    const kept: PackedSample[] = [];
    for (let seed = 1; seed <= 50; seed++) {
      const s = randomSample(seed);
      expect(firstNonFinite(s)).toBeNull();
      expect(b.pushPackedIfFinite(s)).toBe(true);
      kept.push(s);
    }
    // A sum of finite values may overflow to +∞; the check must still say "finite"
    // (1.7e308 + 1.7e308 = +∞ in binary64, IEEE 754-2019 §4.3 rounding to nearest).
    const big = randomSample(7);
    big.hWheel.fill(1.7e308);
    big.q[0] = -0;
    big.omega[1] = Number.MIN_VALUE;
    expect(firstNonFinite(big)).toBeNull();
    expect(b.pushPackedIfFinite(big)).toBe(true);
    kept.push(big);
    const tr = b.finish();
    expect(tr.n).toBe(kept.length);
    kept.forEach((s, k) => expectStored(tr, k, s));
  });

  it('one NaN, +∞ or −∞ in any slot of any channel: not appended, and firstNonFinite names that channel', () => {
    for (const bad of [NaN, Infinity, -Infinity]) {
      for (const ch of CHANNELS) {
        const len = randomSample(1)[ch].length;
        for (let i = 0; i < len; i++) {
          const b = new TraceBuilder(N_WHEELS, 16);
          const good = randomSample(99);
          expect(b.pushPackedIfFinite(good)).toBe(true);
          const s = randomSample(100 + i);
          s[ch][i] = bad;
          expect(b.pushPackedIfFinite(s), `${ch}[${i}] = ${bad}`).toBe(false);
          const tr = b.finish();
          expect(tr.n).toBe(1);
          expectStored(tr, 0, good);
          const msg = firstNonFinite(s);
          expect(msg).not.toBeNull();
          if (ch !== 'scalars') expect(msg).toContain(`(${ch})`);
        }
      }
    }
  });
});

describe('wheelFrictionTorqueAt', () => {
  const axes = new Float64Array([0.6, 0, 0.8, 0, 0.6, 0.8, -0.6, 0, 0.8, 0, -0.6, 0.8]);
  const js = new Float64Array([1e-5, 1.2e-5, 0.9e-5, 1.1e-5]);
  const mk = (friction?: Parameters<typeof makeGyrostat>[2]) => {
    const r = makeGyrostat(m3Diag(0.11, 0.12, 0.08), { n: 4, axes, rotorInertiaKgm2: js }, friction);
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    return r.value;
  };
  const withFriction = mk({ viscousNmsPerRad: new Float64Array([2e-7, 3e-7, 1e-7, 4e-7]), coulombNm: 5e-5, coulombSmoothingRadPerS: 0.3 });
  const none = mk();

  it('same bits as wheelFrictionTorque on the packed state, and the friction law written out', () => {
    const rng = makeRng(42, 0);
    const x = new Float64Array(11);
    const a = new Float64Array(4),
      b = new Float64Array(4);
    for (let k = 0; k < 200; k++) {
      for (let i = 0; i < 11; i++) x[i] = rng.normal() * (i >= 7 ? 5e-3 : 0.05);
      for (const g of [withFriction, none]) {
        wheelFrictionTorque(a, x, g);
        wheelFrictionTorqueAt(b, x.subarray(4, 7), x.subarray(7, 11), g);
        for (let i = 0; i < 4; i++) expect(Object.is(a[i], b[i])).toBe(true);
      }
      wheelFrictionTorqueAt(b, x.subarray(4, 7), x.subarray(7, 11), withFriction);
      for (let i = 0; i < 4; i++) {
        const rel = x[7 + i]! / js[i]! - (axes[3 * i]! * x[4]! + axes[3 * i + 1]! * x[5]! + axes[3 * i + 2]! * x[6]!);
        const c = [2e-7, 3e-7, 1e-7, 4e-7][i]!;
        const want = c * rel + 5e-5 * Math.tanh(rel / 0.3);
        expect(Math.abs(b[i]! - want)).toBeLessThanOrEqual(1e-12 * Math.max(1e-9, Math.abs(want)));
      }
      wheelFrictionTorqueAt(b, x.subarray(4, 7), x.subarray(7, 11), none);
      expect(Array.from(b)).toEqual([0, 0, 0, 0]);
    }
  });
});

describe('limiter fast path when nothing binds', () => {
  const TAU = 0.002,
    H = 0.006;
  const made = makeWheelArray(
    pyramid({
      maxTorqueNm: TAU,
      maxMomentumNms: H,
      rotorInertiaKgm2: 2e-5,
      cantAngleRad: Math.acos(1 / Math.sqrt(3)),
      azimuthOffsetRad: Math.PI / 4,
    }),
  );
  if (!made.ok) throw new Error(JSON.stringify(made.errors));
  const arr = made.value;

  /** Every command inside [lo_i, hi_i] (methods note §6, written out). */
  function inside(cmd: Float64Array, h: Float64Array, dt: number): boolean {
    for (let i = 0; i < 4; i++) {
      let lo = -TAU,
        hi = TAU;
      if (dt > 0) {
        lo = Math.max(lo, h[i]! < -H ? 0 : (-H - h[i]!) / dt);
        hi = Math.min(hi, h[i]! > H ? 0 : (H - h[i]!) / dt);
      } else {
        if (h[i]! <= -H) lo = 0;
        if (h[i]! >= H) hi = 0;
      }
      if (cmd[i]! < lo || cmd[i]! > hi) return false;
    }
    return true;
  }

  it('none exactly when inside, command unchanged bit for bit (also aliased); otherwise s × the body torque', () => {
    const rng = makeRng(2026, 0);
    const cmd = new Float64Array(4),
      h = new Float64Array(4),
      out = new Float64Array(4);
    const info = createLimitInfo();
    let nInside = 0,
      nOutside = 0;
    for (let k = 0; k < 4000; k++) {
      for (let i = 0; i < 4; i++) {
        cmd[i] = rng.normal() * TAU * (k % 3 === 0 ? 1.5 : 0.4);
        h[i] = rng.normal() * H * (k % 5 === 0 ? 1.2 : 0.5);
      }
      if (k % 7 === 0) cmd[k % 4] = -0;
      const dt = k % 4 === 0 ? 0 : 0.1;
      const want = inside(cmd, h, dt);
      limitWheelTorque(out, arr, cmd, h, dt, info);
      if (want) {
        nInside++;
        expect(info.reason).toBe('none');
        expect(info.scale).toBe(1);
        for (let i = 0; i < 4; i++) expect(Object.is(out[i], cmd[i])).toBe(true);
        const alias = Float64Array.from(cmd);
        limitWheelTorque(alias, arr, alias, h, dt, info);
        for (let i = 0; i < 4; i++) expect(Object.is(alias[i], cmd[i])).toBe(true);
      } else {
        nOutside++;
        expect(info.reason).not.toBe('none');
        // Direction kept: delivered body torque = s × requested (methods note §6).
        const req = bodyTorqueFromWheelTorque(new Float64Array(3), arr, cmd);
        const got = bodyTorqueFromWheelTorque(new Float64Array(3), arr, out);
        for (let i = 0; i < 3; i++) expect(Math.abs(got[i]! - info.scale * req[i]!)).toBeLessThan(1e-12);
      }
    }
    // Both branches exercised many times (counts depend only on the seeded draws).
    expect(nInside).toBeGreaterThan(500);
    expect(nOutside).toBeGreaterThan(500);
  });
});

describe('trace capacity up front', () => {
  const veh = pyramidVehicle(
    [
      [0.11, 0, 0],
      [0, 0.12, 0],
      [0, 0, 0.08],
    ],
    0.002,
    0.006,
  );
  const cfg = (tEnd: number, stopRule?: StopRule): ClosedLoopConfig => ({
    plant: veh.plant,
    wheels: veh.wheels,
    controller: law({ kind: 'quaternion-pd', gains: { omegaN: 0.1, zeta: 0.9 } }, veh),
    reference: fixedReference(),
    q0: [0, 0, 0, 1],
    omega0: [0, 0, 0],
    hWheel0: new Float64Array(4),
    tEnd,
    timing: 'sampled',
    controlRateHz: 10,
    rk4StepsPerSample: 1,
    sensors: PERFECT_SENSORS,
    seed: 1,
    actuation: { mode: 'hold' },
    allocation: 'min-norm',
    ...(stopRule ? { stopRule } : {}),
  });
  const never: StopRule = { update: () => false };

  it('whole run when short or without a stop rule; 4096 and growing for a long run that may stop early', () => {
    expect(new LoopCore(cfg(600)).builder.capacity).toBe(6008);
    expect(new LoopCore(cfg(600, never)).builder.capacity).toBe(6008);
    const expected = (tEnd: number) => Math.ceil(tEnd / (1 / 10)) + 8;
    expect(expected(1637.6)).toBe(16_384); // the largest short run
    expect(new LoopCore(cfg(1637.6, never)).builder.capacity).toBe(16_384);
    expect(expected(1640)).toBe(16_408);
    expect(new LoopCore(cfg(1640, never)).builder.capacity).toBe(4096);
    expect(new LoopCore(cfg(86_400)).builder.capacity).toBe(864_008);
    expect(new LoopCore(cfg(86_400, never)).builder.capacity).toBe(4096);
  });
});

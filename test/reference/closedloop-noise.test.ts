/**
 * Measurement noise near a 180° error, through the real closed loop (10 Hz sampled ZOH).
 *
 * Source of the phenomenon: Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust
 * global attitude tracking", IEEE TAC 56(11):2555–2566, 2011, and "On path-lifting mechanisms and
 * unwinding in quaternion-based attitude control", IEEE TAC 58(5):1179–1191, 2013: a memoryless
 * sign choice sgn(η) is discontinuous on η = 0, so
 *   (a) random noise larger than |η| flips the commanded torque from sample to sample (chatter)
 *       until the state happens to leave the band, and
 *   (b) a worst-case noise of size ē (sensors.adversarialEta: the measured error is reflected to
 *       (ε, −η) whenever |η| < ē) holds the state near η = 0 — about 180° from the target — for
 *       ever, while the hysteretic law with δ > ē is not fooled (it needs hη ≤ −δ to switch) and
 *       converges; with δ < ē the same noise makes it switch back and forth.
 *
 * Invented test vehicle: J = diag(2, 3, 4) kg·m², 4-wheel pyramid (1 N·m, 10 N·m·s per wheel,
 * never binding here), slow gains (ω_n = 0.05 rad/s, ζ = 0.9) so that the body lingers near the
 * 180° attitude long enough for the noise to act. Start at rest exactly 180° from the target about
 * (1,1,1)/√3. Random noise: 0.02 rad per axis (the measured η then varies by about ±0.01).
 * Thresholds below are the outcomes these runs must show, not fitted numbers: "reverses many
 * times" = at least 5 reversals per run inside the band |η| < 0.03, against at most 2 for the
 * hybrid laws.
 */
import { describe, expect, it } from 'vitest';
import type { SensorModel } from '../../app/engine/sim/sensors';
import { etaAt, fly, law, metricsOf, pyramidVehicle } from './closedloop-fixtures';
import { DEG_PER_RAD } from '../../app/engine/units';
import { CHATTER_THRESHOLD_PER_S } from '../../app/engine/study/runCase';

const veh = pyramidVehicle(
  [
    [2, 0, 0],
    [0, 3, 0],
    [0, 0, 4],
  ],
  1,
  10,
);
const gains = { omegaN: 0.05, zeta: 0.9 };
const axis = [1, 1, 1].map((x) => x / Math.sqrt(3));
const q0 = [axis[0]!, axis[1]!, axis[2]!, 0]; // η = 0: exactly 180° from the identity target
const SIGN = { kind: 'sign-switch', gains };
const HYST = (delta: number) => ({ kind: 'hysteretic', gains, hysteresis: delta });
// certified family of methods §4.3 (A = diag(1,2,3), warp gain 0.15, δ = 0.2)
const SYN = { kind: 'synergistic', gains, potential: { eigenvalues: [1, 2, 3] }, warpGain: 0.15, hysteresis: 0.2 };

const SIGMA = 0.02;
const random = (): SensorModel => ({ attitudeSigmaRad: SIGMA, rateSigmaRadPerS: 0, rateBiasRadPerS: [0, 0, 0], adversarialEta: 0 });
const worstCase = (ebar: number): SensorModel => ({
  attitudeSigmaRad: 0,
  rateSigmaRadPerS: 0,
  rateBiasRadPerS: [0, 0, 0],
  adversarialEta: ebar,
});

/** Sign reversals of the commanded torque along the start axis while the TRUE |η| < band. */
function reversalsInBand(r: ReturnType<typeof fly>, band: number): { reversals: number; samples: number } {
  const tc = r.trace.torqueCmdBody;
  let reversals = 0,
    samples = 0,
    last = 0;
  for (let k = 0; k < r.trace.n; k++) {
    if (Math.abs(etaAt(r, k)) >= band) continue;
    samples++;
    const p = tc[3 * k]! * axis[0]! + tc[3 * k + 1]! * axis[1]! + tc[3 * k + 2]! * axis[2]!;
    const s = p > 0 ? 1 : -1;
    if (last !== 0 && s !== last) reversals++;
    last = s;
  }
  return { reversals, samples };
}

describe('random attitude noise near a 180° error (10 Hz)', () => {
  const SEEDS = [1, 2, 3, 4, 5, 6];
  const runs = (spec: Record<string, unknown>) =>
    SEEDS.map((seed) => fly({ vehicle: veh, controller: law(spec, veh), q0, tEnd: 300, sensors: random(), seed }));

  it('the sign law reverses its torque many times while |η| is below the noise level; it still gets out and converges', () => {
    const counts = runs(SIGN).map((r) => {
      expect(metricsOf(r, veh).finalErrorRad * DEG_PER_RAD).toBeLessThan(0.5);
      return reversalsInBand(r, 1.5 * SIGMA).reversals;
    });
    for (const c of counts) expect(c).toBeGreaterThanOrEqual(5);
    expect(counts.reduce((a, b) => a + b, 0)).toBeGreaterThanOrEqual(60);
  });

  it('the hysteretic (δ = 0.2) and synergistic laws keep one direction: at most a few jumps and reversals', () => {
    for (const spec of [HYST(0.2), SYN]) {
      for (const r of runs(spec)) {
        expect(r.jumps.length).toBeLessThanOrEqual(2);
        const band = reversalsInBand(r, 1.5 * SIGMA);
        expect(band.samples).toBeGreaterThan(10); // it did spend time in the band
        expect(band.reversals).toBeLessThanOrEqual(2);
        expect(metricsOf(r, veh).finalErrorRad * DEG_PER_RAD).toBeLessThan(0.5);
      }
    }
  });
});

describe('worst-case bounded noise ē = 0.1 (adversarialEta)', () => {
  const EBAR = 0.1;
  const go = (spec: Record<string, unknown>) => {
    const r = fly({ vehicle: veh, controller: law(spec, veh), q0, tEnd: 300, sensors: worstCase(EBAR), seed: 1 });
    return { r, m: metricsOf(r, veh) };
  };
  const minError = (r: ReturnType<typeof fly>) => r.trace.errorAngle.reduce((a, b) => Math.min(a, b), Infinity);

  it('the sign law is held near η = 0: the error stays near 180° for the whole run, with steady chatter', () => {
    const { r, m } = go(SIGN);
    expect(r.outcome.status).toBe('completed');
    expect(r.trace.t[r.trace.n - 1]).toBeCloseTo(300, 6);
    // |η| < ē ⇔ error angle > 2 arccos ē = 168.5°; it never got below that
    expect(minError(r) * DEG_PER_RAD).toBeGreaterThan(2 * Math.acos(EBAR) * DEG_PER_RAD);
    expect(m.settled).toBe(false);
    // Torque direction reverses at most every few samples while held (metrics/chatter.ts): clearly
    // above the study's chatter threshold.
    expect(m.chatterPerS).toBeGreaterThan(CHATTER_THRESHOLD_PER_S);
  });

  it('the hysteretic law with δ = 0.2 > ē is not fooled and converges (no jump needed)', () => {
    const { r, m } = go(HYST(0.2));
    expect(r.jumps.length).toBeLessThanOrEqual(1);
    expect(m.finalErrorRad * DEG_PER_RAD).toBeLessThan(0.01);
    expect(m.chatterPerS).toBeLessThan(1);
  });

  it('the synergistic law (δ = 0.2 on its gap) converges as well', () => {
    const { r, m } = go(SYN);
    expect(r.jumps.length).toBeLessThanOrEqual(2);
    // its bandwidth gains are matched at the slowest axis, so it is still closing in at 300 s
    expect(m.finalErrorRad * DEG_PER_RAD).toBeLessThan(0.1);
  });

  it('counter-check: a hysteretic law with δ = 0.05 < ē is switched back and forth and stays near 180°', () => {
    const { r, m } = go(HYST(0.05));
    expect(r.jumps.length).toBeGreaterThan(10);
    expect(minError(r) * DEG_PER_RAD).toBeGreaterThan(2 * Math.acos(EBAR) * DEG_PER_RAD);
    expect(m.settled).toBe(false);
  });
});

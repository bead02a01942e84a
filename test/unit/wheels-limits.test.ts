/**
 * Direction-preserving wheel limits and null-space momentum bleed, on hand-worked cases.
 *
 * Source for the rules: the project's methods note §6 (derived there): s = min(1, min_i
 * τ_max,i/|τ_w,i|) for torque; a wheel at |h_i| ≥ h_max may only be torqued to reduce |h_i|,
 * null space first, otherwise scale the whole command; bleed α = −k νᵀh/‖ν‖². The expected
 * numbers below are worked by hand from those rules (stated beside each case).
 */
import { describe, expect, it } from 'vitest';
import {
  allocateMinMax,
  bodyTorqueFromWheelTorque,
  createLimitInfo,
  limitWheelTorque,
  limitWheelTorqueStep,
  makeWheelArray,
  nullSpaceMomentumBleed,
  orthogonalTriad,
  pyramid,
} from '../../app/engine/wheels';
import type { WheelArray, WheelSpec } from '../../app/engine/wheels';

const TAU = 0.002,
  H = 0.006;
const lim = { maxTorqueNm: TAU, maxMomentumNms: H, rotorInertiaKgm2: 2e-5 };
function build(specs: WheelSpec[]): WheelArray {
  const r = makeWheelArray(specs);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}
const triad = build(orthogonalTriad(lim));
const pyr = build(pyramid({ ...lim, cantAngleRad: Math.acos(1 / Math.sqrt(3)), azimuthOffsetRad: Math.PI / 4 }));
const body = (arr: WheelArray, w: ArrayLike<number>) => Array.from(bodyTorqueFromWheelTorque(new Float64Array(3), arr, w));

describe('torque limit: one scale for all wheels', () => {
  it('inside the limits: unchanged, reason none', () => {
    const out = new Float64Array(4);
    const cmd = [0.001, -0.0005, 0.0015, 0];
    const info = limitWheelTorque(out, pyr, cmd, [0, 0, 0, 0]);
    expect(info).toEqual({ scale: 1, reason: 'none', bindingWheel: -1, nullSpaceUsed: false });
    expect(Array.from(out)).toEqual(cmd);
  });
  it('cmd (2, 1, 0.5, −1)·τ_max → s = 0.5 set by wheel 0', () => {
    const out = new Float64Array(4);
    const cmd = [2 * TAU, TAU, 0.5 * TAU, -TAU];
    const info = limitWheelTorque(out, pyr, cmd, [0, 0, 0, 0]);
    expect(info.reason).toBe('torque');
    expect(info.scale).toBe(0.5);
    expect(info.bindingWheel).toBe(0);
    cmd.forEach((c, i) => expect(out[i]).toBeCloseTo(0.5 * c, 18));
  });
  it('out may alias the command', () => {
    const cmd = new Float64Array([0, -3 * TAU, TAU]);
    limitWheelTorque(cmd, triad, cmd, [0, 0, 0]);
    expect(Array.from(cmd)).toEqual([0, -TAU, TAU / 3]);
  });
});

describe('momentum limit, instantaneous rule', () => {
  it('triad, wheel 0 at +h_max pushed further: no null space, whole command scaled to 0', () => {
    const out = new Float64Array(3);
    const info = limitWheelTorque(out, triad, [0.001, 0.001, 0], [H, 0, 0]);
    expect(info.reason).toBe('momentum');
    expect(info.scale).toBe(0);
    expect(info.bindingWheel).toBe(0);
    expect(Array.from(out)).toEqual([0, 0, 0]);
  });
  it('triad, wheel 0 at +h_max torqued back: allowed', () => {
    const out = new Float64Array(3);
    expect(limitWheelTorque(out, triad, [-0.001, 0.001, 0], [H, 0, 0]).reason).toBe('none');
  });
  it('triad, wheel beyond −h_max may only be torqued positive', () => {
    const out = new Float64Array(3);
    expect(limitWheelTorque(out, triad, [0, 0, -0.001], [0, 0, -1.2 * H]).scale).toBe(0);
    expect(limitWheelTorque(out, triad, [0, 0, 0.001], [0, 0, -1.2 * H]).reason).toBe('none');
  });
  it('pyramid, wheel 0 saturated: the null space absorbs it, full body torque delivered', () => {
    const cmd = allocateMinMax(new Float64Array(4), pyr, [-0.0004, -0.0002, -0.0003]);
    expect(cmd[0]).toBeGreaterThan(0); // this request pushes wheel 0 further
    const out = new Float64Array(4);
    const info = limitWheelTorque(out, pyr, cmd, [H, 0, 0, 0]);
    expect(info.reason).toBe('momentum-null-space');
    expect(info.scale).toBe(1);
    expect(info.nullSpaceUsed).toBe(true);
    expect(out[0]).toBeLessThanOrEqual(0);
    const want = body(pyr, cmd),
      got = body(pyr, out);
    for (let r = 0; r < 3; r++) expect(got[r]).toBeCloseTo(want[r]!, 16);
    for (let i = 0; i < 4; i++) expect(Math.abs(out[i]!)).toBeLessThanOrEqual(TAU);
    // Smallest change: with ν ∝ (1,−1,1,−1)/2 the fix moves wheel 0 exactly to 0 (α = −2 cmd₀).
    expect(out[0]).toBeCloseTo(0, 18);
    expect(out[1]).toBeCloseTo(cmd[1]! + cmd[0]!, 16);
  });
  it('pyramid, wheels 0 and 1 saturated against a command pushing both: null space cannot help, s = 0', () => {
    // ν = ±(1, −1, 1, −1)/2: lowering wheel 0 raises wheel 1, so no α fixes both (hand-worked).
    const out = new Float64Array(4);
    const info = limitWheelTorque(out, pyr, [0.001, 0.001, 0, 0], [H, H, 0, 0]);
    expect(info.reason).toBe('momentum');
    expect(info.scale).toBe(0);
    expect(Array.from(out).every((x) => x === 0)).toBe(true);
  });
});

describe('momentum limit, predictive over a step', () => {
  const dt = 0.1;
  it('triad: room for half a full-torque step → s = 0.5 and h lands exactly on the limit', () => {
    const h = [H - 0.5 * TAU * dt, 0, 0];
    const out = new Float64Array(3);
    const info = limitWheelTorqueStep(out, triad, [TAU, -TAU / 2, 0], h, dt);
    expect(info.reason).toBe('momentum');
    expect(info.scale).toBeCloseTo(0.5, 14);
    expect(h[0]! + out[0]! * dt).toBeCloseTo(H, 16);
    expect(out[1]).toBeCloseTo(-TAU / 4, 16);
  });
  it('the same call through limitWheelTorque(…, dt, info) (the simulator uses this form)', () => {
    const info = { scale: 1, reason: '' };
    const out = new Float64Array(3);
    limitWheelTorque(out, triad, [TAU, 0, 0], [H - 0.5 * TAU * dt, 0, 0], dt, info);
    expect(info.scale).toBeCloseTo(0.5, 14);
    expect(info.reason).toBe('momentum');
  });
  it('a wheel beyond its limit comes back without overshooting the opposite limit', () => {
    const out = new Float64Array(3);
    // h = 1.0001 H, cmd −τ_max for a long step would overshoot −H: s limited by (H + h)/(τ dt).
    const bigDt = 10;
    const h0 = 1.0001 * H;
    const info = limitWheelTorqueStep(out, triad, [-TAU, 0, 0], [h0, 0, 0], bigDt);
    expect(info.scale).toBeCloseTo((H + h0) / (TAU * bigDt), 12);
    expect(h0 + out[0]! * bigDt).toBeCloseTo(-H, 15);
  });
  it('pyramid: the null space keeps a nearly full wheel inside while delivering the full torque', () => {
    const cmd = allocateMinMax(new Float64Array(4), pyr, [-0.0004, -0.0002, -0.0003]);
    const h = [H - 1e-5, 0, 0, 0];
    const out = new Float64Array(4);
    const info = limitWheelTorqueStep(out, pyr, cmd, h, dt);
    expect(info.reason).toBe('momentum-null-space');
    expect(h[0]! + out[0]! * dt).toBeLessThanOrEqual(H);
    const want = body(pyr, cmd),
      got = body(pyr, out);
    for (let r = 0; r < 3; r++) expect(got[r]).toBeCloseTo(want[r]!, 16);
  });
});

describe('invalid input never produces NaN', () => {
  it('non-finite command, momentum or step → zero torque, reason invalid-input', () => {
    const out = new Float64Array(3).fill(7);
    expect(limitWheelTorque(out, triad, [NaN, 0, 0], [0, 0, 0]).reason).toBe('invalid-input');
    expect(Array.from(out)).toEqual([0, 0, 0]);
    expect(limitWheelTorque(out, triad, [0, 0, 0], [0, Infinity, 0]).reason).toBe('invalid-input');
    expect(limitWheelTorque(out, triad, [0, 0, 0], [0, 0, 0], -1).reason).toBe('invalid-input');
    expect(limitWheelTorqueStep(out, triad, [0, 0, 0], [0, 0, 0], 0).reason).toBe('invalid-input');
    expect(createLimitInfo()).toEqual({ scale: 1, reason: 'none', bindingWheel: -1, nullSpaceUsed: false });
  });
});

describe('nullSpaceMomentumBleed (α = −k νᵀh/‖ν‖²)', () => {
  it('pyramid: torque along ν with α = −k νᵀh, no body torque', () => {
    const h = [0.003, 0.001, -0.002, 0.0005];
    const k = 0.2;
    const out = nullSpaceMomentumBleed(new Float64Array(4), pyr, h, k);
    const nu = Array.from(pyr.nullBasis);
    const nh = nu.reduce((s, v, i) => s + v * h[i]!, 0);
    // ν is unit, so out = −k (νᵀh) ν.
    nu.forEach((v, i) => expect(out[i]).toBeCloseTo(-k * nh * v, 18));
    for (const x of body(pyr, out)) expect(Math.abs(x)).toBeLessThan(1e-19);
    // One Euler step of ḣ = out shrinks the null component by (1 − k dt).
    const dt = 0.5;
    const h1 = h.map((x, i) => x + out[i]! * dt);
    expect(nu.reduce((s, v, i) => s + v * h1[i]!, 0)).toBeCloseTo((1 - k * dt) * nh, 17);
  });
  it('triad has no null space: zero; non-finite gain: zero', () => {
    expect(Array.from(nullSpaceMomentumBleed(new Float64Array(3), triad, [1, 2, 3], 1))).toEqual([0, 0, 0]);
    expect(Array.from(nullSpaceMomentumBleed(new Float64Array(4), pyr, [1, 2, 3, 4], NaN))).toEqual([0, 0, 0, 0]);
  });
});

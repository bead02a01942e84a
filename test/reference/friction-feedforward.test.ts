/**
 * Wheel-drive friction feedforward (scenario vehicle.wheelFriction.compensatedFraction).
 *
 * Reference: static torque balance (textbook statics, no source needed beyond it). A body at rest
 * on its target with one wheel spinning at a constant speed feels the bearing friction torque f of
 * that wheel through the rotor (friction is internal between rotor and body, gyrostat.ts header).
 * At equilibrium the rotor's net torque τ_motor − f must vanish, and with feedforward fraction φ
 * the motor torque is the allocated torque a plus φ f, so a = (1 − φ) f. The quaternion PD law
 * (quaternionBase.ts, τ = −k_p q_v − K_d ω_e with ω_e = 0 at rest) must supply that torque, so
 * k_p |q_v| = (1 − φ) f and the standing error is θ = 2 asin((1 − φ) f / k_p) — exact, no
 * small-angle step. The friction torque is f = c_v ω_w + c_c tanh(ω_w / ω_s) (gyrostat.ts,
 * ω_s = its Coulomb smoothing speed); at the wheel speed used here tanh is 1 to 15 digits.
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { loadExample } from '../unit/scenario-fixtures';

const KP = 0.02; // N·m per unit q_v
const KD = 0.2; // N·m·s
const ROTOR = 1e-4; // kg·m²
const H1 = 0.05; // N·m·s on wheel 1 (500 rad/s relative speed)
const VISCOUS_MNM_PER_RADPS = 1e-3; // mN·m per rad/s
const COULOMB_MNM = 0.5; // mN·m

function standingError(fraction: number | undefined, timing: 'sampled' | 'continuous-ideal'): number {
  const s = loadExample('lumen6-imaging');
  s.vehicle.inertiaKgm2 = [
    [2, 0, 0],
    [0, 3, 0],
    [0, 0, 4],
  ];
  s.vehicle.wheels = { layout: 'triad', maxTorqueMNm: 20, maxMomentumMNms: 200, rotorInertiaKgm2: ROTOR };
  s.vehicle.wheelFriction = {
    viscousMNmPerRadPerS: VISCOUS_MNM_PER_RADPS,
    coulombMNm: COULOMB_MNM,
    ...(fraction === undefined ? {} : { compensatedFraction: fraction }),
  };
  s.vehicle.sensors = { attitudeNoiseArcsec: 0, rateNoiseDegPerS: 0, rateBiasDegPerS: [0, 0, 0] };
  s.initial = { attitude: { quaternion: [0, 0, 0, 1] }, bodyRateDegPerS: [0, 0, 0], wheelMomentumMNms: [H1 * 1000, 0, 0] };
  s.targets = [{ label: 'Hold', attitude: { quaternion: [0, 0, 0, 1] }, holdS: 400 }];
  s.controllers = [{ id: 'pd', label: 'PD', law: 'quaternion-pd', gains: { kp: KP, kd: KD } }];
  s.simulation = { ...s.simulation, mode: 'step-target', timing, tailS: 0 };
  delete s.keepOut;
  const out = runPipeline(s);
  if (!out.ok) throw new Error(JSON.stringify(out.errors));
  const run = out.value.runs[0]!;
  return run.metrics.finalErrorRad;
}

function expected(fraction: number): number {
  const wheelSpeed = H1 / ROTOR; // body at rest: relative speed = h / J_s
  const f = VISCOUS_MNM_PER_RADPS * 1e-3 * wheelSpeed + COULOMB_MNM * 1e-3;
  return 2 * Math.asin(((1 - fraction) * f) / KP);
}

describe('friction feedforward in the wheel drives: standing error from static torque balance', () => {
  it.each([
    [undefined, 0],
    [0.5, 0.5],
    [0.9, 0.9],
  ])('fraction %s: θ = 2 asin((1 − φ) f / k_p), ideal loop', (given, phi) => {
    const theta = standingError(given, 'continuous-ideal');
    expect(theta).toBeGreaterThan(0);
    expect(Math.abs(theta - expected(phi)) / expected(phi)).toBeLessThan(1e-4);
  });

  it('full feedforward leaves no standing error; the sampled loop agrees with the balance too', () => {
    expect(standingError(1, 'continuous-ideal')).toBeLessThan(1e-6);
    // Sampled at the example's 10 Hz the equilibrium is the same (the body is at rest, so the held
    // torque is constant between samples).
    const sampled = standingError(0.5, 'sampled');
    expect(Math.abs(sampled - expected(0.5)) / expected(0.5)).toBeLessThan(1e-3);
  });

  it('refuses a fraction outside [0, 1], naming the field', () => {
    const s = loadExample('kestrel60-momentum');
    s.vehicle.wheelFriction.compensatedFraction = 1.5;
    const out = runPipeline(s);
    expect(out.ok).toBe(false);
    if (!out.ok) expect(out.errors.some((e) => e.path === 'vehicle.wheelFriction.compensatedFraction')).toBe(true);
  });
});

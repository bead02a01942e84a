/**
 * The Mayhew, Sanfelice & Teel 2011 setting as a scenario file for the sweep checks:
 * J = 10·diag(1, 2, 3)/√14 kg·m², u = −h·q_v − ω (k_p = k_d = 1), start at rest 180° from the
 * target about v = (1, 2, 3)/√14, no random noise (the worst-case noise ē comes from the sweep).
 * Source of the setting: Mayhew, Sanfelice & Teel, "Quaternion-based hybrid control for robust
 * global attitude tracking", IEEE TAC 56(11):2555–2566, 2011. The body is actuated by a triad of
 * tiny-rotor wheels with limits far above any torque or momentum reached (the test vehicle is
 * invented; closedloop-hysteretic.test.ts shows how close that is to the rigid body).
 */
const s14 = Math.sqrt(14);
export const MST_AXIS = [1 / s14, 2 / s14, 3 / s14];

export function mstScenario(opts: {
  controlRateHz: number;
  rk4StepsPerSample: number;
  durationS: number;
  hysteresis: number;
  noiseMode: 'reflect' | 'band-edge';
}) {
  return {
    format: 'slewsmith-scenario',
    version: 2,
    name: 'MST 2011 setting',
    description: 'Invented test vehicle with the inertia and gains of the published setting.',
    epochUtc: '2030-01-01T00:00:00Z',
    vehicle: {
      name: 'MST-test',
      inertiaKgm2: [
        [10 / s14, 0, 0],
        [0, 20 / s14, 0],
        [0, 0, 30 / s14],
      ],
      wheels: { layout: 'triad', maxTorqueMNm: 1e6, maxMomentumMNms: 1e6, rotorInertiaKgm2: 1e-9 },
      sensors: { attitudeNoiseArcsec: 0, rateNoiseDegPerS: 0, rateBiasDegPerS: [0, 0, 0], boundedNoiseMode: opts.noiseMode },
      controlRateHz: opts.controlRateHz,
      actuation: { mode: 'hold' },
    },
    initial: { attitude: { quaternion: [MST_AXIS[0], MST_AXIS[1], MST_AXIS[2], 0] }, bodyRateDegPerS: [0, 0, 0] },
    targets: [{ label: 'target', attitude: { quaternion: [0, 0, 0, 1] }, holdS: 0 }],
    controllers: [
      { id: 'sign', label: 'Sign switch', law: 'sign-switch', gains: { kp: 1, kd: 1 } },
      { id: 'hyst', label: 'Hysteretic', law: 'hysteretic', gains: { kp: 1, kd: 1 }, hysteresis: opts.hysteresis },
    ],
    planning: { torqueMargin: 0.9, momentumMargin: 0.9, slewRateLimitDegPerS: 50, profile: 'bang-coast-bang' },
    simulation: {
      mode: 'step-target',
      timing: 'sampled',
      settleAngleDeg: 1,
      settleRateDegPerS: 0.1,
      tailS: 0,
      seed: 1,
      rk4StepsPerSample: opts.rk4StepsPerSample,
    },
    study: { runs: 1, seed: 1, durationS: opts.durationS, stopAfterSettledForS: 5 },
  };
}

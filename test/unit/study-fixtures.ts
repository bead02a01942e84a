/** An invented test vehicle for the study tests (no real mission): a small body with a fast triad. */

/** kp = 2 J ω², kd = 2 ζ ω J with J ≈ 0.04 kg m², ω = 0.3 rad/s, ζ = 0.9 (small-angle model). */
const KP = 0.0072;
const KD = 0.0216;

/** The test vehicle's scenario with the given study block. */
export function testVehicleScenario(study: Record<string, unknown>): Record<string, unknown> {
  return {
    format: 'slewsmith-scenario',
    version: 2,
    name: 'Study test vehicle',
    description: 'Invented test vehicle for the robustness-study checks.',
    epochUtc: '2030-01-01T00:00:00Z',
    vehicle: {
      name: 'Test-6',
      inertiaKgm2: [
        [0.04, 0.0005, 0],
        [0.0005, 0.045, 0.0003],
        [0, 0.0003, 0.03],
      ],
      wheels: { layout: 'triad', maxTorqueMNm: 6, maxMomentumMNms: 20, rotorInertiaKgm2: 1e-5 },
      sensors: { attitudeNoiseArcsec: 10, rateNoiseDegPerS: 0.002, rateBiasDegPerS: [0, 0, 0] },
      controlRateHz: 10,
      actuation: { mode: 'hold' },
    },
    initial: { attitude: { quaternion: [0, 0, 0, 1] }, bodyRateDegPerS: [0, 0, 0] },
    targets: [{ label: 'target', attitude: { quaternion: [0, 0, 0, 1] }, holdS: 0 }],
    controllers: [
      { id: 'pd', label: 'PD', law: 'quaternion-pd', gains: { kp: KP, kd: KD } },
      { id: 'sign', label: 'Sign switch', law: 'sign-switch', gains: { kp: KP, kd: KD } },
      { id: 'hyst', label: 'Hysteretic', law: 'hysteretic', gains: { kp: KP, kd: KD }, hysteresis: 0.2 },
      {
        id: 'syn',
        label: 'Synergistic',
        law: 'synergistic',
        gains: { kp: KP, kd: KD },
        // The certified family of methods §4.3 scaled by c = 1/8: A = c·diag(1, 2, 3), k = 0.15/c, δ = 0.2c.
        potentialWeights: [0.125, 0.25, 0.375],
        warpGain: 1.2,
        gapThreshold: 0.025,
      },
    ],
    planning: { torqueMargin: 0.9, momentumMargin: 0.9, slewRateLimitDegPerS: 5, profile: 'bang-coast-bang' },
    simulation: {
      mode: 'step-target',
      timing: 'sampled',
      settleAngleDeg: 0.2,
      settleRateDegPerS: 0.05,
      tailS: 0,
      seed: 1,
      rk4StepsPerSample: 1,
    },
    study,
  };
}

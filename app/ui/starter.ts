/**
 * What File › New opens: a small valid scenario of our own (not the demo), named "New scenario",
 * to edit from — one generic invented vehicle (a 6U-class bus, inertia of the order of a 6U
 * CubeSat's, a four-wheel pyramid with small wheels), one target 45° away about +Z, one smooth
 * controller, and the usual planning and simulation settings. Every value is an invented round
 * number; none describes a real spacecraft.
 */
import { SCENARIO_FORMAT, SCENARIO_VERSION } from '../engine/scenario/schema';

export const STARTER_NAME = 'New scenario';
export const STARTER_FILE_NAME = 'new-scenario.scenario.json';

export function starterScenario(): Record<string, unknown> {
  return {
    format: SCENARIO_FORMAT,
    version: SCENARIO_VERSION,
    name: STARTER_NAME,
    description: 'A new scenario: one generic vehicle, one target, one controller. Edit it from here.',
    epochUtc: '2030-01-01T00:00:00Z',
    vehicle: {
      name: 'Generic bus',
      inertiaKgm2: [
        [0.09, 0, 0],
        [0, 0.1, 0],
        [0, 0, 0.06],
      ],
      wheels: {
        layout: 'pyramid',
        count: 4,
        cantAngleDeg: 54.7356103172,
        azimuthOffsetDeg: 45,
        maxTorqueMNm: 1,
        maxMomentumMNms: 4,
        rotorInertiaKgm2: 5e-6,
      },
      sensors: { attitudeNoiseArcsec: 10, rateNoiseDegPerS: 0.01, rateBiasDegPerS: [0, 0, 0] },
      controlRateHz: 10,
      actuation: { mode: 'hold' },
    },
    initial: { attitude: { quaternion: [0, 0, 0, 1] }, bodyRateDegPerS: [0, 0, 0] },
    targets: [{ label: 'Target 1', attitude: { relative: { axis: [0, 0, 1], angleDeg: 45 } }, holdS: 30 }],
    controllers: [{ id: 'pd', label: 'Quaternion PD', law: 'quaternion-pd', gains: { bandwidthRadPerS: 0.2, dampingRatio: 0.9 } }],
    planning: { torqueMargin: 0.8, momentumMargin: 0.8, slewRateLimitDegPerS: 2, profile: 'bang-coast-bang' },
    simulation: {
      mode: 'both',
      timing: 'sampled',
      settleAngleDeg: 0.1,
      settleRateDegPerS: 0.02,
      tailS: 30,
      seed: 1,
      rk4StepsPerSample: 1,
    },
  };
}

/**
 * The study's share of cases that violate an attitude constraint (study/summary.ts), with its 95 %
 * interval: Wilson score interval (E. B. Wilson, J. Am. Stat. Assoc. 22(158):209–212, 1927)
 * written out here from the published formula, and the rule of three at k = 0 (Hanley &
 * Lippman-Hand, JAMA 249(13), 1983).
 */
import { describe, expect, it } from 'vitest';
import { summarizeStudy, type StudyInfo } from '../../app/engine/study/summary';
import { TRACE_SAMPLES, type CaseRecord, type CaseRun } from '../../app/engine/study/runCase';
import type { StudyDefinition } from '../../app/engine/scenario/study';

const def: StudyDefinition = {
  runs: 8,
  seed: 1,
  controllers: null,
  durationS: 100,
  mode: 'follow-plan',
  stopAfterSettledForS: 0,
  worstCases: 3,
  attitude: { mode: 'uniform' },
  rateSigmaRadPerS: 0,
  inertia: { momentSigmaFraction: 0, axisMisalignmentSigmaRad: 0 },
  wheels: { torqueDegradationMax: 0, momentumDegradationMax: 0, failOneWheelProbability: 0 },
  sensors: { attitudeNoiseScale: [1, 1], rateBiasSigmaRadPerS: 0, adversarialEta: 0 },
  controlRateHz: null,
  actuation: null,
  torqueQuantumNm: null,
};
const info: StudyInfo = { scenarioName: 'hand-made', def, controllers: [{ id: 'a', label: 'A', law: 'quaternion-pd' }] };

function rec(index: number, over: Partial<CaseRun>): CaseRecord {
  const run: CaseRun = {
    controllerId: 'a',
    status: 'settled',
    reason: '',
    settleTimeS: 10,
    rotationTravelledDeg: 90,
    shortestRotationDeg: 90,
    extraRotationDeg: 0,
    unwound: false,
    longWay: false,
    jumps: 0,
    chatterPerS: 0,
    chattered: false,
    peakWheelTorqueFraction: 0.5,
    peakWheelMomentumFraction: 0.3,
    finalErrorDeg: 0.01,
    finalEta: 1,
    endS: 20,
    errorTraceDeg: new Float32Array(TRACE_SAMPLES),
    traceCount: 0,
    ...over,
  };
  return {
    draw: {
      index,
      q0: [0, 0, 0, 1],
      omega0RadPerS: [0, 0, 0],
      inertiaRows: [
        [1, 0, 0],
        [0, 1, 0],
        [0, 0, 1],
      ],
      inertiaRejections: 0,
      wheelTorqueFactor: [1],
      wheelMomentumFactor: [1],
      failedWheel: -1,
      attitudeNoiseRad: 0,
      rateBiasRadPerS: [0, 0, 0],
      adversarialEta: 0,
      controlRateHz: 10,
      actuation: 'hold',
      noiseSeed: 7,
      errorAxis: [0, 0, 1],
      errorAngleRad: 0.1,
      errorEta: 1,
    },
    runs: [run],
  };
}

describe('study: share of cases that violate a constraint', () => {
  it('3 of 8 flyable cases violate: share 0.375 with the Wilson 95 % interval; the unflyable case is left out', () => {
    const records = [
      ...[0, 1, 2].map((i) => rec(i, { constraintViolated: true, constraintMarginDeg: -2 })),
      ...[3, 4, 5, 6, 7].map((i) => rec(i, { constraintViolated: false, constraintMarginDeg: 3 })),
      rec(8, { status: 'unflyable', settleTimeS: null }),
    ];
    const c = summarizeStudy(info, records).controllers[0]!;
    expect(c.constraintViolated).toBe(3);
    const k = 3,
      n = 8,
      z = 1.959963984540054; // two-sided 95 % normal quantile
    const centre = (k + (z * z) / 2) / (n + z * z);
    const half = (z / (n + z * z)) * Math.sqrt((k * (n - k)) / n + (z * z) / 4);
    expect(c.constraintViolatedShare!.share).toBe(0.375);
    expect(c.constraintViolatedShare!.low).toBeCloseTo(centre - half, 12);
    expect(c.constraintViolatedShare!.high).toBeCloseTo(centre + half, 12);
    // The same formula evaluated separately (Python, double precision): centre 0.41555, half 0.27871 → [0.13684, 0.69426].
    expect(c.constraintViolatedShare!.low).toBeCloseTo(0.1368, 3);
    expect(c.constraintViolatedShare!.high).toBeCloseTo(0.6943, 3);
  });

  it('none violates: the rule of three, [0, 3/n]; no constraints declared: no share at all', () => {
    const clear = summarizeStudy(
      info,
      [0, 1, 2, 3].map((i) => rec(i, { constraintViolated: false })),
    ).controllers[0]!;
    expect(clear.constraintViolatedShare).toEqual({ share: 0, low: 0, high: 0.75, method: 'rule-of-three' });
    const none = summarizeStudy(
      info,
      [0, 1].map((i) => rec(i, {})),
    ).controllers[0]!;
    expect(none.constraintViolatedShare).toBeUndefined();
  });
});

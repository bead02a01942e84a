/**
 * The scenario file's "study" block: structure (zod schema), cross-field rules with their paths,
 * all problems reported together, defaults, and the JSON Schema entry. Rules are our own format's
 * (no outside source); the unit conversions are exact definitions (1° = π/180 rad).
 */
import { describe, expect, it } from 'vitest';
import { loadScenario } from '../../app/engine/scenario/load';
import { validateScenario } from '../../app/engine/scenario/validate';
import { scenarioJsonSchema } from '../../app/engine/scenario/schema';
import { effectiveStudyJson } from '../../app/engine/study/context';
import { testVehicleScenario } from './study-fixtures';
import { loadExample } from './scenario-fixtures';

const errorsOf = (json: unknown) => {
  const r = loadScenario(json);
  return r.ok ? [] : r.errors.map((e) => `${e.path}|${e.rule}`);
};

describe('study block: structure', () => {
  it('a full block resolves to SI with every field', () => {
    const r = loadScenario(
      testVehicleScenario({
        runs: 10,
        seed: 3,
        controllers: ['pd', 'syn'],
        durationS: 120,
        mode: 'follow-plan',
        stopAfterSettledForS: 0,
        worstCases: 3,
        dispersions: {
          initialAttitude: { mode: 'cone', maxAngleDeg: 30 },
          initialRateDegPerS: 0.1,
          inertia: { momentSigmaFraction: 0.05, axisMisalignmentDeg: 2 },
          wheels: { torqueDegradationMax: 0.1, momentumDegradationMax: 0.2, failOneWheelProbability: 0.3 },
          sensors: { attitudeNoiseScale: [0.5, 2], rateBiasDegPerS: 0.001, adversarialEta: 0.05 },
          controlRateHz: [5, 10],
          actuation: ['hold', 'quantized'],
          torqueQuantumMNm: 0.01,
        },
      }),
    );
    if (!r.ok) throw new Error(JSON.stringify(r.errors));
    const d = r.value.study!;
    expect(d.runs).toBe(10);
    expect(d.controllers).toEqual(['pd', 'syn']);
    expect(d.mode).toBe('follow-plan');
    expect(d.stopAfterSettledForS).toBe(0);
    expect(d.attitude).toEqual({ mode: 'cone', maxAngleRad: (30 * Math.PI) / 180 });
    expect(d.rateSigmaRadPerS).toBeCloseTo((0.1 * Math.PI) / 180, 15);
    expect(d.inertia.axisMisalignmentSigmaRad).toBeCloseTo((2 * Math.PI) / 180, 15);
    expect(d.wheels).toEqual({ torqueDegradationMax: 0.1, momentumDegradationMax: 0.2, failOneWheelProbability: 0.3 });
    expect(d.sensors.attitudeNoiseScale).toEqual([0.5, 2]);
    expect(d.torqueQuantumNm).toBeCloseTo(1e-5, 18);
    // A triad that loses a wheel cannot fly: warned up front.
    expect(r.warnings.map((w) => w.rule)).toContain('unflyable');
  });

  it('defaults: 600 s, direct, 20 s early stop, 5 worst cases, nothing dispersed', () => {
    const r = loadScenario(testVehicleScenario({ runs: 5, seed: 1 }));
    if (!r.ok) throw new Error('refused');
    const d = r.value.study!;
    expect([d.durationS, d.mode, d.stopAfterSettledForS, d.worstCases]).toEqual([600, 'step-target', 20, 5]);
    expect(d.attitude).toEqual({ mode: 'nominal' });
    expect(d.controllers).toBeNull();
    expect(d.sensors).toEqual({ attitudeNoiseScale: [1, 1], rateBiasSigmaRadPerS: 0, adversarialEta: 0 });
  });

  it('a file without a block has study = null; the study command supplies a default block and overrides', () => {
    const s = testVehicleScenario({ runs: 1, seed: 1 });
    delete s.study;
    const r = loadScenario(s);
    expect(r.ok && r.value.study).toBeNull();
    const eff = effectiveStudyJson(s, { runs: 12, controllers: ['pd'] });
    expect(eff.defaulted).toBe(true);
    expect((eff.json as any).study).toEqual({ runs: 12, seed: 1, controllers: ['pd'] });
    expect(s.study).toBeUndefined(); // the caller's object is not changed
  });

  it('structural problems are all reported together, each with its path', () => {
    const errs = errorsOf(
      testVehicleScenario({
        runs: 0,
        seed: 1.5,
        durationS: -1,
        mode: 'sideways',
        extra: 1,
        dispersions: {
          initialAttitude: { mode: 'cone' },
          inertia: { momentSigmaFraction: 0.9 },
          wheels: { failOneWheelProbability: 2 },
          sensors: { attitudeNoiseScale: [1] },
          actuation: ['coast'],
        },
      }),
    );
    const paths = errs.map((e) => e.split('|')[0]);
    for (const p of [
      'study.runs',
      'study.seed',
      'study.durationS',
      'study.mode',
      'study.dispersions.initialAttitude.maxAngleDeg',
      'study.dispersions.inertia.momentSigmaFraction',
      'study.dispersions.wheels.failOneWheelProbability',
      'study.dispersions.sensors.attitudeNoiseScale',
      'study.dispersions.actuation[0]',
    ])
      expect(paths).toContain(p);
    expect(errs.some((e) => e.startsWith('study') && e.includes('extra'))).toBe(true);
  });

  it('cross-field rules: unknown or repeated controller ids, min > max, quantized without a quantum', () => {
    const errs = errorsOf(
      testVehicleScenario({
        runs: 3,
        seed: 1,
        controllers: ['pd', 'ghost', 'pd'],
        dispersions: { sensors: { attitudeNoiseScale: [3, 1] }, actuation: ['quantized'] },
      }),
    );
    expect(errs.sort()).toEqual([
      'study.controllers[1]|unknown-id',
      'study.controllers[2]|unique',
      'study.dispersions.sensors.attitudeNoiseScale|min-max',
      'study.dispersions.torqueQuantumMNm|required-for-mode',
    ]);
  });

  it('the example tern12-reversal carries a valid study block', () => {
    const r = validateScenario(loadExample('tern12-reversal'));
    expect(r.ok).toBe(true);
    const l = loadScenario(loadExample('tern12-reversal'));
    expect(l.ok && l.value.study?.attitude.mode).toBe('near-reversal');
  });

  it('the JSON Schema lists the study block as optional with its dispersions', () => {
    const s = scenarioJsonSchema() as any;
    expect(s.required).not.toContain('study');
    const st = s.properties.study;
    expect(st.required.sort()).toEqual(['runs', 'seed']);
    expect(Object.keys(st.properties.dispersions.properties).sort()).toEqual(
      ['actuation', 'controlRateHz', 'inertia', 'initialAttitude', 'initialRateDegPerS', 'sensors', 'torqueQuantumMNm', 'wheels'].sort(),
    );
  });
});

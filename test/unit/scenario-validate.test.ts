/**
 * validateScenario on the example files and on mutated copies: each problem is reported with its
 * JSON path and rule, and several problems come back together. The expected paths and rules are
 * this format's own definition (schema.ts); no outside source.
 */
import { describe, expect, it } from 'vitest';
import { validateScenario } from '../../app/engine/scenario/validate';
import { loadScenario } from '../../app/engine/scenario/load';
import { EXAMPLE_FILES, loadExample } from './scenario-fixtures';
import type { Issue } from '../../app/engine/errors';
import { preparePipeline } from '../../app/engine/pipeline/run';

function errorsOf(json: unknown): Issue[] {
  const r = validateScenario(json);
  if (r.ok) throw new Error('expected validation to fail');
  return r.errors;
}

function pairs(list: Issue[]): string[] {
  return list.map((i) => `${i.path} ${i.rule}`).sort();
}

describe('example scenarios', () => {
  for (const name of EXAMPLE_FILES) {
    it(`${name} validates and resolves without errors or warnings`, () => {
      const r = loadScenario(loadExample(name));
      if (!r.ok) throw new Error(JSON.stringify(r.errors, null, 1));
      // The invented element epochs of the examples on an orbit lie past the leap-second table's
      // validity (2026-06-28), as their scenario epochs do: that notice, at the element epoch's field, is the only one.
      expect(r.warnings.filter((w) => !(w.rule === 'leap-table-expired' && w.path === 'orbit.meanElements.epochUtc'))).toEqual([]);
      expect(r.value.targets.length).toBeGreaterThan(0);
    });
  }
});

describe('orbit stage warnings', () => {
  it("the pipeline's element-epoch notice names the file's key (epochUtc), not the orbit library's input name", () => {
    const p = preparePipeline(loadExample('tern12-reversal'));
    if (!p.ok) throw new Error(JSON.stringify(p.errors, null, 1));
    const epoch = p.warnings.filter((w) => w.rule === 'leap-table-expired');
    expect(epoch.length).toBeGreaterThan(0);
    for (const w of epoch) {
      expect(w.path).toBe('orbit.meanElements.epochUtc');
      expect(w.message).not.toContain('epochUtcIso');
    }
  });
});

describe('format and version gate', () => {
  it('a newer version is refused with a clear message and nothing else', () => {
    const s = loadExample('lumen6-imaging');
    s.version = 7;
    s.targets = 'garbage';
    const e = errorsOf(s);
    expect(e).toHaveLength(1);
    expect(e[0]!.path).toBe('version');
    expect(e[0]!.rule).toBe('version-newer');
    expect(e[0]!.message).toContain('version 7 is newer than this Slewsmith reads (2)');
  });
  it('version 0, 1.5 and "1" are not versions', () => {
    for (const v of [0, 1.5, '1', null]) {
      const s = loadExample('tern12-reversal');
      s.version = v;
      expect(pairs(errorsOf(s))).toEqual(['version version']);
    }
  });
  it('missing version', () => {
    const s = loadExample('tern12-reversal');
    delete s.version;
    expect(pairs(errorsOf(s))).toEqual(['version required']);
  });
  it('missing or wrong format says this is not a scenario file', () => {
    const a = loadExample('tern12-reversal');
    delete a.format;
    const ea = errorsOf(a);
    expect(pairs(ea)).toEqual(['format format']);
    expect(ea[0]!.message).toMatch(/not a Slewsmith scenario file.*missing/);
    const b = loadExample('tern12-reversal');
    b.format = 'slewsmith-run';
    expect(errorsOf(b)[0]!.message).toContain('"slewsmith-run"');
  });
  it('non-objects are rejected at the root', () => {
    for (const v of [null, 3, 'x', [], undefined]) expect(pairs(errorsOf(v))).toEqual([' type']);
  });
});

describe('attitude entries', () => {
  it('zero quaternion: its own rule and message', () => {
    const s = loadExample('lumen6-imaging');
    s.targets[2].attitude.quaternion = [0, 0, 0, 0];
    const e = errorsOf(s);
    expect(pairs(e)).toEqual(['targets[2].attitude.quaternion non-zero']);
    expect(e[0]!.message).toContain('zero quaternion');
  });
  it('a quaternion more than 1e-6 from unit norm is rejected; within it is normalised with a warning', () => {
    const s = loadExample('lumen6-imaging');
    s.targets[2].attitude.quaternion = [0, 0, 0, 1 + 2e-6];
    expect(pairs(errorsOf(s))).toEqual(['targets[2].attitude.quaternion unit-norm']);
    s.targets[2].attitude.quaternion = [0, 0, 0, 0.5];
    expect(pairs(errorsOf(s))).toEqual(['targets[2].attitude.quaternion unit-norm']);
    s.targets[2].attitude.quaternion = [0, 0, 0.7071068, 0.7071068];
    const r = loadScenario(s);
    expect(r.ok).toBe(true);
    expect(pairs(r.warnings)).toEqual(['targets[2].attitude.quaternion normalised']);
    if (r.ok) expect(Math.hypot(...r.value.targets[2]!.qInertialFromBody)).toBeCloseTo(1, 15);
  });
  it('bad Euler sequence names the sequence field', () => {
    const s = loadExample('lumen6-imaging');
    s.targets[0].attitude.euler.sequence = 'ZZY';
    const e = errorsOf(s);
    expect(pairs(e)).toEqual(['targets[0].attitude.euler.sequence one-of']);
    expect(e[0]!.message).toContain('"ZYX"');
  });
  it('lower-case Euler sequence is not accepted either', () => {
    const s = loadExample('tern12-reversal');
    s.initial.attitude.euler.sequence = 'zyx';
    expect(pairs(errorsOf(s))).toEqual(['initial.attitude.euler.sequence one-of']);
  });
  it('parallel pointing vectors name the secondary field', () => {
    const s = loadExample('lumen6-imaging');
    s.targets[3].attitude.pointing.bodySecondary = [-2, 0, 0]; // antiparallel to bodyAxis +X
    s.initial.attitude.pointing.inertialSecondary = [0.9922 * 3, -0.1148 * 3, -0.0488 * 3];
    const e = errorsOf(s);
    expect(pairs(e)).toEqual([
      'initial.attitude.pointing.inertialSecondary not-parallel',
      'targets[3].attitude.pointing.bodySecondary not-parallel',
    ]);
    expect(e.find((i) => i.path.startsWith('targets'))!.message).toContain('bodyAxis');
  });
  it('zero pointing vector', () => {
    const s = loadExample('kestrel60-momentum');
    s.targets[0].attitude.pointing.inertialDirection = [0, 0, 0];
    expect(pairs(errorsOf(s))).toEqual(['targets[0].attitude.pointing.inertialDirection non-zero']);
  });
  it('relative initial attitude has nothing to be relative to', () => {
    const s = loadExample('tern12-reversal');
    s.initial.attitude = { relative: { axis: [0, 0, 1], angleDeg: 10 } };
    expect(pairs(errorsOf(s))).toEqual(['initial.attitude.relative no-previous']);
  });
  it('relative with a zero axis', () => {
    const s = loadExample('tern12-reversal');
    s.targets[0].attitude.relative.axis = [0, 0, 0];
    expect(pairs(errorsOf(s))).toEqual(['targets[0].attitude.relative.axis non-zero']);
  });
  it('an attitude with no form, or an unknown form', () => {
    const s = loadExample('tern12-reversal');
    s.targets[0].attitude = {};
    expect(pairs(errorsOf(s))).toEqual(['targets[0].attitude one-form']);
    s.targets[0].attitude = { axisAngle: [1, 0, 0, 1] };
    expect(pairs(errorsOf(s))).toEqual(['targets[0].attitude one-form']);
  });
  it('a relative target after a broken one is not reported twice', () => {
    const s = loadExample('lumen6-imaging');
    s.targets[0].attitude.euler.anglesDeg = [1, 2];
    expect(pairs(errorsOf(s))).toEqual(['targets[0].attitude.euler.anglesDeg length']);
  });
});

describe('vehicle, controllers and the rest', () => {
  it('negative and zero limits', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.wheels.maxTorqueMNm = -2;
    s.vehicle.wheels.maxMomentumMNms = 0;
    s.planning.slewRateLimitDegPerS = -1;
    s.targets[1].holdS = -5;
    s.vehicle.sensors.attitudeNoiseArcsec = -1;
    expect(pairs(errorsOf(s))).toEqual([
      'planning.slewRateLimitDegPerS positive',
      'targets[1].holdS non-negative',
      'vehicle.sensors.attitudeNoiseArcsec non-negative',
      'vehicle.wheels.maxMomentumMNms positive',
      'vehicle.wheels.maxTorqueMNm positive',
    ]);
  });
  it('duplicate controller ids', () => {
    const s = loadExample('tern12-reversal');
    s.controllers[3].id = 'pd';
    delete s.study;
    const e = errorsOf(s);
    expect(pairs(e)).toEqual(['controllers[3].id unique']);
    expect(e[0]!.message).toContain('controllers[0]');
  });
  it('wheel-momentum count must equal the wheel count', () => {
    const s = loadExample('lumen6-imaging');
    s.initial.wheelMomentumMNms = [0, 0, 0];
    const e = errorsOf(s);
    expect(pairs(e)).toEqual(['initial.wheelMomentumMNms count']);
    expect(e[0]!.message).toContain('4 wheels');
    const k = loadExample('kestrel60-momentum');
    k.vehicle.wheels.wheels.pop();
    expect(pairs(errorsOf(k))).toEqual(['initial.wheelMomentumMNms count']);
  });
  it('initial wheel momentum beyond a wheel limit', () => {
    const s = loadExample('kestrel60-momentum');
    s.initial.wheelMomentumMNms[2] = -251;
    expect(pairs(errorsOf(s))).toEqual(['initial.wheelMomentumMNms[2] within-limit']);
  });
  it('inertia entries: wrong type and wrong shape keep their indices', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.inertiaKgm2[1][2] = '0.0005';
    s.vehicle.inertiaKgm2[2] = [1, 2];
    expect(pairs(errorsOf(s))).toEqual(['vehicle.inertiaKgm2[1][2] type', 'vehicle.inertiaKgm2[2] length']);
  });
  it('NaN and Infinity from code are not finite numbers', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.inertiaKgm2[0][0] = Number.NaN;
    s.initial.bodyRateDegPerS[1] = Number.POSITIVE_INFINITY;
    expect(pairs(errorsOf(s))).toEqual(['initial.bodyRateDegPerS[1] finite', 'vehicle.inertiaKgm2[0][0] finite']);
  });
  it('unknown keys are named (typos do not pass silently)', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.controlRate = 10;
    s.planning.torqueMarginn = 0.5;
    expect(pairs(errorsOf(s))).toEqual(['planning.torqueMarginn unknown-key', 'vehicle.controlRate unknown-key']);
  });
  it('quantized actuation needs its quantum; a quantum elsewhere is a warning', () => {
    const s = loadExample('kestrel60-momentum');
    delete s.vehicle.actuation.torqueQuantumMNm;
    expect(pairs(errorsOf(s))).toEqual(['vehicle.actuation.torqueQuantumMNm required-for-mode']);
    const t = loadExample('tern12-reversal');
    t.vehicle.actuation.torqueQuantumMNm = 0.1;
    const r = validateScenario(t);
    expect(r.ok).toBe(true);
    // (tern12's invented element epoch also draws the leap-table notice: not this test's subject)
    expect(pairs(r.warnings.filter((w) => w.rule !== 'leap-table-expired'))).toEqual(['vehicle.actuation.torqueQuantumMNm ignored']);
  });
  it('synergistic: repeated weights, non-orthonormal axes, zero warp direction', () => {
    const s = loadExample('tern12-reversal');
    const syn = s.controllers[4];
    syn.potentialWeights = [0.25, 0.25, 0.375];
    syn.potentialAxes[1] = [0.1, 1, 0];
    syn.warpDirections[2] = [0, 0, 0];
    expect(pairs(errorsOf(s))).toEqual([
      'controllers[4].potentialAxes orthonormal',
      'controllers[4].potentialWeights distinct',
      'controllers[4].warpDirections[2] non-zero',
    ]);
  });
  it('law-specific fields and gain forms', () => {
    const s = loadExample('tern12-reversal');
    delete s.controllers[2].maxRateDegPerS;
    s.controllers[3].hysteresis = 1.2;
    s.controllers[0].gains = { kp: 0.01 };
    s.controllers[1].gains = { kd: 1, dampingRatio: 0.9 };
    s.controllers[4].law = 'synergy';
    expect(pairs(errorsOf(s))).toEqual([
      'controllers[0].gains.kd required',
      'controllers[1].gains one-form',
      'controllers[2].maxRateDegPerS required',
      'controllers[3].hysteresis max',
      'controllers[4].law one-of',
    ]);
  });
  it('wheel layout discriminator and the pyramid count', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.wheels.count = 6;
    expect(pairs(errorsOf(s))).toEqual(['vehicle.wheels.count value']);
    s.vehicle.wheels.layout = 'skewed';
    expect(pairs(errorsOf(s))).toEqual(['vehicle.wheels.layout one-of']);
  });
  it('a custom wheel with a zero axis', () => {
    const s = loadExample('kestrel60-momentum');
    s.vehicle.wheels.wheels[3].axis = [0, 0, 0];
    expect(pairs(errorsOf(s))).toEqual(['vehicle.wheels.wheels[3].axis non-zero']);
  });
  it('epochs: form and calendar', () => {
    const s = loadExample('lumen6-imaging');
    s.epochUtc = '2030-02-30T10:00:00Z';
    expect(pairs(errorsOf(s))).toEqual(['epochUtc calendar']);
    s.epochUtc = '2030-03-14 10:00:00';
    expect(pairs(errorsOf(s))).toEqual(['epochUtc format']);
  });
  it('no targets, no controllers', () => {
    const s = loadExample('lumen6-imaging');
    s.targets = [];
    s.controllers = [];
    expect(pairs(errorsOf(s))).toEqual(['controllers min-items', 'targets min-items']);
  });
  it('several errors at once are all reported, across structure and cross-field rules', () => {
    const s = loadExample('lumen6-imaging');
    s.vehicle.wheels.maxTorqueMNm = -1; // range (zod)
    s.targets[2].attitude.quaternion = [0, 0, 0, 0]; // cross-field: norm
    s.targets[0].attitude.euler.sequence = 'ABC'; // enum
    s.initial.wheelMomentumMNms = [1, 2]; // count
    s.controllers[2].id = 'pd'; // unique
    s.controllers[1].hysteresis = 0; // range
    delete s.simulation.seed; // required
    s.keepOut[0].inertialDirection = [0, 0, 0]; // cross-field: zero vector
    const e = errorsOf(s);
    expect(pairs(e)).toEqual([
      'controllers[1].hysteresis positive',
      'controllers[2].id unique',
      'initial.wheelMomentumMNms count',
      'keepOut[0].inertialDirection non-zero',
      'simulation.seed required',
      'targets[0].attitude.euler.sequence one-of',
      'targets[2].attitude.quaternion non-zero',
      'vehicle.wheels.maxTorqueMNm positive',
    ]);
    for (const i of e) expect(i.message).toContain(i.path);
  });
  it('a bandwidth near the control rate is a warning', () => {
    const s = loadExample('lumen6-imaging');
    s.controllers[0].gains.bandwidthRadPerS = 8;
    const r = validateScenario(s);
    expect(r.ok).toBe(true);
    expect(pairs(r.warnings)).toEqual(['controllers[0].gains.bandwidthRadPerS sample-rate']);
  });
});

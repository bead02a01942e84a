/**
 * The scenario file's edges: migration of version 1 files, and toScenarioFile, the inverse of
 * resolve (reference: the project's own resolve stage — resolve(validate(toScenarioFile(r))) = r
 * up to the round-off of unit conversions, checked field by field).
 */
import { describe, expect, it } from 'vitest';
import { migrateScenario } from '../../app/engine/scenario/migrate';
import { validateScenario } from '../../app/engine/scenario/validate';
import { resolveScenario, type ResolvedScenario } from '../../app/engine/scenario/resolve';
import { toScenarioFile } from '../../app/engine/scenario/toFile';
import { EXAMPLE_FILES, loadExample } from './scenario-fixtures';

function resolved(json: unknown): ResolvedScenario {
  const v = validateScenario(json);
  if (!v.ok) throw new Error(JSON.stringify(v.errors));
  return resolveScenario(v.value);
}

/** Largest relative difference between two nested structures of numbers (typed arrays included). */
function worstDifference(a: unknown, b: unknown, path = ''): { d: number; at: string } {
  if (typeof a === 'number' && typeof b === 'number') {
    const d = Math.abs(a - b) / Math.max(1, Math.abs(a), Math.abs(b));
    return { d, at: path };
  }
  if (ArrayBuffer.isView(a) || Array.isArray(a)) {
    const x = Array.from(a as ArrayLike<unknown>);
    const y = Array.from(b as ArrayLike<unknown>);
    expect(y.length, path).toBe(x.length);
    return x.reduce<{ d: number; at: string }>(
      (w, v, i) => {
        const r = worstDifference(v, y[i], `${path}[${i}]`);
        return r.d > w.d ? r : w;
      },
      { d: 0, at: path },
    );
  }
  if (a && typeof a === 'object') {
    // How the file described the attitudes and the wheel array changes by design (quaternions, one entry per wheel).
    const keys = Object.keys(a as object).filter((k) => !['name', 'description', 'wheelLayout', 'form'].includes(k));
    return keys.reduce<{ d: number; at: string }>(
      (w, k) => {
        const r = worstDifference((a as Record<string, unknown>)[k], (b as Record<string, unknown>)[k], `${path}.${k}`);
        return r.d > w.d ? r : w;
      },
      { d: 0, at: path },
    );
  }
  expect(b, path).toEqual(a);
  return { d: 0, at: path };
}

describe('version 1 files', () => {
  it('are migrated: the synergistic jump threshold and the mode names, each change reported', () => {
    const v2 = loadExample('tern12-reversal');
    const v1 = JSON.parse(JSON.stringify(v2));
    v1.version = 1;
    v1.controllers[4].hysteresis = v1.controllers[4].gapThreshold;
    delete v1.controllers[4].gapThreshold;
    v1.study.mode = 'direct';
    v1.simulation.mode = 'profiled';
    const m = migrateScenario(v1);
    expect(m.notes.map((n) => n.path)).toEqual(['version', 'controllers[4].gapThreshold', 'simulation.mode', 'study.mode']);
    const doc = m.json as typeof v2;
    expect(doc.controllers[4].gapThreshold).toBe(0.025);
    expect('hysteresis' in doc.controllers[4]).toBe(false);
    expect(doc.controllers[3].hysteresis).toBe(0.2); // the hysteretic law's own δ is untouched
    expect(doc.simulation.mode).toBe('follow-plan');
    expect(doc.study.mode).toBe('step-target');
    expect(v1.version).toBe(1); // the input is not modified
    const r = validateScenario(v1);
    expect(r.ok).toBe(true);
    expect(r.warnings.filter((w) => w.rule === 'migrated')).toHaveLength(4);
  });

  it('leave current files, other formats and newer versions alone', () => {
    const v2 = loadExample('lumen6-imaging');
    expect(migrateScenario(v2).json).toBe(v2);
    expect(migrateScenario({ format: 'other', version: 1 }).notes).toEqual([]);
    expect(migrateScenario({ ...v2, version: 9 }).notes).toEqual([]);
  });
});

describe('toScenarioFile, the inverse of resolve', () => {
  for (const name of EXAMPLE_FILES) {
    it(`${name}: written back and resolved again gives the same SI scenario (within 1e-12)`, () => {
      const r = resolved(loadExample(name));
      const file = toScenarioFile(r);
      expect(file.vehicle.wheels.layout).toBe('custom');
      const again = resolved(file);
      const w = worstDifference(r, again);
      expect(w.d, w.at).toBeLessThan(1e-12);
    });
  }

  it('keeps a model inertia, bounded noise, an early end and a fixed duration', () => {
    const json = loadExample('tern12-reversal');
    json.vehicle.modelInertiaKgm2 = [
      [0.25, 0, 0],
      [0, 0.28, 0],
      [0, 0, 0.2],
    ];
    json.vehicle.sensors.boundedNoiseEta = 0.05;
    json.simulation.endWhenSettledForS = 20;
    json.simulation.durationS = 300;
    const r = resolved(json);
    expect(r.vehicle.modelInertiaKgm2).not.toBeNull();
    const back = toScenarioFile(r);
    expect(back.vehicle.modelInertiaKgm2).toEqual(json.vehicle.modelInertiaKgm2);
    expect(back.vehicle.sensors.boundedNoiseEta).toBe(0.05);
    expect(back.simulation.endWhenSettledForS).toBe(20);
    expect(back.simulation.durationS).toBe(300);
  });
});

/**
 * Study-block editing (app/ui/study/StudyFields.tsx): edits are document edits (undo, dirty,
 * validated by the engine's scenario validator); an emptied optional field removes its key and a
 * dispersion group left empty is removed with it, so the saved file holds only what is dispersed;
 * consecutive edits of one field fold into one undo step; number lists parse or keep the raw text
 * for the validator to name (hand-worked examples).
 */
import { describe, expect, it } from 'vitest';
import { createAppStore } from '../../app/ui/store/document';
import { preflight } from '../../app/ui/preflight';
import { editStudy, parseNumberList, pruneEmpty } from '../../app/ui/study/StudyFields';
import { testVehicleScenario } from './study-fixtures';

type Obj = Record<string, any>;

function setup(study: Obj) {
  let now = 0;
  const json = testVehicleScenario(study);
  const store = createAppStore(json, { validate: preflight, now: () => now });
  store.load(json, 'x.json', false);
  return { store, tick: (ms: number) => (now += ms), study: () => (store.getState().scenario as Obj).study as Obj };
}

describe('study block edits', () => {
  it('removes emptied fields and empty dispersion groups; undo restores', () => {
    const t = setup({ runs: 10, seed: 3, dispersions: { inertia: { momentSigmaFraction: 0.05 } } });
    editStudy(t.store, 'study.dispersions.wheels.torqueDegradationMax', 0.2);
    expect(t.study().dispersions).toEqual({ inertia: { momentSigmaFraction: 0.05 }, wheels: { torqueDegradationMax: 0.2 } });
    t.tick(5000);
    editStudy(t.store, 'study.dispersions.inertia.momentSigmaFraction', undefined);
    expect(t.study().dispersions).toEqual({ wheels: { torqueDegradationMax: 0.2 } });
    t.tick(5000);
    editStudy(t.store, 'study.dispersions.wheels.torqueDegradationMax', undefined);
    expect(t.study()).toEqual({ runs: 10, seed: 3 });
    expect(t.store.getState().validation.ok).toBe(true);
    expect(t.store.getState().dirty).toBe(true);
    t.store.undo();
    t.store.undo();
    t.store.undo();
    expect(t.study()).toEqual({ runs: 10, seed: 3, dispersions: { inertia: { momentSigmaFraction: 0.05 } } });
    expect(t.store.getState().dirty).toBe(false);
  });

  it('folds a burst of edits to one field into one undo step, and the validator names a bad value by path', () => {
    const t = setup({ runs: 10, seed: 3 });
    for (const v of [0, 0.0, 0.5]) {
      editStudy(t.store, 'study.dispersions.sensors.adversarialEta', v);
      t.tick(100);
    }
    expect(t.store.getState().undoStack.length).toBe(1);
    editStudy(t.store, 'study.dispersions.sensors.adversarialEta', 1.5);
    const issue = t.store.getState().validation.errors.find((e) => e.path === 'study.dispersions.sensors.adversarialEta');
    expect(issue).toBeDefined();
    editStudy(t.store, 'study.dispersions.controlRateHz', parseNumberList('5, x'));
    expect(t.store.getState().validation.errors.some((e) => e.path.startsWith('study.dispersions.controlRateHz'))).toBe(true);
  });

  it('parses number lists and prunes empty objects (hand-worked)', () => {
    expect(parseNumberList('5, 10')).toEqual([5, 10]);
    expect(parseNumberList(' 2 ; 4.5  8 ')).toEqual([2, 4.5, 8]);
    expect(parseNumberList('')).toBeUndefined();
    expect(parseNumberList('5, ten')).toBe('5, ten');
    expect(pruneEmpty({ a: {}, b: { c: {} }, d: [], e: 0, f: { g: 1 } })).toEqual({ d: [], e: 0, f: { g: 1 } });
  });
});

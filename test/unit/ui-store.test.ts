/**
 * The renderer's document store: undo/redo over every edit, coalescing of typing into one step,
 * the dirty flag against the last saved snapshot, revalidation on every change, stale-selection
 * handling. Expected behaviour is our own specification (app/ui/store/document.ts header).
 */
import { describe, expect, it } from 'vitest';
import { createAppStore, type ValidationState } from '../../app/ui/store/document';
import { getIn, parsePath, setIn, formatPath } from '../../app/ui/store/paths';
import { createStore } from '../../app/ui/store/createStore';

// A stand-in validator for the store's contract: negative `x` is an error. The real app passes the
// engine's validateScenario; the store must only carry what it is given.
function validate(s: unknown): ValidationState {
  const x = getIn(s, ['a', 'x']);
  return typeof x === 'number' && x >= 0
    ? { ok: true, errors: [], warnings: [] }
    : { ok: false, errors: [{ path: 'a.x', rule: 'non-negative', message: 'a.x must be ≥ 0' }], warnings: [] };
}

function setup() {
  let clock = 0;
  const store = createAppStore(
    { a: { x: 1, y: [1, 2, 3] }, b: { keep: true } },
    {
      validate,
      now: () => clock,
      coalesceMs: 1000,
    },
  );
  return { store, advance: (ms: number) => (clock += ms) };
}

describe('paths', () => {
  it('parses and formats the engine issue style', () => {
    expect(parsePath('vehicle.inertiaKgm2[1][2]')).toEqual(['vehicle', 'inertiaKgm2', 1, 2]);
    expect(formatPath(['targets', 0, 'attitude', 'quaternion', 3])).toBe('targets[0].attitude.quaternion[3]');
    expect(parsePath('')).toEqual([]);
  });
  it('sets immutably with structural sharing', () => {
    const root = { a: { x: 1 }, b: { y: [1, 2] } };
    const next = setIn(root, ['b', 'y', 1], 5) as typeof root;
    expect(next.b.y).toEqual([1, 5]);
    expect(root.b.y).toEqual([1, 2]);
    expect(next.a).toBe(root.a);
    const removed = setIn(root, ['a', 'x'], undefined) as { a: object };
    expect('x' in removed.a).toBe(false);
    expect(setIn(undefined, ['p', 0], 'v')).toEqual({ p: ['v'] });
  });
});

describe('createStore', () => {
  it('notifies only on a change by reference', () => {
    const s = createStore({ n: 1, m: 'a' });
    let calls = 0;
    const off = s.subscribe(() => calls++);
    s.setState({ n: 1 });
    expect(calls).toBe(0);
    s.setState({ n: 2 });
    expect(calls).toBe(1);
    off();
    s.setState({ n: 3 });
    expect(calls).toBe(1);
    expect(s.getState()).toEqual({ n: 3, m: 'a' });
  });
});

describe('app store undo/redo', () => {
  it('undoes and redoes every edit in order', () => {
    const { store, advance } = setup();
    const s0 = store.getState().scenario;
    store.edit('a.x', 2);
    advance(5000);
    store.edit('a.y[1]', 7);
    advance(5000);
    store.replace({ a: { x: 9 } }, 'Replace');
    expect(store.getState().undoStack.map((e) => e.label)).toEqual(['Edit a.x', 'Edit a.y[1]', 'Replace']);

    expect(store.undo()).toBe(true);
    expect(getIn(store.getState().scenario, ['a', 'y', 1])).toBe(7);
    expect(store.undo()).toBe(true);
    expect(getIn(store.getState().scenario, ['a', 'y', 1])).toBe(2);
    expect(getIn(store.getState().scenario, ['a', 'x'])).toBe(2);
    expect(store.undo()).toBe(true);
    expect(store.getState().scenario).toBe(s0);
    expect(store.undo()).toBe(false);

    expect(store.redo()).toBe(true);
    expect(store.redo()).toBe(true);
    expect(store.redo()).toBe(true);
    expect(store.getState().scenario).toEqual({ a: { x: 9 } });
    expect(store.redo()).toBe(false);
  });

  it('folds quick edits of one field into a single step, but not across fields or after a pause', () => {
    const { store, advance } = setup();
    for (const v of [0, 0.1, 0.12, 0.125]) {
      store.edit('a.x', v);
      advance(200);
    }
    expect(store.getState().undoStack).toHaveLength(1);
    store.edit('a.y[0]', 4);
    expect(store.getState().undoStack).toHaveLength(2);
    advance(2000);
    store.edit('a.y[0]', 5);
    expect(store.getState().undoStack).toHaveLength(3);
    store.undo();
    store.undo();
    store.undo();
    expect(getIn(store.getState().scenario, ['a', 'x'])).toBe(1);
  });

  it('a new edit clears the redo stack; a redone step never absorbs the next edit', () => {
    const { store, advance } = setup();
    store.edit('a.x', 2);
    store.undo();
    expect(store.getState().redoStack).toHaveLength(1);
    store.edit('a.x', 3);
    expect(store.getState().redoStack).toHaveLength(0);
    store.undo();
    store.redo();
    advance(10);
    store.edit('a.x', 4);
    expect(store.getState().undoStack).toHaveLength(2);
  });

  it('sets several values as one step (a symmetric matrix entry and its mirror)', () => {
    const store = createAppStore(
      {
        a: { x: 0 },
        m: [
          [1, 0],
          [0, 1],
        ],
      },
      { validate, coalesceMs: 1000, now: () => 0 },
    );
    store.editMany([
      ['m[0][1]', 0.5],
      ['m[1][0]', 0.5],
    ]);
    store.editMany([
      ['m[0][1]', 0.25],
      ['m[1][0]', 0.25],
    ]);
    expect(getIn(store.getState().scenario, ['m'])).toEqual([
      [1, 0.25],
      [0.25, 1],
    ]);
    expect(store.getState().undoStack).toHaveLength(1);
    store.undo();
    expect(getIn(store.getState().scenario, ['m'])).toEqual([
      [1, 0],
      [0, 1],
    ]);
  });

  it('caps the history', () => {
    const store = createAppStore({ a: { x: 0 } }, { validate, maxUndo: 10, coalesceMs: -1 });
    for (let i = 1; i <= 25; i++) store.edit('a.x', i);
    expect(store.getState().undoStack).toHaveLength(10);
    while (store.undo());
    expect(getIn(store.getState().scenario, ['a', 'x'])).toBe(15);
  });
});

describe('app store dirty flag and validation', () => {
  it('is dirty after an edit and clean again when undone back to the saved snapshot', () => {
    const { store, advance } = setup();
    expect(store.getState().dirty).toBe(false);
    store.edit('a.x', 5);
    expect(store.getState().dirty).toBe(true);
    store.undo();
    expect(store.getState().dirty).toBe(false);
    store.redo();
    expect(store.getState().dirty).toBe(true);
    store.markSaved('mine.scenario.json');
    expect(store.getState()).toMatchObject({ dirty: false, fileName: 'mine.scenario.json', untitled: false });
    advance(5000);
    store.undo();
    expect(store.getState().dirty).toBe(true);
    store.redo();
    expect(store.getState().dirty).toBe(false);
  });

  it('load resets history and cleanliness', () => {
    const { store } = setup();
    store.edit('a.x', 5);
    store.load({ a: { x: 3 } }, 'other.json', false);
    expect(store.getState()).toMatchObject({ dirty: false, undoStack: [], redoStack: [], fileName: 'other.json' });
    expect(store.undo()).toBe(false);
  });

  it('revalidates on every edit, undo and redo', () => {
    const { store, advance } = setup();
    expect(store.getState().validation.ok).toBe(true);
    store.edit('a.x', -1);
    expect(store.getState().validation.ok).toBe(false);
    expect(store.getState().validation.errors[0]!.path).toBe('a.x');
    advance(5000);
    store.edit('a.x', 1);
    expect(store.getState().validation.ok).toBe(true);
    store.undo();
    expect(store.getState().validation.ok).toBe(false);
    store.redo();
    expect(store.getState().validation.ok).toBe(true);
  });

  it('keeps the run selection where the runs survive a new output', () => {
    const { store } = setup();
    const out = (keys: string[]) => ({ runs: keys.map((key) => ({ key })) }) as never;
    store.setOutput(out(['pd:follow-plan', 'syn:follow-plan']), null);
    expect(store.getState().selectedRunKeys).toEqual(['pd:follow-plan']);
    store.selectRuns(['syn:follow-plan', 'pd:follow-plan']);
    store.setOutput(out(['syn:follow-plan']), null);
    expect(store.getState().selectedRunKeys).toEqual(['syn:follow-plan']);
    store.setOutput(out(['eig:step-target']), null);
    expect(store.getState().selectedRunKeys).toEqual(['eig:step-target']);
  });
});

describe('opening an older file format', () => {
  it('migrates a version 1 document for editing and marks it changed until saved in version 2', async () => {
    const { createAppStore } = await import('../../app/ui/store/document');
    const { validateScenario } = await import('../../app/engine/scenario/validate');
    const { loadExample } = await import('./scenario-fixtures');
    const v2 = loadExample('lumen6-imaging');
    // The same scenario as a version 1 file: the synergistic jump threshold was called "hysteresis".
    const v1 = JSON.parse(JSON.stringify(v2));
    v1.version = 1;
    v1.controllers[2].hysteresis = v1.controllers[2].gapThreshold;
    delete v1.controllers[2].gapThreshold;
    const store = createAppStore(null, {
      validate: (x) => ({ errors: validateScenario(x).ok ? [] : [{ path: '', rule: 'x', message: 'x' }], warnings: [] }) as never,
    });
    store.load(v1, 'old.scenario.json', false);
    const s = store.getState();
    expect((s.scenario as { version: number }).version).toBe(2);
    expect((s.scenario as { controllers: Record<string, unknown>[] }).controllers[2]!.gapThreshold).toBe(0.025);
    expect(s.dirty).toBe(true);
    store.load(v2, 'new.scenario.json', false);
    expect(store.getState().dirty).toBe(false);
  });
});

/**
 * The renderer's wiring (app/ui/appController.ts) with a fake bridge and a worker stand-in that
 * runs the real pipeline: edits schedule a debounced run, an invalid scenario never reaches the
 * worker, replies for an older document are dropped, unticked controllers are left out, menu
 * commands drive undo/redo and save, and the shell hears about the dirty flag.
 */
import { describe, expect, it, vi } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { SlewsmithBridge, UiCommand } from '../../app/bridge/api';
import { createAppController } from '../../app/ui/appController';
import type { WorkerLike } from '../../app/ui/worker/client';
import type { RunReply, RunRequest } from '../../app/ui/worker/protocol';
import demo from '../../assets/lumen6-imaging.scenario.json';

class InlineWorker implements WorkerLike {
  static posted: RunRequest[] = [];
  /** Hold replies until release() to let a test interleave edits. */
  static hold = false;
  static held: (() => void)[] = [];
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  postMessage(m: RunRequest) {
    InlineWorker.posted.push(m);
    const reply = () => {
      const result = runPipeline(m.scenario, { ...(m.options as object), modes: ['follow-plan'] });
      this.onmessage?.({ data: { type: 'result', id: m.id, result } } as MessageEvent<RunReply>);
    };
    if (InlineWorker.hold) InlineWorker.held.push(reply);
    else setTimeout(reply, 0);
  }
  terminate() {}
}

function fakeBridge() {
  const listeners = new Set<(c: UiCommand) => void>();
  const dirty: boolean[] = [];
  const saved: unknown[] = [];
  const bridge: SlewsmithBridge = {
    shell: 'browser',
    openScenario: async () => ({ status: 'cancelled' }),
    openRecent: async () => ({ status: 'cancelled' }),
    initialScenario: async () => ({ status: 'none' }),
    newScenario: async () => ({ status: 'created' }),
    saveScenario: async (s) => (saved.push(s), { status: 'saved', file: { path: null, name: 'a.json' } }),
    saveScenarioAs: async (s) => (saved.push(s), { status: 'saved', file: { path: null, name: 'b.json' } }),
    saveBeforeClose: async (s) => (saved.push(s), { status: 'saved', file: { path: null, name: 'c.json' } }),
    exportFile: async (r) => ({ status: 'exported', file: { path: null, name: r.suggestedName } }),
    recentFiles: async () => [],
    appInfo: async () => ({ name: 'Slewsmith', version: '0', shell: 'browser', platform: 'test', versions: {} }),
    setDirty: (d) => void dirty.push(d),
    onCommand: (l) => (listeners.add(l), () => listeners.delete(l)),
  };
  return { bridge, dirty, saved, send: (c: UiCommand) => listeners.forEach((l) => l(c)) };
}

function setup(initial?: SlewsmithBridge['initialScenario']) {
  InlineWorker.posted = [];
  InlineWorker.hold = false;
  InlineWorker.held = [];
  const fb = fakeBridge();
  if (initial) fb.bridge.initialScenario = initial;
  const app = createAppController({
    bridge: fb.bridge,
    spawnWorker: () => new InlineWorker(),
    fallbackScenario: demo,
    fallbackName: 'demo.json',
    debounceMs: 10,
  });
  return { app, ...fb };
}

const done = (app: ReturnType<typeof setup>['app']) =>
  vi.waitFor(() => expect(app.store.getState().pipeline.status).toBe('done'), { timeout: 20_000 });

describe('app controller', () => {
  it("starts the fallback's pass at once; the shell's same document keeps it (one pass), a different one replaces it", async () => {
    const file = { path: null, name: 'shell-demo.json' };
    const same = setup(async () => ({ status: 'opened', scenario: JSON.parse(JSON.stringify(demo)), file, template: true, warnings: [] }));
    expect(InlineWorker.posted.length).toBe(1); // posted before the shell answered
    await done(same.app);
    expect(InlineWorker.posted.length).toBe(1);
    expect(same.app.store.getState().fileName).toBe('shell-demo.json');
    same.app.dispose();

    const other = { ...JSON.parse(JSON.stringify(demo)), name: 'another scenario' };
    const diff = setup(async () => ({ status: 'opened', scenario: other, file, template: false, warnings: [] }));
    await vi.waitFor(() => expect(InlineWorker.posted.at(-1)?.scenario).toEqual(other), { timeout: 20_000 });
    await done(diff.app);
    expect(diff.app.store.getState().output?.scenario.name).toBe('another scenario');
    diff.app.dispose();
  });

  it('runs the starting document and sets the playback range from the runs', async () => {
    const { app } = setup();
    await done(app);
    const s = app.store.getState();
    expect(s.output?.runs.map((r) => r.key).sort()).toEqual(['hysteretic:follow-plan', 'pd:follow-plan', 'synergistic:follow-plan']);
    expect(s.outputScenario).toBe(s.scenario);
    const run = s.output!.runs[0]!;
    expect(app.clock.tMax).toBe(Math.max(...s.output!.runs.map((r) => r.trace.t[r.trace.n - 1]!)));
    expect(run.trace.n).toBeGreaterThan(100);
    app.dispose();
  });

  it('never sends an invalid scenario to the worker, and reruns once it is fixed', async () => {
    const { app } = setup();
    await done(app);
    const posts = InlineWorker.posted.length;
    app.store.edit('vehicle.inertiaKgm2[1][1]', -0.12);
    expect(app.store.getState().validation.ok).toBe(false);
    expect(app.store.getState().validation.errors.map((e) => e.rule)).toContain('positive-definite');
    expect(app.blockers().map((b) => b.rule)).toContain('positive-definite');
    await new Promise((r) => setTimeout(r, 60));
    expect(InlineWorker.posted.length).toBe(posts);
    expect(app.store.getState().pipeline.status).toBe('invalid');
    app.store.edit('vehicle.inertiaKgm2[1][1]', 0.125);
    await done(app);
    expect(InlineWorker.posted.length).toBe(posts + 1);
    expect(app.store.getState().output?.vehicle.principalMomentsKgm2.some((m) => Math.abs(m - 0.125) < 0.005)).toBe(true);
    app.dispose();
  });

  it('drops the reply for a document that changed while it ran', async () => {
    const { app } = setup();
    await done(app);
    const outBefore = app.store.getState().output;
    InlineWorker.hold = true;
    app.command('run');
    app.store.edit('vehicle.controlRateHz', 20);
    await new Promise((r) => setTimeout(r, 40));
    // The forced run's reply arrives after the edit: stale, not applied.
    expect(InlineWorker.held).toHaveLength(1);
    InlineWorker.held.shift()!();
    expect(app.store.getState().output).toBe(outBefore);
    expect(app.store.getState().pipeline.status).not.toBe('done');
    InlineWorker.hold = false;
    while (InlineWorker.held.length) InlineWorker.held.shift()!();
    await done(app);
    expect(app.store.getState().outputScenario).toBe(app.store.getState().scenario);
    app.dispose();
  });

  it('leaves unticked controllers out of the run', async () => {
    const { app } = setup();
    await done(app);
    app.store.setExcluded(['hysteretic']);
    await vi.waitFor(
      () =>
        expect(
          app.store
            .getState()
            .output?.runs.map((r) => r.controllerId)
            .sort(),
        ).toEqual(['pd', 'synergistic']),
      { timeout: 20_000 },
    );
    expect(InlineWorker.posted.at(-1)?.options).toEqual({ controllers: ['pd', 'synergistic'] });
    app.store.setExcluded(['hysteretic', 'pd', 'synergistic']);
    expect(app.blockers().map((b) => b.rule)).toEqual(['compare-none']);
    app.dispose();
  });

  it('undoes, redoes and saves from menu commands and reports the dirty flag to the shell', async () => {
    const { app, send, dirty, saved } = setup();
    await done(app);
    app.store.edit('vehicle.controlRateHz', 5);
    expect(dirty.at(-1)).toBe(true);
    send('undo');
    expect(app.store.getState().scenario).toBe(app.store.getState().savedScenario);
    expect(dirty.at(-1)).toBe(false);
    send('redo');
    expect(dirty.at(-1)).toBe(true);
    // The demo is an untitled copy: Save asks for a name (saveScenarioAs).
    send('save');
    await vi.waitFor(() => expect(app.store.getState().fileName).toBe('b.json'));
    expect((saved[0] as { vehicle: { controlRateHz: number } }).vehicle.controlRateHz).toBe(5);
    expect(dirty.at(-1)).toBe(false);
    // Now titled: Save writes in place.
    app.store.edit('vehicle.controlRateHz', 8);
    send('save');
    await vi.waitFor(() => expect(app.store.getState().fileName).toBe('a.json'));
    send('export');
    expect(app.ui.getState().exportOpen).toBe(true);
    app.dispose();
  });

  it('a save whose bridge call rejects shows an error notice and keeps the document dirty (no unhandled rejection)', async () => {
    const { app, send, bridge, dirty } = setup();
    await done(app);
    const unhandled: unknown[] = [];
    const onUnhandled = (e: unknown) => unhandled.push(e);
    process.on('unhandledRejection', onUnhandled);
    // What a refused IPC message or an uncloneable scenario looks like from the renderer.
    bridge.saveScenarioAs = async () => {
      throw new Error("Error invoking remote method 'slewsmith:scenario/save-as': refused");
    };
    bridge.openScenario = async () => {
      throw new Error('open refused');
    };
    app.store.edit('vehicle.controlRateHz', 5);
    send('save');
    await vi.waitFor(() => expect(app.ui.getState().notice?.kind).toBe('error'));
    expect(app.ui.getState().notice?.text).toMatch(/^Not saved: .*refused/);
    expect(app.store.getState().dirty).toBe(true);
    expect(dirty.at(-1)).toBe(true);
    send('open');
    await vi.waitFor(() => expect(app.ui.getState().notice?.text).toBe('Open failed: open refused'));
    await new Promise((r) => setTimeout(r, 20));
    process.off('unhandledRejection', onUnhandled);
    expect(unhandled).toEqual([]);
    app.dispose();
  });

  it("answers the shell's save-before-close with saveBeforeClose, never with an ordinary save", async () => {
    const { app, send, saved } = setup();
    await done(app);
    app.store.edit('vehicle.controlRateHz', 6);
    send('save-before-close');
    await vi.waitFor(() => expect(app.store.getState().fileName).toBe('c.json'));
    expect(saved).toHaveLength(1);
    expect(app.store.getState().dirty).toBe(false);
    app.dispose();
  });
});

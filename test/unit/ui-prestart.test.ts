/**
 * The demo's pass started before the app loads (app/ui/worker/prestart.ts, app/boot.ts): workers
 * named for it fly the pass the app's first request would have posted, and the runner adopts it
 * only when it is that same pass. Behaviour specified in prestart.ts and client.ts (our own
 * design); the flown output is checked against a pass of the same scenario computed here with
 * runPipeline (the engine's one entry point), not against stored numbers.
 */
import { describe, expect, it, vi } from 'vitest';
import type { SlewsmithBridge } from '../../app/bridge/api';
import { createOrbitViewCache } from '../../app/engine/orbit/viewSamplesCache';
import { runPipeline } from '../../app/engine/pipeline/run';
import { createAppController } from '../../app/ui/appController';
import { answerRun } from '../../app/ui/worker/answerRun';
import type { WorkerLike } from '../../app/ui/worker/client';
import {
  PRESTART_ID,
  demoPassMessage,
  prestartDemoPass,
  prestartName,
  prestartRequest,
  samePass,
  takePrestartedPass,
} from '../../app/ui/worker/prestart';
import type { RunReply, RunRequest } from '../../app/ui/worker/protocol';
import demo from '../../assets/lumen6-imaging.scenario.json';

/** A worker stand-in: what pipeline.worker.ts does, with answerRun (the worker's own reply code). */
class NamedWorker implements WorkerLike {
  posted: RunRequest[] = [];
  terminated = false;
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  constructor(readonly name: string) {}
  postMessage(m: RunRequest) {
    this.posted.push(m);
  }
  terminate() {
    this.terminated = true;
  }
  /** Fly a request as the worker would and hand the reply to the page. */
  fly(req: RunRequest) {
    answerRun(req, (reply) => this.onmessage?.({ data: reply } as MessageEvent<RunReply>), createOrbitViewCache());
  }
  /** The pass the worker starts by itself (its name), as pipeline.worker.ts does at load. */
  flyAtStart() {
    const req = prestartRequest(this.name);
    if (req) this.fly(req);
  }
}

function bridge(): SlewsmithBridge {
  return {
    shell: 'browser',
    openScenario: async () => ({ status: 'cancelled' }),
    openRecent: async () => ({ status: 'cancelled' }),
    initialScenario: async () => ({ status: 'none' }),
    newScenario: async () => ({ status: 'created' }),
    saveScenario: async () => ({ status: 'cancelled' }),
    saveScenarioAs: async () => ({ status: 'cancelled' }),
    saveBeforeClose: async () => ({ status: 'cancelled' }),
    exportFile: async () => ({ status: 'cancelled' }),
    recentFiles: async () => [],
    appInfo: async () => ({ name: 'Slewsmith', version: '0', shell: 'browser', platform: 'test', versions: {} }),
    setDirty: () => undefined,
    onCommand: () => () => undefined,
  };
}

/** `before`: what the workers do before the app exists (its main chunk still loading). */
function start(fallback: unknown, prestartSlots: number, workers = 1, before?: (spawned: NamedWorker[]) => void) {
  const spawned: NamedWorker[] = [];
  const spawn = (name = 'pipeline') => {
    const w = new NamedWorker(name);
    spawned.push(w);
    return w;
  };
  prestartDemoPass(spawn, prestartSlots);
  before?.(spawned);
  const app = createAppController({
    bridge: bridge(),
    spawnWorker: spawn,
    fallbackScenario: fallback,
    fallbackName: 'demo.json',
    pipelineWorkers: workers,
    prestarted: takePrestartedPass(),
  });
  return { app, spawned };
}

describe('the demo pass started before the app', () => {
  it('a worker knows its pass from its name alone; other names fly nothing', () => {
    expect(prestartRequest(prestartName(0, 1))).toEqual(demoPassMessage(0, 1));
    const second = prestartRequest(prestartName(1, 2));
    expect(second?.id).toBe(PRESTART_ID);
    expect(second?.options).toEqual({ controllers: demo.controllers.map((c) => c.id), runSlice: { index: 1, of: 2 } });
    for (const name of ['pipeline', '', 'pipeline:demo:2/2', 'pipeline:demo:0/0', 'pipeline:demo:a/1', 'xpipeline:demo:0/1'])
      expect(prestartRequest(name), name).toBeNull();
  });

  it('samePass ignores the id only', () => {
    const a = demoPassMessage(0, 1);
    expect(samePass([a], [{ ...a, id: 7 }])).toBe(true);
    expect(samePass([a], [{ ...a, partialAfterRuns: 1 }])).toBe(false);
    expect(samePass([a], [{ ...a, options: { controllers: ['pd'] } }])).toBe(false);
    expect(samePass([a], [a, a])).toBe(false);
  });

  it("the app's first request adopts the early pass: nothing is posted, and its reply is the demo's output", async () => {
    const { app, spawned } = start(demo, 1);
    expect(spawned.map((w) => w.name)).toEqual([prestartName(0, 1)]);
    const w = spawned[0]!;
    expect(w.posted).toEqual([]); // the runner did not post the pass again
    expect(app.store.getState().pipeline.status).toBe('running');
    w.flyAtStart();
    await vi.waitFor(() => expect(app.store.getState().pipeline.status).toBe('done'));
    const shown = app.store.getState().output!;
    // The same pass computed here from the scenario and the compared controllers the app asks for.
    const direct = runPipeline(demo, { controllers: app.comparedIds() });
    expect(direct.ok).toBe(true);
    if (!direct.ok) return;
    expect(shown.runs.map((r) => r.key)).toEqual(direct.value.runs.map((r) => r.key));
    expect(shown.comparison).toEqual(direct.value.comparison);
    expect(shown.certificates).toEqual(direct.value.certificates);
    app.dispose();
  }, 60_000);

  it('a reply that comes before the app has loaded is kept and taken when the app adopts the pass', async () => {
    const { app, spawned } = start(demo, 1, 1, (ws) => ws[0]!.flyAtStart());
    expect(spawned[0]!.posted).toEqual([]);
    expect(app.store.getState().pipeline.status).toBe('done');
    expect(app.store.getState().output?.runs).toHaveLength(2 * demo.controllers.length);
    app.dispose();
  }, 60_000);

  it('an early reply is dropped when the app asks for another pass', () => {
    const other = { ...structuredClone(demo), name: 'another scenario' };
    const { app, spawned } = start(other, 1, 1, (ws) => ws[0]!.flyAtStart());
    expect(spawned[0]!.posted).toHaveLength(1);
    expect(app.store.getState().output).toBeNull();
    expect(app.store.getState().pipeline.status).toBe('running');
    app.dispose();
  }, 60_000);

  it('a different first document is posted as usual and the early reply is ignored as stale', async () => {
    const other = { ...structuredClone(demo), name: 'another scenario' };
    const { app, spawned } = start(other, 1);
    const w = spawned[0]!;
    expect(w.posted).toHaveLength(1);
    expect(w.posted[0]!.id).not.toBe(PRESTART_ID);
    expect(w.posted[0]!.scenario).toEqual(other);
    w.flyAtStart(); // the demo's reply, under PRESTART_ID
    expect(app.store.getState().output).toBeNull();
    expect(app.store.getState().pipeline.status).toBe('running');
    w.fly(w.posted[0]!);
    await vi.waitFor(() => expect(app.store.getState().pipeline.status).toBe('done'));
    expect(app.store.getState().output?.scenario.name).toBe('another scenario');
    app.dispose();
  }, 60_000);

  it('a pass shared by two workers is adopted from both and merged', async () => {
    const { app, spawned } = start(demo, 2, 2);
    expect(spawned.map((w) => w.name)).toEqual([prestartName(0, 2), prestartName(1, 2)]);
    expect(spawned.every((w) => w.posted.length === 0)).toBe(true);
    spawned.forEach((w) => w.flyAtStart());
    await vi.waitFor(() => expect(app.store.getState().pipeline.status).toBe('done'));
    const direct = runPipeline(demo, { controllers: app.comparedIds() });
    if (!direct.ok) throw new Error('demo failed');
    expect(app.store.getState().output?.runs.map((r) => r.key)).toEqual(direct.value.runs.map((r) => r.key));
    expect(app.store.getState().output?.comparison).toEqual(direct.value.comparison);
    app.dispose();
  }, 60_000);

  it('another worker count: the early workers are stopped and the pass is posted to new ones', () => {
    const { app, spawned } = start(demo, 2, 1);
    expect(spawned.slice(0, 2).every((w) => w.terminated)).toBe(true);
    expect(spawned).toHaveLength(3);
    expect(spawned[2]!.name).toBe('pipeline');
    expect(spawned[2]!.posted).toHaveLength(1);
    app.dispose();
  });

  it('is taken once', () => {
    prestartDemoPass((name) => new NamedWorker(name), 1);
    expect(takePrestartedPass()).not.toBeNull();
    expect(takePrestartedPass()).toBeNull();
  });
});

/**
 * The study view's controller (app/ui/study/session.ts) with stand-in Web Workers that run the
 * real worker script's logic (the engine's createStudyWorker and studyCaseScenario) in this
 * thread, asynchronously like a worker:
 * - 1, 2 and 3 workers give byte-identical per-case CSV and summary JSON, equal to the engine's
 *   single-thread runner (each case depends only on (seed, index)); the CSV has one row per
 *   case × controller, and the not-settled share shown equals the count of such rows by hand;
 * - results fill in while the study runs; Cancel keeps the finished cases (and a worker stuck in
 *   a case is terminated after the hard-stop delay, without a warning about it);
 * - an unknown controller id in the study block is refused with its path and rule;
 * - a scenario without a study block cannot run; the default block is one undoable edit;
 * - a worst case opens as a new untitled document: exactly studyCaseScenario(json, {}, index),
 *   that controller alone ticked, playback at 0, the study view closed.
 */
import { describe, expect, it } from 'vitest';
import { createStudyWorker, runStudy, studyCaseScenario, casesCsv, summaryJson, CASE_COLUMNS } from '../../app/engine/study';
import type { FromStudyWorker, StudyWorkerLike, ToStudyWorker } from '../../app/ui/study/protocol';
import { createStudySession, defaultStudyBlock, type StudySession } from '../../app/ui/study/session';
import { createAppStore } from '../../app/ui/store/document';
import { createClock } from '../../app/ui/playback/clock';
import { preflight } from '../../app/ui/preflight';
import type { ExportRequest, SlewsmithBridge } from '../../app/bridge/api';
import { testVehicleScenario } from './study-fixtures';

const study = {
  runs: 9,
  seed: 777,
  durationS: 90,
  stopAfterSettledForS: 5,
  controllers: ['pd', 'hyst'],
  dispersions: {
    initialAttitude: { mode: 'uniform' },
    initialRateDegPerS: 0.05,
    inertia: { momentSigmaFraction: 0.05 },
    sensors: { attitudeNoiseScale: [0.5, 2] },
    controlRateHz: [5, 10],
  },
};

/** A worker stand-in: the same dispatch as app/ui/worker/study.worker.ts, one macrotask per message. */
class InThreadWorker implements StudyWorkerLike {
  static spawned: InThreadWorker[] = [];
  onmessage: ((ev: MessageEvent<FromStudyWorker>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  dead = false;
  received: ToStudyWorker[] = [];
  /** Never answer 'run' messages (a case that takes forever). */
  hang = false;
  private handle = createStudyWorker((m) => this.emit(m));
  constructor() {
    InThreadWorker.spawned.push(this);
  }
  private emit(m: FromStudyWorker) {
    if (!this.dead) this.onmessage?.({ data: m } as MessageEvent<FromStudyWorker>);
  }
  postMessage(m: ToStudyWorker) {
    this.received.push(m);
    setTimeout(() => {
      if (this.dead) return;
      if (m.type === 'case-scenario')
        this.emit({ type: 'case-scenario', id: m.id, result: studyCaseScenario(m.json, m.overrides, m.index) });
      else if (m.type === 'close') this.dead = true;
      else if (m.type === 'run' && this.hang) return;
      else this.handle(m);
    }, 0);
  }
  terminate() {
    this.dead = true;
  }
}

function fakeBridge() {
  const exported: ExportRequest[] = [];
  let news = 0;
  const bridge = {
    shell: 'browser',
    exportFile: async (r: ExportRequest) => (exported.push(r), { status: 'exported', file: { path: null, name: r.suggestedName } }),
    newScenario: async () => (news++, { status: 'created' }),
  } as unknown as SlewsmithBridge;
  return { bridge, exported, news: () => news };
}

function setup(scenario: unknown, opts: { cores?: number; hardStopMs?: number; spawn?: () => StudyWorkerLike } = {}) {
  InThreadWorker.spawned = [];
  const store = createAppStore(scenario, { validate: preflight });
  store.load(scenario, 'test.scenario.json', false);
  const clock = createClock();
  const fb = fakeBridge();
  const notices: string[] = [];
  const session = createStudySession({
    app: { store, clock, bridge: fb.bridge, notify: (t) => void notices.push(t) },
    spawn: opts.spawn ?? (() => new InThreadWorker()),
    cores: opts.cores ?? 4,
    publishMs: 5,
    hardStopMs: opts.hardStopMs ?? 1500,
  });
  return { session, store, clock, ...fb, notices };
}

async function exportsOf(session: StudySession, exported: ExportRequest[]) {
  await session.exportCases();
  await session.exportSummary();
  const csv = exported[exported.length - 2]!;
  const json = exported[exported.length - 1]!;
  return { csv: String(csv.content), csvName: csv.suggestedName, json: String(json.content), jsonName: json.suggestedName };
}

/** Data rows of the cases CSV as objects (our own tiny parser: no quoted commas in these rows but the reason). */
function csvRows(text: string): Record<string, string>[] {
  const lines = text.split('\n').filter((l) => l !== '' && !l.startsWith('#'));
  const head = lines[0]!.split(',');
  return lines.slice(1).map((l) =>
    Object.fromEntries(
      l
        .split(',')
        .slice(0, head.length - 1)
        .map((v, i) => [head[i], v]),
    ),
  );
}

describe('study session: results do not depend on the number of workers', () => {
  it('1, 2 and 3 workers give identical exports, equal to the single-thread runner', async () => {
    const json = testVehicleScenario(study);
    const outs: { csv: string; json: string }[] = [];
    for (const n of [1, 2, 3] as const) {
      const t = setup(json);
      t.session.setWorkerChoice(n);
      expect(t.session.workerCount(study.runs)).toBe(n);
      await t.session.start();
      const s = t.session.store.getState();
      expect(s.phase).toBe('done');
      expect(s.workersUsed).toBe(n);
      expect(InThreadWorker.spawned.length).toBe(n);
      expect(InThreadWorker.spawned.every((w) => w.dead)).toBe(true); // closed at the end
      // Each worker got its own share of the cases (with 3 workers and chunks of 2, all took some).
      const perWorker = InThreadWorker.spawned.map((w) => w.received.filter((m) => m.type === 'run').length);
      expect(perWorker.every((k) => k > 0)).toBe(true);
      const e = await exportsOf(t.session, t.exported);
      expect(e.csvName).toBe('study-test-vehicle-study-cases.csv');
      expect(e.jsonName).toBe('study-test-vehicle-study-summary.json');
      outs.push(e);
    }
    expect(outs[1]!.csv).toBe(outs[0]!.csv);
    expect(outs[2]!.csv).toBe(outs[0]!.csv);
    expect(outs[1]!.json).toBe(outs[0]!.json);
    expect(outs[2]!.json).toBe(outs[0]!.json);

    const ref = runStudy(json);
    if (!ref.ok) throw new Error('study refused');
    expect(outs[0]!.csv).toBe(casesCsv(ref.value.info, ref.value.records, ref.value.summary));
    expect(outs[0]!.json).toBe(summaryJson(ref.value.info, ref.value.summary, ref.value.map));

    // One row per case × controller, with the engine's columns.
    const rows = csvRows(outs[0]!.csv);
    expect(rows.length).toBe(study.runs * study.controllers.length);
    expect(outs[0]!.csv).toContain(CASE_COLUMNS.join(','));
    const keys = new Set(rows.map((r) => `${r.case}:${r.controller}`));
    expect(keys.size).toBe(rows.length);
    // The share the view shows (summary) against a count of the CSV rows by hand.
    const summary = JSON.parse(outs[0]!.json).summary as {
      controllers: { controllerId: string; shares: { notSettled: { share: number } }; flyable: number }[];
    };
    for (const c of summary.controllers) {
      const mine = rows.filter((r) => r.controller === c.controllerId && r.status !== 'unflyable');
      const bad = mine.filter((r) => r.status === 'unsettled' || r.status === 'failed').length;
      expect(c.flyable).toBe(mine.length);
      expect(c.shares.notSettled.share).toBeCloseTo(bad / mine.length, 15);
    }
  }, 120_000);

  it('auto picks min(4, cores, cases) workers', () => {
    const json = testVehicleScenario(study);
    expect(setup(json, { cores: 2 }).session.workerCount(100)).toBe(2);
    expect(setup(json, { cores: 16 }).session.workerCount(100)).toBe(4);
    expect(setup(json, { cores: 16 }).session.workerCount(3)).toBe(3);
    expect(setup(json, { cores: 1 }).session.workerCount(100)).toBe(1);
  });
});

describe('study session: running, live results and cancel', () => {
  it('fills in results while running and keeps the finished cases on Cancel', async () => {
    const t = setup(testVehicleScenario({ ...study, runs: 60 }));
    t.session.setWorkerChoice(1);
    const seen: number[] = [];
    let cancelled = false;
    const off = t.session.store.subscribe((s) => {
      seen.push(s.records.length);
      if (!cancelled && s.progress && s.progress.done >= 4) {
        cancelled = true;
        t.session.cancel();
      }
    });
    await t.session.start();
    off();
    const s = t.session.store.getState();
    expect(s.phase).toBe('cancelled');
    // Live: the record list grew through intermediate sizes before the end.
    expect(seen.some((n) => n > 0 && n < s.records.length)).toBe(true);
    expect(s.records.length).toBeGreaterThanOrEqual(4);
    expect(s.records.length).toBeLessThan(60);
    expect(s.summary?.incomplete).toBe(true);
    expect(s.summary?.casesDone).toBe(s.records.length);
    expect(s.map.length).toBe(s.records.length);
    const idx = s.records.map((r) => r.draw.index);
    expect(idx).toEqual([...idx].sort((a, b) => a - b));
    const e = await exportsOf(t.session, t.exported);
    expect(csvRows(e.csv).length).toBe(s.records.length * 2);
    expect(e.csv).toContain('stopped early');
  }, 60_000);

  it('terminates a worker stuck in a case after the hard-stop delay, keeping what the others finished', async () => {
    let k = 0;
    const t = setup(testVehicleScenario({ ...study, runs: 40 }), {
      hardStopMs: 50,
      spawn: () => {
        const w = new InThreadWorker();
        if (k++ === 1) w.hang = true; // the second worker never finishes its first chunk
        return w;
      },
    });
    t.session.setWorkerChoice(2);
    let cancelled = false;
    const off = t.session.store.subscribe((s) => {
      if (!cancelled && s.progress && s.progress.done >= 3) {
        cancelled = true;
        t.session.cancel();
      }
    });
    await t.session.start();
    off();
    const s = t.session.store.getState();
    expect(s.phase).toBe('cancelled');
    expect(InThreadWorker.spawned[1]!.dead).toBe(true);
    expect(s.records.length).toBeGreaterThanOrEqual(3);
    // The hung worker's chunk (cases 2, 3 or a later one) is not among the results.
    const hungChunk = InThreadWorker.spawned[1]!.received.find((m) => m.type === 'run');
    if (hungChunk?.type === 'run') for (const i of hungChunk.indices) expect(s.records.some((r) => r.draw.index === i)).toBe(false);
    expect(s.warnings.filter((w) => w.path === 'workers')).toEqual([]);
  }, 60_000);

  it('names an unknown controller id in the study block (path and rule)', async () => {
    const t = setup(testVehicleScenario({ ...study, controllers: ['pd', 'nope'] }));
    await t.session.start();
    const s = t.session.store.getState();
    expect(s.phase).toBe('invalid');
    expect(s.errors.some((e) => e.path === 'study.controllers[1]' && e.rule === 'unknown-id')).toBe(true);
    expect(s.records).toEqual([]);
  });
});

describe('study session: the study block', () => {
  it('a scenario without a block cannot run; the default block is one undoable edit', async () => {
    const json = testVehicleScenario(study) as Record<string, unknown>;
    delete json.study;
    const t = setup(json);
    expect(t.session.blockers().map((b) => `${b.path}|${b.rule}`)).toEqual(['study|required']);
    await t.session.start();
    expect(t.session.store.getState().phase).toBe('invalid');
    expect(InThreadWorker.spawned.length).toBe(0);

    t.session.addDefaultStudy();
    const sc = t.store.getState().scenario as Record<string, unknown>;
    // The engine's default (100 cases, the scenario's seed) plus starts from any attitude.
    expect(sc.study).toEqual({ runs: 100, seed: 1, dispersions: { initialAttitude: { mode: 'uniform' } } });
    expect(defaultStudyBlock(json)).toEqual(sc.study);
    expect(t.store.getState().validation.ok).toBe(true);
    expect(t.store.getState().dirty).toBe(true);
    expect(t.session.blockers()).toEqual([]);
    t.store.undo();
    expect((t.store.getState().scenario as Record<string, unknown>).study).toBeUndefined();
    expect(t.store.getState().dirty).toBe(false);
  });
});

describe('study session: opening a case as a normal run', () => {
  it('loads studyCaseScenario(json, {}, index) as an untitled document with that controller alone ticked', async () => {
    const json = testVehicleScenario(study);
    const t = setup(json);
    await t.session.start();
    t.session.setOpen(true);
    t.clock.setRange(0, 100);
    t.clock.setTime(42);
    const s = t.session.store.getState();
    const worst = s.summary!.controllers[1]!.worst[0]!;
    await t.session.openCase(worst.index, 'hyst');
    const doc = t.store.getState();
    const expected = studyCaseScenario(json, {}, worst.index);
    if (!expected.ok) throw new Error('case refused');
    expect(doc.scenario).toEqual(expected.value);
    expect(doc.untitled).toBe(true);
    expect(doc.dirty).toBe(false);
    expect(doc.fileName).toBe(`study-test-vehicle-case-${worst.index}.scenario.json`);
    expect(doc.excludedControllerIds).toEqual(['pd']);
    expect(doc.validation.ok).toBe(true);
    expect(t.news()).toBe(1);
    expect(t.clock.t).toBe(0);
    expect(t.session.store.getState().open).toBe(false);
    expect(t.session.store.getState().opening).toBe(null);
    // The results stay, tied to the scenario they came from.
    expect(t.session.store.getState().scenario).toBe(json);
    expect(t.notices.some((n) => n.includes(`case ${worst.index}`))).toBe(true);
  }, 60_000);
});

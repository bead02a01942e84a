/**
 * The sweep view's controller (app/ui/study/sweepSession.ts) and form check (sweepForm.ts), with
 * stand-in Web Workers that run the real worker logic (sweepWorkerCore.ts) in this thread, one
 * macrotask per message:
 * - 1 and 2 workers give byte-identical cells.csv and sweep.json, equal to the engine's
 *   single-thread runSweep (the reference: a cell depends only on scenario, definition and index);
 * - the level set after the run moves the boundary exactly as the engine's sweepBoundaries says;
 * - Cancel keeps the finished cells (a worker stuck in a cell is terminated after the hard stop);
 * - bad input is named with its field path and rule (no NaN in any message), a hysteresis sweep
 *   without a hysteretic controller is refused, and Run does nothing while the form is invalid;
 * - a cell's worst case opens as exactly studyCaseScenario(sweepCellJson(json, def, cell), {}, worst).
 */
import { describe, expect, it } from 'vitest';
import {
  runSweep,
  studyCaseScenario,
  sweepBoundaries,
  sweepCellJson,
  sweepCellsCsv,
  sweepJson,
  validateSweep,
  type SweepDefinition,
} from '../../app/engine/study';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { createSweepWorkerHandler } from '../../app/ui/study/sweepWorkerCore';
import type { FromSweepWorker, SweepWorkerLike, ToSweepWorker } from '../../app/ui/study/sweepProtocol';
import { createSweepSession } from '../../app/ui/study/sweepSession';
import { axisFormFor, checkSweepForm, defaultSweepForm, type SweepForm } from '../../app/ui/study/sweepForm';
import { createStudySession } from '../../app/ui/study/session';
import type { FromStudyWorker, StudyWorkerLike, ToStudyWorker } from '../../app/ui/study/protocol';
import { createAppStore } from '../../app/ui/store/document';
import { createClock } from '../../app/ui/playback/clock';
import { preflight } from '../../app/ui/preflight';
import type { ExportRequest, SlewsmithBridge } from '../../app/bridge/api';
import { mstScenario } from '../reference/sweep-fixtures';

/** A small, quick scenario: the MST 2011 setting at 20 Hz, 20 s, starts anywhere (outcomes do not matter here). */
function scenario() {
  const base = mstScenario({ controlRateHz: 20, rk4StepsPerSample: 2, durationS: 20, hysteresis: 0.4, noiseMode: 'band-edge' });
  return { ...base, study: { ...base.study, runs: 2, dispersions: { initialAttitude: { mode: 'uniform' } } } };
}

class InThreadSweepWorker implements SweepWorkerLike {
  static spawned: InThreadSweepWorker[] = [];
  onmessage: ((ev: MessageEvent<FromSweepWorker>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  dead = false;
  hang = false;
  runs = 0;
  private handle = createSweepWorkerHandler((m) => {
    if (!this.dead) this.onmessage?.({ data: m } as MessageEvent<FromSweepWorker>);
  });
  constructor() {
    InThreadSweepWorker.spawned.push(this);
  }
  postMessage(m: ToSweepWorker) {
    setTimeout(() => {
      if (this.dead) return;
      if (m.type === 'run') {
        this.runs++;
        if (this.hang) return;
      }
      if (m.type === 'close') this.dead = true;
      else this.handle(m);
    }, 0);
  }
  terminate() {
    this.dead = true;
  }
}

/** Answers only the case-scenario requests of the study session's open-a-case path. */
class CaseWorker implements StudyWorkerLike {
  onmessage: ((ev: MessageEvent<FromStudyWorker>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  postMessage(m: ToStudyWorker) {
    setTimeout(() => {
      if (m.type === 'case-scenario')
        this.onmessage?.({
          data: { type: 'case-scenario', id: m.id, result: studyCaseScenario(m.json, m.overrides, m.index) },
        } as MessageEvent<FromStudyWorker>);
    }, 0);
  }
  terminate() {}
}

function setup(opts: { cores?: number; hardStopMs?: number; spawn?: () => SweepWorkerLike } = {}) {
  InThreadSweepWorker.spawned = [];
  const json = scenario();
  const store = createAppStore(json, { validate: preflight });
  store.load(json, 'test.scenario.json', false);
  const clock = createClock();
  const exported: ExportRequest[] = [];
  const bridge = {
    shell: 'browser',
    exportFile: async (r: ExportRequest) => (exported.push(r), { status: 'exported', file: { path: null, name: r.suggestedName } }),
    newScenario: async () => ({ status: 'created' }),
  } as unknown as SlewsmithBridge;
  const notices: string[] = [];
  const app = { store, clock, bridge, notify: (t: string) => void notices.push(t) };
  const study = createStudySession({ app, spawn: () => new CaseWorker(), cores: 2 });
  const session = createSweepSession({
    app,
    study,
    spawn: opts.spawn ?? (() => new InThreadSweepWorker()),
    cores: opts.cores ?? 2,
    publishMs: 5,
    hardStopMs: opts.hardStopMs ?? 1500,
  });
  return { json, store, session, study, exported, notices };
}

/** ē ∈ {0.05, 0.15} × δ ∈ {0.1, 0.3}, two cases per cell, seed 5, the hysteretic law only. */
function gridForm(json: unknown): SweepForm {
  const f = defaultSweepForm(json);
  return {
    ...f,
    axes: [
      { ...axisFormFor('worst-case-eta'), mode: 'list', list: '0.05, 0.15' },
      { ...axisFormFor('hysteresis'), lo: '0.1', hi: '0.3', steps: '2' },
    ],
    runs: '2',
    seed: '5',
    controllers: ['hyst'],
  };
}

function refDef(): SweepDefinition {
  const d = validateSweep({
    axes: [
      { parameter: 'worst-case-eta', values: [0.05, 0.15] },
      { parameter: 'hysteresis', lo: 0.1, hi: 0.3, steps: 2 },
    ],
    runs: 2,
    seed: 5,
    controllers: ['hyst'],
    level: 0.5,
  });
  if (!d.ok) throw new Error(JSON.stringify(d.errors));
  return d.value;
}

describe('sweep session: results do not depend on the number of workers', () => {
  it('1 and 2 workers give the engine single-thread runSweep bytes, and the level moves the boundary as sweepBoundaries says', async () => {
    const outs: { csv: string; json: string }[] = [];
    for (const cores of [1, 2]) {
      const t = setup({ cores });
      t.session.setOpen(true);
      t.session.setForm(gridForm(t.json));
      await t.session.start();
      const s = t.session.store.getState();
      expect(s.phase).toBe('done');
      expect(s.workersUsed).toBe(cores);
      expect(s.progress).toMatchObject({ cellsDone: 4, cellsTotal: 4, casesDone: 8, casesTotal: 8 });
      expect(InThreadSweepWorker.spawned.every((w) => w.dead)).toBe(true);
      expect(InThreadSweepWorker.spawned.every((w) => w.runs > 0)).toBe(true);
      await t.session.exportCells(0.5);
      await t.session.exportJson(0.5);
      expect(t.exported.map((e) => e.suggestedName)).toEqual(['mst-2011-setting-sweep-cells.csv', 'mst-2011-setting-sweep.json']);
      outs.push({ csv: String(t.exported[0]!.content), json: String(t.exported[1]!.content) });
      if (cores === 2) {
        const ref = runSweep(t.json, refDef());
        if (!ref.ok) throw new Error('sweep refused');
        expect(outs[0]!.csv).toBe(sweepCellsCsv(ref.value));
        expect(outs[0]!.json).toBe(sweepJson(ref.value, CAUTION_TEXT));
        // A new level after the run: the engine's boundaries at that level, over the same cells.
        const at = t.session.resultAt(0.3)!;
        expect(at.boundaries).toEqual(sweepBoundaries({ ...ref.value.info, def: { ...ref.value.info.def, level: 0.3 } }, ref.value.cells));
        expect(at.cells).toEqual(ref.value.cells);
      }
    }
    expect(outs[1]!.csv).toBe(outs[0]!.csv);
    expect(outs[1]!.json).toBe(outs[0]!.json);
  });
});

describe('sweep session: cancel', () => {
  it('keeps the finished cells; a worker stuck in its cell is terminated after the hard stop', async () => {
    let k = 0;
    const t = setup({
      cores: 2,
      hardStopMs: 50,
      spawn: () => {
        const w = new InThreadSweepWorker();
        if (k++ === 1) w.hang = true; // the second worker never finishes its first cell
        return w;
      },
    });
    t.session.setOpen(true);
    t.session.setForm(gridForm(t.json));
    const run = t.session.start();
    const unsubscribe = t.session.store.subscribe((s) => {
      if (s.phase === 'running' && s.cells.length >= 1) t.session.cancel();
    });
    await run;
    unsubscribe();
    const s = t.session.store.getState();
    expect(s.phase).toBe('cancelled');
    expect(s.cells.length).toBeGreaterThanOrEqual(1);
    expect(s.cells.length).toBeLessThan(4);
    expect(s.progress!.cellsDone).toBe(s.cells.length);
    expect(InThreadSweepWorker.spawned[1]!.dead).toBe(true);
    // The export holds exactly the finished cells, marked incomplete.
    await t.session.exportJson(0.5);
    const j = JSON.parse(String(t.exported[0]!.content));
    expect(j.complete).toBe(false);
    expect(j.cellsDone).toBe(s.cells.length);
    expect(j.cells.map((c: { index: number }) => c.index)).toEqual(s.cells.map((c) => c.index));
  });
});

describe('sweep form: problems named at their fields', () => {
  const json = scenario();
  const base = gridForm(json);
  const check = (f: SweepForm) => checkSweepForm(f, json);
  const rules = (f: SweepForm) => check(f).issues.map((i) => `${i.path}|${i.rule}`);

  it('reads a good form into the definition the engine validates', () => {
    const c = check(base);
    expect(c.issues).toEqual([]);
    expect(c.cells).toBe(4);
    expect(c.def).toEqual(refDef());
  });

  it('names words in number fields with their text, never NaN', () => {
    const c = check({ ...base, runs: 'many', axes: [base.axes[0], { ...base.axes[1], lo: '' }] });
    expect(c.def).toBeNull();
    expect(c.issues.map((i) => `${i.path}|${i.rule}`)).toEqual(['sweep.axes[1].lo|number', 'sweep.runs|number']);
    expect(c.issues[1]!.message).toContain('"many"');
    for (const i of c.issues) expect(i.message).not.toContain('NaN');
  });

  it('names only the unread axis while the other cannot be checked in its place (no shifted paths)', () => {
    const bad = {
      ...base,
      axes: [
        { ...axisFormFor('worst-case-eta'), lo: 'x' },
        { ...base.axes[1], hi: '2' },
      ] as SweepForm['axes'],
    };
    expect(rules(bad)).toEqual(['sweep.axes[0].lo|number']);
    expect(check(bad).cells).toBeNull();
    expect(rules({ ...base, axes: [axisFormFor(''), base.axes[1]] })).toEqual(['sweep.axes[0].parameter|required']);
  });

  it('refuses values outside a parameter’s limits, too many values, a bad level', () => {
    expect(rules({ ...base, axes: [{ ...base.axes[0], list: '0.05, 1' }, base.axes[1]] })).toEqual(['sweep.axes[0].values[1]|range']);
    expect(rules({ ...base, axes: [base.axes[0], { ...base.axes[1], steps: '51' }] })).toEqual(['sweep.axes[1]|max-values']);
    expect(rules({ ...base, axes: [base.axes[0], { ...base.axes[1], lo: '0' }] })).toEqual(['sweep.axes[1].lo|range']);
    const lv = check({ ...base, levelPct: '100' }).issues;
    expect(lv.map((i) => `${i.path}|${i.rule}`)).toEqual(['sweep.level|range']);
    expect(lv[0]!.message).toContain('100 %');
    expect(rules({ ...base, axes: [base.axes[0], { ...base.axes[0] }] })).toEqual(['sweep.axes[1].parameter|unique']);
  });

  it('refuses a hysteresis sweep when no hysteretic controller is flown, and an empty controller list', () => {
    expect(rules({ ...base, controllers: ['sign'] })).toEqual(['sweep.axes[1].parameter|needs-hysteretic']);
    expect(rules({ ...base, controllers: [] })).toContain('sweep.controllers|min-length');
  });

  it('does not start while the form is invalid', async () => {
    const t = setup();
    t.session.setOpen(true);
    t.session.setForm({ ...gridForm(t.json), controllers: ['sign'] });
    await t.session.start();
    expect(t.session.store.getState().phase).toBe('invalid');
    expect(InThreadSweepWorker.spawned.length).toBe(0);
  });
});

describe('sweep session: a cell opens as a run', () => {
  it('loads studyCaseScenario(sweepCellJson(json, def, cell), {}, worst) with that controller ticked', async () => {
    const t = setup();
    t.session.setOpen(true);
    t.session.setForm(gridForm(t.json));
    await t.session.start();
    const cell = t.session.store.getState().cells[3]!;
    const worst = cell.controllers[0]!.worstCase!;
    await t.session.openCell(3, 'hyst');
    const want = studyCaseScenario(sweepCellJson(t.json, refDef(), 3), {}, worst);
    if (!want.ok) throw new Error('case refused');
    expect(t.store.getState().scenario).toEqual(want.value);
    expect(t.store.getState().fileName).toBe(`mst-2011-setting-sweep-cell-3-case-${worst}.scenario.json`);
    expect(t.notices.at(-1)).toContain('sweep cell 3');
    expect(t.study.store.getState().open).toBe(false);
  });
});

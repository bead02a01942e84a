/**
 * The Sweep tab of the study workspace: a robustness sweep of one or two study parameters on a
 * grid (engine/study/sweep*.ts), each cell a seeded study. A bar with Run / Cancel and the exports,
 * the progress in cells, the setup on the left (parameters with lo/hi/steps or a list, cases per
 * cell, seed, controllers), and on the right one map per controller with the boundary at the
 * level set above the maps (recomputed at once when it changes) and the published theory lines.
 */
import { useMemo } from 'react';
import type { Issue } from '../../engine/errors';
import { SWEEP_PARAMETER_NAMES, SWEEP_PARAMETERS, type SweepParameter } from '../../engine/study';
import { MAX_AXIS_VALUES, MAX_SWEEP_CELLS } from '../../engine/study/sweep';
import { useAppState } from '../context';
import { fmt } from '../format';
import { FieldRow } from '../components/fields';
import { SweepLegend, SweepMap } from './SweepMap';
import { axisFormFor, flownControllers, issuesAt, scenarioControllers, type SweepAxisForm, type SweepForm } from './sweepForm';
import { useSweepSession, useSweepState } from './sweepRegistry';
import type { SweepPhase } from './sweepSession';
import { useStudySession } from './registry';
import './sweepWorkspace.css';
import { RunWarnings } from './RunWarnings';

const PHASE_TEXT: Record<SweepPhase, string> = {
  idle: 'Not run yet',
  starting: 'Starting workers…',
  running: 'Running',
  cancelling: 'Cancelling — finishing the cells in progress…',
  done: 'Done',
  cancelled: 'Cancelled — finished cells kept',
  invalid: 'Cannot run',
  failed: 'Workers failed',
};

const isActive = (p: SweepPhase) => p === 'starting' || p === 'running' || p === 'cancelling';

function seconds(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms)) return '—';
  const s = ms / 1000;
  if (s < 60) return `${s.toFixed(s < 10 ? 1 : 0)} s`;
  return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
}

function Issues({ list }: { list: readonly Issue[] }) {
  if (!list.length) return null;
  return (
    <div className="field-issues">
      {list.map((i) => (
        <div key={`${i.path}|${i.rule}`} className="issue error" data-path={i.path} data-rule={i.rule} role="alert">
          {i.message} <span className="rule">[{i.rule}]</span>
        </div>
      ))}
    </div>
  );
}

/** The form and its check, recomputed when the form or the document changes. */
function useSweepCheck() {
  const session = useSweepSession();
  const form = useSweepState((s) => s.form);
  const scenario = useAppState((s) => s.scenario);
  const validation = useAppState((s) => s.validation);
  const pipeline = useAppState((s) => s.pipeline);
  // session.check() reads both stores; recompute when what it reads changes.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  return useMemo(() => session.check(), [session, form, scenario, validation, pipeline]);
}

/** The level typed in the form as a fraction, or null when it is not a number strictly between 0 and 100. */
function levelOf(form: SweepForm | null): number | null {
  const v = Number(form?.levelPct.trim().replace(/\u2212/g, '-'));
  return form && form.levelPct.trim() !== '' && Number.isFinite(v) && v > 0 && v < 100 ? v / 100 : null;
}

function SweepBar() {
  const session = useSweepSession();
  const study = useStudySession();
  const phase = useSweepState((s) => s.phase);
  const form = useSweepState((s) => s.form);
  const hasCells = useSweepState((s) => s.cells.length > 0 && s.info !== null);
  const check = useSweepCheck();
  const active = isActive(phase);
  const level = levelOf(form);
  return (
    <div className="study-bar">
      <WorkspaceTabs />
      {!active ? (
        <button
          className="primary"
          onClick={() => void session.start()}
          disabled={check.def === null}
          data-testid="sweep-run"
          title={check.issues.length ? check.issues[0]!.message : 'Run every grid cell as a seeded study'}
        >
          Run sweep
        </button>
      ) : (
        <button
          className="primary danger"
          onClick={() => session.cancel()}
          disabled={phase === 'cancelling'}
          data-testid="sweep-cancel"
          title="Stop handing out cells; the finished cells are kept and shown"
        >
          Cancel
        </button>
      )}
      <span className={`study-phase ${phase}`} data-testid="sweep-phase" data-phase={phase}>
        {PHASE_TEXT[phase]}
      </span>
      <span className="push-right" />
      <button
        className="small"
        disabled={!hasCells || active || level === null}
        onClick={() => void session.exportCells(level ?? 0.5)}
        data-testid="sweep-export-csv"
        title="cells.csv: one row per cell and controller (shares with 95 % intervals, settle times, worst case)"
      >
        Cells CSV
      </button>
      <button
        className="small"
        disabled={!hasCells || active || level === null}
        onClick={() => void session.exportJson(level ?? 0.5)}
        data-testid="sweep-export-json"
        title="sweep.json: the definition, every finished cell, the boundaries at the level shown and the theory lines"
      >
        Sweep JSON
      </button>
      <button className="small" onClick={() => study.setOpen(false)} data-testid="sweep-close" title="Back to the 3D view and plots">
        Close
      </button>
    </div>
  );
}

/** Study | Sweep: the two views of the study workspace (shown in both bars). */
export function WorkspaceTabs() {
  const session = useSweepSession();
  const open = useSweepState((s) => s.open);
  return (
    <span className="workspace-tabs" role="tablist" aria-label="Robustness study views">
      <button
        role="tab"
        aria-selected={!open}
        className={`tab ${open ? '' : 'on'}`}
        onClick={() => session.setOpen(false)}
        data-testid="tab-study"
        title="Robustness study: one scenario, many dispersed cases"
      >
        Study
      </button>
      <button
        role="tab"
        aria-selected={open}
        className={`tab ${open ? 'on' : ''}`}
        onClick={() => session.setOpen(true)}
        data-testid="tab-sweep"
        title="Robustness sweep: a study per cell of a grid over one or two parameters"
      >
        Sweep
      </button>
    </span>
  );
}

function SweepProgressBar() {
  const phase = useSweepState((s) => s.phase);
  const p = useSweepState((s) => s.progress);
  const workers = useSweepState((s) => s.workersUsed);
  // An empty row keeps the body in the workspace's last (stretching) grid row.
  if (phase === 'idle' || !p) return <div />;
  const frac = p.cellsTotal > 0 ? p.cellsDone / p.cellsTotal : 0;
  const active = isActive(phase);
  return (
    <div className="study-progress-wrap">
      <div
        className={`study-progress ${active ? 'active' : ''}`}
        role="progressbar"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(frac * 100)}
        data-testid="sweep-progress"
        data-done={p.cellsDone}
        data-total={p.cellsTotal}
      >
        <div className="fill" style={{ width: `${(frac * 100).toFixed(2)}%` }} />
        <span className="label">{Math.floor(frac * 100)} %</span>
      </div>
      <span className="study-progress-text" data-testid="sweep-progress-text">
        {p.cellsDone} / {p.cellsTotal} cells · {p.casesDone} / {p.casesTotal} cases
        {active && ` · ${seconds(p.remainingMs)} left`} · {seconds(p.elapsedMs)} elapsed · {workers} worker{workers === 1 ? '' : 's'}
      </span>
    </div>
  );
}

function TextInput(props: { path: string; label: string; unit?: string; value: string; onChange: (v: string) => void; issues: Issue[] }) {
  return (
    <div className="field">
      <FieldRow label={props.label} unit={props.unit}>
        <input
          className={`num ${props.issues.length ? 'invalid' : ''}`}
          type="text"
          inputMode="decimal"
          spellCheck={false}
          aria-label={props.label}
          aria-invalid={props.issues.length > 0}
          data-path={props.path}
          value={props.value}
          onChange={(e) => props.onChange(e.target.value)}
        />
      </FieldRow>
      <Issues list={props.issues} />
    </div>
  );
}

function rangeText(p: SweepParameter): string {
  const d = SWEEP_PARAMETERS[p] as { min: number; max: number; minOpen: boolean; maxOpen?: boolean; unit: string };
  return `${d.minOpen ? '(' : '['}${d.min}, ${d.max}${d.maxOpen ? ')' : ']'}${d.unit && d.unit !== '×' ? ` ${d.unit}` : ''}`;
}

function AxisFields({
  i,
  axis,
  issues,
  onChange,
}: {
  i: 0 | 1;
  axis: SweepAxisForm;
  issues: Issue[];
  onChange: (a: SweepAxisForm) => void;
}) {
  const path = `sweep.axes[${i}]`;
  const p = axis.parameter;
  const unit = p === '' ? '' : SWEEP_PARAMETERS[p].unit;
  const u = unit === '×' ? '×' : unit;
  const own = issues.filter((x) => x.path === path || x.path === `${path}.parameter`);
  return (
    <div className="sweep-axis" data-testid={`sweep-axis-${i}`}>
      <div className="sub-head">{i === 0 ? 'First parameter (across)' : 'Second parameter (up)'}</div>
      <div className="field">
        <select
          className="sweep-parameter"
          aria-label={`${i === 0 ? 'first' : 'second'} parameter`}
          data-path={`${path}.parameter`}
          value={p}
          onChange={(e) => onChange(axisFormFor(e.target.value as SweepParameter | ''))}
        >
          {i === 1 && <option value="">none (one-axis sweep)</option>}
          {SWEEP_PARAMETER_NAMES.map((n) => (
            <option key={n} value={n}>
              {SWEEP_PARAMETERS[n].label}
              {SWEEP_PARAMETERS[n].unit && SWEEP_PARAMETERS[n].unit !== '×' ? `, ${SWEEP_PARAMETERS[n].unit}` : ''}
            </option>
          ))}
        </select>
        <Issues list={own} />
      </div>
      {p !== '' && (
        <>
          <div className="sweep-hint" title={SWEEP_PARAMETERS[p].describe}>
            allowed {rangeText(p)} · {SWEEP_PARAMETERS[p].describe}
          </div>
          <div className="sweep-mode" role="radiogroup" aria-label="values as">
            <label className="check">
              <input type="radio" checked={axis.mode === 'range'} onChange={() => onChange({ ...axis, mode: 'range' })} /> lo / hi / steps
            </label>
            <label className="check">
              <input
                type="radio"
                checked={axis.mode === 'list'}
                onChange={() =>
                  onChange({ ...axis, mode: 'list', list: axis.list || [axis.lo, axis.hi].filter((s) => s.trim()).join(', ') })
                }
              />{' '}
              list
            </label>
          </div>
          {axis.mode === 'range' ? (
            <>
              <TextInput
                path={`${path}.lo`}
                label="lowest"
                unit={u}
                value={axis.lo}
                onChange={(lo) => onChange({ ...axis, lo })}
                issues={issuesAt(issues, `${path}.lo`)}
              />
              <TextInput
                path={`${path}.hi`}
                label="highest"
                unit={u}
                value={axis.hi}
                onChange={(hi) => onChange({ ...axis, hi })}
                issues={issuesAt(issues, `${path}.hi`)}
              />
              <TextInput
                path={`${path}.steps`}
                label="values"
                value={axis.steps}
                onChange={(steps) => onChange({ ...axis, steps })}
                issues={issuesAt(issues, `${path}.steps`)}
              />
            </>
          ) : (
            <div className="field">
              <label className="sweep-list">
                <span>values{u ? ` (${u})` : ''}, increasing, separated by commas</span>
                <input
                  className={`text ${issuesAt(issues, `${path}.values`).length ? 'invalid' : ''}`}
                  type="text"
                  aria-label="values"
                  data-path={`${path}.values`}
                  placeholder="0.1, 0.2, 0.4"
                  value={axis.list}
                  onChange={(e) => onChange({ ...axis, list: e.target.value })}
                />
              </label>
              <Issues list={issuesAt(issues, `${path}.values`)} />
            </div>
          )}
        </>
      )}
    </div>
  );
}

function SweepSetup() {
  const session = useSweepSession();
  const form = useSweepState((s) => s.form) ?? session.form();
  const phase = useSweepState((s) => s.phase);
  const scenario = useAppState((s) => s.scenario);
  const check = useSweepCheck();
  const set = (patch: Partial<SweepForm>) => session.setForm({ ...form, ...patch });
  const setAxis = (i: 0 | 1, a: SweepAxisForm) => {
    const axes: [SweepAxisForm, SweepAxisForm] = [...form.axes] as [SweepAxisForm, SweepAxisForm];
    axes[i] = a;
    set({ axes });
  };
  const all = scenarioControllers(scenario);
  const flown = flownControllers(form, scenario);
  const runs = Number(form.runs);
  const grid = check.issues.filter((i) => i.path === 'sweep.axes');
  return (
    <fieldset className="sweep-setup" disabled={isActive(phase)} data-testid="sweep-setup">
      <p className="muted sweep-intro">
        Each grid cell runs the scenario&apos;s study block (or the default one) as a seeded study of its own, with the cell&apos;s values
        written in. At most {MAX_AXIS_VALUES} values per axis and {MAX_SWEEP_CELLS.toLocaleString('en')} cells.
      </p>
      <AxisFields i={0} axis={form.axes[0]} issues={check.issues} onChange={(a) => setAxis(0, a)} />
      <AxisFields i={1} axis={form.axes[1]} issues={check.issues} onChange={(a) => setAxis(1, a)} />
      <div className="sub-head">Each cell</div>
      <TextInput
        path="sweep.runs"
        label="cases per cell"
        value={form.runs}
        onChange={(r) => set({ runs: r })}
        issues={issuesAt(check.issues, 'sweep.runs')}
      />
      <TextInput
        path="sweep.seed"
        label="sweep seed"
        value={form.seed}
        onChange={(s) => set({ seed: s })}
        issues={issuesAt(check.issues, 'sweep.seed')}
      />
      <div className="study-controllers" data-testid="sweep-controllers">
        <div className="sub-head">Controllers flown</div>
        {all.map((c) => {
          const on = flown.some((f) => f.id === c.id);
          return (
            <label key={c.id} className="check study-check">
              <input
                type="checkbox"
                checked={on}
                data-testid={`sweep-ctl-${c.id}`}
                onChange={(e) => {
                  const ids = flown.map((f) => f.id).filter((id) => id !== c.id);
                  set({ controllers: e.target.checked ? all.map((x) => x.id).filter((id) => id === c.id || ids.includes(id)) : ids });
                }}
              />
              {c.label} <span className="muted">{c.law}</span>
            </label>
          );
        })}
        <Issues list={issuesAt(check.issues, 'sweep.controllers')} />
      </div>
      <div className="sweep-grid-size" data-testid="sweep-grid-size">
        {check.cells !== null && Number.isInteger(runs) && runs > 0
          ? `${check.cells.toLocaleString('en')} cells × ${runs.toLocaleString('en')} cases × ${flown.length} controller${flown.length === 1 ? '' : 's'} = ${(check.cells * runs * flown.length).toLocaleString('en')} runs`
          : 'grid size: fix the fields above'}
      </div>
      <Issues list={grid} />
    </fieldset>
  );
}

function SweepResults() {
  const session = useSweepSession();
  const phase = useSweepState((s) => s.phase);
  const info = useSweepState((s) => s.info);
  const cells = useSweepState((s) => s.cells);
  const errors = useSweepState((s) => s.errors);
  const warnings = useSweepState((s) => s.warnings);
  const message = useSweepState((s) => s.message);
  const opening = useSweepState((s) => s.opening);
  const form = useSweepState((s) => s.form) ?? session.form();
  const forScenario = useSweepState((s) => s.scenario);
  const current = useAppState((s) => s.scenario === forScenario);
  const check = useSweepCheck();
  const level = levelOf(form);
  const active = isActive(phase);
  const result = useMemo(
    () => (info && cells.length ? session.resultAt(level ?? info.def.level) : null),
    // resultAt reads the session's info and cells
    [session, info, cells, level],
  );
  const levelIssues = issuesAt(check.issues, 'sweep.level');
  return (
    <div className="study-results" data-testid="sweep-results">
      {!active && check.issues.length > 0 && (
        <div className="study-errors blockers" data-testid="sweep-blockers">
          <div className="blockers-head">Running the sweep is disabled until these are fixed:</div>
          <ul>
            {check.issues.map((i) => (
              <li key={`${i.path}|${i.rule}`} data-rule={i.rule} data-path={i.path}>
                <code>{i.path || '(file)'}</code> {i.message} <span className="rule">[{i.rule}]</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {(phase === 'invalid' || phase === 'failed') && (errors.length > 0 || message) && (
        <div className="study-errors" data-testid="sweep-errors">
          <div className="blockers-head">{message}</div>
          <Issues list={errors} />
        </div>
      )}
      <RunWarnings warnings={warnings} from="the sweep" />
      <div className="sweep-level-row">
        <div className="field sweep-level">
          <FieldRow label="boundary at" unit="% settled">
            <input
              className={`num ${levelIssues.length ? 'invalid' : ''}`}
              type="text"
              inputMode="decimal"
              aria-label="boundary level, percent settled"
              data-path="sweep.level"
              data-testid="sweep-level"
              value={form.levelPct}
              onChange={(e) => session.setForm({ ...form, levelPct: e.target.value })}
            />
          </FieldRow>
          <Issues list={levelIssues} />
        </div>
        <span className="muted">The boundary is redrawn at once when the level changes; no cell is run again.</span>
      </div>
      {!result || !info ? (
        <div className="panel-empty">
          {active
            ? 'Waiting for the first cells…'
            : 'Set up the grid on the left and press Run sweep. The maps fill in cell by cell while the sweep runs.'}
        </div>
      ) : (
        <>
          {!current && (
            <div className="study-stale" data-testid="sweep-stale">
              These results are for an earlier version of the scenario; run the sweep again for the current one.
            </div>
          )}
          <div className="study-head-line">
            <strong>{info.scenarioName}</strong>
            <span className="muted">
              {' '}
              · {cells.length} of {info.cells} cells · {info.def.runs} cases per cell · seed {info.def.seed} · {fmt(info.durationS, 4)} s
              per case{!result.complete && !active && ' · incomplete'}
            </span>
          </div>
          <SweepLegend levelPct={(level ?? info.def.level) * 100} />
          <div className="sweep-maps" data-testid="sweep-maps">
            {info.controllers.map((c, ci) => (
              <SweepMap
                key={c.id}
                result={result}
                ci={ci}
                disabled={active || opening !== null}
                // the cell's scenario is built from the snapshot the sweep ran on, so it opens as it was flown
                onOpen={(cell, id) => void session.openCell(cell, id)}
              />
            ))}
          </div>
          <div className="map-caption">
            A tile per grid cell, coloured by the share of its cases that settled within the case duration (study rules). Hover a tile for
            its shares with 95 % intervals and its settle times; click it to open the cell&apos;s worst case for that controller as a normal
            run. The boundary joins the points where the settle share crosses the level, interpolated linearly between neighbouring cells.
          </div>
        </>
      )}
    </div>
  );
}

export function SweepWorkspace() {
  return (
    <>
      <SweepBar />
      <SweepProgressBar />
      <div className="study-body">
        <aside className="study-setup" aria-label="Sweep setup">
          <SweepSetup />
        </aside>
        <SweepResults />
      </div>
    </>
  );
}

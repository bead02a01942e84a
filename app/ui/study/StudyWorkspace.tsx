/**
 * The study workspace (design.md: it replaces the centre of the window while open): a bar with Run /
 * Cancel, the worker count, the progress and the exports; the setup form on the left; the
 * results on the right — shares per controller, the outcome map, the worst cases (each opens as
 * a normal run) and the histograms. Results fill in while the study runs.
 */
import { useEffect, useMemo } from 'react';
import type { ControllerSummary, StudySummary } from '../../engine/study';
import type { ShareReport } from '../../engine/math/stats';
import { DESKTOP_RUNS_LIMIT } from '../../engine/study/campaignFolder';
import { useAppState } from '../context';
import { fmt, pct } from '../format';
import { IssueText } from '../components/fields';
import { PALETTE } from '../plots/series';
import { ControllerKey, Histograms } from './Histograms';
import { OutcomeMap } from './OutcomeMap';
import { StudySetup } from './StudySetup';
import { SweepWorkspace, WorkspaceTabs } from './SweepWorkspace';
import { useSweepState } from './sweepRegistry';
import { useStudySession, useStudyState } from './registry';
import type { WorkerChoice } from './session';
import './studyWorkspace.css';
import { RunWarnings } from './RunWarnings';

function seconds(ms: number | null): string {
  if (ms === null || !Number.isFinite(ms)) return '—';
  const s = ms / 1000;
  if (s < 60) return `${s.toFixed(s < 10 ? 1 : 0)} s`;
  return `${Math.floor(s / 60)} min ${Math.round(s % 60)} s`;
}

const PHASE_TEXT: Record<string, string> = {
  idle: 'Not run yet',
  starting: 'Starting workers…',
  running: 'Running',
  cancelling: 'Cancelling — finishing the cases in progress…',
  done: 'Done',
  cancelled: 'Cancelled — finished cases kept',
  invalid: 'Cannot run',
  failed: 'Workers failed',
};

function ProgressBar() {
  const phase = useStudyState((s) => s.phase);
  const p = useStudyState((s) => s.progress);
  const info = useStudyState((s) => s.info);
  const workers = useStudyState((s) => s.workersUsed);
  const total = p?.total ?? info?.def.runs ?? 0;
  const done = p?.done ?? 0;
  const frac = total > 0 ? done / total : 0;
  const active = phase === 'starting' || phase === 'running' || phase === 'cancelling';
  const loadedFrom = useStudyState((s) => s.loadedFrom);
  if (phase === 'idle' || phase === 'invalid' || loadedFrom !== null) return null;
  const nC = info?.controllers.length ?? 0;
  return (
    <div className="study-progress-wrap">
      <div
        className={`study-progress ${active ? 'active' : ''}`}
        role="progressbar"
        aria-valuemin={0}
        aria-valuemax={100}
        aria-valuenow={Math.round(frac * 100)}
        data-testid="study-progress"
        data-done={done}
        data-total={total}
      >
        <div className="fill" style={{ width: `${(frac * 100).toFixed(2)}%` }} />
        <span className="label">{Math.floor(frac * 100)} %</span>
      </div>
      <span className="study-progress-text" data-testid="study-progress-text">
        {done} / {total} cases
        {nC > 0 && ` × ${nC} controller${nC === 1 ? '' : 's'}`} ·{' '}
        <span className={p && p.notSettled > 0 ? 'bad' : ''}>{p?.notSettled ?? 0} runs not settled</span>
        {p && p.unflyable > 0 && ` · ${p.unflyable} unflyable`}
        {active && ` · ${seconds(p?.remainingMs ?? null)} left`}
        {p && ` · ${seconds(p.elapsedMs)} elapsed`} · {workers} worker{workers === 1 ? '' : 's'}
      </span>
    </div>
  );
}

/** "Open results…": a summary.json from the CLI or a merged campaign, read in the page (File API). */
function OpenResultsButton({ disabled }: { disabled: boolean }) {
  const session = useStudySession();
  return (
    <label
      className={`small button-like ${disabled ? 'disabled' : ''}`}
      title="Open the summary.json of a study run elsewhere or of a merged campaign (slewsmith study merge)"
      data-testid="study-open-results-label"
    >
      Open results…
      <input
        type="file"
        accept=".json,application/json"
        hidden
        disabled={disabled}
        data-testid="study-open-results"
        onChange={(e) => {
          const input = e.currentTarget;
          const file = input.files?.[0];
          input.value = '';
          if (file) void file.text().then((text) => session.openResults(text, file.name));
        }}
      />
    </label>
  );
}

function StudyBar() {
  const session = useStudySession();
  const phase = useStudyState((s) => s.phase);
  const choice = useStudyState((s) => s.workerChoice);
  const setupOpen = useStudyState((s) => s.setupOpen);
  const hasResults = useStudyState((s) => s.summary !== null && s.info !== null);
  const loadedFrom = useStudyState((s) => s.loadedFrom);
  const runs = useAppState((s) => (s.scenario as { study?: { runs?: unknown } } | null)?.study?.runs);
  const validation = useAppState((s) => s.validation);
  const pipeline = useAppState((s) => s.pipeline);
  const scenario = useAppState((s) => s.scenario);
  // session.blockers() reads the store; recompute when what it reads changes.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const blockers = useMemo(() => session.blockers(), [session, validation, pipeline, scenario]);
  const active = phase === 'starting' || phase === 'running' || phase === 'cancelling';
  const n = session.workerCount(typeof runs === 'number' ? runs : 1);
  return (
    <div className="study-bar">
      <button
        className="small"
        onClick={() => session.setSetupOpen(!setupOpen)}
        data-testid="study-setup-toggle"
        title={setupOpen ? 'Hide the setup to widen the results' : 'Show the study setup'}
      >
        {setupOpen ? '◂ setup' : '▸ setup'}
      </button>
      <WorkspaceTabs />
      {!active ? (
        <button
          className="primary"
          onClick={() => void session.start()}
          disabled={blockers.length > 0}
          data-testid="study-run"
          title={blockers.length ? blockers[0]!.message : 'Run every case of the study block'}
        >
          Run study
        </button>
      ) : (
        <button
          className="primary danger"
          onClick={() => session.cancel()}
          disabled={phase === 'cancelling'}
          data-testid="study-cancel"
          title="Stop handing out cases; the finished ones are kept"
        >
          Cancel
        </button>
      )}
      <label className="study-workers" title="Web Workers the cases are split across (results do not depend on it)">
        workers
        <select
          value={String(choice)}
          disabled={active}
          onChange={(e) => session.setWorkerChoice((e.target.value === 'auto' ? 'auto' : Number(e.target.value)) as WorkerChoice)}
          data-testid="study-workers"
        >
          <option value="auto">auto ({n})</option>
          {[1, 2, 3, 4].map((k) => (
            <option key={k} value={k}>
              {k}
            </option>
          ))}
        </select>
      </label>
      <span className={`study-phase ${phase}`} data-testid="study-phase" data-phase={phase}>
        {PHASE_TEXT[phase]}
      </span>
      <span className="push-right" />
      <button
        className="small"
        disabled={active || blockers.length > 0}
        onClick={() => void session.saveCampaign()}
        data-testid="study-save-campaign"
        title="Save the study as a campaign for a cluster: one script that writes the campaign folder (scenario, Slurm job array and merge, README)"
      >
        Save as campaign…
      </button>
      <OpenResultsButton disabled={active} />
      <button
        className="small"
        disabled={!hasResults || active || loadedFrom !== null}
        onClick={() => void session.exportCases()}
        data-testid="study-export-csv"
        title="Per-case table: one row per case and controller"
      >
        Cases CSV
      </button>
      <button
        className="small"
        disabled={!hasResults || active}
        onClick={() => void session.exportSummary()}
        data-testid="study-export-json"
        title="Definition, per-controller summary and the outcome map"
      >
        Summary JSON
      </button>
      <button className="small" onClick={() => session.setOpen(false)} data-testid="study-close" title="Back to the 3D view and plots">
        Close
      </button>
    </div>
  );
}

/** A share with its 95 % interval: "1.2% · 0.6–2.4%" (Wilson score), "0.0% · ≤3.0%" at zero events (rule of three). */
export function shareText(r: ShareReport): string {
  if (r.of === 0) return '—';
  const range = r.ruleOfThreeHigh !== null ? `≤${pct(r.ruleOfThreeHigh)}` : `${pct(r.low)}–${pct(r.high)}`;
  return `${pct(r.share)} · ${range}`;
}

const shareTitle = (r: ShareReport) =>
  `${r.count} of ${r.of}; 95 % Wilson score interval ${pct(r.low)}–${pct(r.high)}` +
  (r.ruleOfThreeHigh !== null ? `; no event in ${r.of} runs: the rate is below ${pct(r.ruleOfThreeHigh)} at 95 % (rule of three)` : '');

const settleText = (v: number | null, c: ControllerSummary, s: StudySummary) =>
  v === null ? (c.settled > 0 ? `>${s.durationS}` : '—') : fmt(v, 3);

function SharesTable({ summary }: { summary: StudySummary }) {
  return (
    <table className="data-table study-shares" data-testid="study-shares">
      <thead>
        <tr>
          <th>controller</th>
          <th title="Cases flown (the rest: unflyable vehicles)">runs</th>
          <th title="Share that did not settle within the case length (or failed)">not settled</th>
          <th title="Share that unwound: driven to the far quaternion lift or an extra full turn">unwound</th>
          <th title="Share that ended on the far lift (turned through the 180° error attitude)">long way</th>
          <th title="Share with ≥ 1 logic jump or torque reversal per second in the busiest 10 s">chatter</th>
          <th title="Settle time median / 95th percentile, s">
            settle s<br />
            med / p95
          </th>
          <th title="95th percentile of the final error angle, deg">
            final err
            <br />
            p95 deg
          </th>
          <th title="95th percentile of the peak wheel momentum, % of the case limit">
            peak h<br />
            p95
          </th>
          <th title="95th percentile of the peak wheel torque, % of the case limit">
            peak τ<br />
            p95
          </th>
        </tr>
      </thead>
      <tbody>
        {summary.controllers.map((c, i) => (
          <tr key={c.controllerId} data-controller={c.controllerId}>
            <td className="ctl-name" title={`${c.label} [${c.controllerId}] · ${c.law}`}>
              <span className="swatch" style={{ background: PALETTE[i % PALETTE.length] }} /> {c.label}
            </td>
            <td className="num">{c.flyable}</td>
            <td
              className={`num ${c.shares.notSettled.count > 0 ? 'bad' : ''}`}
              data-testid={`share-unsettled-${c.controllerId}`}
              title={shareTitle(c.shares.notSettled)}
            >
              {shareText(c.shares.notSettled)}
            </td>
            <td
              className={`num ${c.shares.unwound.count > 0 ? 'bad' : ''}`}
              data-testid={`share-unwound-${c.controllerId}`}
              title={shareTitle(c.shares.unwound)}
            >
              {shareText(c.shares.unwound)}
            </td>
            <td className="num" title={shareTitle(c.shares.longWay)}>
              {shareText(c.shares.longWay)}
            </td>
            <td className="num" title={shareTitle(c.shares.chattered)}>
              {shareText(c.shares.chattered)}
            </td>
            <td className="num">
              {settleText(c.spreads.settleTimeS.median, c, summary)} / {settleText(c.spreads.settleTimeS.p95, c, summary)}
            </td>
            <td className="num">{fmt(c.spreads.finalErrorDeg.p95, 3)}</td>
            <td className="num">{pct(c.spreads.peakWheelMomentumFraction.p95)}</td>
            <td className="num">{pct(c.spreads.peakWheelTorqueFraction.p95)}</td>
          </tr>
        ))}
      </tbody>
    </table>
  );
}

const STATUS_TEXT: Record<string, string> = { settled: 'settled', unsettled: 'not settled', failed: 'failed', unflyable: 'unflyable' };

function WorstCases({ summary }: { summary: StudySummary }) {
  const session = useStudySession();
  const opening = useStudyState((s) => s.opening);
  const active = useStudyState((s) => s.phase === 'starting' || s.phase === 'running' || s.phase === 'cancelling');
  return (
    <div className="study-worst" data-testid="study-worst">
      <div className="study-card-head">
        Worst cases <span className="muted">· open one as a normal run</span>
      </div>
      {summary.controllers.map((c, i) => (
        <div key={c.controllerId} className="worst-block" data-controller={c.controllerId}>
          <div className="worst-head">
            <span className="swatch" style={{ background: PALETTE[i % PALETTE.length] }} /> {c.label}
          </div>
          {c.worst.length === 0 && <div className="muted">no flyable cases yet</div>}
          <table className="data-table worst-table">
            <tbody>
              {c.worst.map((w) => {
                const key = `${w.index}:${c.controllerId}`;
                const flags = [w.unwound && 'unwound', w.chattered && 'chattered'].filter(Boolean).join(', ');
                return (
                  <tr key={w.index} title={w.reason || undefined}>
                    <td className="num">#{w.index}</td>
                    <td className={w.status === 'settled' ? '' : 'bad'}>
                      {STATUS_TEXT[w.status] ?? w.status}
                      {flags && <span className="muted"> · {flags}</span>}
                    </td>
                    <td className="num">{w.settleTimeS === null ? '—' : `${fmt(w.settleTimeS, 3)} s`}</td>
                    <td className="num">{fmt(w.finalErrorDeg, 3)}°</td>
                    <td>
                      <button
                        className="small"
                        disabled={opening !== null || active}
                        onClick={() => void session.openCase(w.index, c.controllerId)}
                        data-testid={`open-case-${c.controllerId}-${w.index}`}
                        title={`Open case ${w.index} as a new untitled scenario with ${c.label} ticked`}
                      >
                        {opening === key ? 'opening…' : 'open'}
                      </button>
                    </td>
                  </tr>
                );
              })}
            </tbody>
          </table>
        </div>
      ))}
    </div>
  );
}

/** Cases × controllers of the document's study block (0 when it has none or it is not readable). */
function studyCaseRuns(scenario: unknown): number {
  const sc = scenario as { study?: { runs?: unknown; controllers?: unknown }; controllers?: unknown } | null;
  const runs = sc?.study?.runs;
  if (typeof runs !== 'number') return 0;
  const ids = Array.isArray(sc?.study?.controllers) ? sc.study.controllers : Array.isArray(sc?.controllers) ? sc.controllers : [];
  return runs * Math.max(1, ids.length);
}

function Results() {
  const summary = useStudyState((s) => s.summary);
  const info = useStudyState((s) => s.info);
  const map = useStudyState((s) => s.map);
  const phase = useStudyState((s) => s.phase);
  const errors = useStudyState((s) => s.errors);
  const warnings = useStudyState((s) => s.warnings);
  const message = useStudyState((s) => s.message);
  const forScenario = useStudyState((s) => s.scenario);
  const loadedFrom = useStudyState((s) => s.loadedFrom);
  const current = useAppState((s) => s.scenario === forScenario) || loadedFrom !== null;
  const nameNow = useAppState((s) => (s.scenario as { name?: unknown } | null)?.name);
  const session = useStudySession();
  const validation = useAppState((s) => s.validation);
  const pipeline = useAppState((s) => s.pipeline);
  const scenarioNow = useAppState((s) => s.scenario);
  // A missing block is offered in the setup; anything else that stops a run is listed here.
  // session.blockers() reads the store; recompute when what it reads changes.
  const blockers = useMemo(
    () => session.blockers().filter((b) => !(b.path === 'study' && b.rule === 'required')),
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [session, validation, pipeline, scenarioNow],
  );
  const active = phase === 'starting' || phase === 'running' || phase === 'cancelling';
  const caseRuns = studyCaseRuns(scenarioNow);
  return (
    <div className="study-results" data-testid="study-results">
      {caseRuns > DESKTOP_RUNS_LIMIT && (
        <div className="study-campaign-hint" data-testid="study-campaign-hint">
          This study is {caseRuns.toLocaleString('en')} runs (cases × controllers), more than the {DESKTOP_RUNS_LIMIT.toLocaleString('en')}{' '}
          a desktop finishes in reasonable time: use <strong>Save as campaign…</strong> to run it as a job array on a cluster, then{' '}
          <strong>Open results…</strong> with the merged summary.json.
        </div>
      )}
      {!active && blockers.length > 0 && (
        <div className="study-errors blockers" data-testid="study-blockers">
          <div className="blockers-head">Running the study is disabled until these are fixed:</div>
          <ul>
            {blockers.map((i) => (
              <li key={`${i.path}|${i.rule}`} data-rule={i.rule} data-path={i.path}>
                <code>{i.path || '(file)'}</code> {i.message} <span className="rule">[{i.rule}]</span>
              </li>
            ))}
          </ul>
        </div>
      )}
      {(phase === 'invalid' || phase === 'failed') && errors.length + (message ? 1 : 0) > 0 && blockers.length === 0 && (
        <div className="study-errors" data-testid="study-errors">
          <div className="blockers-head">{message}</div>
          <IssueText errors={errors} />
        </div>
      )}
      <RunWarnings warnings={warnings} from="the study" />
      {!summary || !info ? (
        phase === 'idle' || phase === 'invalid' ? (
          <div className="panel-empty">Set up the study on the left and press Run study. Results fill in here while the cases run.</div>
        ) : (
          <div className="panel-empty">Waiting for the first cases…</div>
        )
      ) : (
        <>
          {!current && (
            <div className="study-stale" data-testid="study-stale">
              These results are for {info.scenarioName === nameNow ? 'an earlier version of this scenario' : `“${info.scenarioName}”`}; run
              the study again for the current one.
            </div>
          )}
          {loadedFrom !== null && (
            <div className="study-loaded" data-testid="study-loaded-from">
              Results opened from <code>{loadedFrom}</code> (per-case rows stay in its cases.csv; a worst case re-flies from the scenario
              stored in the file).
            </div>
          )}
          <div className="study-head-line">
            <strong>{info.scenarioName}</strong>
            <span className="muted">
              {' '}
              · {summary.casesDone} of {summary.runsRequested} cases · seed {summary.seed} · {summary.mode} · {summary.durationS} s per case
              {summary.unflyableCases > 0 && ` · ${summary.unflyableCases} unflyable`}
              {summary.incomplete && phase !== 'running' && ' · incomplete'}
            </span>
          </div>
          <div className="table-scroll">
            <SharesTable summary={summary} />
          </div>
          <div className="study-mid">
            <OutcomeMap info={info} points={map} />
            <WorstCases summary={summary} />
          </div>
          <div className="study-card-head">
            Distributions <span className="muted">· runs per bin, one colour per controller</span>
            <ControllerKey summary={summary} />
          </div>
          <Histograms summary={summary} />
        </>
      )}
    </div>
  );
}

export function StudyWorkspace() {
  const session = useStudySession();
  const setupOpen = useStudyState((s) => s.setupOpen);
  const sweepOpen = useSweepState((s) => s.open);
  // Escape closes the view (when no field has focus).
  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      const t = e.target as HTMLElement | null;
      if (e.key === 'Escape' && !(t && /^(input|select|textarea)$/i.test(t.tagName))) session.setOpen(false);
    };
    window.addEventListener('keydown', onKey);
    return () => window.removeEventListener('keydown', onKey);
  }, [session]);
  return (
    <section className="study-workspace" aria-label="Robustness study" data-testid="study-workspace">
      {sweepOpen ? (
        <SweepWorkspace />
      ) : (
        <>
          <StudyBar />
          <ProgressBar />
          <div className={`study-body ${setupOpen ? '' : 'setup-hidden'}`}>
            {setupOpen && (
              <aside className="study-setup" aria-label="Study setup">
                <StudySetup />
              </aside>
            )}
            <Results />
          </div>
        </>
      )}
    </section>
  );
}

/**
 * Right column: run status with the reasons running is blocked, the plan summary per segment and
 * the comparison table (metrics as rows, runs as columns, the engine's best value marked). The
 * run checkboxes in the table header choose which runs the plots and the 3D view show.
 */
import { useMemo, useState } from 'react';
import type { ComparisonRow, PipelineOutput } from '../../engine/pipeline/types';
import { useApp, useAllIssues, useAppState } from '../context';
import { fmt, pct } from '../format';
import { DEG_PER_RAD, MILLI_PER_SI } from '../../engine/units';
import { COMPARISON_COLUMNS } from '../../engine/pipeline/comparison';

export function RunStatus() {
  const app = useApp();
  const pipeline = useAppState((s) => s.pipeline);
  const issues = useAllIssues();
  const excluded = useAppState((s) => s.excludedControllerIds);
  // app.blockers() reads the store; recompute when what it reads changes.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const blockers = useMemo(() => app.blockers(), [app, issues, excluded, pipeline]);
  const blocked = blockers.length > 0;
  const warnings = useAppState((s) => (s.outputScenario === s.scenario ? s.output?.warnings : undefined));
  const label =
    pipeline.status === 'waiting' || pipeline.status === 'running'
      ? 'Running…'
      : pipeline.status === 'done'
        ? `Up to date · ${pipeline.message}`
        : pipeline.status === 'failed'
          ? 'Engine failure'
          : blocked
            ? 'Cannot run'
            : 'Idle';
  return (
    <div className={`run-status ${blocked ? 'blocked' : ''}`} data-testid="run-status" data-status={pipeline.status}>
      <div className="run-line">
        <button
          className="primary"
          data-testid="run-button"
          disabled={blocked}
          onClick={() => app.command('run')}
          title="Re-plan and re-simulate now (Ctrl/Cmd+R); edits do this automatically"
        >
          Run
        </button>
        <span className={`status-text ${pipeline.status}`}>{label}</span>
      </div>
      {pipeline.status === 'failed' && <div className="issue error">{pipeline.message}</div>}
      {!blocked && warnings && warnings.length > 0 && (
        <details className="run-warnings" data-testid="run-warnings">
          <summary>
            {warnings.length} warning{warnings.length === 1 ? '' : 's'} from the engine
          </summary>
          <ul>
            {warnings.map((i) => (
              <li key={`${i.path}|${i.rule}`} data-rule={i.rule}>
                <code>{i.path || '(file)'}</code> {i.message}
              </li>
            ))}
          </ul>
        </details>
      )}
      {blocked && (
        <div className="blockers" data-testid="blockers">
          <div className="blockers-head">Running is disabled until these are fixed:</div>
          <ul>
            {blockers.map((i) => (
              <li key={`${i.path}|${i.rule}`} data-rule={i.rule} data-path={i.path}>
                <code>{i.path || '(file)'}</code> {i.message} <span className="rule">[{i.rule}]</span>
              </li>
            ))}
          </ul>
        </div>
      )}
    </div>
  );
}

const BINDING_TEXT: Record<string, string> = { torque: 'torque', momentum: 'momentum', 'slew-rate': 'slew rate', none: '—' };

export function PlanSummary() {
  const output = useAppState((s) => s.output);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  if (!output) return <div className="panel-empty">No plan yet.</div>;
  const plan = output.plan;
  return (
    <div className={`plan ${current ? '' : 'stale'}`} data-testid="plan-summary">
      <div className="panel-head">
        Plan <span className={plan.feasible ? 'good' : 'bad'}>{plan.feasible ? 'feasible' : 'NOT feasible'}</span>
        <span className="muted"> · total {fmt(plan.totalTimeS, 4)} s</span>
      </div>
      <table className="data-table plan-table">
        <thead>
          <tr>
            <th>#</th>
            <th>target</th>
            <th title="Slew angle, deg">
              angle
              <br />
              deg
            </th>
            <th title="Slew time, s">
              slew
              <br />s
            </th>
            <th>binds</th>
            <th title="Peak torque as a fraction of the envelope">τ</th>
            <th title="Peak momentum as a fraction of the envelope">h</th>
          </tr>
        </thead>
        <tbody>
          {plan.segments.map((g) => (
            <tr key={g.index} className={g.feasible ? '' : 'infeasible'} title={g.reason}>
              <td>{g.index + 1}</td>
              <td className="wrap">
                {g.label}
                {!g.feasible && <div className="issue error">{g.reason}</div>}
                {g.rollFree && (
                  <div className="muted" data-testid={`plan-roll-free-${g.index}`}>
                    {g.rollFree.summary}
                  </div>
                )}
              </td>
              <td className="num">{fmt(g.angleRad * DEG_PER_RAD, 4)}</td>
              <td className="num">{fmt(g.slewTimeS, 4)}</td>
              <td>{BINDING_TEXT[g.binding] ?? g.binding}</td>
              <td className="num">{pct(g.peakTorqueFraction)}</td>
              <td className="num">{pct(g.peakMomentumFraction)}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** How each comparison column is shown (the columns, their units and definitions come from the engine). */
const SHOW: Partial<Record<keyof ComparisonRow, (r: ComparisonRow) => string>> = {
  status: (r) => r.status,
  settleTimeS: (r) => (r.settleTimeS === null ? 'never' : fmt(r.settleTimeS, 4)),
  trackingErrorPeakDeg: (r) => fmt(r.trackingErrorPeakDeg, 3),
  trackingErrorRmsDeg: (r) => fmt(r.trackingErrorRmsDeg, 3),
  rotationTravelledDeg: (r) => fmt(r.rotationTravelledDeg, 4),
  shortestRotationDeg: (r) => fmt(r.shortestRotationDeg, 4),
  unwound: (r) => (r.unwound ? 'yes' : 'no'),
  jumps: (r) => String(r.jumps),
  chatterPerS: (r) => fmt(r.chatterPerS, 3),
  peakWheelTorqueFraction: (r) => pct(r.peakWheelTorqueFraction),
  peakWheelMomentumFraction: (r) => pct(r.peakWheelMomentumFraction),
  controlEffortNms: (r) => fmt(r.controlEffortNms * MILLI_PER_SI, 4),
  finalErrorDeg: (r) => fmt(r.finalErrorDeg, 3),
  monitorViolations: (r) => String(r.monitorViolations),
};

const METRICS = COMPARISON_COLUMNS.map((c) => ({
  key: c.key,
  label: c.label,
  unit: c.unit === '%' ? '' : c.unit,
  help: `${c.definition} Source: ${c.source}.`,
  show: SHOW[c.key] ?? ((r: ComparisonRow) => String(r[c.key])),
}));

export function ComparisonTable() {
  const app = useApp();
  const [wide, setWide] = useState(false);
  const output: PipelineOutput | null = useAppState((s) => s.output);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const selected = useAppState((s) => s.selectedRunKeys);
  if (!output) return <div className="panel-empty">No runs yet.</div>;
  const rows = output.comparison;
  const toggle = (key: string, on: boolean) => {
    const next = on ? [...selected, key] : selected.filter((k) => k !== key);
    app.store.selectRuns(next);
  };
  return (
    <div className={`comparison ${current ? '' : 'stale'} ${wide ? 'wide' : ''}`} data-testid="comparison">
      <div className="panel-head">
        Comparison <span className="muted">· ★ best per metric · tick runs to plot</span>
        <button
          className="small push-right"
          onClick={() => setWide(!wide)}
          title={wide ? 'Back to the side column' : 'Show every run side by side over the plots'}
          data-testid="comparison-wide"
        >
          {wide ? 'narrow' : 'widen'}
        </button>
      </div>
      <div className="table-scroll">
        <table className="data-table comparison-table">
          <thead>
            <tr>
              <th>metric</th>
              {rows.map((r) => (
                <th key={r.key} className={`run-col ${selected[0] === r.key ? 'detail' : ''}`} data-run={r.key}>
                  <label
                    className="check"
                    title={`${r.label} (${r.mode}) — ${selected[0] === r.key ? 'shown in the detail plots' : 'tick to show in plots and 3D'}`}
                  >
                    <input
                      type="checkbox"
                      checked={selected.includes(r.key)}
                      onChange={(e) => toggle(r.key, e.target.checked)}
                      data-testid={`show-${r.key}`}
                    />
                    <span className="run-name">{r.label}</span>
                  </label>
                  <div className="run-mode muted">{r.mode}</div>
                  {selected.includes(r.key) && selected[0] !== r.key && (
                    <button
                      className="link"
                      onClick={() => app.store.selectRuns([r.key, ...selected.filter((k) => k !== r.key)])}
                      title="Show this run in the detail plots"
                    >
                      detail
                    </button>
                  )}
                </th>
              ))}
            </tr>
          </thead>
          <tbody>
            {METRICS.map((m) => {
              const best = output.best[m.key];
              return (
                <tr key={m.key} title={m.help}>
                  <th className="metric">
                    {m.label}
                    {m.unit && <span className="unit"> {m.unit}</span>}
                  </th>
                  {rows.map((r) => (
                    <td
                      key={r.key}
                      className={`num ${best === r.key ? 'best' : ''} ${m.key === 'status' && r.verdict !== 'settled' ? 'bad' : ''}`}
                      data-best={best === r.key ? 'true' : undefined}
                    >
                      {m.show(r)}
                      {best === r.key && (
                        <span className="star" aria-label="best">
                          {' '}
                          ★
                        </span>
                      )}
                    </td>
                  ))}
                </tr>
              );
            })}
          </tbody>
        </table>
      </div>
    </div>
  );
}

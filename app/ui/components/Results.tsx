/**
 * Right column: run status with the reasons running is blocked, the plan summary per segment and
 * the comparison table (metrics as rows, runs as columns, the engine's best value marked). The
 * run checkboxes in the table header choose which runs the plots and the 3D view show.
 */
import { useMemo, useState } from 'react';
import type { ComparisonRow, PipelineOutput } from '../../engine/pipeline/types';
import { useApp, useAllIssues, useAppState } from '../context';
import { fmt, pct } from '../format';
import { DEG_PER_RAD } from '../../engine/units';

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

interface Metric {
  key: keyof ComparisonRow;
  label: string;
  unit: string;
  show: (r: ComparisonRow) => string;
}

const METRICS: Metric[] = [
  { key: 'status', label: 'Outcome', unit: '', show: (r) => r.status },
  { key: 'settleTimeS', label: 'Settle time', unit: 's', show: (r) => (r.settleTimeS === null ? 'never' : fmt(r.settleTimeS, 4)) },
  { key: 'rotationTravelledDeg', label: 'Travelled', unit: 'deg', show: (r) => fmt(r.rotationTravelledDeg, 4) },
  { key: 'shortestRotationDeg', label: 'Shortest', unit: 'deg', show: (r) => fmt(r.shortestRotationDeg, 4) },
  { key: 'unwound', label: 'Unwound', unit: '', show: (r) => (r.unwound ? 'yes' : 'no') },
  { key: 'jumps', label: 'Jumps', unit: '', show: (r) => String(r.jumps) },
  { key: 'chatterPerS', label: 'Chatter', unit: '1/s', show: (r) => fmt(r.chatterPerS, 3) },
  { key: 'peakWheelTorqueFraction', label: 'Peak τ wheel', unit: '', show: (r) => pct(r.peakWheelTorqueFraction) },
  { key: 'peakWheelMomentumFraction', label: 'Peak h wheel', unit: '', show: (r) => pct(r.peakWheelMomentumFraction) },
  { key: 'controlEffortNms', label: 'Effort ∫|τ|', unit: 'mN·m·s', show: (r) => fmt(r.controlEffortNms * 1e3, 4) },
  { key: 'finalErrorDeg', label: 'Final error', unit: 'deg', show: (r) => fmt(r.finalErrorDeg, 3) },
  { key: 'monitorFlags', label: 'W flags', unit: '', show: (r) => String(r.monitorFlags) },
];

/** What each metric means, shown as the row's tooltip. */
const METRIC_HELP: Partial<Record<keyof ComparisonRow, string>> = {
  settleTimeS: 'Earliest time after which the error angle and rate error stay inside the settle thresholds',
  rotationTravelledDeg: 'Total rotation travelled by the body (sum over segments)',
  shortestRotationDeg: 'Sum of the shortest rotations from each segment start to its target',
  unwound: 'A segment travelled more than 180° beyond the shortest rotation',
  jumps: 'Logic jumps of the hybrid controller',
  chatterPerS: 'Largest rate of logic jumps and torque sign reversals in a sliding window',
  peakWheelTorqueFraction: 'Largest wheel torque as a fraction of its limit',
  peakWheelMomentumFraction: 'Largest wheel momentum as a fraction of its limit',
  controlEffortNms: 'Integral of the delivered body torque magnitude',
  finalErrorDeg: 'Error angle at the end of the run',
  monitorFlags: 'Intervals where the Lyapunov value W rose on a flow or a jump fell short',
};

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
                <tr key={m.key} title={METRIC_HELP[m.key]}>
                  <th className="metric">
                    {m.label}
                    {m.unit && <span className="unit"> {m.unit}</span>}
                  </th>
                  {rows.map((r) => (
                    <td
                      key={r.key}
                      className={`num ${best === r.key ? 'best' : ''} ${m.key === 'status' && r.status !== 'completed' ? 'bad' : ''}`}
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

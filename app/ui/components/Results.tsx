/**
 * Right column: run status with the reasons running is blocked (one per field, in the form's
 * words), the plan summary per segment and the comparison table (ComparisonTable.tsx).
 */
import { useMemo } from 'react';
import { useApp, useAllIssues, useAppState } from '../context';
import { fmt, pct } from '../format';
import { DEG_PER_RAD } from '../../engine/units';
import type { PipelineOutput } from '../../engine/pipeline/types';
import { presentIssues, sentence } from '../issues/present';
import { PartialNote } from './PartialNote';

export { ComparisonTable } from './ComparisonTable';

export function RunStatus() {
  const app = useApp();
  const pipeline = useAppState((s) => s.pipeline);
  const issues = useAllIssues();
  const excluded = useAppState((s) => s.excludedControllerIds);
  // app.blockers() reads the store; recompute when what it reads changes.
  // eslint-disable-next-line react-hooks/exhaustive-deps
  const blockers = useMemo(() => app.blockers(), [app, issues, excluded, pipeline]);
  const blocked = blockers.length > 0;
  // A partial pass's warnings are not final: the count waits for the whole pass (PartialNote says so).
  const warnings = useAppState((s) => (s.outputScenario === s.scenario && !s.partial ? s.output?.warnings : undefined));
  const partial = useAppState((s) => s.partial);
  const hadWarnings = useAppState((s) => (s.completeOutput?.warnings.length ?? 0) > 0);
  const scenario = useAppState((s) => s.scenario);
  const shownBlockers = useMemo(() => presentIssues(blockers, scenario), [blockers, scenario]);
  const shownWarnings = useMemo(() => presentIssues(warnings ?? [], scenario), [warnings, scenario]);
  const label =
    pipeline.status === 'waiting' || pipeline.status === 'running'
      ? partial
        ? `Running… ${partial.done} of ${partial.total} runs shown`
        : 'Running…'
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
      {/* In place of the warnings line while the pass is partial (the status line says "n of m runs" too). */}
      {!blocked && partial && hadWarnings && <PartialNote what="warnings" />}
      {!blocked && warnings && warnings.length > 0 && (
        <details className="run-warnings" data-testid="run-warnings">
          <summary>
            {shownWarnings.length} warning{shownWarnings.length === 1 ? '' : 's'} from the engine
          </summary>
          <ul>
            {shownWarnings.map((p) => (
              <li key={p.path} data-rule={p.rule} data-path={p.path}>
                <strong>{p.title}:</strong> {sentence(p.text)}
                {p.more.length > 0 && <span className="muted"> (+{p.more.length} related)</span>}
              </li>
            ))}
          </ul>
        </details>
      )}
      {blocked && (
        <div className="blockers" data-testid="blockers">
          <div className="blockers-head">Running is disabled until these are fixed:</div>
          <ul>
            {shownBlockers.map((p) => (
              <li key={p.path} data-rule={p.rule} data-path={p.path}>
                <strong className="issue-field">{p.title}:</strong> {sentence(p.text)}
                {p.suggestion && <span className="issue-suggest"> Suggested: {p.suggestion}.</span>}{' '}
                <span className="rule">[{p.rule}]</span>
                {p.more.length > 0 && (
                  <span className="muted">
                    {' '}
                    (+{p.more.length} related finding{p.more.length === 1 ? '' : 's'}, listed beside the field)
                  </span>
                )}
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
      <PlanConstraints output={output} />
    </div>
  );
}

/** Each constraint's smallest planned margin and whether the planned reference violates it. */
function PlanConstraints({ output }: { output: PipelineOutput }) {
  const report = output.plan.constraints;
  if (!report || report.constraints.length === 0) return null;
  return (
    <table className="data-table plan-table" data-testid="plan-constraints">
      <thead>
        <tr>
          <th>constraint</th>
          <th title="Smallest margin of the planned reference to the cone edge beyond its margin, deg">
            min margin
            <br />
            deg
          </th>
          <th title="When the smallest margin occurs, s from the epoch">
            at
            <br />s
          </th>
          <th>plan</th>
        </tr>
      </thead>
      <tbody>
        {report.constraints.map((c) => {
          const violated = c.intervals.length > 0;
          const checked = Number.isFinite(c.minMarginRad);
          return (
            <tr key={c.name} className={violated ? 'infeasible' : ''} data-constraint={c.name}>
              <td className="wrap">
                {c.name} <span className="muted">({c.kind})</span>
              </td>
              <td className="num">{checked ? fmt(c.minMarginRad * DEG_PER_RAD, 3) : '–'}</td>
              <td className="num">{checked ? fmt(c.minAtS, 4) : '–'}</td>
              <td className={violated ? 'bad' : 'good'}>
                {!checked ? 'outside its window' : violated ? `violated ${fmt(c.violatedS, 3)} s` : 'clear'}
              </td>
            </tr>
          );
        })}
      </tbody>
    </table>
  );
}

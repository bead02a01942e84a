/** Maneuver editor: the initial state and the ordered target list with hold times. */
import { useApp, useAppState, useIssuesAt, useIssuesUnder, useScenarioValue } from '../context';
import { fmt } from '../format';
import { AttitudeEditor } from './AttitudeEditor';
import { TrackEditor, WindowFields } from '../orbit/TrackEditor';
import { TargetKindChoice } from '../orbit/TargetKindChoice';
import { PRIMARY_AXIS } from '../../engine/scenario/pointingOnly';
import { IssueText, NumberField, NumberInput, Section, TextField, VectorField } from './fields';

type Obj = Record<string, unknown>;
const NONE: string[] = [];

function wheelCountOf(scenario: unknown): number {
  const w = ((scenario as Obj)?.vehicle as Obj | undefined)?.wheels as Obj | undefined;
  if (!w) return 0;
  if (w.layout === 'pyramid') return 4;
  if (w.layout === 'triad') return 3;
  return Array.isArray(w.wheels) ? w.wheels.length : 0;
}

function InitialEditor() {
  const app = useApp();
  const h0 = useScenarioValue('initial.wheelMomentumMNms');
  const h0Issues = useIssuesUnder('initial.wheelMomentumMNms', NONE);
  const n = useAppState((s) => wheelCountOf(s.scenario));
  return (
    <div className="initial" data-testid="initial-editor">
      <div className="sub-head">Initial state</div>
      <AttitudeEditor path="initial.attitude" chainIndex={0} allowRelative={false} />
      <VectorField path="initial.bodyRateDegPerS" label="Body rate" unit="deg/s" />
      <label className="check">
        <input
          type="checkbox"
          checked={Array.isArray(h0)}
          onChange={(e) =>
            app.store.edit('initial.wheelMomentumMNms', e.target.checked ? new Array(n).fill(0) : undefined, {
              label: 'Initial wheel momentum',
              coalesceKey: null,
            })
          }
        />{' '}
        initial wheel momentum (else zero)
      </label>
      {Array.isArray(h0) && (
        <div className="field">
          <div className="field-row">
            <span className="field-label">h₀ per wheel</span>
            <span className="field-control vecn">
              {h0.map((_, i) => (
                <NumberFieldInline key={i} path={`initial.wheelMomentumMNms[${i}]`} label={`wheel ${i + 1}`} />
              ))}
            </span>
            <span className="field-unit">mN·m·s</span>
          </div>
          <IssueText errors={h0Issues} />
        </div>
      )}
    </div>
  );
}

function NumberFieldInline({ path, label }: { path: string; label: string }) {
  return <NumberInput path={path} ariaLabel={label} showIssues={false} />;
}

/** Pointing only (roll free): offered on attitude forms that name a pointed body axis (scenario/pointingOnly.ts). */
function RollFreeCheck({ i, attitude }: { i: number; attitude: unknown }) {
  const app = useApp();
  const path = `targets[${i}].rollFree`;
  const on = useScenarioValue(path) === true;
  const forms = Object.keys(PRIMARY_AXIS);
  const form = attitude && typeof attitude === 'object' ? Object.keys(attitude as Obj)[0] : undefined;
  const allowed = form !== undefined && forms.includes(form);
  return (
    <label
      className="check"
      title={`Only the primary body axis must reach its direction; the roll about it is free and the slew is the shortest rotation that carries the axis there. Needs a form with a pointed axis (${forms.join(', ')}).`}
    >
      <input
        type="checkbox"
        data-testid={`roll-free-${i}`}
        checked={on}
        disabled={!allowed && !on}
        onChange={(e) => app.store.edit(path, e.target.checked ? true : undefined, { label: 'Pointing only', coalesceKey: null })}
      />{' '}
      pointing only (roll free)
    </label>
  );
}

function TargetCard({ i, count }: { i: number; count: number }) {
  const app = useApp();
  const target = useScenarioValue(`targets[${i}]`) as Obj | undefined;
  const seg = useAppState((s) => s.output?.plan.segments[i]);
  const issues = useIssuesUnder(`targets[${i}]`, NONE);
  const move = (d: -1 | 1) => {
    const list = (app.store.getState().scenario as Obj).targets as Obj[];
    const next = list.slice();
    const [t] = next.splice(i, 1);
    next.splice(i + d, 0, t!);
    app.store.edit('targets', next, { label: `Move target ${i + 1}`, coalesceKey: null });
  };
  const remove = () => {
    const list = (app.store.getState().scenario as Obj).targets as Obj[];
    app.store.edit(
      'targets',
      list.filter((_, k) => k !== i),
      { label: `Remove target ${i + 1}`, coalesceKey: null },
    );
  };
  return (
    <details className={`target ${issues.length ? 'has-issues' : ''}`} open={count <= 4} data-testid={`target-${i}`}>
      <summary>
        <span className="target-no">{i + 1}</span>
        <span className="target-label">{String(target?.label ?? '')}</span>
        <span className="target-meta">
          {seg ? `${fmt(seg.slewTimeS, 3)} s slew` : ''}
          {seg && !seg.feasible ? ' · infeasible' : ''}
        </span>
        <span className="target-buttons">
          <button className="icon" title="Move up" disabled={i === 0} onClick={(e) => (e.preventDefault(), move(-1))}>
            ↑
          </button>
          <button className="icon" title="Move down" disabled={i === count - 1} onClick={(e) => (e.preventDefault(), move(1))}>
            ↓
          </button>
          <button className="icon" title="Remove target" disabled={count <= 1} onClick={(e) => (e.preventDefault(), remove())}>
            ×
          </button>
        </span>
      </summary>
      <TextField path={`targets[${i}].label`} label="Label" />
      <TargetKindChoice i={i} />
      {target?.track !== undefined ? (
        <TrackEditor i={i} />
      ) : (
        <>
          <AttitudeEditor path={`targets[${i}].attitude`} chainIndex={i + 1} allowRelative />
          <RollFreeCheck i={i} attitude={target?.attitude} />
          <WindowFields i={i} passes={false} onlyWithOrbit />
        </>
      )}
      <NumberField path={`targets[${i}].holdS`} label="Hold" unit="s" step={5} />
      {seg?.rollFree && (
        <div className="derived" data-testid={`roll-free-saving-${i}`}>
          {seg.rollFree.summary}
        </div>
      )}
    </details>
  );
}

export function ManeuverPanel() {
  const app = useApp();
  const count = useAppState((s) => (Array.isArray((s.scenario as Obj)?.targets) ? ((s.scenario as Obj).targets as unknown[]).length : 0));
  const listIssues = useIssuesAt('targets').errors;
  const add = () => {
    const list = ((app.store.getState().scenario as Obj).targets as Obj[]) ?? [];
    const holdS = (list[list.length - 1]?.holdS as number) ?? 30;
    app.store.edit(
      'targets',
      [...list, { label: `Target ${list.length + 1}`, attitude: { relative: { axis: [0, 0, 1], angleDeg: 30 } }, holdS }],
      {
        label: 'Add target',
        coalesceKey: null,
      },
    );
  };
  return (
    <Section title="Maneuver" testId="maneuver-panel">
      <InitialEditor />
      <div className="sub-head">
        Targets <span className="muted">({count}, visited in order)</span>
      </div>
      {Array.from({ length: count }, (_, i) => (
        <TargetCard key={i} i={i} count={count} />
      ))}
      <IssueText errors={listIssues} />
      <button className="small" onClick={add} disabled={count >= 1000}>
        + target
      </button>
    </Section>
  );
}

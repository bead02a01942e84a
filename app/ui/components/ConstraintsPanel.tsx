/**
 * Constraints editor: the scenario's `constraints` list (keep-out and keep-in cones on a body
 * axis against a direction). Every edit goes through the store as one undo step; the engine's
 * messages appear beside the field they name (issues/fieldLabels.ts has the same labels).
 */
import { useApp, useAppState, useIssuesAt, useIssuesUnder, useScenarioValue } from '../context';
import { fmt } from '../format';
import { DEG_PER_RAD } from '../../engine/units';
import { IssueText, NumberField, SelectField, TextField, VectorField, Section } from './fields';
import { CONSTRAINT_FIELDS, DIRECTION_CHOICES, directionDefaults, newConstraint } from '../constraintForms';

type Obj = Record<string, unknown>;

/** Paths every field of a card shows itself; anything else under the card is listed at its foot. */
function shownPaths(p: string): string[] {
  const own = ['name', 'kind', 'halfAngleDeg', 'marginDeg', 'window.startS', 'window.endS', 'direction.kind'];
  const vec = ['bodyAxis', 'direction.inertialDirection'].flatMap((k) => [k, `${k}[0]`, `${k}[1]`, `${k}[2]`]);
  const site = ['direction.latitudeDeg', 'direction.longitudeDeg', 'direction.altitudeM'];
  return [...own, ...vec, ...site].map((k) => `${p}.${k}`);
}

function list(app: ReturnType<typeof useApp>): Obj[] {
  const l = (app.store.getState().scenario as Obj).constraints;
  return Array.isArray(l) ? (l as Obj[]) : [];
}

function ConstraintCard({ i }: { i: number }) {
  const app = useApp();
  const p = `constraints[${i}]`;
  const c = useScenarioValue(p) as Obj | undefined;
  const direction = (c?.direction ?? {}) as Obj;
  const dirKind = typeof direction.kind === 'string' ? direction.kind : 'fixed';
  const window = c?.window;
  const rest = useIssuesUnder(p, shownPaths(p));
  const planned = useAppState((s) => (s.outputScenario === s.scenario ? s.output?.plan.constraints : undefined));
  const name = typeof c?.name === 'string' ? c.name : '';
  const outcome = planned?.constraints.find((o) => o.name === name);
  const remove = () =>
    app.store.edit(
      'constraints',
      list(app).filter((_, k) => k !== i),
      { label: `Remove constraint ${i + 1}`, coalesceKey: null },
    );
  return (
    <details className={`target ${rest.length ? 'has-issues' : ''}`} open data-testid={`constraint-${i}`}>
      <summary>
        <span className="target-no">{i + 1}</span>
        <span className="target-label">{name}</span>
        <span className="target-meta" data-testid={`constraint-plan-${i}`}>
          {outcome && Number.isFinite(outcome.minMarginRad)
            ? `plan margin ${fmt(outcome.minMarginRad * DEG_PER_RAD, 3)}°${outcome.intervals.length ? ' · violated' : ''}`
            : ''}
        </span>
        <span className="target-buttons">
          <button className="icon" title="Remove constraint" onClick={(e) => (e.preventDefault(), remove())}>
            ×
          </button>
        </span>
      </summary>
      <TextField path={`${p}.name`} label={CONSTRAINT_FIELDS.name} />
      <SelectField
        path={`${p}.kind`}
        label={CONSTRAINT_FIELDS.kind}
        choices={[
          { value: 'keep-out', label: 'Keep out (stay outside the cone)' },
          { value: 'keep-in', label: 'Keep in (stay inside the cone)' },
        ]}
      />
      <VectorField path={`${p}.bodyAxis`} label={CONSTRAINT_FIELDS.bodyAxis} />
      <NumberField path={`${p}.halfAngleDeg`} label={CONSTRAINT_FIELDS.halfAngleDeg} unit="deg" step={1} />
      <NumberField
        path={`${p}.marginDeg`}
        label={CONSTRAINT_FIELDS.marginDeg}
        unit="deg"
        step={1}
        title="Extra clearance: widens a keep-out cone, narrows a keep-in cone"
      />
      <SelectField
        label={CONSTRAINT_FIELDS.direction}
        value={dirKind}
        choices={DIRECTION_CHOICES}
        path={`${p}.direction.kind`}
        onChoose={(v) =>
          app.store.edit(`${p}.direction`, directionDefaults(v), { label: `Constraint ${i + 1} direction: ${v}`, coalesceKey: null })
        }
      />
      {dirKind === 'fixed' && <VectorField path={`${p}.direction.inertialDirection`} label={CONSTRAINT_FIELDS.inertialDirection} />}
      {dirKind === 'ground-station' && (
        <>
          <NumberField path={`${p}.direction.latitudeDeg`} label={CONSTRAINT_FIELDS.latitudeDeg} unit="deg" />
          <NumberField path={`${p}.direction.longitudeDeg`} label={CONSTRAINT_FIELDS.longitudeDeg} unit="deg" />
          <NumberField path={`${p}.direction.altitudeM`} label={CONSTRAINT_FIELDS.altitudeM} unit="m" />
        </>
      )}
      <label className="check">
        <input
          type="checkbox"
          data-testid={`constraint-window-${i}`}
          checked={window !== undefined}
          onChange={(e) =>
            app.store.edit(`${p}.window`, e.target.checked ? { startS: 0, endS: 60 } : undefined, {
              label: e.target.checked ? 'Add constraint window' : 'Remove constraint window',
              coalesceKey: null,
            })
          }
        />{' '}
        only within a time window (else always)
      </label>
      {window !== undefined && (
        <>
          <NumberField path={`${p}.window.startS`} label={CONSTRAINT_FIELDS.startS} unit="s" />
          <NumberField path={`${p}.window.endS`} label={CONSTRAINT_FIELDS.endS} unit="s" />
        </>
      )}
      <IssueText errors={rest} />
    </details>
  );
}

export function ConstraintsPanel() {
  const app = useApp();
  const count = useAppState((s) => {
    const l = (s.scenario as Obj)?.constraints;
    return Array.isArray(l) ? l.length : 0;
  });
  const listIssues = useIssuesAt('constraints').errors;
  const add = () => {
    const l = list(app);
    app.store.edit('constraints', [...l, newConstraint(l)], { label: 'Add constraint', coalesceKey: null });
  };
  return (
    <Section title="Constraints" testId="constraints-panel">
      <div className="sub-head">
        Keep-out and keep-in cones <span className="muted">({count})</span>
      </div>
      {Array.from({ length: count }, (_, i) => (
        <ConstraintCard key={i} i={i} />
      ))}
      <IssueText errors={listIssues} />
      <button className="small" onClick={add} disabled={count >= 50} data-testid="add-constraint">
        + constraint
      </button>
    </Section>
  );
}

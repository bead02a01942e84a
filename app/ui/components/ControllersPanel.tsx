/**
 * Controllers to compare: a checkbox per controller (unchecked ones are left out of the run),
 * law and gains editors, and for the synergistic law the certificate badge from the engine.
 */
import type { CertificateSummary } from '../../engine/pipeline/types';
import { CONTROL_LAWS } from '../../engine/scenario/schema';
import { useAllIssues, useApp, useAppState, useIssuesAt, useScenarioValue } from '../context';
import { fmt } from '../format';
import { IssueText, NumberField, Section, SelectField, TextField, VectorField } from './fields';

type Obj = Record<string, unknown>;

const LAW_LABELS: Record<string, string> = {
  'quaternion-pd': 'Quaternion PD (smooth)',
  'sign-switch': 'Sign switch (memoryless)',
  eigenaxis: 'Eigenaxis, rate-limited',
  hysteretic: 'Hysteretic hybrid (h ∈ {−1, 1})',
  synergistic: 'Synergistic hybrid (warped potentials)',
};

/** Starting values for the fields a law adds (from the demo scenario's choices). */
const LAW_DEFAULTS: Record<string, Obj> = {
  'quaternion-pd': {},
  'sign-switch': {},
  eigenaxis: { maxRateDegPerS: 3 },
  hysteretic: { hysteresis: 0.2 },
  synergistic: { potentialWeights: [0.125, 0.25, 0.375], warpGain: 1.2, hysteresis: 0.025 },
};
const LAW_KEYS = ['maxRateDegPerS', 'hysteresis', 'potentialWeights', 'potentialAxes', 'warpGain', 'warpDirections'];

export function CertificateBadge({ id, compared, base }: { id: string; compared: boolean; base: string }) {
  const cert: CertificateSummary | undefined = useAppState((s) => s.output?.certificates.find((c) => c.controllerId === id));
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const all = useAllIssues();
  // The engine refuses a law it cannot certify (e.g. δ not below δ*): say so rather than show the
  // last run's verdict.
  const refusal = all.find((i) => i.path === base || i.path.startsWith(`${base}.`) || i.path.startsWith(`${base}[`));
  if (!compared) return <div className="cert none">Certificate: not computed (controller not compared)</div>;
  if (refusal)
    return (
      <div className="cert bad" data-testid={`certificate-${id}`}>
        <span className="cert-verdict">not certified</span>
        <div className="cert-msg">{refusal.message}</div>
      </div>
    );
  if (!cert) return <div className="cert none">Certificate: waiting for a run…</div>;
  return (
    <div
      className={`cert ${cert.admissible ? 'ok' : 'bad'} ${current ? '' : 'stale'}`}
      data-testid={`certificate-${id}`}
      title={cert.message}
    >
      <span className="cert-verdict">{cert.admissible ? 'admissible' : 'NOT admissible'}</span>
      <span>δ* = {fmt(cert.deltaStar, 4)}</span>
      <span>δ = {fmt(cert.delta, 4)}</span>
      <span>margin {fmt(cert.margin, 3)}</span>
      <div className="cert-msg">{cert.message}</div>
    </div>
  );
}

function GainsEditor({ base }: { base: string }) {
  const app = useApp();
  const gains = useScenarioValue(`${base}.gains`) as Obj | undefined;
  const form = gains && 'kp' in gains ? 'kp-kd' : 'bandwidth';
  return (
    <>
      <SelectField
        label="Gains"
        value={form}
        choices={[
          { value: 'bandwidth', label: 'Bandwidth and damping' },
          { value: 'kp-kd', label: 'Explicit kp, kd' },
        ]}
        onChoose={(f) =>
          app.store.edit(`${base}.gains`, f === 'kp-kd' ? { kp: 0.01, kd: 0.05 } : { bandwidthRadPerS: 0.2, dampingRatio: 0.9 }, {
            label: 'Gains form',
            coalesceKey: null,
          })
        }
      />
      {form === 'bandwidth' ? (
        <>
          <NumberField path={`${base}.gains.bandwidthRadPerS`} label="Bandwidth ωn" unit="rad/s" step={0.01} />
          <NumberField path={`${base}.gains.dampingRatio`} label="Damping ratio ζ" unit="—" step={0.05} />
        </>
      ) : (
        <>
          <NumberField path={`${base}.gains.kp`} label="kp" unit="SI" title="N·m per unit error (eigenaxis: 1/s²)" />
          <NumberField path={`${base}.gains.kd`} label="kd" unit="SI" title="N·m·s/rad (eigenaxis: 1/s)" />
        </>
      )}
    </>
  );
}

function SynergisticExtras({ base }: { base: string }) {
  const app = useApp();
  const axes = useScenarioValue(`${base}.potentialAxes`);
  const dirs = useScenarioValue(`${base}.warpDirections`) as unknown[] | undefined;
  return (
    <>
      <VectorField path={`${base}.potentialWeights`} label="Weights λ" unit="—" names={['1', '2', '3']} />
      <NumberField path={`${base}.warpGain`} label="Warp gain k" unit="rad" step={0.05} />
      <NumberField
        path={`${base}.hysteresis`}
        label="Switching δ"
        unit="—"
        step={0.005}
        title="Switching margin δ on the synergy gap, in potential units; must be below the certified gap δ*"
      />
      <label className="check">
        <input
          type="checkbox"
          checked={axes !== undefined}
          onChange={(e) =>
            app.store.edit(
              `${base}.potentialAxes`,
              e.target.checked
                ? [
                    [1, 0, 0],
                    [0, 1, 0],
                    [0, 0, 1],
                  ]
                : undefined,
              { label: 'Potential axes', coalesceKey: null },
            )
          }
        />{' '}
        potential axes (else body x, y, z)
      </label>
      {Array.isArray(axes) &&
        [0, 1, 2].map((k) => <VectorField key={k} path={`${base}.potentialAxes[${k}]`} label={`Axis of λ${k + 1}`} stacked />)}
      <label className="check">
        <input
          type="checkbox"
          checked={Array.isArray(dirs)}
          onChange={(e) =>
            app.store.edit(
              `${base}.warpDirections`,
              e.target.checked
                ? [
                    [1, 0, 0],
                    [0, 1, 0],
                    [0, 0, 1],
                  ]
                : undefined,
              { label: 'Warp directions', coalesceKey: null },
            )
          }
        />{' '}
        warp directions (else the potential axes)
      </label>
      {Array.isArray(dirs) && (
        <>
          {dirs.map((_, k) => (
            <div key={k} className="row-with-button">
              <VectorField path={`${base}.warpDirections[${k}]`} label={`warp direction u${k + 1}`} stacked />
              <button
                className="icon"
                title={`Remove u${k + 1}`}
                disabled={dirs.length <= 2}
                onClick={() =>
                  app.store.edit(
                    `${base}.warpDirections`,
                    dirs.filter((__, i) => i !== k),
                    { label: 'Remove warp direction', coalesceKey: null },
                  )
                }
              >
                ×
              </button>
            </div>
          ))}
          <button
            className="small"
            disabled={dirs.length >= 12}
            onClick={() =>
              app.store.edit(`${base}.warpDirections`, [...dirs, [1, 1, 0]], { label: 'Add warp direction', coalesceKey: null })
            }
          >
            + direction
          </button>
        </>
      )}
    </>
  );
}

function ControllerCard({ i, count }: { i: number; count: number }) {
  const app = useApp();
  const base = `controllers[${i}]`;
  const c = (useScenarioValue(base) ?? {}) as Obj;
  const id = String(c.id ?? '');
  const law = String(c.law ?? '');
  const excluded = useAppState((s) => s.excludedControllerIds);
  const compared = !excluded.includes(id);
  const output = useAppState((s) => s.output);
  const gainNote = output?.runs.find((r) => r.controllerId === id)?.gainNote;
  const rest = useIssuesAt(base).errors;

  const chooseLaw = (next: string) => {
    const kept: Obj = {};
    for (const [k, v] of Object.entries(c)) if (!LAW_KEYS.includes(k)) kept[k] = v;
    app.store.edit(base, { ...kept, law: next, ...LAW_DEFAULTS[next] }, { label: `Law: ${next}`, coalesceKey: null });
  };
  const remove = () => {
    const list = (app.store.getState().scenario as Obj).controllers as Obj[];
    app.store.edit(
      'controllers',
      list.filter((_, k) => k !== i),
      { label: `Remove controller ${id}`, coalesceKey: null },
    );
  };

  return (
    <details className={`controller ${compared ? 'compared' : ''}`} open data-testid={`controller-${id}`}>
      <summary>
        <label className="check compare" onClick={(e) => e.stopPropagation()}>
          <input
            type="checkbox"
            aria-label={`compare ${c.label ?? id}`}
            data-testid={`compare-${id}`}
            checked={compared}
            onChange={(e) => app.store.setExcluded(e.target.checked ? excluded.filter((x) => x !== id) : [...excluded, id])}
          />
        </label>
        <span className="controller-label">{String(c.label ?? id)}</span>
        <span className="muted">{law}</span>
        <button className="icon" title="Remove controller" disabled={count <= 1} onClick={(e) => (e.preventDefault(), remove())}>
          ×
        </button>
      </summary>
      <TextField path={`${base}.label`} label="Label" />
      <TextField path={`${base}.id`} label="Id" />
      <SelectField
        label="Law"
        value={law}
        choices={CONTROL_LAWS.map((l) => ({ value: l, label: LAW_LABELS[l] ?? l }))}
        onChoose={chooseLaw}
      />
      <GainsEditor base={base} />
      {law === 'eigenaxis' && <NumberField path={`${base}.maxRateDegPerS`} label="Slew-rate limit" unit="deg/s" step={0.5} />}
      {law === 'hysteretic' && (
        <NumberField
          path={`${base}.hysteresis`}
          label="Hysteresis δ"
          unit="—"
          step={0.05}
          title="Hysteresis half-width δ on h·η (0 < δ < 1)"
        />
      )}
      {law === 'synergistic' && (
        <>
          <SynergisticExtras base={base} />
          <CertificateBadge id={id} compared={compared} base={base} />
        </>
      )}
      {gainNote && <div className="derived">{gainNote}</div>}
      <IssueText errors={rest} />
    </details>
  );
}

export function ControllersPanel() {
  const app = useApp();
  const count = useAppState((s) =>
    Array.isArray((s.scenario as Obj)?.controllers) ? ((s.scenario as Obj).controllers as unknown[]).length : 0,
  );
  const add = () => {
    const list = ((app.store.getState().scenario as Obj).controllers as Obj[]) ?? [];
    let n = list.length + 1;
    while (list.some((c) => c.id === `ctl${n}`)) n++;
    app.store.edit(
      'controllers',
      [...list, { id: `ctl${n}`, label: `Controller ${n}`, law: 'quaternion-pd', gains: { bandwidthRadPerS: 0.2, dampingRatio: 0.9 } }],
      { label: 'Add controller', coalesceKey: null },
    );
  };
  return (
    <Section title="Controllers to compare" testId="controllers-panel">
      {Array.from({ length: count }, (_, i) => (
        <ControllerCard key={i} i={i} count={count} />
      ))}
      <button className="small" onClick={add} disabled={count >= 20}>
        + controller
      </button>
    </Section>
  );
}

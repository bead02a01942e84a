/**
 * Controllers to compare: a checkbox per controller (unchecked ones are left out of the run),
 * law and gains editors, and for the synergistic laws (SO(3) and pointing, S²) the certificate badge
 * from the engine (an S² gap shown rounded down, so the shown value is admissible).
 */
import type { CertificateSummary } from '../../engine/pipeline/types';
import { LAW_IDS, LAWS } from '../../engine/control/registry';
import type { LawField } from '../../engine/control/definition';
import type { LawId } from '../../engine/control/params';
import { useAllIssues, useApp, useAppState, useIssuesAt, useScenarioValue } from '../context';
import { fmt } from '../format';
import { fmtFloor } from '../formatFloor';
import { cleanMessage } from '../issues/present';
import { gapShownDown } from '../../engine/control/sphere/shownGap';
import { IssueText, NumberField, Section, SelectField, TextField, VectorField } from './fields';

type Obj = Record<string, unknown>;

/** Every law's own file keys (to drop the old law's fields when the law changes). */
const LAW_KEYS = [...new Set(LAW_IDS.flatMap((l) => LAWS[l].fields.map((f) => f.key)))];

function CertificateBadge({ id, compared, base }: { id: string; compared: boolean; base: string }) {
  const cert: CertificateSummary | undefined = useAppState((s) => s.output?.certificates.find((c) => c.controllerId === id));
  const current = useAppState((s) => s.outputScenario === s.scenario);
  const all = useAllIssues();
  const scenario = useAppState((s) => s.scenario);
  // The engine refuses a law it cannot certify (e.g. δ not below δ*): say so rather than show the
  // last run's verdict.
  const refusal = all.find((i) => i.path === base || i.path.startsWith(`${base}.`) || i.path.startsWith(`${base}[`));
  if (!compared) return <div className="cert none">Certificate: not computed (controller not compared)</div>;
  if (refusal)
    return (
      <div className="cert bad" data-testid={`certificate-${id}`}>
        <span className="cert-verdict">not certified</span>
        <div className="cert-msg">{cleanMessage(refusal.message, refusal.path, scenario)}</div>
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
      {cert.space === 'S2' ? (
        <span title="pointing family on the sphere S²; δ* less its error bound, rounded down, so every δ below it is admissible">
          S² δ* ≥ {gapShownDown(cert.deltaStar, cert.deltaStarTolerance ?? 0, 4)}
        </span>
      ) : (
        <span title="Certified gap, printed rounded down so that the value shown is itself admissible">
          δ* = {fmtFloor(cert.deltaStar, 4, true)}
        </span>
      )}
      <span>jump threshold δ = {fmt(cert.delta, 4)}</span>
      <span>margin δ* − δ = {fmtFloor(cert.margin, 3)}</span>
      <div className="cert-msg">{cert.message}</div>
    </div>
  );
}

function GainsEditor({ base, law }: { base: string; law: LawId | null }) {
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
          <NumberField
            path={`${base}.gains.kp`}
            label={`Stiffness ${law ? LAWS[law].gains.stiffness.symbol : 'kp'}`}
            unit={law ? LAWS[law].gains.stiffness.unit : 'SI'}
            title={law ? `${LAWS[law].gains.stiffness.symbol}: ${LAWS[law].gains.stiffness.meaning}` : 'stiffness'}
          />
          <NumberField
            path={`${base}.gains.kd`}
            label={`Damping ${law ? LAWS[law].gains.damping.symbol : 'kd'}`}
            unit={law ? LAWS[law].gains.damping.unit : 'SI'}
            title={law ? `${LAWS[law].gains.damping.symbol}: ${LAWS[law].gains.damping.meaning}` : 'damping'}
          />
        </>
      )}
    </>
  );
}

const IDENTITY_ROWS = [
  [1, 0, 0],
  [0, 1, 0],
  [0, 0, 1],
];

/** A list of unit vectors the user may leave out (default named in the field's help). */
function OptionalVectors({ base, f }: { base: string; f: LawField }) {
  const app = useApp();
  const path = `${base}.${f.key}`;
  const list = useScenarioValue(path) as unknown[] | undefined;
  const growable = f.kind === 'optional-directions';
  return (
    <>
      <label className="check" title={f.help}>
        <input
          type="checkbox"
          checked={Array.isArray(list)}
          onChange={(e) => app.store.edit(path, e.target.checked ? IDENTITY_ROWS : undefined, { label: f.label, coalesceKey: null })}
        />{' '}
        {f.label} <span className="muted">({f.help})</span>
      </label>
      {Array.isArray(list) &&
        list.map((_, k) => (
          <div key={k} className="row-with-button">
            <VectorField path={`${path}[${k}]`} label={`${f.label} ${k + 1}`} stacked />
            {growable && (
              <button
                className="icon"
                title={`Remove ${f.label.toLowerCase()} ${k + 1}`}
                disabled={list.length <= 2}
                onClick={() =>
                  app.store.edit(
                    path,
                    list.filter((__, i) => i !== k),
                    { label: `Remove ${f.label.toLowerCase()}`, coalesceKey: null },
                  )
                }
              >
                ×
              </button>
            )}
          </div>
        ))}
      {growable && Array.isArray(list) && (
        <button
          className="small"
          disabled={list.length >= 12}
          onClick={() => app.store.edit(path, [...list, [1, 1, 0]], { label: `Add ${f.label.toLowerCase()}`, coalesceKey: null })}
        >
          + {f.label.toLowerCase().replace(/s$/, '')}
        </button>
      )}
    </>
  );
}

/** A list of numbers (2 to 12 entries), e.g. the warp azimuths of the pointing family. */
function NumberList({ base, f }: { base: string; f: LawField }) {
  const app = useApp();
  const path = `${base}.${f.key}`;
  const raw = useScenarioValue(path);
  const list = Array.isArray(raw) ? (raw as unknown[]) : [];
  return (
    <div className="number-list" data-testid={`list-${f.key}`}>
      {list.map((_, k) => (
        <div key={k} className="row-with-button">
          <NumberField path={`${path}[${k}]`} label={`${f.label} ${k + 1}`} unit={f.unit} step={f.step} title={f.help} />
          <button
            className="icon"
            title={`Remove ${f.label.toLowerCase()} ${k + 1}`}
            disabled={list.length <= 2}
            onClick={() =>
              app.store.edit(
                path,
                list.filter((__, i) => i !== k),
                { label: `Remove ${f.label.toLowerCase()}`, coalesceKey: null },
              )
            }
          >
            ×
          </button>
        </div>
      ))}
      <button
        className="small"
        disabled={list.length >= 12}
        onClick={() => app.store.edit(path, [...list, 0], { label: `Add ${f.label.toLowerCase()}`, coalesceKey: null })}
      >
        + {f.label.toLowerCase().replace(/s$/, '')}
      </button>
    </div>
  );
}

/** The fields a law adds, as its registry entry describes them (one name per quantity everywhere). */
function LawFields({ base, law }: { base: string; law: LawId }) {
  return (
    <>
      {LAWS[law].fields.map((f) =>
        f.kind === 'number' ? (
          <NumberField key={f.key} path={`${base}.${f.key}`} label={f.label} unit={f.unit} step={f.step} title={f.help} />
        ) : f.kind === 'vector3' ? (
          <VectorField key={f.key} path={`${base}.${f.key}`} label={f.label} unit={f.unit} names={['1', '2', '3']} />
        ) : f.kind === 'number-list' ? (
          <NumberList key={f.key} base={base} f={f} />
        ) : (
          <OptionalVectors key={f.key} base={base} f={f} />
        ),
      )}
    </>
  );
}

function ControllerCard({ i, count }: { i: number; count: number }) {
  const app = useApp();
  const base = `controllers[${i}]`;
  const c = (useScenarioValue(base) ?? {}) as Obj;
  const id = String(c.id ?? '');
  const law = String(c.law ?? '') as LawId;
  const known = (LAW_IDS as readonly string[]).includes(law);
  const excluded = useAppState((s) => s.excludedControllerIds);
  const compared = !excluded.includes(id);
  // The note alone (a string): the card does not render again for an output that leaves it as it was.
  const gainNote = useAppState((s) => s.output?.runs.find((r) => r.controllerId === id)?.gainNote);
  const rest = useIssuesAt(base).errors;

  const chooseLaw = (next: string) => {
    const kept: Obj = {};
    for (const [k, v] of Object.entries(c)) if (!LAW_KEYS.includes(k)) kept[k] = v;
    const def = LAWS[next as LawId];
    app.store.edit(base, { ...kept, law: next, ...def.fileDefaults }, { label: `Law: ${def.title}`, coalesceKey: null });
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
      <SelectField label="Law" value={law} choices={LAW_IDS.map((l) => ({ value: l, label: LAWS[l].title }))} onChoose={chooseLaw} />
      {known && <div className="muted law-summary">{LAWS[law].summary}</div>}
      <GainsEditor base={base} law={known ? law : null} />
      {known && <LawFields base={base} law={law} />}
      {(law === 'synergistic' || (known && LAWS[law].certificate !== undefined)) && (
        <CertificateBadge id={id} compared={compared} base={base} />
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

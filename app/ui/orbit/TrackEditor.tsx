/**
 * The moving-target part of a target card (scenario/orbitSchema.ts `track` and `window`): the
 * site or station, the body axis and the secondary axis with what it is kept toward, the nadir
 * yaw rule, and when the target is due. Every field writes through the store (undo/redo) and
 * shows the engine's own message for its path (orbitValidate.ts); what the form has no field
 * for is listed under it.
 */
import { useMemo } from 'react';
import { useApp, useIssuesUnder, useScenarioValue } from '../context';
import { IssueText, SelectField, TextField, VectorField } from '../components/fields';
import {
  SECONDARY_TOWARD,
  WINDOW_KINDS,
  YAW_RULES,
  secondaryFor,
  secondaryKindOf,
  targetKindOf,
  windowFor,
  windowKindOf,
  type WindowKind,
} from './trackForms';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);
const AXES = [0, 1, 2];

function vectorPaths(p: string): string[] {
  return [p, ...AXES.map((k) => `${p}[${k}]`)];
}

function SiteChoice({ path, kind }: { path: string; kind: 'site' | 'station' }) {
  const sites = useScenarioValue('orbit.sites');
  const id = useScenarioValue(path);
  const choices = useMemo(() => {
    const list = Array.isArray(sites) ? (sites as unknown[]).filter(isObj) : [];
    const c = list.map((s) => ({ value: String(s.id), label: `${String(s.label ?? s.id)} (${String(s.id)})` }));
    if (typeof id === 'string' && !c.some((x) => x.value === id))
      c.unshift({ value: id, label: id === '' ? '— none —' : `${id} (not a site)` });
    return c;
  }, [sites, id]);
  return (
    <SelectField
      label={kind === 'station' ? 'Station' : 'Site'}
      path={path}
      choices={choices}
      title="One of the orbit's sites (add sites in the Orbit panel); a station's pass is the time above its elevation mask"
    />
  );
}

function AimedFields({ base }: { base: string }) {
  const app = useApp();
  const toward = useScenarioValue(`${base}.secondaryToward`);
  const choice = secondaryKindOf(toward);
  return (
    <>
      <VectorField path={`${base}.bodyAxis`} label="Body axis" stacked title="Body axis pointed exactly at the target" />
      <VectorField
        path={`${base}.bodySecondary`}
        label="Body secondary axis"
        stacked
        title="Kept as close as possible to the direction chosen below; not parallel to the body axis"
      />
      <SelectField
        label="Secondary toward"
        path={`${base}.secondaryToward`}
        value={choice}
        choices={SECONDARY_TOWARD}
        onChoose={(v) =>
          app.store.edit(`${base}.secondaryToward`, secondaryFor(v, toward), { label: 'Secondary toward', coalesceKey: null })
        }
      />
      {choice === 'fixed' && <VectorField path={`${base}.secondaryToward.inertialDirection`} label="→ EME2000 direction" stacked />}
    </>
  );
}

function NadirFields({ base }: { base: string }) {
  const app = useApp();
  const body = useScenarioValue(base) as Obj | undefined;
  const own = Array.isArray(body?.bodyAxis) || Array.isArray(body?.bodySecondary);
  const yaw = body?.yaw === 'sun-steering' ? 'sun-steering' : 'lvlh';
  return (
    <>
      <SelectField label="Yaw rule" path={`${base}.yaw`} choices={YAW_RULES} />
      <label className="check" title="Without: +Z on nadir, and +Y (LVLH) or +X (Sun steering) placed by the yaw rule">
        <input
          type="checkbox"
          data-testid={`nadir-own-axes-${base}`}
          checked={own}
          onChange={(e) =>
            app.store.editMany(
              [
                [`${base}.bodyAxis`, e.target.checked ? [0, 0, 1] : undefined],
                [`${base}.bodySecondary`, e.target.checked ? (yaw === 'lvlh' ? [0, 1, 0] : [1, 0, 0]) : undefined],
              ],
              { label: 'Nadir body axes', coalesceKey: null },
            )
          }
        />{' '}
        own body axes
      </label>
      {own && (
        <>
          <VectorField path={`${base}.bodyAxis`} label="Body axis on nadir" stacked />
          <VectorField path={`${base}.bodySecondary`} label="Body secondary axis" stacked />
        </>
      )}
    </>
  );
}

/** Track fields and window of target i (its kind is chosen in the card). */
export function TrackEditor({ i }: { i: number }) {
  const target = useScenarioValue(`targets[${i}]`);
  const kind = targetKindOf(target);
  const base = `targets[${i}].track.${kind}`;
  const shown = useMemo(() => {
    const p = [base, `${base}.id`, `${base}.yaw`, `${base}.secondaryToward`];
    for (const f of ['bodyAxis', 'bodySecondary', 'secondaryToward.inertialDirection']) p.push(...vectorPaths(`${base}.${f}`));
    return p;
  }, [base]);
  const other = useIssuesUnder(`targets[${i}].track`, shown);
  // A track the form does not know (a typo in the file): the engine's messages, and the Target choice to replace it.
  if (kind === 'fixed') return <IssueText errors={other} />;
  return (
    <div className="track-editor" data-testid={`track-editor-${i}`}>
      {(kind === 'site' || kind === 'station') && <SiteChoice path={`${base}.id`} kind={kind} />}
      {kind === 'nadir' ? <NadirFields base={base} /> : <AimedFields base={base} />}
      <IssueText errors={other} />
      <WindowFields i={i} passes={kind === 'site' || kind === 'station'} />
    </div>
  );
}

/** When the target is due: after the previous one, at its site's next pass start, or at a UTC time. */
export function WindowFields({ i, passes, onlyWithOrbit = false }: { i: number; passes: boolean; onlyWithOrbit?: boolean }) {
  const app = useApp();
  const target = useScenarioValue(`targets[${i}]`);
  const epoch = useScenarioValue('epochUtc');
  const hasOrbit = useScenarioValue('orbit') !== undefined;
  const kind = windowKindOf(target);
  const path = `targets[${i}].window`;
  const choices =
    passes || kind === 'pass' || kind === 'pass-to-end'
      ? WINDOW_KINDS
      : WINDOW_KINDS.filter((k) => k.value === 'none' || k.value === 'time');
  const shown = useMemo(() => [path, `${path}.start`, `${path}.atUtc`, `${path}.holdUntil`], [path]);
  const startIssues = useIssuesUnder(`${path}.start`, []);
  const other = useIssuesUnder(path, shown);
  // A fixed target on a scenario without an orbit has no window (unless the file gives one).
  if (onlyWithOrbit && !hasOrbit && kind === 'none') return null;
  return (
    <div className="window-fields" data-testid={`window-${i}`}>
      <SelectField
        label="Due"
        path={path}
        value={kind}
        choices={choices}
        title="When tracking starts (the slew ends there; the previous target is held until the slew must start): after the previous target; at the start of the next pass above the mask, holding for Hold or to the pass end; or at a UTC time"
        onChoose={(v) =>
          app.store.edit(path, windowFor(v as WindowKind, isObj(target) ? target.window : undefined, epoch), {
            label: 'Target window',
            coalesceKey: null,
          })
        }
      />
      <IssueText errors={startIssues} />
      {kind === 'time' && <TextField path={`${path}.atUtc`} label="Start (UTC)" title="ISO 8601 UTC with a trailing Z" />}
      <IssueText errors={other} />
    </div>
  );
}

/**
 * The orbit block of the scenario (engine: scenario/orbitSchema.ts, validated in orbitValidate.ts):
 * add or remove it; the orbit as a pasted two-line element set or as SGP4 mean elements with
 * their units; the horizon; the ground sites and stations targets point at. Every edit goes
 * through the store (one undo step per field burst); the engine's messages show at the field —
 * a TLE problem names its line and columns.
 */
import { useEffect, useMemo, useRef, useState } from 'react';
import type { Issue } from '../../engine/errors';
import { useAllIssues, useApp, useAppState, useScenarioValue } from '../context';
import { IssueText, NumberField, Section, SelectField, TextField } from '../components/fields';
import { newSite, sizeAs, starterElements, starterOrbit, type SizeKey } from './orbitEdits';
import { tleLinesOfText } from './orbitRows';

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

const SOURCES = [
  { value: 'tle', label: 'Two-line element set (paste)' },
  { value: 'meanElements', label: 'SGP4 mean elements' },
];

const SIZE_KEYS = [
  { value: 'meanMotionRevPerDay', label: 'Mean motion' },
  { value: 'semiMajorAxisKm', label: 'Semi-major axis' },
];

function useIssuesStarting(prefix: string): Issue[] {
  const all = useAllIssues();
  return useMemo(() => all.filter((i) => i.path.startsWith(prefix)), [all, prefix]);
}

function useWarningsStarting(prefix: string): Issue[] {
  const warnings = useAppState((s) => s.validation.warnings);
  return useMemo(() => warnings.filter((i) => i.path.startsWith(prefix)), [warnings, prefix]);
}

/** The TLE as one text box: typed or pasted text kept as a draft, stored as the list of lines. */
function TleField() {
  const app = useApp();
  const value = useScenarioValue('orbit.tle');
  const lines = Array.isArray(value) ? (value as unknown[]).map(String) : [];
  const errors = useIssuesStarting('orbit.tle');
  const warnings = useWarningsStarting('orbit.tle');
  const [draft, setDraft] = useState<string | null>(null);
  const committed = useRef<unknown>(value);
  useEffect(() => {
    if (!Object.is(value, committed.current)) {
      committed.current = value;
      setDraft(null);
    }
  }, [value]);
  return (
    <div className="field stacked">
      <div
        className="stacked-field"
        title="Paste the two lines (an optional title line first); each must be 69 characters with valid checksums"
      >
        <span className="field-label">Two-line element set</span>
        <span className="field-unit" />
        <textarea
          className={`tle-text ${errors.length ? 'invalid' : ''}`}
          data-testid="orbit-tle"
          data-path="orbit.tle"
          aria-label="Two-line element set"
          aria-invalid={errors.length > 0}
          spellCheck={false}
          rows={Math.max(2, lines.length)}
          style={{ height: `calc(${Math.max(2, lines.length)} * 1.4em + 12px)` }}
          wrap="off"
          value={draft ?? lines.join('\n')}
          onChange={(e) => {
            setDraft(e.target.value);
            const next = tleLinesOfText(e.target.value);
            committed.current = next;
            app.store.edit('orbit.tle', next, { label: 'Two-line element set', coalesceKey: 'orbit.tle' });
          }}
          onBlur={() => setDraft(null)}
        />
      </div>
      <div data-testid="orbit-tle-issues">
        <IssueText errors={errors} warnings={warnings} />
      </div>
    </div>
  );
}

function MeanElementsFields() {
  const app = useApp();
  const me = useScenarioValue('orbit.meanElements');
  const sizeKey = isObj(me) && me.semiMajorAxisKm !== undefined ? 'semiMajorAxisKm' : 'meanMotionRevPerDay';
  const p = 'orbit.meanElements';
  return (
    <>
      <TextField path={`${p}.name`} label="Element set name" />
      <TextField path={`${p}.epochUtc`} label="Element epoch (UTC)" title="ISO 8601 UTC with a trailing Z" />
      <SelectField
        label="Size given as"
        choices={SIZE_KEYS}
        value={sizeKey}
        onChoose={(v) => {
          if (v === sizeKey || !isObj(me)) return;
          const next = sizeAs(me, v as SizeKey);
          app.store.editMany(
            [
              [`${p}.${sizeKey}`, undefined],
              [`${p}.${v}`, next],
            ],
            { label: 'Orbit size', coalesceKey: null },
          );
        }}
      />
      {sizeKey === 'meanMotionRevPerDay' ? (
        <NumberField path={`${p}.meanMotionRevPerDay`} label="Mean motion" unit="rev/day" step={0.01} />
      ) : (
        <NumberField path={`${p}.semiMajorAxisKm`} label="Semi-major axis" unit="km" step={1} />
      )}
      <NumberField path={`${p}.eccentricity`} label="Eccentricity" unit="" step={0.0001} title="Mean eccentricity, 0 ≤ e < 1" />
      <NumberField path={`${p}.inclinationDeg`} label="Inclination" unit="deg" step={0.1} />
      <NumberField path={`${p}.raanDeg`} label="RAAN" unit="deg" step={1} title="Right ascension of the ascending node" />
      <NumberField path={`${p}.argPerigeeDeg`} label="Argument of perigee" unit="deg" step={1} />
      <NumberField path={`${p}.meanAnomalyDeg`} label="Mean anomaly" unit="deg" step={1} />
      <NumberField path={`${p}.bstarPerEarthRadii`} label="B* drag term" unit="1/ER" step={0.00001} title="SGP4 drag term; empty means 0" />
    </>
  );
}

function SiteCard({ i }: { i: number }) {
  const app = useApp();
  const sites = useScenarioValue('orbit.sites');
  const list = Array.isArray(sites) ? (sites as unknown[]) : [];
  const p = `orbit.sites[${i}]`;
  const site = list[i];
  return (
    <div className="orbit-site" data-testid={`orbit-site-${i}`}>
      <div className="orbit-row-head">
        <span className="orbit-site-title">{isObj(site) && typeof site.label === 'string' ? site.label : `Site ${i + 1}`}</span>
        <button
          className="small"
          data-testid={`orbit-site-remove-${i}`}
          onClick={() =>
            app.store.edit(
              'orbit.sites',
              list.filter((_, k) => k !== i),
              { label: `Remove site ${i + 1}`, coalesceKey: null },
            )
          }
          title="Remove this site (targets that name it then show an error)"
        >
          Remove
        </button>
      </div>
      <TextField path={`${p}.id`} label="Id" title="What targets name it by: letters, digits, _ and -, at most 40" />
      <TextField path={`${p}.label`} label="Name" />
      <NumberField path={`${p}.latitudeDeg`} label="Latitude" unit="deg N" step={0.1} />
      <NumberField path={`${p}.longitudeDeg`} label="Longitude" unit="deg E" step={0.1} />
      <NumberField path={`${p}.heightM`} label="Height" unit="m" step={10} title="Above the WGS-84 ellipsoid" />
      <NumberField
        path={`${p}.elevationMaskDeg`}
        label="Elevation mask"
        unit="deg"
        step={1}
        title="Passes are the times above it; empty means 0"
      />
    </div>
  );
}

export function OrbitPanel() {
  const app = useApp();
  const orbit = useScenarioValue('orbit');
  const epoch = useScenarioValue('epochUtc');
  const sites = useScenarioValue('orbit.sites');
  const list = Array.isArray(sites) ? (sites as unknown[]) : [];
  const own = useIssuesStarting('orbit');
  const blockIssues = useMemo(() => own.filter((i) => i.path === 'orbit' || i.path === 'orbit.sites'), [own]);
  const has = isObj(orbit);
  const source = has && orbit.tle !== undefined ? 'tle' : 'meanElements';
  return (
    <Section title="Orbit" testId="orbit-panel" open={has} badge={has ? undefined : <span className="muted"> · none</span>}>
      {!has ? (
        <div className="field">
          <p className="muted">No orbit: targets are fixed attitudes. Add one to point at ground sites, the Sun or nadir during passes.</p>
          <button
            className="small"
            data-testid="orbit-add"
            onClick={() => app.store.edit('orbit', starterOrbit(epoch), { label: 'Add orbit', coalesceKey: null })}
          >
            Add orbit
          </button>
        </div>
      ) : (
        <>
          <div className="orbit-row-head">
            <span className="muted">SGP4, EME2000 frame; the epoch is in the run settings.</span>
            <button
              className="small"
              data-testid="orbit-remove"
              onClick={() => app.store.edit('orbit', undefined, { label: 'Remove orbit', coalesceKey: null })}
              title="Remove the orbit block (targets that track a site, the Sun or nadir then show an error)"
            >
              Remove orbit
            </button>
          </div>
          <IssueText errors={blockIssues} />
          <SelectField
            label="Orbit given as"
            choices={SOURCES}
            value={source}
            onChoose={(v) => {
              if (v === source) return;
              app.store.editMany(
                v === 'tle'
                  ? [
                      ['orbit.meanElements', undefined],
                      ['orbit.tle', []],
                    ]
                  : [
                      ['orbit.tle', undefined],
                      ['orbit.meanElements', starterElements(epoch)],
                    ],
                { label: 'Orbit source', coalesceKey: null },
              );
            }}
          />
          {source === 'tle' ? <TleField /> : <MeanElementsFields />}
          <NumberField
            path="orbit.horizonS"
            label="Horizon"
            unit="s"
            step={600}
            title="How far past the epoch the ephemeris, passes, eclipses and the plan reach (default one day, at most 7 days)"
          />
          <div className="sub-head">Ground sites and stations</div>
          {list.map((_, i) => (
            <SiteCard key={i} i={i} />
          ))}
          <button
            className="small"
            data-testid="orbit-site-add"
            onClick={() => app.store.edit('orbit.sites', [...list, newSite(list)], { label: 'Add site', coalesceKey: null })}
          >
            Add site
          </button>
        </>
      )}
    </Section>
  );
}

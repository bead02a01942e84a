/** One attitude entry in any of its four forms, with a form switch that keeps the attitude. */
import { useMemo } from 'react';
import { EULER_SEQUENCES, qNorm, type EulerSequence } from '../../engine/math/rotation';
import type { AttitudeForm } from '../../engine/scenario/schema';
import { useApp, useIssuesUnder, useScenarioValue } from '../context';
import { convertAttitude, formOf, tidy } from '../attitudeForms';
import { IssueText, NumberField, NumberInput, SelectField, VectorField } from './fields';

type Obj = Record<string, unknown>;

const FORMS: { value: AttitudeForm; label: string }[] = [
  { value: 'quaternion', label: 'Quaternion [x y z w]' },
  { value: 'euler', label: 'Euler sequence' },
  { value: 'pointing', label: 'Pointing (two vectors)' },
  { value: 'relative', label: 'Relative rotation' },
];

export function AttitudeEditor({ path, chainIndex, allowRelative }: { path: string; chainIndex: number; allowRelative: boolean }) {
  const app = useApp();
  const attitude = useScenarioValue(path) as Obj | undefined;
  const form = formOf(attitude) ?? 'quaternion';
  const shown = useMemo(() => {
    const base = `${path}.${form}`;
    if (form === 'quaternion') return [base, ...[0, 1, 2, 3].map((k) => `${base}[${k}]`)];
    if (form === 'euler') return [`${base}.sequence`, `${base}.anglesDeg`, ...[0, 1, 2].map((k) => `${base}.anglesDeg[${k}]`)];
    if (form === 'pointing')
      return ['bodyAxis', 'inertialDirection', 'bodySecondary', 'inertialSecondary'].flatMap((f) => [
        `${base}.${f}`,
        ...[0, 1, 2].map((k) => `${base}.${f}[${k}]`),
      ]);
    return [`${base}.angleDeg`, `${base}.axis`, ...[0, 1, 2].map((k) => `${base}.axis[${k}]`)];
  }, [path, form]);
  const other = useIssuesUnder(path, shown);

  const choose = (f: string, sequence?: EulerSequence) => {
    const s = app.store.getState().scenario;
    app.store.edit(path, convertAttitude(s, chainIndex, f as AttitudeForm, sequence), { label: `Attitude form: ${f}`, coalesceKey: null });
  };

  const q = (attitude?.quaternion as unknown[]) ?? [];
  const qn = q.length === 4 && q.every((x) => typeof x === 'number') ? qNorm(q as number[]) : NaN;

  return (
    <div className="attitude">
      <SelectField
        label="Form"
        value={form}
        choices={allowRelative ? FORMS : FORMS.filter((f) => f.value !== 'relative')}
        onChoose={(f) => choose(f)}
      />
      {form === 'quaternion' && (
        <div className="field stacked">
          <div className="stacked-field">
            <span className="field-label">q = [x, y, z, w] (Hamilton, scalar last)</span>
            <span className="field-unit">
              <button
                className="small"
                title={`Normalise (|q| = ${Number.isFinite(qn) ? qn.toPrecision(8) : '—'})`}
                disabled={!(qn > 0) || Math.abs(qn - 1) < 1e-12}
                onClick={() =>
                  app.store.edit(
                    `${path}.quaternion`,
                    (q as number[]).map((x) => tidy(x / qn)),
                    { label: 'Normalise quaternion', coalesceKey: null },
                  )
                }
              >
                |q|=1
              </button>
            </span>
            <span className="stacked-inputs vec4">
              {[0, 1, 2, 3].map((k) => (
                <NumberInput key={k} path={`${path}.quaternion[${k}]`} ariaLabel={`q ${'xyzw'[k]}`} showIssues={false} />
              ))}
            </span>
          </div>
        </div>
      )}
      {form === 'euler' && (
        <>
          <SelectField
            label="Sequence"
            title="Intrinsic rotation sequence: each rotation about an axis of the already rotated frame"
            value={String((attitude?.euler as Obj | undefined)?.sequence ?? 'ZYX')}
            choices={EULER_SEQUENCES.map((s) => ({ value: s, label: s }))}
            // Keep the attitude: rewrite the angles for the new sequence.
            onChoose={(seq) => choose('euler', seq as EulerSequence)}
          />
          <VectorField path={`${path}.euler.anglesDeg`} label="Angles" unit="deg" names={['1', '2', '3']} />
        </>
      )}
      {form === 'pointing' && (
        <>
          <VectorField
            path={`${path}.pointing.bodyAxis`}
            label="Body axis"
            stacked
            title="Body axis pointed exactly along the inertial direction"
          />
          <VectorField path={`${path}.pointing.inertialDirection`} label="→ along inertial direction" stacked />
          <VectorField
            path={`${path}.pointing.bodySecondary`}
            label="Body secondary axis"
            stacked
            title="Kept as close as possible to the inertial secondary"
          />
          <VectorField path={`${path}.pointing.inertialSecondary`} label="→ towards inertial secondary" stacked />
        </>
      )}
      {form === 'relative' && (
        <>
          <VectorField
            path={`${path}.relative.axis`}
            label="Axis (previous body frame)"
            stacked
            title="Rotation axis in the previous attitude's body frame"
          />
          <NumberField path={`${path}.relative.angleDeg`} label="Angle" unit="deg" step={5} />
        </>
      )}
      <IssueText errors={other} />
    </div>
  );
}

/** Vehicle editor: inertia, wheels, friction, sensors, control rate, actuation. */
import { useState } from 'react';
import { useApp, useAppState, useIssuesUnder, useScenarioValue } from '../context';
import { fmt } from '../format';
import { INERTIA_PATH } from '../preflight';
import { IssueText, NumberField, NumberInput, Section, SelectField, TextField, VectorField } from './fields';
import { WheelsEditor } from './WheelsEditor';

const NONE: string[] = [];

function InertiaEditor() {
  const [symmetric, setSymmetric] = useState(true);
  const issues = useIssuesUnder(INERTIA_PATH, NONE);
  const axis = ['x', 'y', 'z'];
  // A rule of the whole matrix (definiteness, triangle inequality) marks every entry.
  const matrixInvalid = issues.some((i) => i.path === INERTIA_PATH);
  return (
    <div className="inertia" data-testid="inertia-editor">
      <div className="sub-head">
        Inertia about the centre of mass, body axes <span className="unit">kg·m²</span>
      </div>
      <div className="matrix">
        {[0, 1, 2].map((r) =>
          [0, 1, 2].map((c) => (
            <NumberInput
              key={`${r}${c}`}
              path={`${INERTIA_PATH}[${r}][${c}]`}
              ariaLabel={`J${axis[r]}${axis[c]}`}
              title={`J${axis[r]}${axis[c]}, kg·m²`}
              className={r === c ? 'diag' : 'offdiag'}
              mirrorPath={symmetric && r !== c ? `${INERTIA_PATH}[${c}][${r}]` : undefined}
              groupInvalid={matrixInvalid}
              showIssues={false}
            />
          )),
        )}
      </div>
      <label className="check">
        <input type="checkbox" checked={symmetric} onChange={(e) => setSymmetric(e.target.checked)} /> keep symmetric (edit J_rc and J_cr
        together)
      </label>
      <IssueText errors={issues} />
      <PrincipalMoments />
    </div>
  );
}

/** The last run's principal moments (its own component: only it follows the output). */
function PrincipalMoments() {
  const moments = useAppState((s) => s.output?.vehicle.principalMomentsKgm2);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  if (!moments) return null;
  return (
    <div className={`derived ${current ? '' : 'stale'}`} data-testid="principal-moments">
      Principal moments: {moments.map((m) => fmt(m, 4)).join(', ')} kg·m²
      {current ? '' : ' (last valid run)'}
    </div>
  );
}

function FrictionEditor() {
  const app = useApp();
  const friction = useScenarioValue('vehicle.wheelFriction');
  const on = friction !== undefined;
  return (
    <>
      <label className="check">
        <input
          type="checkbox"
          checked={on}
          onChange={(e) =>
            app.store.edit('vehicle.wheelFriction', e.target.checked ? { viscousMNmPerRadPerS: 0.001, coulombMNm: 0.01 } : undefined, {
              label: e.target.checked ? 'Add wheel friction' : 'Remove wheel friction',
              coalesceKey: null,
            })
          }
        />{' '}
        wheel bearing friction
      </label>
      {on && (
        <>
          <NumberField path="vehicle.wheelFriction.viscousMNmPerRadPerS" label="Viscous" unit="mN·m/(rad/s)" />
          <NumberField path="vehicle.wheelFriction.coulombMNm" label="Coulomb" unit="mN·m" />
        </>
      )}
    </>
  );
}

function ActuationEditor() {
  const app = useApp();
  const mode = useScenarioValue('vehicle.actuation.mode');
  return (
    <>
      <SelectField
        label="Actuation"
        value={typeof mode === 'string' ? mode : 'hold'}
        title="How each sampled torque command reaches the wheels"
        choices={[
          { value: 'hold', label: 'Zero-order hold' },
          { value: 'pwm', label: 'Pulse-width modulated' },
          { value: 'quantized', label: 'Quantized' },
        ]}
        onChoose={(v) => {
          // The quantum belongs to quantized mode only: add a starting value, or drop it.
          const quantum = v === 'quantized' ? 0.01 : undefined;
          app.store.editMany(
            [
              ['vehicle.actuation.mode', v],
              ['vehicle.actuation.torqueQuantumMNm', quantum],
            ],
            { label: `Actuation: ${v}`, coalesceKey: null },
          );
        }}
      />
      {mode === 'quantized' && <NumberField path="vehicle.actuation.torqueQuantumMNm" label="Torque quantum" unit="mN·m" />}
    </>
  );
}

export function VehiclePanel() {
  return (
    <Section title="Vehicle" testId="vehicle-panel">
      <TextField path="vehicle.name" label="Name" />
      <InertiaEditor />
      <div className="sub-head">Reaction wheels</div>
      <WheelsEditor />
      <FrictionEditor />
      <div className="sub-head">Sensors and control</div>
      <NumberField
        path="vehicle.sensors.attitudeNoiseArcsec"
        label="Attitude noise σ"
        unit="arcsec"
        title="Attitude measurement noise, 1σ per axis"
      />
      <NumberField
        path="vehicle.sensors.rateNoiseDegPerS"
        label="Rate noise σ"
        unit="deg/s"
        title="Rate measurement noise, 1σ per axis per sample"
      />
      <VectorField path="vehicle.sensors.rateBiasDegPerS" label="Rate bias" unit="deg/s" />
      <NumberField path="vehicle.controlRateHz" label="Control rate" unit="Hz" step={1} />
      <ActuationEditor />
    </Section>
  );
}

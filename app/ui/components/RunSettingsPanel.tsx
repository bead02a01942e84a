/**
 * The scenario-wide settings: name, epoch (t = 0, UTC) and the inertial frame every attitude is
 * given in; the planning margins and profile; the simulation's modes, timing and settle
 * thresholds. The epoch is validated by the engine (scenario/validate.ts: ISO 8601 with Z, a real
 * calendar date, 1960–2099) like every other field.
 */
import { INERTIAL_FRAME } from '../../engine/caution';
import { useApp, useScenarioValue } from '../context';
import { SIMULATION_MODE_CHOICES } from '../modeNames';
import { NumberField, Section, SelectField, TextField } from './fields';

const PROFILES = [
  { value: 'bang-coast-bang', label: 'Accelerate, coast, brake' },
  { value: 'bang-bang', label: 'Accelerate, brake (no coast)' },
];

const TIMINGS = [
  { value: 'sampled', label: 'Sampled at the control rate' },
  { value: 'continuous-ideal', label: 'Continuous (ideal, theory check)' },
];

function OptionalNumber(props: { path: string; label: string; unit: string; title: string; start: number }) {
  const app = useApp();
  const v = useScenarioValue(props.path);
  const on = v !== undefined;
  return (
    <>
      <label className="check" title={props.title}>
        <input
          type="checkbox"
          checked={on}
          onChange={(e) =>
            app.store.edit(props.path, e.target.checked ? props.start : undefined, { label: props.label, coalesceKey: null })
          }
        />{' '}
        {props.label.toLowerCase()}
      </label>
      {on && <NumberField path={props.path} label={props.label} unit={props.unit} title={props.title} />}
    </>
  );
}

export function RunSettingsPanel() {
  const mode = useScenarioValue('simulation.mode');
  return (
    <Section title="Scenario, plan and simulation" testId="run-settings-panel" open>
      <div className="sub-head">Scenario and timing</div>
      <TextField path="name" label="Scenario name" />
      <TextField
        path="epochUtc"
        label="Epoch (UTC)"
        title="t = 0 of every plot and export: ISO 8601 UTC with a trailing Z, e.g. 2030-03-14T10:00:00Z (at most milliseconds; 1960–2099)"
      />
      <div
        className="field-row"
        title="Every attitude and inertial direction is given in this frame; the AEM export names it as REF_FRAME_A"
      >
        <span className="field-label">Inertial frame</span>
        <span className="field-control frame-value" data-testid="inertial-frame">
          {INERTIAL_FRAME} (J2000 mean equator and equinox)
        </span>
        <span className="field-unit" />
      </div>
      <div className="sub-head">Planning</div>
      <SelectField
        path="planning.profile"
        label="Slew profile"
        choices={PROFILES}
        title="Accelerate, coast, brake: the fastest, coasting at the rate cap when it binds. Accelerate, brake: never coasts; a rate cap lowers the acceleration instead."
      />
      <NumberField
        path="planning.torqueMargin"
        label="Torque margin"
        unit="of env."
        step={0.05}
        title="Fraction of the wheel torque envelope the plan may use, (0, 1]"
      />
      <NumberField
        path="planning.momentumMargin"
        label="Momentum margin"
        unit="of env."
        step={0.05}
        title="Fraction of the wheel momentum envelope the plan may use, (0, 1]"
      />
      <NumberField
        path="planning.slewRateLimitDegPerS"
        label="Slew-rate cap"
        unit="deg/s"
        step={0.5}
        title="Cap on the body rate during a planned slew"
      />
      <div className="sub-head">Simulation</div>
      <SelectField
        path="simulation.mode"
        label="Modes flown"
        choices={SIMULATION_MODE_CHOICES}
        title={SIMULATION_MODE_CHOICES.find((c) => c.value === mode)?.help ?? 'How each controller is given the maneuver'}
      />
      <dl className="mode-legend compact" data-testid="simulation-mode-legend">
        {SIMULATION_MODE_CHOICES.filter((c) => c.value !== 'both').map((c) => (
          <div key={c.value}>
            <dt>{c.label}:</dt> <dd>{c.help}</dd>
          </div>
        ))}
      </dl>
      <SelectField path="simulation.timing" label="Controller timing" choices={TIMINGS} />
      <NumberField
        path="simulation.settleAngleDeg"
        label="Settle angle"
        unit="deg"
        step={0.05}
        title="A segment has settled when the error angle to its target stays below this through the segment's end"
      />
      <NumberField
        path="simulation.settleRateDegPerS"
        label="Settle rate"
        unit="deg/s"
        step={0.01}
        title="… and the body rate stays below this"
      />
      <NumberField
        path="simulation.tailS"
        label="Tail after the last hold"
        unit="s"
        step={10}
        title="Extra simulated time after the last hold"
      />
      <NumberField
        path="simulation.seed"
        label="Noise seed"
        unit=""
        step={1}
        title="Seed of the sensor-noise generator (whole number, 0 to 4294967295)"
      />
      <NumberField
        path="simulation.rk4StepsPerSample"
        label="RK4 steps per sample"
        unit=""
        step={1}
        title="Fixed RK4 integration steps per control period"
      />
      <OptionalNumber
        path="simulation.durationS"
        label="Total duration"
        unit="s"
        start={300}
        title="Simulate exactly this long from t = 0 (otherwise to the end of the last hold plus the tail)"
      />
      <OptionalNumber
        path="simulation.endWhenSettledForS"
        label="End when settled for"
        unit="s"
        start={20}
        title="End a target-at-once run once it has stayed settled this long"
      />
    </Section>
  );
}

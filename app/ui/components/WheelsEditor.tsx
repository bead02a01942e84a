/**
 * Wheel array: pyramid or triad preset, or an explicit table of axes with per-wheel limits.
 * Switching layout keeps the limits; switching to custom copies the preset's axes (as resolved by
 * the engine in the last run, or from the engine's preset builders when no run exists yet).
 */
import { pyramid, orthogonalTriad } from '../../engine/wheels/presets';
import { useApp, useAppState, useIssuesUnder, useScenarioValue } from '../context';
import { fmt } from '../format';
import { DEG_PER_RAD, MILLI_PER_SI, RAD_PER_DEG } from '../../engine/units';
import { IssueText, NumberField, NumberInput, SelectField } from './fields';

type Obj = Record<string, unknown>;
const P = 'vehicle.wheels';
const NONE: string[] = [];
const FIELD_PATHS = ['cantAngleDeg', 'azimuthOffsetDeg', 'maxTorqueMNm', 'maxMomentumMNms', 'rotorInertiaKgm2'].map((k) => `${P}.${k}`);
const CUBE_DIAGONAL_CANT_DEG = Math.acos(1 / Math.sqrt(3)) * DEG_PER_RAD;

interface Limits {
  maxTorqueMNm: unknown;
  maxMomentumMNms: unknown;
  rotorInertiaKgm2: unknown;
}

function limitsOf(w: Obj): Limits {
  const src = w.layout === 'custom' && Array.isArray(w.wheels) && w.wheels.length > 0 ? (w.wheels[0] as Obj) : w;
  return {
    maxTorqueMNm: src.maxTorqueMNm ?? 2,
    maxMomentumMNms: src.maxMomentumMNms ?? 6,
    rotorInertiaKgm2: src.rotorInertiaKgm2 ?? 2e-5,
  };
}

const num = (v: unknown, d: number) => (typeof v === 'number' && Number.isFinite(v) ? v : d);
const round = (v: number) => Number(v.toPrecision(12));

function presetAxes(w: Obj): number[][] {
  const l = limitsOf(w);
  const limits = {
    maxTorqueNm: num(l.maxTorqueMNm, 2) / 1e3,
    maxMomentumNms: num(l.maxMomentumMNms, 6) / 1e3,
    rotorInertiaKgm2: num(l.rotorInertiaKgm2, 2e-5),
  };
  const specs =
    w.layout === 'pyramid'
      ? pyramid({
          ...limits,
          count: 4,
          cantAngleRad: num(w.cantAngleDeg, CUBE_DIAGONAL_CANT_DEG) * RAD_PER_DEG,
          azimuthOffsetRad: num(w.azimuthOffsetDeg, 0) * RAD_PER_DEG,
        })
      : orthogonalTriad(limits);
  return specs.map((s) => s.axis.map(round));
}

export function WheelsEditor() {
  const app = useApp();
  const wheels = (useScenarioValue(P) ?? {}) as Obj;
  const layout = typeof wheels.layout === 'string' ? wheels.layout : 'pyramid';
  const shown = layout === 'custom' ? NONE : FIELD_PATHS;
  const other = useIssuesUnder(P, shown);

  function chooseLayout(next: string) {
    if (next === layout) return;
    const l = limitsOf(wheels);
    let value: Obj;
    if (next === 'pyramid')
      value = { layout: 'pyramid', count: 4, cantAngleDeg: round(CUBE_DIAGONAL_CANT_DEG), azimuthOffsetDeg: 45, ...l };
    else if (next === 'triad') value = { layout: 'triad', ...l };
    else {
      // Keep the geometry the user had: the engine's resolved axes from the last run when current
      // (read at the choice, so the editor does not render again for every new output).
      const st = app.store.getState();
      const output = st.output;
      const current = st.outputScenario === st.scenario;
      let axes: number[][];
      if (output && current && output.vehicle.nWheels > 0) {
        axes = [];
        for (let i = 0; i < output.vehicle.nWheels; i++) axes.push([0, 1, 2].map((k) => round(output.vehicle.wheelAxes[3 * i + k]!)));
      } else axes = presetAxes(wheels);
      value = { layout: 'custom', wheels: axes.map((axis) => ({ axis, ...l })) };
    }
    app.store.replace(
      { ...(app.store.getState().scenario as Obj), vehicle: { ...((app.store.getState().scenario as Obj).vehicle as Obj), wheels: value } },
      `Wheel layout: ${next}`,
    );
  }

  const list = Array.isArray(wheels.wheels) ? (wheels.wheels as Obj[]) : [];

  return (
    <div className="wheels">
      <SelectField
        label="Layout"
        value={layout}
        onChoose={chooseLayout}
        choices={[
          { value: 'pyramid', label: 'Pyramid (4 wheels)' },
          { value: 'triad', label: 'Orthogonal triad (X, Y, Z)' },
          { value: 'custom', label: 'Custom axes' },
        ]}
      />
      {layout === 'pyramid' && (
        <>
          <NumberField
            path={`${P}.cantAngleDeg`}
            label="Cant from +Z"
            unit="deg"
            step={0.5}
            title="Angle of each spin axis from the body +Z axis; 54.7356° puts the axes on cube diagonals"
          />
          <NumberField
            path={`${P}.azimuthOffsetDeg`}
            label="Azimuth, wheel 1"
            unit="deg"
            step={5}
            title="Azimuth of wheel 1 about +Z from +X; the others follow every 90°"
          />
        </>
      )}
      {layout !== 'custom' && (
        <>
          <NumberField path={`${P}.maxTorqueMNm`} label="Max torque" unit="mN·m" step={0.1} title="Largest motor torque of each wheel" />
          <NumberField
            path={`${P}.maxMomentumMNms`}
            label="Max momentum"
            unit="mN·m·s"
            step={0.5}
            title="Largest stored momentum of each wheel"
          />
          <NumberField path={`${P}.rotorInertiaKgm2`} label="Rotor inertia" unit="kg·m²" title="Rotor axial inertia of each wheel" />
        </>
      )}
      {layout === 'custom' && (
        <>
          <table className="grid-table wheel-table">
            <thead>
              <tr>
                <th>#</th>
                <th colSpan={3}>spin axis in body axes (normalised on load)</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {list.map((_, i) => (
                <tr key={i}>
                  <td>{i + 1}</td>
                  {[0, 1, 2].map((k) => (
                    <td key={k}>
                      <NumberInput path={`${P}.wheels[${i}].axis[${k}]`} ariaLabel={`wheel ${i + 1} axis ${'xyz'[k]}`} showIssues={false} />
                    </td>
                  ))}
                  <td>
                    <button
                      className="icon"
                      title={`Remove wheel ${i + 1}`}
                      disabled={list.length <= 3}
                      onClick={() =>
                        app.store.edit(
                          `${P}.wheels`,
                          list.filter((__, k) => k !== i),
                          { label: `Remove wheel ${i + 1}`, coalesceKey: null },
                        )
                      }
                    >
                      ×
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <table className="grid-table wheel-table">
            <thead>
              <tr>
                <th>#</th>
                <th title="Largest motor torque">τ max (mN·m)</th>
                <th title="Largest stored momentum">h max (mN·m·s)</th>
                <th title="Rotor axial inertia">J rotor (kg·m²)</th>
              </tr>
            </thead>
            <tbody>
              {list.map((_, i) => (
                <tr key={i}>
                  <td>{i + 1}</td>
                  <td>
                    <NumberInput path={`${P}.wheels[${i}].maxTorqueMNm`} ariaLabel={`wheel ${i + 1} max torque`} showIssues={false} />
                  </td>
                  <td>
                    <NumberInput path={`${P}.wheels[${i}].maxMomentumMNms`} ariaLabel={`wheel ${i + 1} max momentum`} showIssues={false} />
                  </td>
                  <td>
                    <NumberInput
                      path={`${P}.wheels[${i}].rotorInertiaKgm2`}
                      ariaLabel={`wheel ${i + 1} rotor inertia`}
                      showIssues={false}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <button
            className="small"
            disabled={list.length >= 12}
            onClick={() => {
              const last = list[list.length - 1] ?? { axis: [1, 0, 0], ...limitsOf(wheels) };
              app.store.edit(`${P}.wheels`, [...list, { ...last, axis: [0, 0, 1] }], { label: 'Add wheel', coalesceKey: null });
            }}
          >
            + wheel
          </button>
        </>
      )}
      <IssueText errors={other} />
      <WheelCapacity />
    </div>
  );
}

/** The last run's worst-direction capacities (its own component: only it follows the output). */
function WheelCapacity() {
  const vehicle = useAppState((s) => s.output?.vehicle);
  const current = useAppState((s) => s.outputScenario === s.scenario);
  if (!vehicle) return null;
  return (
    <div className={`derived ${current ? '' : 'stale'}`} data-testid="wheel-capacity">
      Worst-direction capacity: torque {fmt(vehicle.worstTorqueCapacityNm * MILLI_PER_SI, 3)} mN·m, momentum{' '}
      {fmt(vehicle.worstMomentumCapacityNms * MILLI_PER_SI, 3)} mN·m·s
    </div>
  );
}

/**
 * Study setup: the scenario's "study" block (engine/scenario/schema.ts StudySchema) as a form.
 * Edits are ordinary document edits (undo, dirty flag, saved with the file); the engine's own
 * validator and study-definition rules report problems beside the fields, by path.
 * A scenario without a block gets an offer of the default one.
 */
import { DEFAULT_DURATION_S, DEFAULT_SETTLED_FOR_S, DEFAULT_WORST_CASES } from '../../engine/study';
import { useApp, useIssuesUnder, useScenarioValue } from '../context';
import { IssueText, NumberField, SelectField } from '../components/fields';
import { useStudySession } from './registry';
import { editStudy, NumberListField, OptNumberField, RangeField } from './StudyFields';

type Obj = Record<string, unknown>;

const ATTITUDE_MODES = [
  { value: 'none', label: 'nominal (not dispersed)' },
  { value: 'uniform', label: 'uniform (all attitudes)' },
  { value: 'cone', label: 'cone about nominal' },
  { value: 'near-reversal', label: 'near 180° error' },
  { value: 'near-antipode', label: 'pointed axis near its antipode (pointing-only target)' },
];

const ACTUATION = [
  { value: 'hold', label: 'hold' },
  { value: 'pwm', label: 'PWM' },
  { value: 'quantized', label: 'quantized' },
];

/** Paths shown by a field of this panel (the rest of the issues under study are listed at the end). */
const SHOWN = [
  'study.runs',
  'study.seed',
  'study.durationS',
  'study.mode',
  'study.stopAfterSettledForS',
  'study.worstCases',
  'study.dispersions.initialAttitude.maxAngleDeg',
  'study.dispersions.initialAttitude.withinDeg',
  'study.dispersions.initialRateDegPerS',
  'study.dispersions.inertia.momentSigmaFraction',
  'study.dispersions.inertia.axisMisalignmentDeg',
  'study.dispersions.wheels.torqueDegradationMax',
  'study.dispersions.wheels.momentumDegradationMax',
  'study.dispersions.wheels.failOneWheelProbability',
  'study.dispersions.sensors.attitudeNoiseScale',
  'study.dispersions.sensors.attitudeNoiseScale[0]',
  'study.dispersions.sensors.attitudeNoiseScale[1]',
  'study.dispersions.sensors.rateBiasDegPerS',
  'study.dispersions.sensors.adversarialEta',
  'study.dispersions.sensors.antipodalNoiseDeg',
  'study.dispersions.controlRateHz',
  'study.dispersions.torqueQuantumMNm',
];

function ControllerChoice() {
  const app = useApp();
  const controllers = (useScenarioValue('controllers') ?? []) as Obj[];
  const chosen = useScenarioValue('study.controllers');
  const list = Array.isArray(chosen) ? (chosen as unknown[]) : null;
  const ids = controllers.map((c) => String(c.id ?? ''));
  const issues = useIssuesUnder('study.controllers', []);
  const isOn = (id: string) => (list ? list.includes(id) : true);
  const toggle = (id: string, on: boolean) => {
    const next = ids.filter((x) => (x === id ? on : isOn(x)));
    // Every controller ticked is the default (no list in the file).
    editStudy(
      app.store,
      'study.controllers',
      next.length === ids.length && ids.every((x) => next.includes(x)) ? undefined : next,
      'Study controllers',
    );
  };
  const onCount = ids.filter(isOn).length;
  return (
    <div className="study-controllers" data-testid="study-controllers">
      <div className="sub-head">Controllers flown on every case</div>
      {controllers.map((c, i) => {
        const id = ids[i]!;
        return (
          <label key={`${id}-${i}`} className="check study-check">
            <input
              type="checkbox"
              checked={isOn(id)}
              disabled={isOn(id) && onCount <= 1}
              onChange={(e) => toggle(id, e.target.checked)}
              data-testid={`study-ctl-${id}`}
            />
            {String(c.label ?? id)} <span className="muted">{String(c.law ?? '')}</span>
          </label>
        );
      })}
      {list && list.some((x) => !ids.includes(String(x))) && (
        <button className="small" onClick={() => editStudy(app.store, 'study.controllers', undefined, 'Study controllers')}>
          fly every controller
        </button>
      )}
      <IssueText errors={issues} />
    </div>
  );
}

function AttitudeDispersion() {
  const app = useApp();
  const a = useScenarioValue('study.dispersions.initialAttitude') as Obj | undefined;
  const mode = typeof a?.mode === 'string' ? a.mode : 'none';
  const choose = (m: string) => {
    const v =
      m === 'none'
        ? undefined
        : m === 'uniform'
          ? { mode: 'uniform' }
          : m === 'cone'
            ? { mode: 'cone', maxAngleDeg: 30 }
            : m === 'near-antipode'
              ? { mode: 'near-antipode', withinDeg: 1 }
              : { mode: 'near-reversal', withinDeg: 10 };
    editStudy(app.store, 'study.dispersions.initialAttitude', v, 'Study start attitudes');
  };
  const issues = useIssuesUnder('study.dispersions.initialAttitude', SHOWN);
  return (
    <>
      <SelectField
        label="Start attitude"
        value={mode}
        choices={ATTITUDE_MODES}
        onChoose={choose}
        title="How the initial attitude of each case is drawn"
      />
      {mode === 'cone' && <NumberField path="study.dispersions.initialAttitude.maxAngleDeg" label="Cone radius" unit="deg" step={5} />}
      {mode === 'near-reversal' && (
        <NumberField path="study.dispersions.initialAttitude.withinDeg" label="Off 180° by ≤" unit="deg" step={1} />
      )}
      {mode === 'near-antipode' && (
        <NumberField path="study.dispersions.initialAttitude.withinDeg" label="Axis off its antipode by ≤" unit="deg" step={0.5} />
      )}
      <IssueText errors={issues} />
    </>
  );
}

function ActuationChoice() {
  const app = useApp();
  const v = useScenarioValue('study.dispersions.actuation');
  const list = Array.isArray(v) ? (v as string[]) : null;
  const issues = useIssuesUnder('study.dispersions.actuation', []);
  const toggle = (m: string, on: boolean) => {
    const next = ACTUATION.map((x) => x.value).filter((x) => (x === m ? on : (list ?? []).includes(x)));
    editStudy(app.store, 'study.dispersions.actuation', next.length ? next : undefined, 'Study actuation modes');
  };
  return (
    <div className="field">
      <div className="field-row" title="Actuation modes drawn per case; none ticked flies the vehicle's own">
        <span className="field-label">Actuation</span>
        <span className="field-control">
          {ACTUATION.map((m) => (
            <label key={m.value} className="check study-inline">
              <input type="checkbox" checked={(list ?? []).includes(m.value)} onChange={(e) => toggle(m.value, e.target.checked)} />{' '}
              {m.label}
            </label>
          ))}
        </span>
        <span className="field-unit">{list ? '' : "vehicle's"}</span>
      </div>
      <IssueText errors={issues} />
    </div>
  );
}

export function StudySetup() {
  const app = useApp();
  const session = useStudySession();
  const study = useScenarioValue('study');
  const rest = useIssuesUnder('study', SHOWN);
  // Those under the controller list, the start attitude and the actuation modes are shown there.
  const restOwn = rest.filter(
    (i) =>
      !['study.controllers', 'study.dispersions.initialAttitude', 'study.dispersions.actuation'].some(
        (p) => i.path === p || i.path.startsWith(`${p}.`) || i.path.startsWith(`${p}[`),
      ),
  );
  if (study === undefined) {
    return (
      <div className="study-setup-empty" data-testid="study-no-block">
        <p>This scenario has no study block yet.</p>
        <p className="muted">
          The default block flies every controller on 100 cases drawn from the scenario&apos;s seed, starting from attitudes spread
          uniformly over all rotations, with the vehicle&apos;s sensor noise drawn afresh per case. Add it, then edit it here; it is saved
          with the scenario and can be undone.
        </p>
        <button className="primary" onClick={() => session.addDefaultStudy()} data-testid="study-add-default">
          Add the default study block
        </button>
      </div>
    );
  }
  return (
    <div className="study-setup-form" data-testid="study-setup">
      <div className="sub-head">Cases</div>
      <NumberField path="study.runs" label="Cases" unit="" step={10} title="Dispersed cases; every ticked controller flies every case" />
      <NumberField
        path="study.seed"
        label="Seed"
        unit=""
        title="A case depends only on (seed, case index): the same seed gives the same cases"
      />
      <OptNumberField
        path="study.durationS"
        label="Case length"
        unit="s"
        placeholder={String(DEFAULT_DURATION_S)}
        title="Simulated time per case"
      />
      <SelectField
        label="How the controller is given the slew"
        title="Step to the target: regulate to the first target from the dispersed start. Follow the plan: track the slew planned on the nominal model from that start."
        path="study.mode"
        value={(study as Obj).mode === 'follow-plan' ? 'follow-plan' : 'step-target'}
        onChoose={(m) => editStudy(app.store, 'study.mode', m === 'step-target' ? undefined : m, 'Study reference mode')}
        choices={[
          { value: 'step-target', label: 'Step to the target at once' },
          { value: 'follow-plan', label: 'Follow the planned slew' },
        ]}
      />
      <OptNumberField
        path="study.stopAfterSettledForS"
        label="Stop when settled"
        unit="s"
        placeholder={String(DEFAULT_SETTLED_FOR_S)}
        title="End a case once it has stayed settled this long (0 = always run the full length)"
      />
      <OptNumberField
        path="study.worstCases"
        label="Worst cases"
        unit=""
        placeholder={String(DEFAULT_WORST_CASES)}
        title="Worst cases listed per controller"
      />
      <ControllerChoice />

      <div className="sub-head">Start</div>
      <AttitudeDispersion />
      <OptNumberField
        path="study.dispersions.initialRateDegPerS"
        label="Start rate 1σ"
        unit="deg/s"
        placeholder="0"
        title="1σ per body axis of the initial rate added to the nominal one"
      />

      <div className="sub-head">Vehicle uncertainty</div>
      <OptNumberField
        path="study.dispersions.inertia.momentSigmaFraction"
        label="Moments 1σ"
        unit="fraction"
        placeholder="0"
        title="1σ relative error of each principal moment of inertia"
      />
      <OptNumberField
        path="study.dispersions.inertia.axisMisalignmentDeg"
        label="Axes 1σ"
        unit="deg"
        placeholder="0"
        title="1σ per axis of a small rotation of the principal axes"
      />
      <OptNumberField
        path="study.dispersions.wheels.torqueDegradationMax"
        label="Torque loss ≤"
        unit="fraction"
        placeholder="0"
        title="Each wheel loses a fraction of its torque limit drawn uniformly in [0, this]"
      />
      <OptNumberField
        path="study.dispersions.wheels.momentumDegradationMax"
        label="Momentum loss ≤"
        unit="fraction"
        placeholder="0"
        title="Each wheel loses a fraction of its momentum limit drawn uniformly in [0, this]"
      />
      <OptNumberField
        path="study.dispersions.wheels.failOneWheelProbability"
        label="Lose a wheel"
        unit="prob."
        placeholder="0"
        title="Probability that one wheel, chosen at random, is lost for the whole case"
      />

      <div className="sub-head">Sensors and sampling</div>
      <RangeField
        path="study.dispersions.sensors.attitudeNoiseScale"
        label="Noise × [min, max]"
        unit="×"
        defaults={[1, 1]}
        title="Factor on the vehicle's attitude noise, drawn uniformly per case"
      />
      <OptNumberField
        path="study.dispersions.sensors.rateBiasDegPerS"
        label="Extra rate bias 1σ"
        unit="deg/s"
        placeholder="0"
        title="1σ per axis of an extra constant gyro bias"
      />
      <OptNumberField
        path="study.dispersions.sensors.adversarialEta"
        label="Worst-case noise ē"
        unit="—"
        placeholder="0"
        title="Bounded worst-case noise on the error quaternion scalar part: the measured η is reflected when |η| < ē (0 = off)"
      />
      <OptNumberField
        path="study.dispersions.sensors.antipodalNoiseDeg"
        label="Worst-case pointing noise"
        unit="deg"
        placeholder="0"
        title="Pointing-only targets: whenever the pointed axis is within this angle of its antipode, the measurement shows it exactly there (the stall of a smooth pointing law; 0 = off)"
      />
      <NumberListField
        path="study.dispersions.controlRateHz"
        label="Control rates"
        unit="Hz"
        placeholder="vehicle's"
        title="Control rates drawn uniformly per case, e.g. 5, 10"
      />
      <ActuationChoice />
      <OptNumberField
        path="study.dispersions.torqueQuantumMNm"
        label="Torque quantum"
        unit="mN·m"
        placeholder="vehicle's"
        title="Torque quantum of cases drawn as quantized when the vehicle has none"
      />
      <IssueText errors={restOwn} />
    </div>
  );
}

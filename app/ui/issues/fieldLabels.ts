/**
 * Issue paths (the engine's `vehicle.wheels.maxTorqueMNm`, `controllers[2].gapThreshold`) in the
 * words of the form: the section the field sits in and the field's own label, and a value to
 * suggest. Data-driven: one table per block of the file, keyed by the field's key, plus the law
 * registry's field labels (control/laws/<law>/definition.ts) for the controllers. The labels here
 * are the ones the panels show (test/e2e checks them against the rendered form).
 *
 * Suggestions are values that satisfy the field's own rule: the bundled starter scenario's
 * choices (starter.ts), the law registry's `suggested` values; none where no single value is right
 * (an attitude, a name that must be unique).
 */
import { LAWS } from '../../engine/control/registry';
import type { LawId } from '../../engine/control/params';
import { parsePath, type PathToken } from '../store/paths';
import { CONSTRAINT_FIELDS as CF } from '../constraintForms';

export interface FieldDescription {
  /** Sections, outermost first, as the form titles them ("Vehicle", "Reaction wheels"). */
  where: string[];
  /** The field's label in the form ("Max torque"). */
  label: string;
  /** A value that satisfies the field's own rule, when there is one. */
  suggest?: unknown;
}

interface Leaf {
  label: string;
  suggest?: unknown;
}

type Obj = Record<string, unknown>;
const AXIS = ['x', 'y', 'z'];

function get(root: unknown, tokens: readonly PathToken[]): unknown {
  let v = root;
  for (const t of tokens) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<string | number, unknown>)[t];
  }
  return v;
}

/** The section and label of a leaf table entry, with vector components ("Rate bias x"). */
function leaf(where: string[], table: Readonly<Record<string, Leaf>>, rest: readonly PathToken[], names = AXIS): FieldDescription | null {
  const [key, ...more] = rest;
  if (typeof key !== 'string') return null;
  const e = table[key];
  if (!e) return null;
  if (more.length === 0) return { where, label: e.label, suggest: e.suggest };
  if (more.length === 1 && typeof more[0] === 'number') {
    const k = more[0];
    const s = Array.isArray(e.suggest) ? e.suggest[k] : undefined;
    return { where, label: `${e.label} ${names[k] ?? k + 1}`, suggest: s };
  }
  return null;
}

// ---------------------------------------------------------------------------------------------
// Scenario, planning and simulation (RunSettingsPanel.tsx)

const SCENARIO_SECTION = 'Scenario and timing';
const SCENARIO: Record<string, Leaf> = {
  name: { label: 'Scenario name', suggest: 'New scenario' },
  description: { label: 'Description' },
  epochUtc: { label: 'Epoch (UTC)', suggest: '2030-01-01T00:00:00Z' },
  format: { label: 'File format' },
  version: { label: 'File format version' },
};

const PLANNING: Record<string, Leaf> = {
  torqueMargin: { label: 'Torque margin', suggest: 0.8 },
  momentumMargin: { label: 'Momentum margin', suggest: 0.8 },
  slewRateLimitDegPerS: { label: 'Slew-rate cap', suggest: 2 },
  profile: { label: 'Slew profile', suggest: 'bang-coast-bang' },
};

const SIMULATION: Record<string, Leaf> = {
  mode: { label: 'Modes flown', suggest: 'both' },
  timing: { label: 'Controller timing', suggest: 'sampled' },
  settleAngleDeg: { label: 'Settle angle', suggest: 0.1 },
  settleRateDegPerS: { label: 'Settle rate', suggest: 0.02 },
  tailS: { label: 'Tail after the last hold', suggest: 30 },
  durationS: { label: 'Total duration', suggest: 300 },
  seed: { label: 'Noise seed', suggest: 1 },
  rk4StepsPerSample: { label: 'RK4 steps per sample', suggest: 1 },
  endWhenSettledForS: { label: 'End when settled for', suggest: 0 },
};

// ---------------------------------------------------------------------------------------------
// Vehicle (VehiclePanel.tsx, WheelsEditor.tsx)

const VEHICLE: Record<string, Leaf> = {
  name: { label: 'Name', suggest: 'Generic bus' },
  controlRateHz: { label: 'Control rate', suggest: 10 },
  modelInertiaKgm2: { label: 'Model inertia (file only)' },
};

const WHEELS: Record<string, Leaf> = {
  layout: { label: 'Layout', suggest: 'pyramid' },
  count: { label: 'Wheel count', suggest: 4 },
  cantAngleDeg: { label: 'Cant from +Z', suggest: 54.7356103172 },
  azimuthOffsetDeg: { label: 'Azimuth, wheel 1', suggest: 45 },
  maxTorqueMNm: { label: 'Max torque', suggest: 1 },
  maxMomentumMNms: { label: 'Max momentum', suggest: 4 },
  rotorInertiaKgm2: { label: 'Rotor inertia', suggest: 5e-6 },
  wheels: { label: 'Wheels' },
};

const CUSTOM_WHEEL: Record<string, Leaf> = {
  axis: { label: 'spin axis' },
  maxTorqueMNm: { label: 'τ max', suggest: 1 },
  maxMomentumMNms: { label: 'h max', suggest: 4 },
  rotorInertiaKgm2: { label: 'J rotor', suggest: 5e-6 },
};

const FRICTION: Record<string, Leaf> = {
  viscousMNmPerRadPerS: { label: 'Viscous', suggest: 0.001 },
  coulombMNm: { label: 'Coulomb', suggest: 0.01 },
  compensatedFraction: { label: 'Friction feedforward fraction (file only)', suggest: 0 },
};

const SENSORS: Record<string, Leaf> = {
  attitudeNoiseArcsec: { label: 'Attitude noise σ', suggest: 10 },
  rateNoiseDegPerS: { label: 'Rate noise σ', suggest: 0.01 },
  rateBiasDegPerS: { label: 'Rate bias', suggest: [0, 0, 0] },
  boundedNoiseEta: { label: 'Bounded noise ē (file only)', suggest: 0 },
  boundedNoiseMode: { label: 'Bounded noise mode (file only)', suggest: 'reflect' },
};

const ACTUATION: Record<string, Leaf> = {
  mode: { label: 'Actuation', suggest: 'hold' },
  torqueQuantumMNm: { label: 'Torque quantum', suggest: 0.01 },
};

function vehicleField(rest: readonly PathToken[]): FieldDescription | null {
  const V = ['Vehicle'];
  const [key, ...more] = rest;
  if (key === undefined) return { where: [], label: 'Vehicle' };
  if (key === 'inertiaKgm2') {
    const where = [...V, 'Inertia'];
    if (more.length === 0) return { where: V, label: 'Inertia matrix' };
    if (more.length === 1 && typeof more[0] === 'number') return { where, label: `row ${AXIS[more[0]] ?? more[0] + 1}` };
    if (more.length === 2 && typeof more[0] === 'number' && typeof more[1] === 'number')
      return { where, label: `J${AXIS[more[0]] ?? '?'}${AXIS[more[1]] ?? '?'}` };
    return null;
  }
  if (key === 'wheels') {
    const W = [...V, 'Reaction wheels'];
    if (more.length === 0) return { where: V, label: 'Reaction wheels' };
    if (more[0] === 'wheels' && typeof more[1] === 'number') {
      const i = more[1];
      const where = [...W, `wheel ${i + 1}`];
      if (more.length === 2) return { where: W, label: `wheel ${i + 1}` };
      return leaf(where, CUSTOM_WHEEL, more.slice(2));
    }
    return leaf(W, WHEELS, more);
  }
  if (key === 'wheelFriction') {
    if (more.length === 0) return { where: V, label: 'Wheel bearing friction' };
    return leaf([...V, 'Wheel bearing friction'], FRICTION, more);
  }
  if (key === 'sensors') {
    if (more.length === 0) return { where: V, label: 'Sensors and control' };
    return leaf([...V, 'Sensors and control'], SENSORS, more);
  }
  if (key === 'actuation') {
    if (more.length === 0) return { where: [...V, 'Sensors and control'], label: 'Actuation' };
    return leaf([...V, 'Sensors and control'], ACTUATION, more);
  }
  if (key === 'controlRateHz') return leaf([...V, 'Sensors and control'], VEHICLE, rest);
  if (key === 'modelInertiaKgm2') return { where: V, label: VEHICLE.modelInertiaKgm2!.label };
  return leaf(V, VEHICLE, rest);
}

// ---------------------------------------------------------------------------------------------
// Attitudes (AttitudeEditor.tsx), initial state and targets (ManeuverPanel.tsx)

const ATTITUDE_FIELDS: Record<string, Record<string, Leaf>> = {
  quaternion: {},
  euler: { sequence: { label: 'Sequence', suggest: 'ZYX' }, anglesDeg: { label: 'Angles' } },
  pointing: {
    bodyAxis: { label: 'Body axis' },
    inertialDirection: { label: '→ along inertial direction' },
    bodySecondary: { label: 'Body secondary axis' },
    inertialSecondary: { label: '→ towards inertial secondary' },
  },
  relative: { axis: { label: 'Axis (previous body frame)' }, angleDeg: { label: 'Angle' } },
};

function attitudeField(where: string[], rest: readonly PathToken[]): FieldDescription | null {
  const [form, ...more] = rest;
  if (form === undefined) return { where, label: 'Attitude' };
  if (form === 'quaternion') {
    if (more.length === 0) return { where, label: 'q = [x, y, z, w]' };
    if (more.length === 1 && typeof more[0] === 'number') return { where, label: `q ${'xyzw'[more[0]] ?? more[0] + 1}` };
    return null;
  }
  const table = typeof form === 'string' ? ATTITUDE_FIELDS[form] : undefined;
  if (!table) return null;
  if (more.length === 0) return { where, label: 'Attitude form' };
  return leaf(where, table, more, form === 'euler' ? ['1', '2', '3'] : AXIS);
}

// A target's track and window (orbit/TrackEditor.tsx).
const TRACK_AIMED: Record<string, Leaf> = {
  id: { label: 'Site' },
  bodyAxis: { label: 'Body axis', suggest: [0, 0, 1] },
  bodySecondary: { label: 'Body secondary axis', suggest: [1, 0, 0] },
  secondaryToward: { label: 'Secondary toward', suggest: 'orbit-normal' },
};
const TRACK_NADIR: Record<string, Leaf> = {
  yaw: { label: 'Yaw rule', suggest: 'lvlh' },
  bodyAxis: { label: 'Body axis on nadir', suggest: [0, 0, 1] },
  bodySecondary: { label: 'Body secondary axis' },
};
const WINDOW: Record<string, Leaf> = {
  start: { label: 'Due' },
  holdUntil: { label: 'Due' },
  atUtc: { label: 'Start (UTC)' },
};

function trackField(where: string[], key: 'track' | 'window', rest: readonly PathToken[]): FieldDescription | null {
  if (key === 'window') return rest.length === 0 ? { where, label: 'Due' } : leaf(where, WINDOW, rest);
  const [form, ...more] = rest;
  if (form === undefined || more.length === 0) return { where, label: 'Target' };
  if (form === 'station' && more[0] === 'id') return { where, label: 'Station' };
  if (more[0] === 'secondaryToward' && more[1] === 'inertialDirection')
    return leaf(where, { inertialDirection: { label: '→ EME2000 direction', suggest: [0, 0, 1] } }, more.slice(1));
  return leaf(where, form === 'nadir' ? TRACK_NADIR : TRACK_AIMED, more);
}

function maneuverField(scenario: unknown, tokens: readonly PathToken[]): FieldDescription | null {
  const M = ['Maneuver'];
  const [block, ...rest] = tokens;
  if (block === 'initial') {
    const I = [...M, 'Initial state'];
    const [key, ...more] = rest;
    if (key === undefined) return { where: M, label: 'Initial state' };
    if (key === 'attitude') return attitudeField(I, more);
    if (key === 'bodyRateDegPerS') return leaf(I, { bodyRateDegPerS: { label: 'Body rate', suggest: [0, 0, 0] } }, rest);
    if (key === 'wheelMomentumMNms') {
      if (more.length === 0) return { where: I, label: 'h₀ per wheel' };
      if (more.length === 1 && typeof more[0] === 'number') return { where: I, label: `h₀ wheel ${more[0] + 1}`, suggest: 0 };
    }
    return null;
  }
  // targets
  const [i, key, ...more] = rest;
  if (i === undefined) return { where: M, label: 'Targets' };
  if (typeof i !== 'number') return null;
  const t = get(scenario, ['targets', i]) as Obj | undefined;
  const name = typeof t?.label === 'string' && t.label.trim() ? ` “${t.label}”` : '';
  const T = [...M, `Target ${i + 1}${name}`];
  if (key === undefined) return { where: M, label: `Target ${i + 1}${name}` };
  if (key === 'attitude') return attitudeField(T, more);
  if (key === 'track' || key === 'window') return trackField(T, key, more);
  return leaf(T, { label: { label: 'Label', suggest: `Target ${i + 1}` }, holdS: { label: 'Hold', suggest: 30 } }, [key, ...more]);
}

// ---------------------------------------------------------------------------------------------
// Controllers (ControllersPanel.tsx; law fields from the registry)

const CONTROLLER: Record<string, Leaf> = {
  id: { label: 'Id' },
  label: { label: 'Label' },
  law: { label: 'Law', suggest: 'quaternion-pd' },
  gains: { label: 'Gains' },
};

const BANDWIDTH_GAINS: Record<string, Leaf> = {
  bandwidthRadPerS: { label: 'Bandwidth ωn', suggest: 0.2 },
  dampingRatio: { label: 'Damping ratio ζ', suggest: 0.9 },
};

function controllerField(scenario: unknown, rest: readonly PathToken[]): FieldDescription | null {
  const C = ['Controllers to compare'];
  const [i, key, ...more] = rest;
  if (i === undefined) return { where: [], label: 'Controllers to compare' };
  if (typeof i !== 'number') return null;
  const c = get(scenario, ['controllers', i]) as Obj | undefined;
  const name = typeof c?.label === 'string' && c.label.trim() ? c.label : typeof c?.id === 'string' ? c.id : `controller ${i + 1}`;
  const where = [...C, name];
  if (key === undefined) return { where: C, label: name };
  const law = (typeof c?.law === 'string' && c.law in LAWS ? c.law : null) as LawId | null;
  if (key === 'gains') {
    if (more.length === 0) return { where, label: 'Gains' };
    if (more[0] === 'kp' || more[0] === 'kd') {
      const g = law ? LAWS[law].gains[more[0] === 'kp' ? 'stiffness' : 'damping'] : null;
      const word = more[0] === 'kp' ? 'Stiffness' : 'Damping';
      return { where, label: `${word} ${g ? g.symbol : more[0]}`, suggest: more[0] === 'kp' ? 0.01 : 0.05 };
    }
    return leaf(where, BANDWIDTH_GAINS, more);
  }
  if (typeof key === 'string' && key in CONTROLLER) return leaf(where, CONTROLLER, [key, ...more]);
  if (typeof key !== 'string') return null;
  // A law's own field: the registry's label (one name per quantity everywhere).
  const f = (law ? LAWS[law].fields : Object.values(LAWS).flatMap((l) => l.fields)).find((x) => x.key === key);
  if (!f) return null;
  if (more.length === 0) return { where, label: f.label, suggest: f.suggested };
  const [k, m] = more;
  if (typeof k !== 'number') return null;
  const item = f.kind === 'vector3' ? `${f.label} ${k + 1}` : `${f.label.replace(/s$/, '')} ${k + 1}`;
  const s = Array.isArray(f.suggested) ? f.suggested[k] : undefined;
  if (more.length === 1) return { where, label: item, suggest: s };
  if (more.length === 2 && typeof m === 'number') return { where, label: `${item} ${AXIS[m] ?? m + 1}` };
  return null;
}

// ---------------------------------------------------------------------------------------------
// Keep-out cones and the study block

const KEEP_OUT: Record<string, Leaf> = {
  label: { label: 'Label' },
  bodyAxis: { label: 'Body axis', suggest: [0, 0, 1] },
  inertialDirection: { label: 'Cone axis (inertial)' },
  halfAngleDeg: { label: 'Half-angle', suggest: 30 },
};

function keepOutField(scenario: unknown, rest: readonly PathToken[]): FieldDescription | null {
  const K = ['Keep-out cones'];
  const [i, ...more] = rest;
  if (i === undefined) return { where: [], label: 'Keep-out cones' };
  if (typeof i !== 'number') return null;
  const k = get(scenario, ['keepOut', i]) as Obj | undefined;
  const name = typeof k?.label === 'string' && k.label.trim() ? ` “${k.label}”` : '';
  if (more.length === 0) return { where: K, label: `cone ${i + 1}${name}` };
  return leaf([...K, `cone ${i + 1}${name}`], KEEP_OUT, more);
}

const CONSTRAINT: Record<string, Leaf> = {
  name: { label: CF.name },
  kind: { label: CF.kind, suggest: 'keep-out' },
  bodyAxis: { label: CF.bodyAxis, suggest: [0, 0, 1] },
  halfAngleDeg: { label: CF.halfAngleDeg, suggest: 30 },
  marginDeg: { label: CF.marginDeg, suggest: 0 },
};
const CONSTRAINT_DIRECTION: Record<string, Leaf> = {
  kind: { label: CF.direction, suggest: 'sun' },
  inertialDirection: { label: CF.inertialDirection, suggest: [1, 0, 0] },
  latitudeDeg: { label: CF.latitudeDeg, suggest: 0 },
  longitudeDeg: { label: CF.longitudeDeg, suggest: 0 },
  altitudeM: { label: CF.altitudeM, suggest: 0 },
};
const CONSTRAINT_WINDOW: Record<string, Leaf> = { startS: { label: CF.startS, suggest: 0 }, endS: { label: CF.endS } };

/** The Constraints panel (ConstraintsPanel.tsx): one card per constraint. */
function constraintField(scenario: unknown, rest: readonly PathToken[]): FieldDescription | null {
  const C = ['Constraints'];
  const [i, key, ...more] = rest;
  if (i === undefined) return { where: [], label: 'Constraints' };
  if (typeof i !== 'number') return null;
  const c = get(scenario, ['constraints', i]) as Obj | undefined;
  const name = typeof c?.name === 'string' && c.name.trim() ? ` “${c.name}”` : '';
  const where = [...C, `constraint ${i + 1}${name}`];
  if (key === undefined) return { where: C, label: `constraint ${i + 1}${name}` };
  if (key === 'direction') return more.length === 0 ? { where, label: CF.direction } : leaf(where, CONSTRAINT_DIRECTION, more);
  if (key === 'window') return more.length === 0 ? { where, label: 'Time window' } : leaf(where, CONSTRAINT_WINDOW, more);
  return leaf(where, CONSTRAINT, [key, ...more]);
}

const STUDY: Record<string, Leaf> = {
  runs: { label: 'Cases', suggest: 100 },
  seed: { label: 'Seed', suggest: 1 },
  controllers: { label: 'Controllers flown on every case' },
  durationS: { label: 'Case length', suggest: 600 },
  mode: { label: 'How the controller is given the slew', suggest: 'step-target' },
  stopAfterSettledForS: { label: 'Stop when settled', suggest: 20 },
  worstCases: { label: 'Worst cases', suggest: 5 },
};
const STUDY_DISPERSIONS: Record<string, Leaf> = {
  initialAttitude: { label: 'Start attitude' },
  initialRateDegPerS: { label: 'Start rate 1σ', suggest: 0 },
  controlRateHz: { label: 'Control rates', suggest: [10] },
  actuation: { label: 'Actuation', suggest: ['hold'] },
  torqueQuantumMNm: { label: 'Torque quantum', suggest: 0.01 },
};
const STUDY_GROUPS: Record<string, Record<string, Leaf>> = {
  initialAttitude: {
    mode: { label: 'Start attitude', suggest: 'uniform' },
    maxAngleDeg: { label: 'Cone radius', suggest: 30 },
    withinDeg: { label: 'Off 180° by ≤', suggest: 10 },
  },
  inertia: { momentSigmaFraction: { label: 'Moments 1σ', suggest: 0.05 }, axisMisalignmentDeg: { label: 'Axes 1σ', suggest: 1 } },
  wheels: {
    torqueDegradationMax: { label: 'Torque loss ≤', suggest: 0.1 },
    momentumDegradationMax: { label: 'Momentum loss ≤', suggest: 0.1 },
    failOneWheelProbability: { label: 'Lose a wheel', suggest: 0 },
  },
  sensors: {
    attitudeNoiseScale: { label: 'Noise × [min, max]', suggest: [1, 1] },
    rateBiasDegPerS: { label: 'Extra rate bias 1σ', suggest: 0 },
    adversarialEta: { label: 'Worst-case noise ē', suggest: 0 },
    antipodalNoiseDeg: { label: 'Worst-case pointing noise', suggest: 0 },
  },
};
const GROUP_TITLES: Record<string, string> = {
  inertia: 'Vehicle uncertainty',
  wheels: 'Vehicle uncertainty',
  sensors: 'Sensors and sampling',
};

function studyField(rest: readonly PathToken[]): FieldDescription | null {
  const S = ['Robustness study'];
  const [key, ...more] = rest;
  if (key === undefined) return { where: [], label: 'Robustness study block' };
  if (key === 'controllers') return { where: S, label: STUDY.controllers!.label };
  if (key !== 'dispersions') return leaf(S, STUDY, rest);
  const [group, ...inner] = more;
  if (group === undefined) return { where: S, label: 'Dispersions' };
  if (typeof group !== 'string') return null;
  const table = STUDY_GROUPS[group];
  if (table && inner.length > 0) return leaf([...S, GROUP_TITLES[group] ?? 'Start'], table, inner, ['min', 'max', '3']);
  if (group === 'actuation' && inner.length === 1) return { where: S, label: 'Actuation', suggest: 'hold' };
  if (group === 'controlRateHz' && inner.length === 1) return { where: [...S, 'Sensors and sampling'], label: 'Control rates' };
  return leaf(S, STUDY_DISPERSIONS, more);
}

// ---------------------------------------------------------------------------------------------
// Orbit (orbit/OrbitPanel.tsx)

const ORBIT_SECTION = 'Orbit';
const ORBIT: Record<string, Leaf> = {
  horizonS: { label: 'Horizon', suggest: 86400 },
};
const ELEMENTS: Record<string, Leaf> = {
  name: { label: 'Element set name' },
  epochUtc: { label: 'Element epoch (UTC)' },
  semiMajorAxisKm: { label: 'Semi-major axis' },
  meanMotionRevPerDay: { label: 'Mean motion' },
  eccentricity: { label: 'Eccentricity' },
  inclinationDeg: { label: 'Inclination' },
  raanDeg: { label: 'RAAN' },
  argPerigeeDeg: { label: 'Argument of perigee' },
  meanAnomalyDeg: { label: 'Mean anomaly' },
  bstarPerEarthRadii: { label: 'B* drag term' },
};
const SITE: Record<string, Leaf> = {
  id: { label: 'Id' },
  label: { label: 'Name' },
  latitudeDeg: { label: 'Latitude' },
  longitudeDeg: { label: 'Longitude' },
  heightM: { label: 'Height' },
  elevationMaskDeg: { label: 'Elevation mask' },
};

/** TLE issues carry the line and columns in their path ("orbit.tle line 2, column 69"). */
function orbitField(path: string, rest: readonly PathToken[]): FieldDescription | null {
  if (path.startsWith('orbit.tle')) return { where: [ORBIT_SECTION], label: 'Two-line element set' };
  const [key, ...more] = rest;
  if (key === undefined) return { where: [], label: 'Orbit block' };
  if (key === 'meanElements')
    return more.length === 0 ? { where: [ORBIT_SECTION], label: 'Mean elements' } : leaf([ORBIT_SECTION, 'Mean elements'], ELEMENTS, more);
  if (key === 'sites') {
    const [i, ...inner] = more;
    if (typeof i !== 'number') return { where: [ORBIT_SECTION], label: 'Ground sites' };
    return inner.length === 0 ? { where: [ORBIT_SECTION], label: `Site ${i + 1}` } : leaf([ORBIT_SECTION, `Site ${i + 1}`], SITE, inner);
  }
  return leaf([ORBIT_SECTION], ORBIT, rest);
}

// ---------------------------------------------------------------------------------------------

/** The form's section and label for an issue path, or null when the form has no such field. */
export function describeField(path: string, scenario: unknown): FieldDescription | null {
  if (path === '') return { where: [], label: 'Scenario file' };
  const tokens = parsePath(path);
  const [head, ...rest] = tokens;
  switch (head) {
    case 'vehicle':
      return vehicleField(rest);
    case 'initial':
    case 'targets':
      return maneuverField(scenario, tokens);
    case 'controllers':
      return controllerField(scenario, rest);
    case 'planning':
      return rest.length === 0 ? { where: [], label: 'Planning' } : leaf(['Planning'], PLANNING, rest);
    case 'simulation':
      return rest.length === 0 ? { where: [], label: 'Simulation' } : leaf(['Simulation'], SIMULATION, rest);
    case 'keepOut':
      return keepOutField(scenario, rest);
    case 'constraints':
      return constraintField(scenario, rest);
    case 'study':
      return studyField(rest);
    case 'orbit':
      return orbitField(path, rest);
    default:
      return typeof head === 'string' && rest.length === 0 && SCENARIO[head]
        ? { where: [SCENARIO_SECTION], label: SCENARIO[head].label, suggest: SCENARIO[head].suggest }
        : null;
  }
}

/** "Vehicle › Reaction wheels › Max torque". */
export function fieldTitle(d: FieldDescription): string {
  return [...d.where, d.label].join(' › ');
}

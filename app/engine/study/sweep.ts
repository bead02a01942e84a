/**
 * A robustness sweep: one or two study parameters on a grid; every grid cell is a seeded study
 * of N cases (the study's own case generator and accumulator, sweepRun.ts) flown by the chosen
 * controllers. This file holds the definition: the parameters a sweep may vary, how a value is
 * written into the cell's scenario file, the grid (values listed or lo/hi/steps) and its checks.
 *
 * A cell's study seed is a pure function of the sweep seed and the cell index (`cellSeed`), so a
 * cell gives the same result whichever worker runs it and in whatever order.
 */
import type { Issue, Result } from '../errors';
import { fail, issue, ok } from '../errors';

/** The parameters a sweep may vary (file keys of the sweep, our own names). */
export const SWEEP_PARAMETERS = {
  'noise-scale': {
    label: 'attitude-noise scale',
    unit: '×',
    min: 0,
    max: 1000,
    minOpen: false,
    describe:
      'factor on vehicle.sensors.attitudeNoiseArcsec for every case of the cell (study.dispersions.sensors.attitudeNoiseScale = [v, v])',
  },
  'worst-case-eta': {
    label: 'worst-case noise ē',
    unit: '',
    min: 0,
    max: 1,
    minOpen: false,
    maxOpen: true,
    describe: 'worst-case noise ē: the measured η is reflected whenever |η| < ē (study.dispersions.sensors.adversarialEta)',
  },
  hysteresis: {
    label: 'hysteresis δ',
    unit: '',
    min: 0,
    max: 1,
    minOpen: true,
    maxOpen: true,
    describe: 'hysteresis δ of every hysteretic controller flown (controllers[].hysteresis); laws without one are flown unchanged',
  },
  'control-rate-hz': {
    label: 'control rate',
    unit: 'Hz',
    min: 0,
    max: 1000,
    minOpen: true,
    describe: 'vehicle.controlRateHz (any study dispersion of the rate is dropped)',
  },
  'torque-quantum-mnm': {
    label: 'torque quantum',
    unit: 'mN·m',
    min: 0,
    max: 1e6,
    minOpen: true,
    describe:
      'torque resolution of quantised actuation: vehicle.actuation = quantized with this quantum (any study dispersion of the actuation is dropped)',
  },
  'inertia-error': {
    label: 'inertia error 1σ',
    unit: '',
    min: 0,
    max: 0.5,
    minOpen: false,
    describe: '1σ relative error of each principal moment (study.dispersions.inertia.momentSigmaFraction)',
  },
  'jump-threshold': {
    label: 'jump threshold δ',
    unit: '',
    min: 0,
    max: 1e6,
    minOpen: true,
    describe:
      'jump threshold δ on the synergy gap of every synergistic controller flown (controllers[].gapThreshold, the law’s potential units); cells at or beyond the certified gap δ* are flown anyway (requireCertificate: false), so the map shows what the certificate rules out',
  },
  'failed-wheel': {
    label: 'wheel-loss probability',
    unit: '',
    min: 0,
    max: 1,
    minOpen: false,
    describe: 'probability that one wheel is lost for the whole case (study.dispersions.wheels.failOneWheelProbability)',
  },
} as const satisfies Record<
  string,
  { label: string; unit: string; min: number; max: number; minOpen: boolean; maxOpen?: boolean; describe: string }
>;

export type SweepParameter = keyof typeof SWEEP_PARAMETERS;
export const SWEEP_PARAMETER_NAMES = Object.keys(SWEEP_PARAMETERS) as SweepParameter[];

/** At most this many values on one axis, and cells in a sweep (common practice, no source: a 50 × 50 map is already fine-grained). */
export const MAX_AXIS_VALUES = 50;
export const MAX_SWEEP_CELLS = 2500;

/** One axis as asked: values listed, or lo/hi/steps (steps values from lo to hi inclusive, evenly spaced). */
export type SweepAxisSpec = { parameter: string; values: readonly number[] } | { parameter: string; lo: number; hi: number; steps: number };

export interface SweepSpec {
  axes: readonly SweepAxisSpec[];
  /** Cases per cell (each flown by every controller). */
  runs: number;
  /** Sweep seed (unsigned 32-bit integer). */
  seed: number;
  /** Controller ids (null: the study's or the scenario's). */
  controllers: readonly string[] | null;
  /** Settle-share level of the boundary, 0 < level < 1. */
  level: number;
}

export interface SweepAxis {
  parameter: SweepParameter;
  label: string;
  unit: string;
  values: number[];
}

export interface SweepDefinition {
  axes: SweepAxis[];
  runs: number;
  seed: number;
  controllers: string[] | null;
  level: number;
}

/** Cells in a sweep: the product of the axis lengths. */
export function cellCount(def: Pick<SweepDefinition, 'axes'>): number {
  return def.axes.reduce((n, a) => n * a.values.length, 1);
}

/** Grid position of cell `index`: the first axis varies fastest. */
export function cellPosition(def: Pick<SweepDefinition, 'axes'>, index: number): number[] {
  const pos: number[] = [];
  let r = index;
  for (const a of def.axes) {
    pos.push(r % a.values.length);
    r = Math.floor(r / a.values.length);
  }
  return pos;
}

/**
 * A cell's study seed from the sweep seed and the cell index: the 32-bit finaliser of MurmurHash3
 * (Appleby, public domain) over seed ⊕ golden-ratio multiple of the index. Any fixed mixing would
 * do; what matters is that it depends on nothing else.
 */
export function cellSeed(sweepSeed: number, index: number): number {
  let h = (sweepSeed ^ Math.imul(index + 1, 0x9e3779b9)) >>> 0;
  h ^= h >>> 16;
  h = Math.imul(h, 0x85ebca6b);
  h ^= h >>> 13;
  h = Math.imul(h, 0xc2b2ae35);
  h ^= h >>> 16;
  return h >>> 0;
}

const fmt = (x: number) => String(x);

function inRange(p: SweepParameter, v: number): boolean {
  const d = SWEEP_PARAMETERS[p] as { min: number; max: number; minOpen: boolean; maxOpen?: boolean };
  if (!Number.isFinite(v)) return false;
  if (d.minOpen ? v <= d.min : v < d.min) return false;
  if (d.maxOpen ? v >= d.max : v > d.max) return false;
  return true;
}

function rangeText(p: SweepParameter): string {
  const d = SWEEP_PARAMETERS[p] as { min: number; max: number; minOpen: boolean; maxOpen?: boolean; unit: string };
  return `${d.minOpen ? '(' : '['}${d.min}, ${d.max}${d.maxOpen ? ')' : ']'}${d.unit && d.unit !== '×' ? ` ${d.unit}` : ''}`;
}

function axisOf(spec: SweepAxisSpec, path: string, errors: Issue[]): SweepAxis | null {
  const before = errors.length;
  if (!(SWEEP_PARAMETER_NAMES as string[]).includes(spec.parameter)) {
    errors.push(
      issue(
        `${path}.parameter`,
        'unknown-parameter',
        `${path}.parameter "${spec.parameter}" is not a sweep parameter (have: ${SWEEP_PARAMETER_NAMES.join(', ')})`,
      ),
    );
    return null;
  }
  const p = spec.parameter as SweepParameter;
  let values: number[];
  if ('values' in spec) {
    values = [...spec.values];
    if (values.length < 1) errors.push(issue(`${path}.values`, 'min-length', `${path}.values must list at least one value`));
  } else {
    const { lo, hi, steps } = spec;
    if (!Number.isInteger(steps) || steps < 1)
      errors.push(issue(`${path}.steps`, 'integer', `${path}.steps must be a whole number of at least 1 (got ${fmt(steps)})`));
    if (!Number.isFinite(lo) || !Number.isFinite(hi) || !(lo <= hi))
      errors.push(issue(`${path}.lo`, 'min-max', `${path} needs lo ≤ hi, both finite (got lo ${fmt(lo)}, hi ${fmt(hi)})`));
    else if (steps === 1 && lo !== hi)
      errors.push(issue(`${path}.steps`, 'one-step', `${path}.steps is 1: lo and hi must then be equal (got ${fmt(lo)} and ${fmt(hi)})`));
    if (errors.length > before) return null;
    // inner values rounded to 12 significant digits, so 0:0.3:4 reads 0, 0.1, 0.2, 0.3 in the tables
    values = Array.from({ length: steps }, (_, k) =>
      steps === 1 ? lo : k === steps - 1 ? hi : Number((lo + ((hi - lo) * k) / (steps - 1)).toPrecision(12)),
    );
    const bounds: [string, number][] = [
      ['lo', lo],
      ['hi', hi],
    ];
    for (const [key, v] of bounds)
      if (!inRange(p, v))
        errors.push(
          issue(`${path}.${key}`, 'range', `${path}.${key}: ${SWEEP_PARAMETERS[p].label} must lie in ${rangeText(p)} (got ${fmt(v)})`),
        );
    if (errors.length > before) return null;
  }
  if (values.length > MAX_AXIS_VALUES)
    errors.push(issue(path, 'max-values', `${path} has ${values.length} values; at most ${MAX_AXIS_VALUES} per axis`));
  values.forEach((v, k) => {
    if (!inRange(p, v))
      errors.push(
        issue(
          `${path}.values[${k}]`,
          'range',
          `${path}.values[${k}]: ${SWEEP_PARAMETERS[p].label} must lie in ${rangeText(p)} (got ${fmt(v)})`,
        ),
      );
  });
  for (let k = 1; k < values.length && errors.length === before; k++)
    if (!(values[k]! > values[k - 1]!))
      errors.push(
        issue(
          `${path}.values`,
          'increasing',
          `${path}.values must increase strictly (value ${k} is ${fmt(values[k]!)} after ${fmt(values[k - 1]!)})`,
        ),
      );
  if (errors.length > before) return null;
  const d = SWEEP_PARAMETERS[p];
  return { parameter: p, label: d.label, unit: d.unit, values };
}

/** Check a sweep as asked: every problem at once, each with its path and rule. */
export function validateSweep(spec: SweepSpec): Result<SweepDefinition> {
  const errors: Issue[] = [];
  if (spec.axes.length < 1 || spec.axes.length > 2)
    errors.push(issue('sweep.axes', 'count', `a sweep varies one or two parameters (got ${spec.axes.length})`));
  const axes = spec.axes.slice(0, 2).map((a, i) => axisOf(a, `sweep.axes[${i}]`, errors));
  if (axes.length === 2 && axes[0] && axes[1] && axes[0].parameter === axes[1].parameter)
    errors.push(issue('sweep.axes[1].parameter', 'unique', `sweep.axes[1] varies "${axes[1].parameter}" again: the two axes must differ`));
  if (!Number.isInteger(spec.runs) || spec.runs < 1 || spec.runs > 1_000_000)
    errors.push(
      issue('sweep.runs', 'range', `sweep.runs (cases per cell) must be a whole number from 1 to 1000000 (got ${fmt(spec.runs)})`),
    );
  if (!Number.isInteger(spec.seed) || spec.seed < 0 || spec.seed > 0xffffffff)
    errors.push(issue('sweep.seed', 'range', `sweep.seed must be a whole number from 0 to 4294967295 (got ${fmt(spec.seed)})`));
  if (!(spec.level > 0 && spec.level < 1))
    errors.push(
      issue('sweep.level', 'range', `sweep.level (the settle share of the boundary) must lie in (0, 1) (got ${fmt(spec.level)})`),
    );
  if (errors.length) return fail(errors);
  const def: SweepDefinition = {
    axes: axes as SweepAxis[],
    runs: spec.runs,
    seed: spec.seed,
    controllers: spec.controllers ? [...spec.controllers] : null,
    level: spec.level,
  };
  const n = cellCount(def);
  if (n > MAX_SWEEP_CELLS) return fail([issue('sweep.axes', 'max-cells', `the grid has ${n} cells; at most ${MAX_SWEEP_CELLS}`)]);
  return ok(def);
}

function isObj(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

function child(o: Record<string, unknown>, key: string): Record<string, unknown> {
  const c = o[key];
  if (isObj(c)) return c;
  const made: Record<string, unknown> = {};
  o[key] = made;
  return made;
}

/** The laws with a jump threshold on a synergy gap (and a gap certificate). */
export const SYNERGISTIC_LAWS: readonly string[] = ['synergistic', 'pointing-synergistic'];

/** Write value `v` of parameter `p` into a copy of the scenario JSON (which already has its study block). */
export function applyParameter(json: Record<string, unknown>, p: SweepParameter, v: number): void {
  const study = child(json, 'study');
  const disp = child(study, 'dispersions');
  switch (p) {
    case 'noise-scale':
      child(disp, 'sensors').attitudeNoiseScale = [v, v];
      return;
    case 'worst-case-eta':
      child(disp, 'sensors').adversarialEta = v;
      return;
    case 'hysteresis': {
      const cs = json.controllers;
      if (Array.isArray(cs)) for (const c of cs) if (isObj(c) && c.law === 'hysteretic') c.hysteresis = v;
      return;
    }
    case 'control-rate-hz':
      child(json, 'vehicle').controlRateHz = v;
      delete disp.controlRateHz;
      return;
    case 'torque-quantum-mnm':
      child(json, 'vehicle').actuation = { mode: 'quantized', torqueQuantumMNm: v };
      delete disp.actuation;
      return;
    case 'inertia-error':
      child(disp, 'inertia').momentSigmaFraction = v;
      return;
    case 'jump-threshold': {
      const cs = json.controllers;
      if (Array.isArray(cs))
        for (const c of cs)
          if (isObj(c) && typeof c.law === 'string' && SYNERGISTIC_LAWS.includes(c.law)) {
            c.gapThreshold = v;
            c.requireCertificate = false;
          }
      return;
    }
    case 'failed-wheel':
      child(disp, 'wheels').failOneWheelProbability = v;
      return;
  }
}

/**
 * Checks against the scenario that the grid alone cannot make: a hysteresis sweep needs a
 * hysteretic controller among those flown, a jump-threshold sweep a synergistic one.
 */
export function sweepScenarioIssues(def: SweepDefinition, laws: readonly { id: string; law: string }[]): Issue[] {
  const out: Issue[] = [];
  def.axes.forEach((a, i) => {
    if (a.parameter === 'hysteresis' && !laws.some((c) => c.law === 'hysteretic'))
      out.push(
        issue(
          `sweep.axes[${i}].parameter`,
          'needs-hysteretic',
          `sweep.axes[${i}] varies the hysteresis δ, but none of the controllers flown (${laws.map((c) => c.id).join(', ')}) is hysteretic`,
        ),
      );
    if (a.parameter === 'jump-threshold' && !laws.some((c) => SYNERGISTIC_LAWS.includes(c.law)))
      out.push(
        issue(
          `sweep.axes[${i}].parameter`,
          'needs-synergistic',
          `sweep.axes[${i}] varies the jump threshold δ, but none of the controllers flown (${laws.map((c) => c.id).join(', ')}) is synergistic (${SYNERGISTIC_LAWS.join(' or ')})`,
        ),
      );
  });
  return out;
}

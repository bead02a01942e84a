/**
 * The sweep setup as typed (text per field, like the other forms), and its check: the text is
 * read into numbers here (a word where a number belongs is named with its field, never passed on
 * as NaN), then the engine's validateSweep and sweepScenarioIssues say what else is wrong, each
 * problem with the field path the form shows it under (sweep.axes[0].lo, sweep.runs, …).
 *
 * A sweep is not part of the scenario file (the CLI takes it as options), so the form lives in
 * the sweep session, not in the document.
 */
import type { Issue } from '../../engine/errors';
import { issue } from '../../engine/errors';
import {
  SWEEP_PARAMETER_NAMES,
  SWEEP_PARAMETERS,
  validateSweep,
  type SweepAxisSpec,
  type SweepDefinition,
  type SweepParameter,
} from '../../engine/study';
import { sweepScenarioIssues } from '../../engine/study/sweep';
import { parseNumberText } from '../format';
import { parseNumberList } from './StudyFields';

export interface SweepAxisForm {
  /** A sweep parameter, or '' on the second axis for "none" (a one-axis sweep). */
  parameter: SweepParameter | '';
  mode: 'range' | 'list';
  lo: string;
  hi: string;
  steps: string;
  list: string;
}

export interface SweepForm {
  axes: [SweepAxisForm, SweepAxisForm];
  runs: string;
  seed: string;
  /** Settle share of the boundary, as a fraction typed in percent ("50"). */
  levelPct: string;
  /** Controller ids flown (null: the study block's list, else every controller). */
  controllers: string[] | null;
}

/** Starting grid per parameter when it is picked (common practice, no source: a few values across the usual range). */
export const PARAMETER_START: Record<SweepParameter, { lo: number; hi: number; steps: number }> = {
  'noise-scale': { lo: 0.5, hi: 4, steps: 4 },
  'worst-case-eta': { lo: 0, hi: 0.3, steps: 4 },
  hysteresis: { lo: 0.1, hi: 0.4, steps: 4 },
  'control-rate-hz': { lo: 2, hi: 20, steps: 4 },
  'torque-quantum-mnm': { lo: 0.01, hi: 0.1, steps: 4 },
  'inertia-error': { lo: 0, hi: 0.2, steps: 5 },
  // Synergy gaps certified for the bundled families are 0.03–0.25 (potential units); a span across them.
  'jump-threshold': { lo: 0.01, hi: 0.3, steps: 5 },
  'failed-wheel': { lo: 0, hi: 1, steps: 3 },
};

export function axisFormFor(parameter: SweepParameter | ''): SweepAxisForm {
  if (parameter === '') return { parameter, mode: 'range', lo: '', hi: '', steps: '', list: '' };
  const s = PARAMETER_START[parameter];
  return { parameter, mode: 'range', lo: String(s.lo), hi: String(s.hi), steps: String(s.steps), list: '' };
}

type Obj = Record<string, unknown>;
const isObj = (v: unknown): v is Obj => v !== null && typeof v === 'object' && !Array.isArray(v);

/** The form offered for a scenario: one axis (attitude-noise scale), 20 cases per cell, the study's seed, level 50 %. */
export function defaultSweepForm(scenario: unknown): SweepForm {
  const sc = isObj(scenario) ? scenario : {};
  const study = isObj(sc.study) ? sc.study : {};
  const sim = isObj(sc.simulation) ? sc.simulation : {};
  const seed = [study.seed, sim.seed].find((s) => typeof s === 'number' && Number.isInteger(s) && s >= 0) ?? 1;
  return { axes: [axisFormFor('noise-scale'), axisFormFor('')], runs: '20', seed: String(seed), levelPct: '50', controllers: null };
}

/** Controllers of the scenario as {id, label, law}, skipping malformed entries. */
export function scenarioControllers(scenario: unknown): { id: string; label: string; law: string }[] {
  const cs = isObj(scenario) && Array.isArray(scenario.controllers) ? scenario.controllers : [];
  return cs
    .filter(isObj)
    .filter((c) => typeof c.id === 'string')
    .map((c) => ({ id: c.id as string, label: typeof c.label === 'string' ? c.label : (c.id as string), law: String(c.law ?? '') }));
}

/** The controllers the sweep flies: the form's ticks, else the study block's list, else all. */
export function flownControllers(form: SweepForm, scenario: unknown): { id: string; label: string; law: string }[] {
  const all = scenarioControllers(scenario);
  const study = isObj(scenario) && isObj(scenario.study) ? scenario.study : {};
  const want = form.controllers ?? (Array.isArray(study.controllers) ? (study.controllers as unknown[]) : null);
  return want ? all.filter((c) => want.includes(c.id)) : all;
}

function numberAt(text: string, path: string, what: string, errors: Issue[]): number {
  const v = parseNumberText(text);
  if (typeof v === 'number') return v;
  errors.push(
    issue(
      path,
      'number',
      text.trim() === '' ? `${path}: enter the ${what}` : `${path}: the ${what} must be a number (got "${text.trim()}")`,
    ),
  );
  return 0;
}

export interface SweepFormCheck {
  def: SweepDefinition | null;
  /** Every problem, each with the path of the field it belongs to. */
  issues: Issue[];
  /** Cells of the grid when the axes read (null when they do not). */
  cells: number | null;
}

/** Read and check the form against the scenario. */
export function checkSweepForm(form: SweepForm, scenario: unknown): SweepFormCheck {
  const errors: Issue[] = [];
  const axes: SweepAxisSpec[] = [];
  form.axes.forEach((a, i) => {
    const path = `sweep.axes[${i}]`;
    if (a.parameter === '') {
      if (i === 0) errors.push(issue(`${path}.parameter`, 'required', `${path}.parameter: pick the parameter to sweep`));
      return;
    }
    if (!(SWEEP_PARAMETER_NAMES as string[]).includes(a.parameter)) {
      errors.push(issue(`${path}.parameter`, 'unknown-parameter', `${path}.parameter "${a.parameter}" is not a sweep parameter`));
      return;
    }
    if (a.mode === 'list') {
      const v = parseNumberList(a.list);
      if (v === undefined) errors.push(issue(`${path}.values`, 'min-length', `${path}.values: list at least one value`));
      else if (typeof v === 'string')
        errors.push(issue(`${path}.values`, 'number', `${path}.values must be numbers separated by commas (got "${v.trim()}")`));
      else axes.push({ parameter: a.parameter, values: v });
    } else {
      const before = errors.length;
      const unit = SWEEP_PARAMETERS[a.parameter].unit;
      const u = unit && unit !== '×' ? ` (${unit})` : '';
      const lo = numberAt(a.lo, `${path}.lo`, `lowest value${u}`, errors);
      const hi = numberAt(a.hi, `${path}.hi`, `highest value${u}`, errors);
      const steps = numberAt(a.steps, `${path}.steps`, 'number of values', errors);
      if (errors.length === before) axes.push({ parameter: a.parameter, lo, hi, steps });
    }
  });
  // Only a complete set of axes goes to the engine: a missing one would shift the other's index in its paths.
  const axesRead = errors.length === 0;
  const runs = numberAt(form.runs, 'sweep.runs', 'cases per cell', errors);
  const seed = numberAt(form.seed, 'sweep.seed', 'seed', errors);
  const levelPct = numberAt(form.levelPct, 'sweep.level', 'boundary level (%)', errors);
  const flown = flownControllers(form, scenario);
  if (form.controllers !== null && flown.length === 0)
    errors.push(issue('sweep.controllers', 'min-length', 'sweep.controllers: tick at least one controller to fly'));
  const r = validateSweep({
    axes: axesRead ? axes : [],
    runs,
    seed,
    controllers: form.controllers ? flown.map((c) => c.id) : null,
    level: levelPct / 100,
  });
  const cells = axesRead ? gridCells(axes) : null;
  if (!r.ok) {
    // Problems of fields that did not read are already named; the engine's level is a fraction, the form's a percentage.
    for (const e of r.errors) {
      if ((!axesRead && e.path.startsWith('sweep.axes')) || errors.some((x) => x.path === e.path)) continue;
      errors.push(
        e.path === 'sweep.level'
          ? issue(
              e.path,
              e.rule,
              `sweep.level (the settle share of the boundary) must lie strictly between 0 and 100 % (got ${form.levelPct.trim()} %)`,
            )
          : e,
      );
    }
    return { def: null, issues: errors, cells };
  }
  errors.push(...sweepScenarioIssues(r.value, flown));
  return { def: errors.length ? null : r.value, issues: errors, cells };
}

function gridCells(axes: readonly SweepAxisSpec[]): number {
  return axes.reduce((n, a) => n * ('values' in a ? a.values.length : Number.isInteger(a.steps) && a.steps > 0 ? a.steps : 0), 1);
}

/** Issues for one field: its own path, or below it (values[k] under values). */
export function issuesAt(issues: readonly Issue[], path: string): Issue[] {
  return issues.filter((i) => i.path === path || i.path.startsWith(`${path}[`) || i.path.startsWith(`${path}.`));
}

/**
 * validateScenario: the file's format and version first (a file we cannot read says so and
 * nothing else), then the zod structure and the cross-field rules, ALL reported together, each
 * with its JSON path and rule. Cross-field rules run on the raw input part by part, so one
 * broken field does not hide problems elsewhere.
 */
import type { Issue, Result } from '../errors';
import { dedupeIssues, describe, fail, issue, ok } from '../errors';
import { qCreate } from '../math/rotation';
import type { Quat } from '../math/rotation';
import { resolveAttitude } from './attitude';
import { resolveTargetAttitude } from './pointingOnly';
import { fromZodIssues } from './issues';
import {
  ActuationSchema,
  AttitudeSchema,
  ControllerSchema,
  InitialSchema,
  KeepOutSchema,
  SCENARIO_FORMAT,
  SCENARIO_VERSION,
  ScenarioSchema,
  EPOCH_MAX_YEAR,
  EPOCH_MIN_YEAR,
  WheelsSchema,
} from './schema';
import type { Scenario, WheelsSpec } from './schema';
import { parseIsoUtcMs } from './utc';
import { migrateScenario } from './migrate';
import { resolveStudy } from './study';
import { checkLawFields } from '../control/registry';
import { checkBandwidthAgainstRate } from '../control/lawSupport';
import { checkOrbitScenario } from './orbitValidate';
import { checkConstraintList } from './constraintValidate';
import { knownValidation } from './knownValidation';

type Obj = Record<string, unknown>;

function isObj(v: unknown): v is Obj {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

function get(v: unknown, ...keys: (string | number)[]): unknown {
  let x = v;
  for (const k of keys) {
    if (x === null || typeof x !== 'object') return undefined;
    x = (x as Obj)[k as string];
  }
  return x;
}

/** Number of wheels of a wheels entry that parses, else null. */
export function wheelCount(w: WheelsSpec): number {
  return w.layout === 'pyramid' ? 4 : w.layout === 'triad' ? 3 : w.wheels.length;
}

/** Per-wheel momentum limits (mN·m·s) of a wheels entry. */
export function wheelMomentumLimitsMNms(w: WheelsSpec): number[] {
  if (w.layout === 'custom') return w.wheels.map((x) => x.maxMomentumMNms);
  return new Array(wheelCount(w)).fill(w.maxMomentumMNms);
}

/** Wheel count from the layout alone, so a bad limit elsewhere in `wheels` does not hide a count error. */
function rawWheelCount(w: unknown): number | null {
  const layout = get(w, 'layout');
  if (layout === 'pyramid') return 4;
  if (layout === 'triad') return 3;
  const list = get(w, 'wheels');
  return layout === 'custom' && Array.isArray(list) ? list.length : null;
}

/** The format and version gate. Returns issues when the file is not one we can read. */
function checkFormatAndVersion(json: unknown): Issue[] {
  if (!isObj(json)) {
    return [issue('', 'type', `A scenario file must be a JSON object (got ${describe(json)})`)];
  }
  const f = json.format;
  if (f !== SCENARIO_FORMAT) {
    const msg =
      f === undefined
        ? `This is not a Slewsmith scenario file: the field "format" is missing (it must be "${SCENARIO_FORMAT}")`
        : `This is not a Slewsmith scenario file: "format" is ${describe(f)}, not "${SCENARIO_FORMAT}"`;
    return [issue('format', 'format', msg)];
  }
  const v = json.version;
  if (v === undefined) {
    return [issue('version', 'required', `version is missing; this Slewsmith reads scenario files of version ${SCENARIO_VERSION}`)];
  }
  if (typeof v !== 'number' || !Number.isInteger(v) || v < 1) {
    return [
      issue(
        'version',
        'version',
        `version must be a whole number ≥ 1 (got ${describe(v)}); this Slewsmith reads version ${SCENARIO_VERSION}`,
      ),
    ];
  }
  if (v > SCENARIO_VERSION) {
    return [
      issue(
        'version',
        'version-newer',
        `version ${v} is newer than this Slewsmith reads (${SCENARIO_VERSION}); open the file with a newer Slewsmith`,
      ),
    ];
  }
  return [];
}

/** At most this many problems are listed; the rest are counted in one last issue. */
export const MAX_LISTED_ISSUES = 200;

/** The first MAX_LISTED_ISSUES issues and, when there are more, one that says how many were left out. */
export function capIssues(list: readonly Issue[], max = MAX_LISTED_ISSUES): Issue[] {
  if (list.length <= max) return [...list];
  const rest = list.length - max;
  return [
    ...list.slice(0, max),
    {
      ...issue('', 'more', `… and ${rest} more problem${rest === 1 ? '' : 's'} of the same kinds (fix the ones above first)`),
      count: rest,
    },
  ];
}

/**
 * Structure, ranges, units and cross-field rules of a scenario file: the one validation of the
 * pipeline (later stages assert). Older formats are migrated first (migrate.ts; its notes come
 * back as warnings). An input equal to one validated at build time (the bundled demo, planted by
 * the renderer's threads: knownValidation.ts) gets that validation without the work.
 */
export function validateScenario(json: unknown): Result<Scenario> {
  return knownValidation<Scenario>(json) ?? validateScenarioAfresh(json);
}

/**
 * validateScenario without the planted validations: always does the work. The renderer's threads
 * call it once on the demo when idle after the first pass, so that the first edit does not also
 * pay for the validator's first run (its code compiled and warmed up).
 */
export function validateScenarioAfresh(json: unknown): Result<Scenario> {
  const gate = checkFormatAndVersion(json);
  if (gate.length) return fail(gate);
  const migrated = migrateScenario(json);
  const doc = migrated.json;

  const errors: Issue[] = [];
  const warnings: Issue[] = [...migrated.notes];
  const parsed = ScenarioSchema.safeParse(doc);
  if (!parsed.success) errors.push(...fromZodIssues(parsed.error.issues as never, doc));
  crossFieldChecks(doc as Obj, errors, warnings);
  if (parsed.success && parsed.data.study) resolveStudy(parsed.data.study, parsed.data, errors, warnings);

  if (errors.length || !parsed.success) return fail(capIssues(dedupeIssues(errors)), capIssues(warnings));
  return ok(parsed.data, capIssues(warnings));
}

function crossFieldChecks(raw: Obj, errors: Issue[], warnings: Issue[]): void {
  // Epoch: the regex passes 2030-02-30T…; the calendar check does not.
  const ep = raw.epochUtc;
  if (typeof ep === 'string' && /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}(\.\d{1,3})?Z$/.test(ep)) {
    const year = Number(ep.slice(0, 4));
    if (parseIsoUtcMs(ep) === null)
      errors.push(issue('epochUtc', 'calendar', `epochUtc ${JSON.stringify(ep)} is not a real UTC date and time`));
    else if (year < EPOCH_MIN_YEAR || year > EPOCH_MAX_YEAR)
      errors.push(
        issue(
          'epochUtc',
          'range',
          `epochUtc ${JSON.stringify(ep)} is outside ${EPOCH_MIN_YEAR}–${EPOCH_MAX_YEAR}, the years the leap-second table, the ephemerides and two-digit element-set years cover`,
        ),
      );
  }

  // Wheels and the initial wheel momentum.
  const wheels = WheelsSchema.safeParse(get(raw, 'vehicle', 'wheels'));
  if (wheels.success && wheels.data.layout === 'custom') {
    wheels.data.wheels.forEach((w, i) => {
      if (!(Math.hypot(w.axis[0]!, w.axis[1]!, w.axis[2]!) > 0)) {
        const p = `vehicle.wheels.wheels[${i}].axis`;
        errors.push(issue(p, 'non-zero', `${p} is the zero vector; a spin axis needs a non-zero length`));
      }
    });
  }
  const h0 = get(raw, 'initial', 'wheelMomentumMNms');
  const n = rawWheelCount(get(raw, 'vehicle', 'wheels'));
  if (n !== null && Array.isArray(h0)) {
    if (h0.length !== n) {
      errors.push(
        issue(
          'initial.wheelMomentumMNms',
          'count',
          `initial.wheelMomentumMNms has ${h0.length} value${h0.length === 1 ? '' : 's'} but the vehicle has ${n} wheels (one value per wheel)`,
        ),
      );
    } else if (wheels.success) {
      const lim = wheelMomentumLimitsMNms(wheels.data);
      h0.forEach((h, i) => {
        if (typeof h === 'number' && Number.isFinite(h) && Math.abs(h) > lim[i]!) {
          const p = `initial.wheelMomentumMNms[${i}]`;
          errors.push(issue(p, 'within-limit', `${p} = ${h} mN·m·s exceeds wheel ${i + 1}'s momentum limit of ${lim[i]} mN·m·s`));
        }
      });
    }
  }

  // Actuation mode and its quantum.
  const act = ActuationSchema.safeParse(get(raw, 'vehicle', 'actuation'));
  if (act.success) {
    if (act.data.mode === 'quantized' && act.data.torqueQuantumMNm === undefined) {
      errors.push(
        issue(
          'vehicle.actuation.torqueQuantumMNm',
          'required-for-mode',
          'vehicle.actuation.torqueQuantumMNm is required when vehicle.actuation.mode is "quantized"',
        ),
      );
    } else if (act.data.mode !== 'quantized' && act.data.torqueQuantumMNm !== undefined) {
      warnings.push(
        issue(
          'vehicle.actuation.torqueQuantumMNm',
          'ignored',
          `vehicle.actuation.torqueQuantumMNm is ignored when mode is "${act.data.mode}"`,
        ),
      );
    }
  }

  checkAttitudes(raw, errors, warnings);
  checkControllers(raw, errors, warnings);
  checkOrbitScenario(raw, errors, warnings, MAX_CHECKED_ITEMS);
  checkConstraintList(raw.constraints, errors);

  const ko = raw.keepOut;
  if (Array.isArray(ko)) {
    ko.forEach((k, i) => {
      const r = KeepOutSchema.safeParse(k);
      if (!r.success) return;
      for (const f of ['inertialDirection', 'bodyAxis'] as const) {
        const v = r.data[f];
        if (v && !(Math.hypot(v[0]!, v[1]!, v[2]!) > 0)) {
          const p = `keepOut[${i}].${f}`;
          errors.push(issue(p, 'non-zero', `${p} is the zero vector; a direction needs a non-zero length`));
        }
      }
    });
  }
}

/** Resolve every attitude in order (so relative ones compose) and report their problems. */
function checkAttitudes(raw: Obj, errors: Issue[], warnings: Issue[]): void {
  let previous: Quat | null = null;
  const init = InitialSchema.shape.attitude.safeParse(get(raw, 'initial', 'attitude'));
  if (init.success) {
    const q = qCreate();
    if (resolveAttitude(q, init.data, null, 'initial.attitude', errors, warnings, true)) previous = q;
  }
  const targets = raw.targets;
  if (!Array.isArray(targets)) return;
  targets.slice(0, MAX_CHECKED_ITEMS).forEach((t, i) => {
    const a = AttitudeSchema.safeParse(get(t, 'attitude'));
    if (!a.success) {
      previous = null;
      return;
    }
    const q = qCreate();
    previous = resolveTargetAttitude(q, a.data, get(t, 'rollFree') === true, previous, i, errors, warnings) !== false ? q : null;
  });
}

/** Largest list the cross-field rules look at (beyond the schema's own maxima nothing is flyable anyway). */
const MAX_CHECKED_ITEMS = 1000;

function checkControllers(raw: Obj, errors: Issue[], warnings: Issue[]): void {
  const list = raw.controllers;
  if (!Array.isArray(list)) return;
  const firstIndex = new Map<string, number>();
  const rate = get(raw, 'vehicle', 'controlRateHz');
  list.slice(0, MAX_CHECKED_ITEMS).forEach((c, i) => {
    const id = get(c, 'id');
    if (typeof id === 'string') {
      const k = firstIndex.get(id);
      if (k === undefined) firstIndex.set(id, i);
      else
        errors.push(
          issue(
            `controllers[${i}].id`,
            'unique',
            `controllers[${i}].id "${id}" is already used by controllers[${k}]; controller ids must be unique`,
          ),
        );
    }
    const r = ControllerSchema.safeParse(c);
    if (!r.success) return;
    const path = `controllers[${i}]`;
    checkBandwidthAgainstRate(r.data.gains, typeof rate === 'number' ? rate : null, path, warnings);
    checkLawFields(r.data, path, errors, warnings);
  });
}

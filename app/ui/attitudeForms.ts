/**
 * Switching an attitude between its four written forms without changing the attitude: resolve
 * the current entry with the engine (scenario/attitude.ts), then write the same rotation in the
 * new form with the engine's rotation functions. Where a form has free choices (pointing's axes)
 * we pick body +Z → its inertial image, body +X → its image.
 */
import type { Issue } from '../engine/errors';
import { qConjMultiply, qCreate, qRotate, qToAxisAngle, qToEuler, type EulerSequence, type Quat } from '../engine/math/rotation';
import { resolveAttitude } from '../engine/scenario/attitude';
import { resolveTargetAttitude } from '../engine/scenario/pointingOnly';
import { AttitudeSchema, type AttitudeForm } from '../engine/scenario/schema';
import { DEG_PER_RAD } from '../engine/units';

type Obj = Record<string, unknown>;

/** Round for the file: 12 significant digits, and tiny values to 0 (keeps files readable). */
export function tidy(v: number): number {
  if (Math.abs(v) < 1e-12) return 0;
  return Number(v.toPrecision(12));
}

/**
 * Resolved attitudes: index 0 the initial attitude, k ≥ 1 target k−1. An entry is null when it
 * (or, for a relative entry, the one before it) does not resolve.
 */
export function resolveAttitudeChain(scenario: unknown): (Quat | null)[] {
  const s = (scenario ?? {}) as Obj;
  const errors: Issue[] = [];
  const warnings: Issue[] = [];
  const out: (Quat | null)[] = [];
  const resolveOne = (raw: unknown, previous: Quat | null, path: string, initial: boolean): Quat | null => {
    const spec = AttitudeSchema.safeParse(raw);
    if (!spec.success) return null;
    const q = qCreate();
    return resolveAttitude(q, spec.data, previous, path, errors, warnings, initial) ? q : null;
  };
  const init = resolveOne((s.initial as Obj | undefined)?.attitude, null, 'initial.attitude', true);
  out.push(init);
  let prev = init;
  const targets = Array.isArray(s.targets) ? (s.targets as Obj[]) : [];
  targets.forEach((t, i) => {
    // a roll-free target is the reduced target from the previous attitude (scenario/pointingOnly.ts)
    const spec = AttitudeSchema.safeParse(t?.attitude);
    const q = qCreate();
    prev = spec.success && resolveTargetAttitude(q, spec.data, t?.rollFree === true, prev, i, errors, warnings) !== false ? q : null;
    out.push(prev);
  });
  return out;
}

const DEFAULT_ATTITUDES: Record<AttitudeForm, Obj> = {
  quaternion: { quaternion: [0, 0, 0, 1] },
  euler: { euler: { sequence: 'ZYX', anglesDeg: [0, 0, 0] } },
  pointing: { pointing: { bodyAxis: [0, 0, 1], inertialDirection: [0, 0, 1], bodySecondary: [1, 0, 0], inertialSecondary: [1, 0, 0] } },
  relative: { relative: { axis: [0, 0, 1], angleDeg: 30 } },
};

/** Write attitude `q` in `form`. `previous` is needed for the relative form. */
export function attitudeInForm(q: Quat, form: AttitudeForm, previous: Quat | null, sequence: EulerSequence = 'ZYX'): Obj | null {
  switch (form) {
    case 'quaternion':
      return { quaternion: [q[0]!, q[1]!, q[2]!, q[3]!].map(tidy) };
    case 'euler': {
      const a = qToEuler(new Float64Array(3), sequence, q);
      return { euler: { sequence, anglesDeg: [a[0]!, a[1]!, a[2]!].map((x) => tidy(x * DEG_PER_RAD)) } };
    }
    case 'pointing': {
      const z = qRotate(new Float64Array(3), q, [0, 0, 1]);
      const x = qRotate(new Float64Array(3), q, [1, 0, 0]);
      return {
        pointing: {
          bodyAxis: [0, 0, 1],
          inertialDirection: [...z].map(tidy),
          bodySecondary: [1, 0, 0],
          inertialSecondary: [...x].map(tidy),
        },
      };
    }
    case 'relative': {
      if (!previous) return null;
      const rel = qConjMultiply(qCreate(), previous, q);
      const axis = new Float64Array(3);
      const angle = qToAxisAngle(axis, rel);
      return { relative: { axis: [...axis].map(tidy), angleDeg: tidy(angle * DEG_PER_RAD) } };
    }
  }
}

/**
 * The attitude entry at chain index `k` (0 initial, k ≥ 1 target k−1) rewritten in `form`; the
 * form's default when the current entry does not resolve.
 */
export function convertAttitude(scenario: unknown, k: number, form: AttitudeForm, sequence?: EulerSequence): Obj {
  const chain = resolveAttitudeChain(scenario);
  const q = chain[k];
  const prev = k > 0 ? chain[k - 1]! : null;
  if (q) {
    const r = attitudeInForm(q, form, prev, sequence);
    if (r) return r;
  }
  return DEFAULT_ATTITUDES[form];
}

export function formOf(attitude: unknown): AttitudeForm | null {
  if (attitude === null || typeof attitude !== 'object') return null;
  for (const f of ['quaternion', 'euler', 'pointing', 'relative'] as const) if (f in (attitude as Obj)) return f;
  return null;
}

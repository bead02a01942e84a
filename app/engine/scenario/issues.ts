/**
 * zod issues → engine Issues ({ path, rule, message }), with JSON-style paths such as
 * `vehicle.inertiaKgm2[1][2]` and our own wording. Keyed unions (attitude forms, gain forms) are
 * resolved to the branch the input chose, so a bad Euler sequence reports
 * `targets[2].attitude.euler.sequence`, not "no union member matched".
 */
import type { Issue } from '../errors';
import { describe } from '../errors';
import { KEYED_UNIONS } from './schema';

type Key = PropertyKey;

interface ZIssue {
  code: string;
  path: Key[];
  message: string;
  [k: string]: unknown;
}

export function formatPath(path: readonly Key[]): string {
  let s = '';
  for (const k of path) {
    if (typeof k === 'number') s += `[${k}]`;
    else s += s === '' ? String(k) : `.${String(k)}`;
  }
  return s;
}

function valueAt(root: unknown, path: readonly Key[]): unknown {
  let v: unknown = root;
  for (const k of path) {
    if (v === null || typeof v !== 'object') return undefined;
    v = (v as Record<PropertyKey, unknown>)[k as never];
  }
  return v;
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  return v !== null && typeof v === 'object' && !Array.isArray(v);
}

/** Convert every zod issue; `root` is the input that was parsed (to tell missing from wrong). */
export function fromZodIssues(issues: readonly ZIssue[], root: unknown, prefix: Key[] = []): Issue[] {
  const out: Issue[] = [];
  for (const zi of issues) convert(zi, root, prefix, out);
  return out;
}

function convert(zi: ZIssue, root: unknown, prefix: Key[], out: Issue[]): void {
  const path = [...prefix, ...zi.path];
  const p = formatPath(path);
  const value = valueAt(root, path);
  const add = (rule: string, message: string) => out.push({ path: p, rule, message });

  switch (zi.code) {
    case 'invalid_type': {
      const expected = String(zi.expected);
      if (value === undefined) {
        add('required', `${p} is required (${article(expected)})`);
      } else if (typeof value === 'number' && !Number.isFinite(value)) {
        add('finite', `${p} must be a finite number (got ${describe(value)})`);
      } else if (expected === 'int') {
        add('integer', `${p} must be a whole number (got ${describe(value)})`);
      } else {
        add('type', `${p} must be ${article(expected)} (got ${describe(value)})`);
      }
      return;
    }
    case 'too_small':
    case 'too_big': {
      const small = zi.code === 'too_small';
      const bound = Number(small ? zi.minimum : zi.maximum);
      const inclusive = zi.inclusive !== false;
      const origin = String(zi.origin);
      if (origin === 'array') {
        const n = Array.isArray(value) ? value.length : NaN;
        if (zi.exact) add('length', `${p} must have exactly ${bound} entries (got ${n})`);
        else if (small) add('min-items', `${p} must have at least ${bound} entr${bound === 1 ? 'y' : 'ies'} (got ${n})`);
        else add('max-items', `${p} must have at most ${bound} entries (got ${n})`);
      } else if (origin === 'string') {
        if (small) add('non-empty', `${p} must have at least ${bound} character${bound === 1 ? '' : 's'}`);
        else add('max-length', `${p} must have at most ${bound} characters`);
      } else if (small && bound === 0 && !inclusive) {
        add('positive', `${p} must be greater than zero (got ${describe(value)})`);
      } else if (small && bound === 0) {
        add('non-negative', `${p} must not be negative (got ${describe(value)})`);
      } else {
        const rel = small ? (inclusive ? '≥' : '>') : inclusive ? '≤' : '<';
        add(small ? 'min' : 'max', `${p} must be ${rel} ${bound} (got ${describe(value)})`);
      }
      return;
    }
    case 'invalid_value': {
      const values = (zi.values as unknown[] | undefined) ?? [];
      if (values.length === 1) add('value', `${p} must be ${JSON.stringify(values[0])} (got ${describe(value)})`);
      else add('one-of', `${p} must be one of ${values.map((v) => JSON.stringify(v)).join(', ')} (got ${describe(value)})`);
      return;
    }
    case 'unrecognized_keys': {
      for (const k of (zi.keys as string[] | undefined) ?? []) {
        const kp = formatPath([...path, k]);
        out.push({ path: kp, rule: 'unknown-key', message: `${kp} is not a field of this format (check the spelling)` });
      }
      return;
    }
    case 'invalid_format':
      add('format', `${p} is not in the required form (got ${describe(value)})`);
      return;
    case 'invalid_union':
      convertUnion(zi, root, path, value, out);
      return;
    case 'custom':
      add(String((zi.params as { rule?: string } | undefined)?.rule ?? 'custom'), `${p}: ${zi.message}`);
      return;
    default:
      add(zi.code, `${p}: ${zi.message}`);
  }
}

function convertUnion(zi: ZIssue, root: unknown, path: Key[], value: unknown, out: Issue[]): void {
  const p = formatPath(path);
  // Discriminated unions report a bad discriminator as a union issue at the discriminator's path.
  if (zi.discriminator !== undefined) {
    const opts = ((zi.options as unknown[] | undefined) ?? []).map((o) => JSON.stringify(o)).join(', ');
    const rule = value === undefined ? 'required' : 'one-of';
    out.push({ path: p, rule, message: `${p} must be one of ${opts} (got ${describe(value)})` });
    return;
  }
  const last = [...path].reverse().find((k) => typeof k === 'string') as string | undefined;
  const keys = last !== undefined ? KEYED_UNIONS[last] : undefined;
  const branches = (zi.errors as ZIssue[][] | undefined) ?? [];
  if (keys && isPlainObject(value)) {
    const present = keys.map((k, i) => (k in value ? i : -1)).filter((i) => i >= 0);
    if (present.length === 1 && branches[present[0]!]) {
      for (const bi of branches[present[0]!]!) convert(bi, root, path, out);
      return;
    }
    const list = keys.map((k) => `"${k}"`).join(', ');
    out.push({
      path: p,
      rule: 'one-form',
      message:
        present.length === 0
          ? `${p} must have one of the keys ${list}`
          : `${p} must have only one of the keys ${list} (found ${present.map((i) => `"${keys[i]}"`).join(', ')})`,
    });
    return;
  }
  if (keys) {
    out.push({
      path: p,
      rule: value === undefined ? 'required' : 'type',
      message: `${p} must be an object with one of the keys ${keys.join(', ')} (got ${describe(value)})`,
    });
    return;
  }
  out.push({ path: p, rule: 'one-form', message: `${p} does not match any allowed form` });
}

function article(expected: string): string {
  const word = expected === 'int' ? 'whole number' : expected;
  return /^[aeiou]/.test(word) ? `an ${word}` : `a ${word}`;
}

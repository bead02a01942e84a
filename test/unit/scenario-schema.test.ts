/**
 * The JSON Schema generated from the zod source (scenarioJsonSchema): the example files satisfy it
 * under a small structural checker written here from the JSON Schema 2020-12 validation vocabulary
 * (type, required, properties, additionalProperties, items, minItems/maxItems, enum, const,
 * anyOf/oneOf, minimum/maximum, exclusiveMinimum/exclusiveMaximum, minLength/maxLength, pattern;
 * json-schema.org, "JSON Schema Validation", draft 2020-12, §6). Mutated copies fail it, and every
 * numeric field names its unit in the key or in its description.
 */
import { describe, expect, it } from 'vitest';
import { scenarioJsonSchema } from '../../app/engine/scenario/schema';
import { EXAMPLE_FILES, loadExample } from './scenario-fixtures';

type S = Record<string, any>;

function typeOk(t: string, v: unknown): boolean {
  switch (t) {
    case 'object':
      return v !== null && typeof v === 'object' && !Array.isArray(v);
    case 'array':
      return Array.isArray(v);
    case 'string':
      return typeof v === 'string';
    case 'number':
      return typeof v === 'number' && Number.isFinite(v);
    case 'integer':
      return typeof v === 'number' && Number.isInteger(v);
    case 'boolean':
      return typeof v === 'boolean';
    case 'null':
      return v === null;
    default:
      throw new Error(`checker does not know type ${t}`);
  }
}

/** Returns the list of problems (empty when v satisfies s). */
function check(s: S, v: unknown, path = '$'): string[] {
  const out: string[] = [];
  const known = new Set([
    '$schema',
    'title',
    'description',
    'type',
    'required',
    'properties',
    'additionalProperties',
    'items',
    'minItems',
    'maxItems',
    'enum',
    'const',
    'anyOf',
    'oneOf',
    'minimum',
    'maximum',
    'exclusiveMinimum',
    'exclusiveMaximum',
    'minLength',
    'maxLength',
    'pattern',
    'format',
  ]);
  for (const k of Object.keys(s)) if (!known.has(k)) throw new Error(`checker does not implement keyword ${k} at ${path}`);
  if (s.type && !typeOk(s.type, v)) return [`${path}: expected ${s.type}`];
  if (s.const !== undefined && v !== s.const) out.push(`${path}: expected const ${JSON.stringify(s.const)}`);
  if (s.enum && !s.enum.includes(v)) out.push(`${path}: not in enum`);
  if (typeof v === 'number') {
    if (s.minimum !== undefined && !(v >= s.minimum)) out.push(`${path}: < minimum`);
    if (s.maximum !== undefined && !(v <= s.maximum)) out.push(`${path}: > maximum`);
    if (s.exclusiveMinimum !== undefined && !(v > s.exclusiveMinimum)) out.push(`${path}: ≤ exclusiveMinimum`);
    if (s.exclusiveMaximum !== undefined && !(v < s.exclusiveMaximum)) out.push(`${path}: ≥ exclusiveMaximum`);
  }
  if (typeof v === 'string') {
    if (s.minLength !== undefined && v.length < s.minLength) out.push(`${path}: too short`);
    if (s.maxLength !== undefined && v.length > s.maxLength) out.push(`${path}: too long`);
    if (s.pattern && !new RegExp(s.pattern, 'u').test(v)) out.push(`${path}: pattern`);
  }
  if (Array.isArray(v)) {
    if (s.minItems !== undefined && v.length < s.minItems) out.push(`${path}: minItems`);
    if (s.maxItems !== undefined && v.length > s.maxItems) out.push(`${path}: maxItems`);
    if (s.items) v.forEach((x, i) => out.push(...check(s.items, x, `${path}[${i}]`)));
  }
  if (v !== null && typeof v === 'object' && !Array.isArray(v)) {
    const o = v as Record<string, unknown>;
    for (const r of s.required ?? []) if (!(r in o)) out.push(`${path}.${r}: required`);
    for (const [k, x] of Object.entries(o)) {
      if (s.properties?.[k]) out.push(...check(s.properties[k], x, `${path}.${k}`));
      else if (s.additionalProperties === false) out.push(`${path}.${k}: additional property`);
    }
  }
  for (const kw of ['anyOf', 'oneOf'] as const) {
    if (!s[kw]) continue;
    const passing = (s[kw] as S[]).filter((b) => check(b, v, path).length === 0).length;
    if (kw === 'anyOf' ? passing < 1 : passing !== 1) out.push(`${path}: ${kw} matched ${passing}`);
  }
  return out;
}

describe('scenarioJsonSchema', () => {
  const schema = scenarioJsonSchema();

  it('is plain JSON with the 2020-12 dialect and the fixed top-level keys required', () => {
    expect(JSON.parse(JSON.stringify(schema))).toEqual(schema);
    expect(schema.$schema).toBe('https://json-schema.org/draft/2020-12/schema');
    expect([...(schema.required as string[])].sort()).toEqual(
      [
        'controllers',
        'description',
        'epochUtc',
        'format',
        'initial',
        'name',
        'planning',
        'simulation',
        'targets',
        'vehicle',
        'version',
      ].sort(),
    );
    const props = schema.properties as S;
    expect(props.format.const).toBe('slewsmith-scenario');
    expect(props.version.const).toBe(2);
    expect(Object.keys(props)).toContain('keepOut');
  });

  for (const name of EXAMPLE_FILES) {
    it(`${name} satisfies the JSON Schema`, () => {
      expect(check(schema, loadExample(name))).toEqual([]);
    });
  }

  it('mutated copies fail the JSON Schema where they should (the checker can fail)', () => {
    const a = loadExample('lumen6-imaging');
    delete a.vehicle.sensors;
    expect(check(schema, a)).toEqual(['$.vehicle.sensors: required']);
    const b = loadExample('lumen6-imaging');
    b.targets[0].attitude = { euler: { sequence: 'XXX', anglesDeg: [1, 2, 3] } };
    expect(check(schema, b).length).toBeGreaterThan(0);
    const c = loadExample('tern12-reversal');
    c.vehicle.wheels.layout = 'pyramid';
    expect(check(schema, c).length).toBeGreaterThan(0);
    const d = loadExample('kestrel60-momentum');
    d.simulation.seed = 1.5;
    expect(check(schema, d)).toEqual(['$.simulation.seed: expected integer']);
  });

  it('every numeric field carries its unit in the key or says it in its description', () => {
    const unitSuffix = /(Deg|DegPerS|MNm|MNms|MNmPerRadPerS|Kgm2|S|Hz|Arcsec|RadPerS)$/;
    const missing: string[] = [];
    const isNumeric = (s: S): boolean =>
      s.type === 'number' || s.type === 'integer' || (s.type === 'array' && s.items && isNumeric(s.items));
    const walk = (s: S, path: string) => {
      for (const [k, p] of Object.entries((s.properties ?? {}) as Record<string, S>)) {
        if (isNumeric(p) && !unitSuffix.test(k) && !p.description && !p.const) missing.push(`${path}.${k}`);
        walk(p, `${path}.${k}`);
        if (p.items) walk(p.items, `${path}.${k}[]`);
      }
      for (const b of [...(s.anyOf ?? []), ...(s.oneOf ?? [])]) walk(b, path);
      if (s.items) walk(s.items, `${path}[]`);
    };
    walk(schema, '$');
    expect(missing).toEqual([]);
  });
});

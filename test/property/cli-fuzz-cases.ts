/**
 * Generated CLI invocations for test/property/cli-fuzz.test.ts: seeded fast-check arbitraries for
 * scenario files (mutated examples: deleted fields, wrong types, extreme numbers, huge strings,
 * deep nesting, `__proto__` keys, BOMs, invalid UTF-8, truncation, non-object documents) and for
 * argument lists (every command and option with good and bad values, unknown and dangling options).
 */
import fc from 'fast-check';

export interface FuzzCase {
  /** The scenario file's bytes, or null for no file argument. */
  file: Uint8Array | null;
  /** Argument list with the placeholders @FILE@, @OUT@ and @TMP@ replaced by the runner. */
  args: string[];
  /** Environment for the run (SOURCE_DATE_EPOCH sometimes). */
  env: Record<string, string>;
  /** How the case was made, for the failure report. */
  how: string[];
}

type Json = null | boolean | number | string | Json[] | { [k: string]: Json };

/** Every path into a JSON value (as key lists), the root included. */
function paths(v: Json, at: (string | number)[] = [], out: (string | number)[][] = []): (string | number)[][] {
  out.push(at);
  if (Array.isArray(v)) v.forEach((x, i) => paths(x, [...at, i], out));
  else if (v && typeof v === 'object') for (const k of Object.keys(v)) paths(v[k]!, [...at, k], out);
  return out;
}

/** Values a field may be replaced with: wrong types, edge numbers JSON can carry, big and deep data. */
const WEIRD: { name: string; value: () => Json }[] = [
  { name: 'null', value: () => null },
  { name: 'true', value: () => true },
  { name: 'string', value: () => 'slew' },
  { name: 'empty array', value: () => [] },
  { name: 'empty object', value: () => ({}) },
  { name: '-1', value: () => -1 },
  { name: '0', value: () => 0 },
  { name: '1e308', value: () => 1e308 },
  { name: '-1e308', value: () => -1e308 },
  { name: '5e-324', value: () => 5e-324 },
  { name: '1e6', value: () => 1e6 },
  { name: '0.5', value: () => 0.5 },
  { name: 'huge string', value: () => 'x'.repeat(200_000) },
  { name: '__proto__ object', value: () => JSON.parse('{"__proto__": {"polluted": true}, "x": 1}') as Json },
  { name: 'long array', value: () => Array.from({ length: 2000 }, () => 0) },
];

/**
 * Written into the JSON text as they are: numbers JSON allows that JSON.parse turns into ±Infinity
 * or -0, and nesting 50 000 deep (JSON.parse copes; a recursive walk over it would overflow the stack).
 */
const NUMBER_TOKENS = ['1e400', '-1e400', '-0', '1E+308', '4.9e-324', `${'['.repeat(50_000)}0${']'.repeat(50_000)}`];

function setAt(root: Json, at: (string | number)[], value: Json | undefined): Json {
  if (at.length === 0) return value === undefined ? {} : value;
  let parent = root as Record<string | number, Json> | Json[];
  for (const k of at.slice(0, -1)) parent = (parent as Record<string | number, Json>)[k] as Record<string | number, Json>;
  const last = at[at.length - 1]!;
  if (value === undefined) {
    if (Array.isArray(parent)) parent.splice(last as number, 1);
    else delete (parent as Record<string, Json>)[last];
  } else (parent as Record<string | number, Json>)[last] = value;
  return root;
}

const mutation = fc.record({
  kind: fc.constantFrom('delete', 'replace', 'replace', 'number-token'),
  pathPick: fc.nat(),
  weird: fc.nat({ max: WEIRD.length - 1 }),
  token: fc.constantFrom(...NUMBER_TOKENS),
});

const fileLevel = fc.constantFrom(
  ...(['none', 'none', 'none', 'none', 'none', 'none', 'none', 'none', 'none', 'none'] as const),
  ...(['bom', 'bad-utf8', 'truncate', 'null', 'array', 'number', 'string', 'empty', 'proto-root'] as const),
);

export function scenarioArb(bases: Record<string, string>) {
  return fc
    .record({
      base: fc.constantFrom(...Object.keys(bases)),
      // About half the files are the examples untouched, so the simulations and exports run too.
      mutations: fc.oneof(fc.constant([]), fc.array(mutation, { minLength: 1, maxLength: 3 })),
      level: fileLevel,
      offset: fc.nat(),
      badByte: fc.constantFrom(0x80, 0xc0, 0xed, 0xf5, 0xff, 0xe9),
    })
    .map((r) => {
      const how = [`base ${r.base}`];
      let json = JSON.parse(bases[r.base]!) as Json;
      const tokens: [string, string][] = [];
      for (const m of r.mutations) {
        const all = paths(json).filter((p) => p.length > 0);
        const at = all[m.pathPick % all.length]!;
        if (m.kind === 'delete') {
          json = setAt(json, at, undefined);
          how.push(`delete ${at.join('.')}`);
        } else if (m.kind === 'replace') {
          json = setAt(json, at, WEIRD[m.weird]!.value());
          how.push(`${at.join('.')} = ${WEIRD[m.weird]!.name}`);
        } else {
          const mark = `__TOKEN_${tokens.length}__`;
          tokens.push([`"${mark}"`, m.token]);
          json = setAt(json, at, mark);
          how.push(`${at.join('.')} = ${m.token.length > 20 ? 'deep nesting' : m.token} (as JSON text)`);
        }
      }
      let text = JSON.stringify(json, null, 1);
      for (const [mark, token] of tokens) text = text.replace(mark, token);
      let bytes: Uint8Array = new TextEncoder().encode(text);
      const level = r.level;
      if (level !== 'none') how.push(`file: ${level}`);
      if (level === 'bom') bytes = Uint8Array.from([0xef, 0xbb, 0xbf, ...bytes]);
      else if (level === 'bad-utf8') {
        const at = r.offset % bytes.length;
        bytes = Uint8Array.from([...bytes.subarray(0, at), r.badByte, ...bytes.subarray(at)]);
      } else if (level === 'truncate') bytes = bytes.subarray(0, r.offset % bytes.length);
      else if (level === 'proto-root') bytes = new TextEncoder().encode(`{"__proto__": {"format": "x"}, ${text.trimStart().slice(1)}`);
      else if (level !== 'none')
        bytes = new TextEncoder().encode({ null: 'null', array: '[1, 2]', number: '42', string: '"lumen"', empty: '' }[level]!);
      return { bytes, how };
    });
}

/** Values each option is given: the first ones are good, the rest bad; `benign` cases use good ones only. */
const OPTION_VALUES: Record<string, string[]> = {
  rate: ['0.5', '2', '10', '0.001', 'Infinity', '1e-320', 'abc', '-1', '0', '11', '1e308', 'NaN', ''],
  mode: ['follow-plan', 'step-target', 'both', 'sideways'],
  format: ['csv', 'aem', 'json,aem', 'xml', ''],
  controller: ['pd', 'hysteretic', 'synergistic', 'nope', 'pd,nope', ''],
  out: ['@OUT@', '@OUT@/nested/deeper', '@TMP@/existing-file', '/proc/fuzz/out', ''],
  csv: ['@OUT@/table.csv', '@TMP@', '/proc/fuzz.csv'],
  'json-file': ['@OUT@/table.json', '@TMP@/existing-file'],
  'creation-date': ['2030-03-13T08:00:00Z', '2030-02-30T00:00:00Z', 'yesterday'],
  'message-id': ['PASS-1', 'Mixed Case', ' pad'],
  runs: ['1', '0', '-3', '1.5', '1e3', 'many'],
  workers: ['1', '0', '65', 'two'],
  seed: ['7', '-1', '4294967296', '0x10'],
  case: ['0', '3', '99999999', '-1', 'first'],
};
/** How many leading values of each list are good. */
const GOOD_COUNT: Record<string, number> = {
  rate: 4,
  mode: 3,
  format: 3,
  controller: 3,
  out: 2,
  csv: 1,
  'json-file': 1,
  'creation-date': 1,
  'message-id': 1,
  runs: 1,
  workers: 1,
  seed: 1,
  case: 2,
};

/** The options each command takes (the others are refused as unknown, which `foreign` cases try too). */
const COMMAND_OPTIONS: Record<string, string[]> = {
  fly: ['rate', 'mode', 'format', 'controller', 'out', 'creation-date', 'message-id'],
  compare: ['controller', 'mode', 'csv', 'json-file'],
  certify: ['controller'],
  study: ['runs', 'workers', 'seed', 'controller', 'out', 'case'],
};

// The commands that read a scenario come up often; help, version and unknown names now and then.
const COMMANDS = [
  'check',
  'check',
  'plan',
  'plan',
  'fly',
  'fly',
  'compare',
  'compare',
  'certify',
  'study',
  'study',
  'schema',
  'launch',
  '--help',
  '--version',
];

export const argsArb = (clean: boolean) =>
  fc
    .record({
      command: fc.constantFrom(...COMMANDS),
      withFile: clean ? fc.constant('file' as const) : fc.constantFrom('file', 'file', 'file', 'none', 'missing', 'folder', 'device'),
      options: fc.array(fc.record({ name: fc.nat(), pick: fc.nat(), form: fc.constantFrom('space', 'equals') }), { maxLength: 4 }),
      foreign: clean ? fc.constant(1) : fc.nat({ max: 6 }),
      benign: clean ? fc.constant(true) : fc.boolean(),
      extra: fc.oneof(
        { arbitrary: fc.constant(null), weight: 2 },
        { arbitrary: fc.constantFrom('--json', '--help', '--bogus', '--rate', 'extra-positional'), weight: 1 },
      ),
      sourceDateEpoch: fc.constantFrom(null, null, null, '1900000000', '1.5e9', ''),
    })
    .map((r) => {
      const args = [r.command];
      const file = { file: '@FILE@', none: null, missing: '@TMP@/missing.json', folder: '@TMP@', device: '/dev/zero' }[r.withFile];
      if (file) args.push(file);
      // One case in seven draws from every option, mostly refused as unknown for the command.
      const pool = r.foreign === 0 ? Object.keys(OPTION_VALUES) : (COMMAND_OPTIONS[r.command] ?? []);
      const names: string[] = [];
      for (const o of pool.length ? r.options : []) {
        const name = pool[o.name % pool.length]!;
        const values = OPTION_VALUES[name]!;
        const v = values[o.pick % (r.benign ? GOOD_COUNT[name]! : values.length)]!;
        names.push(name);
        if (o.form === 'equals') args.push(`--${name}=${v}`);
        else args.push(`--${name}`, v);
      }
      // Keep simulations short: one fast controller unless the case picked its own; study writes one case only.
      if (r.command === 'fly' || r.command === 'compare') {
        if (!names.includes('controller')) args.push('--controller', 'pd');
        if (!names.includes('mode')) args.push('--mode', 'follow-plan');
        if (r.command === 'fly' && !names.includes('out')) args.push('--out', '@OUT@');
      }
      if (r.command === 'study' && !names.includes('case')) args.push('--case', '1');
      // A dangling option (no value) only makes sense last.
      // --json exists for plan, compare, certify and study; elsewhere it is unknown, like --bogus. A
      // dangling --rate (no value) comes last.
      const jsonOk = ['plan', 'compare', 'certify', 'study'].includes(r.command);
      if (r.extra && (!r.benign || (r.extra === '--json' && jsonOk))) args.push(r.extra);
      const env: Record<string, string> = r.sourceDateEpoch === null ? {} : { SOURCE_DATE_EPOCH: r.sourceDateEpoch };
      return { args, env, withFile: file === '@FILE@' };
    });

/**
 * With the default weight a third of the cases are clean (an example file as it is, good option
 * values) so that plans, simulations, certificates and exports run too; the rest are hostile.
 */
export function caseArb(bases: Record<string, string>, cleanWeight = 1): fc.Arbitrary<FuzzCase> {
  const clean = fc.record({
    a: argsArb(true),
    s: fc.constantFrom(...Object.keys(bases)).map((b) => ({ bytes: new TextEncoder().encode(bases[b]!), how: [`base ${b} (clean)`] })),
  });
  const hostile = fc.record({ a: argsArb(false), s: scenarioArb(bases) });
  return fc.oneof({ arbitrary: clean, weight: cleanWeight }, { arbitrary: hostile, weight: 2 }).map(({ a, s }) => ({
    file: a.withFile ? s.bytes : null,
    args: a.args,
    env: a.env,
    how: a.withFile ? s.how : [],
  }));
}

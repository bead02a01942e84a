/**
 * A small argument parser for the CLI: positional arguments, `--name value`, `--name=value` and
 * boolean flags. Unknown options are errors that name the option (never silently ignored).
 */
export interface OptionSpec {
  name: string;
  /** 'flag' takes no value; 'value' takes one; 'list' may repeat or take a comma list. */
  kind: 'flag' | 'value' | 'list';
  help: string;
  valueName?: string;
}

export interface ParsedArgs {
  positional: string[];
  values: Record<string, string>;
  lists: Record<string, string[]>;
  flags: Set<string>;
}

export function parseArgs(
  argv: readonly string[],
  specs: readonly OptionSpec[],
): { ok: true; args: ParsedArgs } | { ok: false; message: string } {
  const byName = new Map(specs.map((s) => [s.name, s]));
  const out: ParsedArgs = { positional: [], values: {}, lists: {}, flags: new Set() };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i]!;
    if (!a.startsWith('--') || a === '--') {
      out.positional.push(a);
      continue;
    }
    const eq = a.indexOf('=');
    const name = a.slice(2, eq > 0 ? eq : undefined);
    const spec = byName.get(name);
    if (!spec) return { ok: false, message: `unknown option --${name} (see --help)` };
    if (spec.kind === 'flag') {
      if (eq > 0) return { ok: false, message: `--${name} takes no value` };
      out.flags.add(name);
      continue;
    }
    const value: string | undefined = eq > 0 ? a.slice(eq + 1) : argv[i + 1];
    if (eq < 0) i++;
    if (value === undefined || (eq < 0 && value.startsWith('--')))
      return { ok: false, message: `--${name} needs a value (${spec.valueName ?? 'value'})` };
    if (spec.kind === 'value') out.values[name] = value;
    else
      (out.lists[name] ??= []).push(
        ...value
          .split(',')
          .map((v) => v.trim())
          .filter(Boolean),
      );
  }
  return { ok: true, args: out };
}

export function optionHelp(specs: readonly OptionSpec[]): string {
  const rows = specs.map((s) => {
    const left = `  --${s.name}${s.kind === 'flag' ? '' : ` <${s.valueName ?? 'value'}>`}`;
    return `${left.padEnd(30)} ${s.help}`;
  });
  return rows.join('\n');
}

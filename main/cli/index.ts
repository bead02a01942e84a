/**
 * The `slewsmith` command line: the same jobs as the desktop app, headless.
 *
 *   slewsmith check   <scenario>            validate a scenario file
 *   slewsmith plan    <scenario>            the slew plan: times, binding limits, feasibility
 *   slewsmith fly     <scenario>            simulate controllers and write the exports
 *   slewsmith compare <scenario>            the metrics table of every controller
 *   slewsmith certify <scenario>            the synergy-gap certificate of synergistic controllers
 *   slewsmith study   <scenario>            seeded Monte Carlo robustness study (also: study merge, study slurm)
 *   slewsmith sweep   <scenario>            robustness sweep: one or two study parameters on a grid, a study per cell (also: sweep merge, sweep slurm)
 *   slewsmith schema                        the scenario format as JSON Schema
 *
 * Exit codes: 0 success; 2 invalid input or options (every problem named, field by field, on
 * stderr); 1 an infeasible plan, a refused certificate, a run that did not settle (unsettled,
 * failed or truncated) or a failed write; 130 interrupted
 * (Ctrl-C). Progress goes to stderr, results to stdout. No input or option makes the CLI print a
 * stack trace: an unexpected exception is one line naming the command (the stack only with
 * SLEWSMITH_DEBUG=1), status 1.
 */
import { parseArgs, optionHelp, type OptionSpec, type ParsedArgs } from './args';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { oneLine, type CliContext, type CliIo } from './io';
import { readScenario } from './input';
import type { Computer } from './compute';

/**
 * The commands' work, loaded on first use: the engine takes most of a second to load, which
 * `--help`, `--version`, a bad option or an unreadable file should not wait for.
 */
const work = () => import('./commands');

const TOOL_NAME = 'Slewsmith';
const TOOL_VERSION = '0.1.0';

export type { CliContext, CliIo } from './io';

type Command = {
  summary: string;
  usage: string;
  options: OptionSpec[];
  /** Lines after the options in `--help`. */
  notes?: string[];
  run: (a: ParsedArgs, ctx: CliContext) => Promise<number>;
};

const HELP: OptionSpec = { name: 'help', kind: 'flag', help: 'show this help' };
const CONTROLLER: OptionSpec = {
  name: 'controller',
  kind: 'list',
  valueName: 'id[,id]',
  help: 'only these controller ids (default: all in the file)',
};
const MODE: OptionSpec = {
  name: 'mode',
  kind: 'value',
  valueName: 'follow-plan|step-target|both',
  help: "override the scenario's simulation.mode: follow the planned slew, or step to each target at once",
};
const JSON_OUT: OptionSpec = { name: 'json', kind: 'flag', help: 'print JSON instead of a table' };

const commands: Record<string, Command> = {
  check: {
    summary: 'validate a scenario file (schema, physics, controllers, certificate)',
    usage: 'slewsmith check <scenario.json>',
    options: [HELP],
    async run(a, ctx) {
      const doc = await readScenario(a.positional[0], ctx.io);
      return doc === null ? 2 : (await work()).runCheck(a.positional[0]!, doc.json, ctx);
    },
  },
  plan: {
    summary: 'print the slew plan: per segment time, binding limit, envelope use, feasibility',
    usage: 'slewsmith plan <scenario.json> [--json]',
    options: [HELP, JSON_OUT],
    async run(a, ctx) {
      const doc = await readScenario(a.positional[0], ctx.io);
      return doc === null ? 2 : (await work()).runPlan(a.positional[0]!, doc.json, a, ctx);
    },
  },
  compare: {
    summary: 'simulate every controller and print the metrics table',
    usage:
      'slewsmith compare <scenario.json> [--controller id,...] [--mode follow-plan|step-target|both] [--csv FILE] [--json-file FILE] [--json]',
    options: [
      HELP,
      CONTROLLER,
      MODE,
      JSON_OUT,
      { name: 'csv', kind: 'value', valueName: 'file', help: 'also write the table as CSV' },
      { name: 'json-file', kind: 'value', valueName: 'file', help: 'also write the table as JSON' },
    ],
    async run(a, ctx) {
      const doc = await readScenario(a.positional[0], ctx.io);
      return doc === null ? 2 : (await work()).runCompare(a.positional[0]!, doc, a, ctx);
    },
  },
  fly: {
    summary: 'simulate controllers and write the command timeline exports (CSV, JSON, CCSDS AEM)',
    usage:
      'slewsmith fly <scenario.json> [--out DIR] [--format csv,json,aem] [--controller id,...] [--mode ...] [--rate HZ] [--creation-date ISO] [--message-id TEXT]',
    options: [
      HELP,
      CONTROLLER,
      MODE,
      { name: 'out', kind: 'value', valueName: 'dir', help: 'output folder (default: ./slewsmith-out); made if missing' },
      { name: 'format', kind: 'list', valueName: 'csv,json,aem', help: 'which exports (default: all three)' },
      {
        name: 'rate',
        kind: 'value',
        valueName: 'Hz',
        help: "export sample rate, 0.001 Hz up to the scenario's control rate (default: every control sample)",
      },
      {
        name: 'creation-date',
        kind: 'value',
        valueName: 'ISO',
        help: 'AEM CREATION_DATE, ISO 8601 UTC like 2030-03-13T08:00:00Z (default: SOURCE_DATE_EPOCH, else now)',
      },
      {
        name: 'message-id',
        kind: 'value',
        valueName: 'text',
        help: 'AEM MESSAGE_ID: letters, digits, _ - . : + / (one case, ≤ 64) (default: <vehicle>-<creation date>)',
      },
    ],
    notes: [
      'Reproducible exports: the same scenario and options give byte-identical files when the AEM',
      'creation date is fixed, by --creation-date or by the SOURCE_DATE_EPOCH environment variable',
      '(whole seconds since 1970-01-01T00:00:00Z, the reproducible-builds.org convention).',
      'Ctrl-C stops the simulation or the writing with status 130; no file is left half-written.',
    ],
    async run(a, ctx) {
      const doc = await readScenario(a.positional[0], ctx.io);
      return doc === null ? 2 : (await work()).runFly(a.positional[0]!, doc, a, ctx, { name: TOOL_NAME, version: TOOL_VERSION });
    },
  },
  certify: {
    summary: 'certify the synergistic controllers of a scenario (synergy gap δ*, admissible δ)',
    usage: 'slewsmith certify <scenario.json> [--controller id,...] [--json]',
    options: [HELP, CONTROLLER, JSON_OUT],
    async run(a, ctx) {
      const doc = await readScenario(a.positional[0], ctx.io);
      return doc === null ? 2 : (await work()).runCertify(a.positional[0]!, doc.json, a, ctx);
    },
  },
  study: {
    summary: 'seeded Monte Carlo robustness study (the scenario\'s "study" block) in worker threads',
    usage:
      'slewsmith study <scenario.json> [--runs N] [--workers K] [--seed S] [--controller id,...] [--out DIR] [--json] [--case INDEX] [--shard i/K]\n' +
      '       slewsmith study merge <dir|shard file>... [--out DIR]\n' +
      '       slewsmith study slurm <scenario.json> --shards K --out DIR [--cpus-per-task N] [--mem-mb M] [--time-min T] [--partition P] [--account A] [--submit]',
    options: [
      HELP,
      CONTROLLER,
      { name: 'runs', kind: 'value', valueName: 'N', help: "number of dispersed cases (default: the file's study.runs)" },
      { name: 'workers', kind: 'value', valueName: 'K', help: 'worker threads (default: CPU count)' },
      { name: 'seed', kind: 'value', valueName: 'S', help: "study seed (default: the file's study.seed)" },
      { name: 'out', kind: 'value', valueName: 'dir', help: 'write cases.csv and summary.json there' },
      JSON_OUT,
      {
        name: 'case',
        kind: 'value',
        valueName: 'index',
        help: 'write that case as a normal scenario file (into --out, else to stdout) instead of running the study',
      },
      {
        name: 'shard',
        kind: 'value',
        valueName: 'i/K',
        help: 'run only shard i of K and write its shard file into --out (merge with "study merge")',
      },
      { name: 'shards', kind: 'value', valueName: 'K', help: 'study slurm: array tasks (shards)' },
      { name: 'cpus-per-task', kind: 'value', valueName: 'N', help: 'study slurm: CPUs per array task (default 1)' },
      { name: 'mem-mb', kind: 'value', valueName: 'M', help: 'study slurm: memory per array task, MiB (default 1024)' },
      { name: 'time-min', kind: 'value', valueName: 'T', help: 'study slurm: time limit per array task, minutes (default 60)' },
      { name: 'partition', kind: 'value', valueName: 'P', help: 'study slurm: Slurm partition' },
      { name: 'account', kind: 'value', valueName: 'A', help: 'study slurm: Slurm account' },
      { name: 'submit', kind: 'flag', help: 'study slurm: submit the array and the merge job with sbatch and print their ids' },
    ],
    notes: [
      'study merge: combine shard files into cases.csv and summary.json, the same bytes as one process running the whole study.',
      'study slurm: write a campaign folder (scenario, job-array and merge scripts, README.txt); --submit calls sbatch.',
    ],
    async run(a, { io }) {
      const sub = a.positional[0];
      if (sub === 'merge') return (await work()).runStudyMerge(a, io, `${TOOL_NAME} ${TOOL_VERSION}`);
      if (sub === 'slurm') {
        const doc = await readScenario(a.positional[1], io);
        return doc === null ? 2 : (await work()).runStudySlurm(doc.json, a, io);
      }
      const doc = await readScenario(a.positional[0], io);
      return doc === null ? 2 : (await work()).runStudyCli(doc.json, a, io, `${TOOL_NAME} ${TOOL_VERSION}`);
    },
  },
  sweep: {
    summary: 'robustness sweep: one or two study parameters on a grid, each cell a seeded study; settle-share maps with their boundary',
    usage:
      'slewsmith sweep <scenario.json> --param NAME=lo:hi:steps [--param2 NAME=v1,v2,...] --runs N [--controller id,...] [--workers K] [--seed S] [--level L] [--out DIR] [--shard i/K]\n' +
      '       slewsmith sweep merge <shard file|folder>... [--out DIR]\n' +
      '       slewsmith sweep slurm <scenario.json> --param ... [--param2 ...] --runs N [--controller id,...] [--seed S] [--level L] --shards K --out DIR [--cpus-per-task N] [--mem-mb M] [--time-min T] [--partition P] [--account A] [--submit]',
    options: [
      HELP,
      CONTROLLER,
      {
        name: 'param',
        kind: 'value',
        valueName: 'NAME=lo:hi:steps',
        help: 'first swept parameter: noise-scale, worst-case-eta, hysteresis, control-rate-hz, torque-quantum-mnm, inertia-error, jump-threshold, failed-wheel (values also as NAME=v1,v2,...)',
      },
      { name: 'param2', kind: 'value', valueName: 'NAME=lo:hi:steps', help: 'second swept parameter (a 2-D grid)' },
      { name: 'runs', kind: 'value', valueName: 'N', help: 'cases per grid cell' },
      { name: 'workers', kind: 'value', valueName: 'K', help: 'worker threads (default: CPU count); results do not depend on it' },
      { name: 'seed', kind: 'value', valueName: 'S', help: 'sweep seed (default 0); cell i runs with a seed made from it and i' },
      { name: 'level', kind: 'value', valueName: 'L', help: 'settle share of the boundary, 0.001 to 0.999 (default 0.5)' },
      { name: 'out', kind: 'value', valueName: 'dir', help: 'write cells.csv and sweep.json there' },
      {
        name: 'shard',
        kind: 'value',
        valueName: 'i/K',
        help: 'run only shard i of K (a contiguous range of the cells) and write its shard file into --out (merge with "sweep merge")',
      },
      { name: 'shards', kind: 'value', valueName: 'K', help: 'sweep slurm: array tasks (shards), at most the number of cells' },
      { name: 'cpus-per-task', kind: 'value', valueName: 'N', help: 'sweep slurm: CPUs (worker threads) per array task (default 1)' },
      { name: 'mem-mb', kind: 'value', valueName: 'M', help: 'sweep slurm: memory per array task, MiB (default 1024)' },
      { name: 'time-min', kind: 'value', valueName: 'T', help: 'sweep slurm: time limit per array task, minutes (default 60)' },
      { name: 'partition', kind: 'value', valueName: 'P', help: 'sweep slurm: Slurm partition' },
      { name: 'account', kind: 'value', valueName: 'A', help: 'sweep slurm: Slurm account' },
      { name: 'submit', kind: 'flag', help: 'sweep slurm: submit the array and the merge job with sbatch and print their ids' },
    ],
    notes: [
      'sweep merge: combine the shard files of one sweep into cells.csv and sweep.json, the same bytes as one process running every cell.',
      'sweep slurm: write a campaign folder (scenario, job-array and merge scripts, README.txt) whose merge job writes the same cells.csv and sweep.json as one process; --submit calls sbatch.',
      "Each cell is the scenario's study (its dispersions, duration and settle rules) with the cell's values written in; exit 130 after Ctrl-C keeps the finished cells.",
    ],
    async run(a, { io }) {
      if (a.positional[0] === 'merge') return (await work()).runSweepMerge(a, io, `${TOOL_NAME} ${TOOL_VERSION}`);
      if (a.positional[0] === 'slurm') {
        const doc = await readScenario(a.positional[1], io);
        return doc === null ? 2 : (await work()).runSweepSlurm(doc, a, io);
      }
      const doc = await readScenario(a.positional[0], io);
      return doc === null ? 2 : (await work()).runSweepCli(doc.json, a, io, `${TOOL_NAME} ${TOOL_VERSION}`);
    },
  },
  schema: {
    summary: 'print the scenario file format as JSON Schema (for editors)',
    usage: 'slewsmith schema',
    options: [HELP],
    async run(_a, { io }) {
      io.out(JSON.stringify((await work()).scenarioJsonSchema(), null, 2));
      return 0;
    },
  },
};

function mainHelp(): string {
  const rows = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(9)} ${c.summary}`);
  return [
    `${TOOL_NAME} ${TOOL_VERSION} — slew planning with reaction wheels, smooth vs hybrid attitude control`,
    '',
    'usage: slewsmith <command> [options]',
    '',
    'commands:',
    ...rows,
    '',
    "Run 'slewsmith <command> --help' for a command's options.",
    'Exit codes: 0 success (fly/compare: every run settled); 2 invalid input or options; 1 infeasible',
    'plan, refused certificate, a run unsettled, failed or truncated (named in the last lines), or a',
    'failed write; 3 (plan, fly, compare) everything ran but the plan or a run violated an attitude',
    'constraint of the scenario (listed on stderr); 130 interrupted (Ctrl-C). 1 and 2 win over 3.',
    'A closed output pipe (e.g. `| head`) is not an error:',
    "output stops, files are still written, and the status is the command's own.",
    'SLEWSMITH_DEBUG=1 adds the stack to the one-line report of an unexpected failure.',
    '',
    CAUTION_TEXT,
  ].join('\n');
}

const inlineCompute: Computer = async (job, progress, signal) => (await import('./compute')).inlineComputer(job, progress, signal);

/** What a caller may leave out: the in-process defaults (inline simulation, no signal wiring). */
function withDefaults(io: CliIo, given: Partial<Omit<CliContext, 'io'>>): CliContext {
  return {
    io,
    env: given.env ?? process.env,
    compute: given.compute ?? inlineCompute,
    onInterrupt: given.onInterrupt ?? (() => () => {}),
  };
}

export async function runCli(argv: readonly string[], io: CliIo, context: Partial<Omit<CliContext, 'io'>> = {}): Promise<number> {
  const ctx = withDefaults(io, context);
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.out(mainHelp());
    return name ? 0 : 2;
  }
  if (name === '--version') {
    io.out(`${TOOL_NAME} ${TOOL_VERSION}`);
    return 0;
  }
  const cmd = Object.hasOwn(commands, name) ? commands[name] : undefined;
  if (!cmd) {
    io.err(`unknown command ${JSON.stringify(oneLine(name, 60))}. Commands: ${Object.keys(commands).join(', ')}. Try slewsmith --help.`);
    return 2;
  }
  const parsed = parseArgs(rest, cmd.options);
  if (!parsed.ok) {
    io.err(`error: ${oneLine(parsed.message)}\nusage: ${cmd.usage}`);
    return 2;
  }
  if (parsed.args.flags.has('help')) {
    const notes = cmd.notes ? `\n\n${cmd.notes.join('\n')}` : '';
    io.out(`${cmd.summary}\n\nusage: ${cmd.usage}\n\noptions:\n${optionHelp(cmd.options)}${notes}`);
    return 0;
  }
  try {
    return await cmd.run(parsed.args, ctx);
  } catch (e) {
    // Expected failures are results; reaching here is a bug. One line for the user, the stack on request.
    const what = e instanceof Error ? `${e.name}: ${e.message}` : String(e);
    const debug = ctx.env.SLEWSMITH_DEBUG === '1';
    io.err(`slewsmith ${name}: unexpected failure: ${oneLine(what)}${debug ? '' : ' (SLEWSMITH_DEBUG=1 shows where)'}`);
    if (debug && e instanceof Error && e.stack) io.err(e.stack);
    return 1;
  }
}

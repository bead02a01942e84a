/**
 * The `slewsmith` command line: the same jobs as the desktop app, headless.
 *
 *   slewsmith check   <scenario>            validate a scenario file
 *   slewsmith plan    <scenario>            the slew plan: times, binding limits, feasibility
 *   slewsmith fly     <scenario>            simulate controllers and write the exports
 *   slewsmith compare <scenario>            the metrics table of every controller
 *   slewsmith certify <scenario>            the synergy-gap certificate of synergistic controllers
 *   slewsmith study   <scenario>            seeded Monte Carlo robustness study
 *   slewsmith schema                        the scenario format as JSON Schema
 *
 * Exit codes: 0 success; 2 invalid input (field-level messages on stderr); 1 an infeasible plan,
 * a refused certificate or a failed run. Progress goes to stderr, results to stdout.
 */
import { readFile, mkdir } from 'node:fs/promises';
import path from 'node:path';
import { parseArgs, optionHelp, type OptionSpec, type ParsedArgs } from './args';
import { comparisonCsv, comparisonTable, planTable } from './format';
import { writeFileAtomicNode } from './fs';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';
import { planSummary } from '../../app/engine/pipeline/plan';
import { isCertificateRefusal } from '../../app/engine/control/certificate';
import type { RunMode } from '../../app/engine/sim/types';
import { scenarioJsonSchema } from '../../app/engine/scenario/schema';
import { CAUTION_TEXT } from '../../app/engine/caution';
import { exportRun, EXPORT_FORMATS, type ExportFormat } from '../../app/engine/export/runExport';
import { runStudyCli } from './study';
import { printIssues, type CliIo } from './io';

export const TOOL_NAME = 'Slewsmith';
export const TOOL_VERSION = '0.1.0';

export type { CliIo } from './io';

type Command = {
  summary: string;
  usage: string;
  options: OptionSpec[];
  run: (a: ParsedArgs, io: CliIo) => Promise<number>;
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

async function readScenario(file: string | undefined, io: CliIo): Promise<unknown | null> {
  if (!file) {
    io.err('error: give a scenario file (e.g. assets/lumen6-imaging.scenario.json)');
    return null;
  }
  let text: string;
  try {
    text = await readFile(file, 'utf8');
  } catch (e) {
    io.err(`error: cannot read ${file}: ${(e as Error).message}`);
    return null;
  }
  try {
    return JSON.parse(text);
  } catch (e) {
    io.err(`error: ${file} is not valid JSON: ${(e as Error).message}`);
    return null;
  }
}

function modesOf(a: ParsedArgs, io: CliIo): RunMode[] | undefined | null {
  const m = a.values.mode;
  if (m === undefined) return undefined;
  if (m === 'both') return ['follow-plan', 'step-target'];
  if (m === 'follow-plan' || m === 'step-target') return [m];
  io.err(`error: --mode must be follow-plan, step-target or both (got "${m}")`);
  return null;
}

const commands: Record<string, Command> = {
  check: {
    summary: 'validate a scenario file (schema, physics, controllers, certificate)',
    usage: 'slewsmith check <scenario.json>',
    options: [HELP],
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      const p = preparePipeline(json);
      if (!p.ok) {
        printIssues(io, `${a.positional[0]} is not valid`, p.errors);
        return 2;
      }
      for (const w of p.value.warnings) io.err(`warning: ${w.path}: ${w.message}`);
      const s = p.value.scenario;
      io.out(
        `${a.positional[0]}: valid. "${s.name}", ${s.vehicle.wheels.length} wheels, ${s.targets.length} targets, ${p.value.controllers.length} controllers.`,
      );
      return 0;
    },
  },
  plan: {
    summary: 'print the slew plan: per segment time, binding limit, envelope use, feasibility',
    usage: 'slewsmith plan <scenario.json> [--json]',
    options: [HELP, JSON_OUT],
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      const p = preparePipeline(json);
      if (!p.ok) {
        printIssues(io, `${a.positional[0]} is not valid`, p.errors);
        return 2;
      }
      const plan = planSummary(p.value.plan, p.value.scenario.targets);
      if (a.flags.has('json')) io.out(JSON.stringify({ caution: CAUTION_TEXT, plan }, null, 2));
      else io.out(`Plan for "${p.value.scenario.name}"\n\n${planTable(plan)}\n\n${CAUTION_TEXT}`);
      return plan.feasible ? 0 : 1;
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
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      const modes = modesOf(a, io);
      if (modes === null) return 2;
      const r = runPipeline(json, { controllers: a.lists.controller, modes, onProgress: (d, n, l) => io.err(`[${d}/${n}] ${l}`) });
      if (!r.ok) {
        printIssues(io, `${a.positional[0]} is not valid`, r.errors);
        return 2;
      }
      const o = r.value;
      if (a.flags.has('json')) io.out(JSON.stringify({ caution: CAUTION_TEXT, comparison: o.comparison, best: o.best }, null, 2));
      else
        io.out(
          `Comparison for "${o.vehicle.name}" (plan ${o.plan.feasible ? 'feasible' : 'INFEASIBLE'}, ${o.plan.totalTimeS.toFixed(1)} s)\n\n${comparisonTable(o.comparison, o.best)}\n\n${CAUTION_TEXT}`,
        );
      if (a.values.csv) await writeOrFail(a.values.csv, comparisonCsv(o.comparison, CAUTION_TEXT), io);
      if (a.values['json-file'])
        await writeOrFail(
          a.values['json-file'],
          JSON.stringify({ caution: CAUTION_TEXT, comparison: o.comparison, best: o.best }, null, 2) + '\n',
          io,
        );
      const failed = o.runs.filter((x) => x.outcome.status !== 'completed');
      for (const f of failed) io.err(`run ${f.key} ended early: ${f.outcome.message}`);
      return o.plan.feasible && failed.length === 0 ? 0 : 1;
    },
  },
  fly: {
    summary: 'simulate controllers and write the command timeline exports (CSV, JSON, CCSDS AEM)',
    usage: 'slewsmith fly <scenario.json> [--out DIR] [--format csv,json,aem] [--controller id,...] [--mode ...] [--rate HZ]',
    options: [
      HELP,
      CONTROLLER,
      MODE,
      { name: 'out', kind: 'value', valueName: 'dir', help: 'output folder (default: ./slewsmith-out)' },
      { name: 'format', kind: 'list', valueName: 'csv,json,aem', help: 'which exports (default: all three)' },
      { name: 'rate', kind: 'value', valueName: 'Hz', help: 'export sample rate (default: every control sample)' },
    ],
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      const modes = modesOf(a, io);
      if (modes === null) return 2;
      const formats = (a.lists.format ?? [...EXPORT_FORMATS]) as ExportFormat[];
      const bad = formats.filter((f) => !(EXPORT_FORMATS as readonly string[]).includes(f));
      if (bad.length) {
        io.err(`error: --format takes csv, json and aem (got ${bad.join(', ')})`);
        return 2;
      }
      const rate = a.values.rate === undefined ? undefined : Number(a.values.rate);
      if (rate !== undefined && !(rate > 0)) {
        io.err(`error: --rate must be a positive number of samples per second (got "${a.values.rate}")`);
        return 2;
      }
      const r = runPipeline(json, {
        controllers: a.lists.controller,
        modes,
        onProgress: (d, n, l) => io.err(`[${d}/${n}] simulated ${l}`),
      });
      if (!r.ok) {
        printIssues(io, `${a.positional[0]} is not valid`, r.errors);
        return 2;
      }
      const outDir = a.values.out ?? 'slewsmith-out';
      await mkdir(outDir, { recursive: true });
      const base = path.basename(a.positional[0]!).replace(/\.scenario\.json$|\.json$/, '');
      let status = r.value.plan.feasible ? 0 : 1;
      for (const run of r.value.runs) {
        for (const f of formats) {
          const text = exportRun(f, run, r.value, {
            toolName: TOOL_NAME,
            toolVersion: TOOL_VERSION,
            sampleRateHz: rate,
          });
          const file = path.join(outDir, `${base}.${run.controllerId}.${run.mode}.${f === 'aem' ? 'aem' : f}`);
          if (!text.ok) {
            printIssues(io, `export ${file} refused`, text.errors);
            status = 1;
            continue;
          }
          if (!(await writeOrFail(file, text.value, io))) status = 1;
          else io.out(`wrote ${file}`);
        }
      }
      io.out(`\n${comparisonTable(r.value.comparison, r.value.best)}\n\n${CAUTION_TEXT}`);
      return status;
    },
  },
  certify: {
    summary: 'certify the synergistic controllers of a scenario (synergy gap δ*, admissible δ)',
    usage: 'slewsmith certify <scenario.json> [--controller id,...] [--json]',
    options: [HELP, CONTROLLER, JSON_OUT],
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      const p = preparePipeline(json, a.lists.controller);
      if (!p.ok) {
        const refusedOnly = p.errors.every(isCertificateRefusal);
        printIssues(io, refusedOnly ? 'certificate refused' : `${a.positional[0]} is not valid`, p.errors);
        return refusedOnly ? 1 : 2;
      }
      const certs = p.value.controllers.filter((c) => c.controller.certificate);
      if (certs.length === 0) {
        io.err('no synergistic controller in the selection: nothing to certify');
        return 2;
      }
      let status = 0;
      for (const c of certs) {
        const k = c.controller.certificate!;
        if (!k.admissible) status = 1;
        if (a.flags.has('json')) {
          io.out(JSON.stringify({ controller: c.id, ...k }, null, 2));
          continue;
        }
        io.out(`${c.label} [${c.id}]: ${k.summary}`);
        io.out(
          `  δ* = ${k.deltaStar.toFixed(6)} (±${k.deltaStarTolerance.toExponential(1)}), δ = ${k.delta}, margin ${k.margin.toFixed(6)}, recommended δ ≈ ${k.recommendedDelta.toFixed(4)}`,
        );
        io.out(`  diffeomorphism margin min(1 + gᵀu) = ${k.diffeomorphismMargin.toFixed(6)}`);
        const rows = k.criticalPoints.filter((cp) => cp.target > 0);
        io.out('  undesired critical points (member q, Φ critical point i, warp angle θ*, V at the point, gap μ, jump to):');
        for (const cp of rows)
          io.out(
            `    q=${cp.member} i=${cp.target}  θ*=${cp.warpAngle.toFixed(6)}  V=(${cp.potentials.map((v) => v.toFixed(6)).join(', ')})  μ=${cp.gap.toFixed(6)}  → ${cp.jumpTo}`,
          );
        for (const w of k.warnings) io.err(`warning: ${w.message}`);
      }
      return status;
    },
  },
  study: {
    summary: 'seeded Monte Carlo robustness study (the scenario\'s "study" block) in worker threads',
    usage: 'slewsmith study <scenario.json> [--runs N] [--workers K] [--seed S] [--controller id,...] [--out DIR] [--json] [--case INDEX]',
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
    ],
    async run(a, io) {
      const json = await readScenario(a.positional[0], io);
      if (json === null) return 2;
      return runStudyCli(json, a, io);
    },
  },
  schema: {
    summary: 'print the scenario file format as JSON Schema (for editors)',
    usage: 'slewsmith schema',
    options: [HELP],
    async run(_a, io) {
      io.out(JSON.stringify(scenarioJsonSchema(), null, 2));
      return 0;
    },
  },
};

async function writeOrFail(file: string, text: string, io: CliIo): Promise<boolean> {
  const r = await writeFileAtomicNode(file, text);
  if (!r.ok) io.err(`error: could not write ${file}: ${r.message}`);
  return r.ok;
}

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
    'Exit codes: 0 success, 2 invalid input, 1 infeasible plan / refused certificate / failed run.',
    '',
    CAUTION_TEXT,
  ].join('\n');
}

export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  const [name, ...rest] = argv;
  if (!name || name === '--help' || name === '-h' || name === 'help') {
    io.out(mainHelp());
    return name ? 0 : 2;
  }
  if (name === '--version') {
    io.out(`${TOOL_NAME} ${TOOL_VERSION}`);
    return 0;
  }
  const cmd = commands[name];
  if (!cmd) {
    io.err(`unknown command "${name}". Commands: ${Object.keys(commands).join(', ')}. Try slewsmith --help.`);
    return 2;
  }
  const parsed = parseArgs(rest, cmd.options);
  if (!parsed.ok) {
    io.err(`error: ${parsed.message}\nusage: ${cmd.usage}`);
    return 2;
  }
  if (parsed.args.flags.has('help')) {
    io.out(`${cmd.summary}\n\nusage: ${cmd.usage}\n\noptions:\n${optionHelp(cmd.options)}`);
    return 0;
  }
  try {
    return await cmd.run(parsed.args, io);
  } catch (e) {
    io.err(`internal error: ${(e as Error).stack ?? e}`);
    return 1;
  }
}

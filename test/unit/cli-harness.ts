/**
 * Two ways to run the CLI in tests: in this process through runCli with captured output (fast:
 * no Node or tsx start-up), and as the real `bin/slewsmith.mjs` child process (streams, signals,
 * exit status as a user sees them).
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { runCli, type CliContext } from '../../main/cli/index';

export const root = path.resolve(__dirname, '../..');
export const bin = path.join(root, 'bin/slewsmith.mjs');
export const asset = (name: string) => path.join(root, 'assets', name);

export interface CliRun {
  code: number | null;
  signal?: NodeJS.Signals | null;
  stdout: string;
  stderr: string;
}

export async function runInProcess(argv: string[], context: Partial<Omit<CliContext, 'io'>> = {}): Promise<CliRun> {
  const out: string[] = [];
  const err: string[] = [];
  const code = await runCli(argv, { out: (s) => out.push(s), err: (s) => err.push(s) }, { env: {}, ...context });
  return { code, stdout: out.map((s) => s + '\n').join(''), stderr: err.map((s) => s + '\n').join('') };
}

export interface SpawnOptions {
  env?: Record<string, string>;
  /** Called with the child once it runs (to send a signal, close a pipe …). */
  onStart?: (child: ReturnType<typeof spawn>, stderrSoFar: () => string) => void;
}

export function spawnCli(args: string[], o: SpawnOptions = {}): Promise<CliRun> {
  return new Promise((resolve) => {
    const env: Record<string, string | undefined> = { ...process.env };
    delete env.SLEWSMITH_DEBUG;
    delete env.SOURCE_DATE_EPOCH;
    const child = spawn(process.execPath, [bin, ...args], {
      cwd: root,
      env: { ...env, ...o.env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    o.onStart?.(child, () => stderr);
    child.on('close', (code, signal) => resolve({ code, signal, stdout, stderr }));
  });
}

/** Signs that something escaped the CLI's own reporting. */
export const STACK_TRACE = /\n\s+at .+[(:]\d+|internal error|Unhandled|node:internal|\bthrow er\b/;

/**
 * The prebuilt CLI bundle (main/vite.cli.config.ts, `npm run build:cli`) against the TypeScript
 * sources run through tsx: built into a temporary folder, the same commands must write the same
 * bytes (stdout and files) either way — a study with two worker threads (bundled study workers)
 * and a fly (the bundled compute worker). The reference here is the tsx path itself, i.e. the
 * sources as written. Also the rule bin/cli-bundle.mjs applies to pick one (common practice,
 * no source: a build output is stale once an input is newer, as make(1) decides).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { bundleState, chooseCli } from '../../bin/cli-bundle.mjs';
import { asset, bin, root } from './cli-harness';

function run(cmd: string, args: string[], env: Record<string, string>): Promise<{ code: number | null; stdout: string; stderr: string }> {
  return new Promise((resolve) => {
    const base: Record<string, string | undefined> = { ...process.env };
    delete base.SLEWSMITH_DEBUG;
    delete base.SOURCE_DATE_EPOCH;
    delete base.SLEWSMITH_CLI;
    delete base.SLEWSMITH_CLI_DIR;
    const child = spawn(cmd, args, { cwd: root, env: { ...base, ...env }, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => (stdout += d.toString()));
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('close', (code) => resolve({ code, stdout, stderr }));
  });
}

const files = (dir: string) => fs.readdirSync(dir).sort();

describe('bin/cli-bundle.mjs: which program runs', () => {
  let tmp = '';
  beforeAll(() => {
    tmp = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-clipick-'));
    fs.mkdirSync(path.join(tmp, 'src'));
    fs.mkdirSync(path.join(tmp, 'dist/cli'), { recursive: true });
    fs.writeFileSync(path.join(tmp, 'src/a.ts'), 'export {};\n');
    fs.writeFileSync(path.join(tmp, 'dist/cli/slewsmith.mjs'), 'export {};\n');
  });
  afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));
  const manifest = (builtAtMs: number, sources = ['src/a.ts']) =>
    fs.writeFileSync(path.join(tmp, 'dist/cli/cli-manifest.json'), JSON.stringify({ builtAtMs, sources }));
  const setMtime = (ms: number) => fs.utimesSync(path.join(tmp, 'src/a.ts'), ms / 1000, ms / 1000);

  it('uses the bundle only when every listed source is not newer than the build', () => {
    setMtime(1_000_000);
    manifest(2_000_000);
    expect(chooseCli(tmp, {})).toEqual({ kind: 'bundle', entry: path.join(tmp, 'dist/cli/slewsmith.mjs') });
    setMtime(3_000_000);
    const c = chooseCli(tmp, {});
    expect(c.kind).toBe('tsx');
    expect(c.kind === 'tsx' && c.reason).toContain('src/a.ts changed after the bundle was built');
    manifest(4_000_000, ['src/a.ts', 'src/gone.ts']);
    expect(bundleState(tmp, path.join(tmp, 'dist/cli')).stale).toContain('src/gone.ts is gone');
  });

  it('falls back to tsx without a manifest, and obeys SLEWSMITH_CLI', () => {
    fs.rmSync(path.join(tmp, 'dist/cli/cli-manifest.json'), { force: true });
    expect(chooseCli(tmp, {}).kind).toBe('tsx');
    const forced = chooseCli(tmp, { SLEWSMITH_CLI: 'bundle' });
    expect(forced.kind === 'error' && forced.message).toContain('run npm run build:cli');
    setMtime(5_000_000);
    manifest(2_000_000); // stale, yet forced
    expect(chooseCli(tmp, { SLEWSMITH_CLI: 'bundle' }).kind).toBe('bundle');
    setMtime(1_000_000);
    expect(chooseCli(tmp, { SLEWSMITH_CLI: 'tsx' }).kind).toBe('tsx');
    const bad = chooseCli(tmp, { SLEWSMITH_CLI: 'fast' });
    expect(bad.kind === 'error' && bad.message).toBe('SLEWSMITH_CLI must be tsx, bundle or auto (got "fast")');
    expect(chooseCli(root, { SLEWSMITH_CLI_DIR: path.join(tmp, 'dist/cli') }).kind).toBe('tsx'); // src/a.ts is not in root
  });
});

describe('the bundled CLI writes the same bytes as the tsx path', () => {
  let tmp = '';
  let dist = '';
  beforeAll(async () => {
    // Inside the repository (`.tmp-*` is ignored by git): the bundle loads its packages from node_modules.
    tmp = fs.mkdtempSync(path.join(root, '.tmp-clibundle-'));
    dist = path.join(tmp, 'dist');
    const b = await run(
      process.execPath,
      [path.join(root, 'node_modules/vite/bin/vite.js'), 'build', '-c', 'main/vite.cli.config.ts', '--outDir', dist, '--logLevel', 'error'],
      {},
    );
    expect(b.stderr).toBe('');
    expect(b.code).toBe(0);
  });
  afterAll(() => fs.rmSync(tmp, { recursive: true, force: true }));

  it('built the CLI, its three worker entries and a manifest of project sources', () => {
    const names = files(dist);
    for (const f of ['slewsmith.mjs', 'study-worker.mjs', 'sweep-worker.mjs', 'compute-worker.mjs', 'cli-manifest.json'])
      expect(names).toContain(f);
    const m = JSON.parse(fs.readFileSync(path.join(dist, 'cli-manifest.json'), 'utf8')) as { sources: string[]; builtAtMs: number };
    expect(m.sources).toContain('main/cli/main.ts');
    expect(m.sources).toContain('app/engine/study/parallel.ts');
    expect(m.sources.some((s) => s.includes('node_modules'))).toBe(false);
    // Built from this checkout a moment ago: the automatic rule picks it.
    expect(chooseCli(root, { SLEWSMITH_CLI_DIR: dist }).kind).toBe('bundle');
  });

  it('study with two worker threads: same stdout, cases.csv and summary.json', async () => {
    const args = (out: string) => [
      bin,
      'study',
      asset('tern12-reversal.scenario.json'),
      '--runs',
      '12',
      '--seed',
      '5',
      '--workers',
      '2',
      '--out',
      out,
    ];
    const a = await run(process.execPath, args(path.join(tmp, 'study-bundle')), { SLEWSMITH_CLI: 'bundle', SLEWSMITH_CLI_DIR: dist });
    const t = await run(process.execPath, args(path.join(tmp, 'study-tsx')), { SLEWSMITH_CLI: 'tsx' });
    expect(a.code).toBe(0);
    expect(t.code).toBe(0);
    expect(a.stdout).toBe(t.stdout);
    expect(a.stdout).toContain('Robustness study of');
    expect(files(path.join(tmp, 'study-bundle'))).toEqual(['cases.csv', 'summary.json']);
    for (const f of ['cases.csv', 'summary.json'])
      expect(fs.readFileSync(path.join(tmp, 'study-bundle', f)).equals(fs.readFileSync(path.join(tmp, 'study-tsx', f)))).toBe(true);
  });

  it('fly in the bundled compute worker: same stdout and export files', async () => {
    const args = (out: string) => [
      bin,
      'fly',
      asset('lumen6-imaging.scenario.json'),
      '--rate',
      '1',
      '--creation-date',
      '2030-03-13T08:00:00Z',
      '--out',
      out,
    ];
    const a = await run(process.execPath, args(path.join(tmp, 'fly-bundle')), { SLEWSMITH_CLI: 'bundle', SLEWSMITH_CLI_DIR: dist });
    const t = await run(process.execPath, args(path.join(tmp, 'fly-tsx')), { SLEWSMITH_CLI: 'tsx' });
    expect(a.code).toBe(t.code);
    expect(a.stdout).toBe(t.stdout.replaceAll(path.join(tmp, 'fly-tsx'), path.join(tmp, 'fly-bundle')));
    const names = files(path.join(tmp, 'fly-tsx'));
    expect(names.length).toBeGreaterThan(3);
    expect(files(path.join(tmp, 'fly-bundle'))).toEqual(names);
    for (const f of names)
      expect(fs.readFileSync(path.join(tmp, 'fly-bundle', f)).equals(fs.readFileSync(path.join(tmp, 'fly-tsx', f)))).toBe(true);
  });

  it('a bad SLEWSMITH_CLI is named, exit 2', async () => {
    const r = await run(process.execPath, [bin, '--help'], { SLEWSMITH_CLI: 'fast' });
    expect(r.code).toBe(2);
    expect(r.stderr).toBe('error: SLEWSMITH_CLI must be tsx, bundle or auto (got "fast")\n');
  });
});

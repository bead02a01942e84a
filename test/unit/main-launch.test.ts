/**
 * Launching without the Electron binary: one line naming the fetch command, exit status 1, no
 * stack trace. The lookup mirrors node_modules/electron/index.js of the installed electron 45,
 * which the last tests read to make sure the assumptions still hold.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { FETCH_COMMAND, locateElectronBinary, type BinaryFs } from '../../main/electron-binary';
import { parseLaunchArgs } from '../../main/launch-args';

function fakeFs(files: Record<string, string>): BinaryFs {
  return {
    existsSync: (p) => p in files,
    readFileSync: (p) => {
      if (!(p in files)) throw new Error(`ENOENT ${p}`);
      return files[p]!;
    },
  };
}

const E = '/repo/node_modules/electron';

describe('locateElectronBinary', () => {
  it('finds dist/<path.txt> when installed', () => {
    const r = locateElectronBinary(
      E,
      fakeFs({ [`${E}/package.json`]: '{}', [`${E}/path.txt`]: 'electron', [`${E}/dist/electron`]: '' }),
      {},
    );
    expect(r).toEqual({ ok: true, path: `${E}/dist/electron` });
  });

  it('says in one line how to fetch the binary when path.txt or the executable is missing', () => {
    const cases: Record<string, string>[] = [
      { [`${E}/package.json`]: '{}' },
      { [`${E}/package.json`]: '{}', [`${E}/path.txt`]: 'electron' },
    ];
    for (const files of cases) {
      const r = locateElectronBinary(E, fakeFs(files), {});
      expect(r.ok).toBe(false);
      if (r.ok) continue;
      expect(r.message).not.toContain('\n');
      expect(r.message).toContain(FETCH_COMMAND);
      expect(r.message).toMatch(/^Slewsmith: the Electron binary is not installed/);
    }
  });

  it('asks for npm ci when the electron package itself is absent', () => {
    const r = locateElectronBinary(E, fakeFs({}), {});
    expect(r).toEqual({ ok: false, message: 'Slewsmith: the electron package is not installed; run `npm ci`, then `npm start` again.' });
  });

  it('honours ELECTRON_OVERRIDE_DIST_PATH as electron/index.js does', () => {
    const files = { [`${E}/package.json`]: '{}', '/opt/electron/electron': '' };
    expect(locateElectronBinary(E, fakeFs(files), { ELECTRON_OVERRIDE_DIST_PATH: '/opt/electron' })).toEqual({
      ok: true,
      path: '/opt/electron/electron',
    });
    const r = locateElectronBinary(E, fakeFs(files), { ELECTRON_OVERRIDE_DIST_PATH: '/nowhere' });
    expect(r.ok).toBe(false);
  });

  it('the fetch command names a script the installed electron package really ships', () => {
    const dir = path.resolve('node_modules/electron');
    const pkg = JSON.parse(fs.readFileSync(path.join(dir, 'package.json'), 'utf8')) as {
      version: string;
      bin: Record<string, string>;
      scripts?: Record<string, string>;
    };
    expect(pkg.bin['install-electron']).toBe('install.js');
    expect(fs.existsSync(path.resolve(FETCH_COMMAND.split(' ')[1]!))).toBe(true);
    // No postinstall: the binary really is fetched lazily (toolchain note, electron >= 42).
    expect(pkg.scripts?.postinstall).toBeUndefined();
    const index = fs.readFileSync(path.join(dir, 'index.js'), 'utf8');
    for (const needle of ["'path.txt'", "'dist'", 'ELECTRON_OVERRIDE_DIST_PATH']) expect(index).toContain(needle);
  });
});

describe('npm start without the binary', () => {
  it('prints one line, exits with status 1, and builds nothing', () => {
    const empty = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-noelectron-'));
    try {
      const r = spawnSync(process.execPath, ['--import', 'tsx', 'main/launch.ts'], {
        encoding: 'utf8',
        env: { ...process.env, ELECTRON_OVERRIDE_DIST_PATH: empty },
        timeout: 60_000,
      });
      expect(r.status).toBe(1);
      const lines = r.stderr.trim().split('\n');
      expect(lines).toHaveLength(1);
      expect(lines[0]).toContain(FETCH_COMMAND);
      expect(r.stderr).not.toMatch(/\bat .*:\d+:\d+/);
      expect(r.stdout).toBe('');
    } finally {
      fs.rmSync(empty, { recursive: true, force: true });
    }
  });
});

describe('parseLaunchArgs', () => {
  const cwd = '/repo';
  it('reads --demo (as a template) and a plain .json path (as a file) after the app path', () => {
    expect(parseLaunchArgs(['electron', 'dist/main/main.cjs', '--demo=assets/d.json'], false, cwd)).toEqual({
      kind: 'template',
      path: '/repo/assets/d.json',
    });
    expect(parseLaunchArgs(['electron', '.', '--demo', '/abs/d.json'], false, cwd)).toEqual({ kind: 'template', path: '/abs/d.json' });
    expect(parseLaunchArgs(['slewsmith', 'plans/x.json'], true, cwd)).toEqual({ kind: 'file', path: '/repo/plans/x.json' });
    expect(parseLaunchArgs(['electron', '.', '--demo=d.json', 'mine.json'], false, cwd)).toEqual({ kind: 'file', path: '/repo/mine.json' });
  });

  it('ignores switches, the app path itself and non-JSON arguments', () => {
    expect(parseLaunchArgs(['electron', 'dist/main/main.cjs'], false, cwd)).toBeNull();
    expect(parseLaunchArgs(['electron', 'x.json'], false, cwd)).toBeNull();
    expect(parseLaunchArgs(['slewsmith', '--no-sandbox', '--inspect=9229', 'notes.txt'], true, cwd)).toBeNull();
  });
});

/**
 * What the desktop app was asked to open on its command line.
 *
 * `electron dist/main/main.cjs [--demo=<file>] [<file>]` in development, `slewsmith [<file>]`
 * when packaged. `--demo` opens an untitled copy (so Save never overwrites the bundled demo);
 * a plain path opens that file. Chromium and Electron switches are left alone.
 */
import path from 'node:path';
import type { LaunchDocument } from './documents';

export function parseLaunchArgs(argv: readonly string[], isPackaged: boolean, cwd: string): LaunchDocument {
  // Packaged: [exe, ...args]. Development: [electron, appPath, ...args].
  const args = argv.slice(isPackaged ? 1 : 2);
  let demo: string | null = null;
  let file: string | null = null;
  for (let i = 0; i < args.length; i++) {
    const a = args[i]!;
    if (a === '--demo' && i + 1 < args.length) {
      demo = args[++i]!;
    } else if (a.startsWith('--demo=')) {
      demo = a.slice('--demo='.length);
    } else if (!a.startsWith('-') && file === null && a.toLowerCase().endsWith('.json')) {
      file = a;
    }
  }
  if (file) return { kind: 'file', path: path.resolve(cwd, file) };
  if (demo) return { kind: 'template', path: path.resolve(cwd, demo) };
  return null;
}

/**
 * Finds the Electron executable without requiring the `electron` package: its index.js starts a
 * download when the binary is missing, which cannot work offline and ends in a stack trace.
 *
 * electron 42 and later have no postinstall step; node_modules/electron/install.js fetches the
 * binary into node_modules/electron/dist and writes path.txt (the executable's path inside dist).
 * This mirrors the lookup of node_modules/electron/index.js, including ELECTRON_OVERRIDE_DIST_PATH.
 */
import path from 'node:path';

export interface BinaryFs {
  existsSync(p: string): boolean;
  readFileSync(p: string, encoding: 'utf8'): string;
}

export type BinaryLookup = { ok: true; path: string } | { ok: false; message: string };

/** The command that fetches the binary, as a user types it from the repository root. */
export const FETCH_COMMAND = 'node node_modules/electron/install.js';

function missingBinaryMessage(detail: string): string {
  return `Slewsmith: the Electron binary is not installed (${detail}); fetch it with \`${FETCH_COMMAND}\` (needs internet access), then run \`npm start\` again.`;
}

export function locateElectronBinary(electronDir: string, fs: BinaryFs, env: Record<string, string | undefined>): BinaryLookup {
  if (!fs.existsSync(path.join(electronDir, 'package.json')))
    return { ok: false, message: 'Slewsmith: the electron package is not installed; run `npm ci`, then `npm start` again.' };
  let relative: string | null = null;
  const pathFile = path.join(electronDir, 'path.txt');
  if (fs.existsSync(pathFile)) relative = fs.readFileSync(pathFile, 'utf8').trim();
  const override = env.ELECTRON_OVERRIDE_DIST_PATH;
  if (override) {
    const p = path.join(override, relative || 'electron');
    return fs.existsSync(p)
      ? { ok: true, path: p }
      : { ok: false, message: missingBinaryMessage(`ELECTRON_OVERRIDE_DIST_PATH has no ${p}`) };
  }
  if (!relative) return { ok: false, message: missingBinaryMessage('node_modules/electron/path.txt is missing') };
  const p = path.join(electronDir, 'dist', relative);
  if (!fs.existsSync(p)) return { ok: false, message: missingBinaryMessage(`${path.relative(process.cwd(), p) || p} is missing`) };
  return { ok: true, path: p };
}

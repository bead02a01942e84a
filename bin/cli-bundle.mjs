// Which program `slewsmith` runs: the prebuilt bundle (dist/cli, made by `npm run build:cli`) or
// the TypeScript sources through tsx. The rule, in order:
//   1. SLEWSMITH_CLI=tsx: the sources, always.
//   2. SLEWSMITH_CLI=bundle: the bundle, even when stale; an error when there is none.
//   3. Otherwise the bundle when its cli-manifest.json is readable and every source file it lists
//      still exists with a modification time not after the build's start; else the sources.
// SLEWSMITH_CLI_DIR names another bundle folder (default dist/cli of this repository).
// Plain JavaScript on purpose: it runs before any TypeScript loader.
import fs from 'node:fs';
import path from 'node:path';

export const MANIFEST = 'cli-manifest.json';

/**
 * @param {string} root repository root (sources are listed relative to it)
 * @param {Record<string, string | undefined>} env
 * @returns {{ kind: 'bundle', entry: string } | { kind: 'tsx', reason: string } | { kind: 'error', message: string }}
 */
export function chooseCli(root, env) {
  const mode = env.SLEWSMITH_CLI ?? '';
  if (mode !== '' && mode !== 'tsx' && mode !== 'bundle' && mode !== 'auto')
    return { kind: 'error', message: `SLEWSMITH_CLI must be tsx, bundle or auto (got "${mode}")` };
  if (mode === 'tsx') return { kind: 'tsx', reason: 'SLEWSMITH_CLI=tsx' };
  const dir = env.SLEWSMITH_CLI_DIR ? path.resolve(env.SLEWSMITH_CLI_DIR) : path.join(root, 'dist', 'cli');
  const entry = path.join(dir, 'slewsmith.mjs');
  const state = bundleState(root, dir);
  if (mode === 'bundle') {
    if (state.missing) return { kind: 'error', message: `SLEWSMITH_CLI=bundle but ${state.missing} (run npm run build:cli)` };
    return { kind: 'bundle', entry };
  }
  if (state.missing) return { kind: 'tsx', reason: state.missing };
  if (state.stale) return { kind: 'tsx', reason: state.stale };
  return { kind: 'bundle', entry };
}

/**
 * @param {string} root
 * @param {string} dir
 * @returns {{ missing?: string, stale?: string }}
 */
export function bundleState(root, dir) {
  let manifest;
  try {
    manifest = JSON.parse(fs.readFileSync(path.join(dir, MANIFEST), 'utf8'));
  } catch {
    return { missing: `no readable ${path.join(dir, MANIFEST)}` };
  }
  const builtAt = manifest?.builtAtMs;
  const sources = manifest?.sources;
  if (typeof builtAt !== 'number' || !Array.isArray(sources) || sources.length === 0)
    return { missing: `${path.join(dir, MANIFEST)} is not a bundle manifest` };
  if (!fs.existsSync(path.join(dir, 'slewsmith.mjs'))) return { missing: `no ${path.join(dir, 'slewsmith.mjs')}` };
  for (const rel of sources) {
    let st;
    try {
      st = fs.statSync(path.join(root, String(rel)));
    } catch {
      return { stale: `${rel} is gone since the bundle was built` };
    }
    if (st.mtimeMs > builtAt) return { stale: `${rel} changed after the bundle was built` };
  }
  return {};
}

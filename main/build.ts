/**
 * Programmatic builds, the same as `npm run build:renderer` and `npm run build:main`: used by the
 * desktop launcher (main/launch.ts) and by the browser tests' global setup.
 */
import path from 'node:path';
import { build, type InlineConfig } from 'vite';

export interface BuildOptions {
  /** Repository root. */
  root: string;
  logLevel?: InlineConfig['logLevel'];
}

export async function buildRenderer(o: BuildOptions): Promise<void> {
  await build({ configFile: path.join(o.root, 'vite.config.ts'), root: path.join(o.root, 'app'), logLevel: o.logLevel ?? 'warn' });
}

export async function buildElectronBundles(o: BuildOptions): Promise<void> {
  const configFile = path.join(o.root, 'main/vite.electron.config.ts');
  // Separate builds: a shared chunk would make the sandboxed preload require a second file.
  await build({ configFile, mode: 'main', logLevel: o.logLevel ?? 'warn' });
  await build({ configFile, mode: 'preload', logLevel: o.logLevel ?? 'warn' });
}

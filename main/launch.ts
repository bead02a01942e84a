/**
 * `npm start`: check for the Electron binary, build renderer + main + preload, launch the desktop
 * app with the demo scenario. Without the binary it prints one line saying how to fetch it and
 * exits with status 1 (before spending time on a build that cannot be run).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { electronConfig } from '../electron.config';
import { buildElectronBundles, buildRenderer } from './build';
import { locateElectronBinary } from './electron-binary';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

async function main(): Promise<number> {
  // What we build is what we ship: React's production build, whatever the calling shell set.
  process.env.NODE_ENV = 'production';
  const binary = locateElectronBinary(path.join(root, 'node_modules/electron'), fs, process.env);
  if (!binary.ok) {
    console.error(binary.message);
    return 1;
  }
  await buildRenderer({ root });
  await buildElectronBundles({ root });

  const args = [path.join(root, electronConfig.output.mainDir, electronConfig.output.mainFile)];
  const demo = path.join(root, electronConfig.demoScenario);
  if (fs.existsSync(demo)) args.push(`--demo=${demo}`);
  else console.error(`Slewsmith: ${electronConfig.demoScenario} not found; starting with an empty scenario.`);
  args.push(...process.argv.slice(2));

  const child = spawn(binary.path, args, { stdio: 'inherit', cwd: root });
  for (const signal of ['SIGINT', 'SIGTERM'] as const) process.on(signal, () => child.kill(signal));
  return new Promise((resolve) => {
    child.on('error', (e) => {
      console.error(`Slewsmith: could not start ${binary.path}: ${e.message}`);
      resolve(1);
    });
    child.on('close', (code, signal) => resolve(code ?? (signal ? 1 : 0)));
  });
}

main().then(
  (code) => process.exit(code),
  (e: unknown) => {
    console.error(`Slewsmith: build failed: ${e instanceof Error ? e.message : String(e)}`);
    process.exit(1);
  },
);

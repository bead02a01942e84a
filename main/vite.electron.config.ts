/**
 * Main-process and preload bundles for Electron: `vite build -c main/vite.electron.config.ts
 * --mode main|preload`. Each is one CommonJS file in dist/main with its dependencies (zod,
 * gl-matrix, our engine) bundled in and only `electron` and Node built-ins left as requires, so
 * the packaged app needs no node_modules. The preload must be a single file: sandboxed preloads
 * can require `electron` and a few built-ins, nothing else.
 */
import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vite';
import { electronConfig } from '../electron.config.ts';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

export default defineConfig(({ mode }) => {
  if (mode !== 'main' && mode !== 'preload') throw new Error(`main/vite.electron.config.ts: --mode must be main or preload (got ${mode})`);
  const o = electronConfig.output;
  const entry = path.join(root, mode === 'main' ? electronConfig.entries.main : electronConfig.entries.preload);
  const fileName = mode === 'main' ? o.mainFile : o.preloadFile;
  return {
    root,
    publicDir: false,
    // Bundle for Node (Electron 45 ships Node 22), not the browser.
    ssr: { target: 'node', noExternal: true },
    // satellite.js's root entry pulls in its WebAssembly build (top-level await), which a CommonJS
    // bundle cannot hold; the engine uses only the JavaScript SGP4 (app/satellite-core.ts).
    resolve: { alias: [{ find: /^satellite\.js$/, replacement: path.join(root, 'app/satellite-core.ts') }] },
    build: {
      ssr: entry,
      outDir: path.join(root, o.mainDir),
      // Main and preload share the folder: neither build may wipe the other's output.
      emptyOutDir: false,
      target: 'node22',
      minify: false,
      // Not shipped (as for the renderer); SLEWSMITH_SOURCEMAP=1 builds them for debugging.
      sourcemap: process.env.SLEWSMITH_SOURCEMAP === '1',
      copyPublicDir: false,
      rolldownOptions: {
        external: ['electron', ...builtinModules, ...builtinModules.map((m) => `node:${m}`)],
        output: { format: 'cjs', entryFileNames: fileName, inlineDynamicImports: true },
      },
    },
  };
});

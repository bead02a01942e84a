/**
 * The prebuilt command line: `npm run build:cli` (`vite build -c main/vite.cli.config.ts`) writes
 * dist/cli/ — the CLI (`slewsmith.mjs`, exporting `main`) and its three worker entries
 * (`study-worker.mjs`, `sweep-worker.mjs`, `compute-worker.mjs`) as plain ES modules for Node, with
 * shared code in `chunk-*.mjs` beside them, plus `cli-manifest.json` (see below).
 *
 * Optional: bin/slewsmith.mjs runs this bundle when it is there and not older than its sources
 * (bin/cli-bundle.mjs decides), and the TypeScript sources through tsx otherwise, so `npm ci`
 * alone still gives a working command. Why: tsx transpiles on every start, in the CLI and again
 * in each worker thread (1.5–2.7 s each on the 2-core machine).
 *
 * - Every file lands in one folder: the CLI finds its workers with
 *   `new URL('./study-worker.mjs', import.meta.url)`, which then names the bundled worker (the
 *   sources' `.mjs` of the same name is the tsx launcher of the `.ts` worker).
 * - Packages stay in node_modules (every bare import is external): only our TypeScript is
 *   bundled, so a dependency update needs no rebuild and the bundle runs the very same library
 *   code as the tsx path. So the bundle must sit inside the repository (Node finds the packages
 *   from the bundle's folder upwards).
 * - `cli-manifest.json` lists the project files that went in (paths relative to the repository)
 *   and when the build started; a bundle is stale once any of them is newer.
 *   `--outDir DIR` builds elsewhere (the bundle test builds into a temporary folder).
 */
import { builtinModules } from 'node:module';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, type Plugin } from 'vite';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** The bundle's entries: output name (without .mjs) → source. */
export const CLI_ENTRIES = {
  slewsmith: 'main/cli/main.ts',
  'study-worker': 'main/cli/study-worker.ts',
  'sweep-worker': 'main/cli/sweep-worker.ts',
  'compute-worker': 'main/cli/compute-worker.ts',
} as const;

export const CLI_MANIFEST = 'cli-manifest.json';

/** Writes cli-manifest.json: the build's start time and the project files it read. */
function manifestPlugin(): Plugin {
  let startedMs = 0;
  return {
    name: 'slewsmith-cli-manifest',
    buildStart() {
      // Taken before any source is read: a file saved during the build counts as newer.
      startedMs = Date.now();
    },
    generateBundle(_options, bundle) {
      const files = new Set<string>();
      for (const out of Object.values(bundle)) {
        if (out.type !== 'chunk') continue;
        for (const id of out.moduleIds) {
          const rel = path.relative(root, id.split('?')[0]!);
          if (!rel.startsWith('..') && !path.isAbsolute(rel) && !rel.includes('node_modules') && !rel.startsWith('\0'))
            files.add(rel.split(path.sep).join('/'));
        }
      }
      const manifest = { builtAtMs: startedMs, node: process.versions.node, sources: [...files].sort() };
      this.emitFile({ type: 'asset', fileName: CLI_MANIFEST, source: JSON.stringify(manifest, null, 2) + '\n' });
    },
  };
}

/** A bare import (a package), as opposed to a relative or absolute path. */
const isPackage = (id: string) => !id.startsWith('.') && !path.isAbsolute(id) && !id.startsWith('\0');

export default defineConfig({
  root,
  publicDir: false,
  ssr: { target: 'node' },
  plugins: [manifestPlugin()],
  build: {
    ssr: true,
    outDir: path.join(root, 'dist/cli'),
    emptyOutDir: true,
    target: 'node20',
    minify: false,
    sourcemap: process.env.SLEWSMITH_SOURCEMAP === '1',
    copyPublicDir: false,
    rolldownOptions: {
      input: Object.fromEntries(Object.entries(CLI_ENTRIES).map(([name, file]) => [name, path.join(root, file)])),
      external: (id) => isPackage(id) || builtinModules.includes(id) || id.startsWith('node:'),
      output: { format: 'es', entryFileNames: '[name].mjs', chunkFileNames: 'chunk-[hash].mjs' },
    },
  },
});

/**
 * Renderer build: app/index.html + React into dist/renderer, with relative asset URLs (base './')
 * so the same files load from app://, file:// or a static server. `vite preview` (npm run web)
 * serves that folder on 127.0.0.1.
 *
 * The production index gets the CSP from electron.config.ts as a <meta> tag (the dev server leaves
 * it out: React's fast refresh needs an inline script there). The Web Worker entries import
 * app/no-eval.ts first, like the page does; test/unit/renderer-bundles.test.ts checks the built
 * workers for it and that no source map is emitted. A copy of the demo scenario is
 * emitted beside the page so the browser build can open it without a file system.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import react from '@vitejs/plugin-react';
import { defineConfig, type Plugin } from 'vite';
import { contentSecurityPolicy, electronConfig } from './electron.config.ts';

const root = path.dirname(fileURLToPath(import.meta.url));
const pkg = JSON.parse(fs.readFileSync(path.join(root, 'package.json'), 'utf8')) as { version: string };

/** Puts the CSP right after the charset declaration, ahead of every script and stylesheet. */
function cspMeta(csp: string): Plugin {
  const tag = `<meta http-equiv="Content-Security-Policy" content="${csp.replace(/"/g, '&quot;')}" />`;
  return {
    name: 'slewsmith-csp-meta',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(html) {
        const charset = /<meta charset="utf-8"\s*\/?>/i;
        if (!charset.test(html)) throw new Error('app/index.html must declare <meta charset="utf-8"> first in <head>');
        return html.replace(charset, (m) => `${m}\n    ${tag}`);
      },
    },
  };
}

function demoScenario(): Plugin {
  const source = path.join(root, electronConfig.demoScenario);
  const url = electronConfig.demoScenarioUrl;
  return {
    name: 'slewsmith-demo-scenario',
    generateBundle() {
      // The browser shell treats a missing demo as "no initial scenario", so absence is not an error.
      if (fs.existsSync(source)) this.emitFile({ type: 'asset', fileName: url, source: fs.readFileSync(source) });
    },
    configureServer(server) {
      server.middlewares.use(`/${url}`, (_req, res, next) => {
        if (!fs.existsSync(source)) return next();
        res.setHeader('Content-Type', 'application/json; charset=utf-8');
        res.end(fs.readFileSync(source));
      });
    },
  };
}

/**
 * A module made at build time by one of main/'s scripts run on the bundled demo (through tsx in a
 * child process, so it runs the engine's own sources): `id` resolves to what the script prints.
 */
function demoBuildModule(id: string, script: string): Plugin {
  return {
    name: `slewsmith-${id.replace('virtual:slewsmith-', '')}`,
    resolveId: (source) => (source === id ? `\0${id}` : null),
    load(resolved) {
      if (resolved !== `\0${id}`) return null;
      const r = spawnSync(process.execPath, ['--import', 'tsx', path.join(root, script), path.join(root, electronConfig.demoScenario)], {
        cwd: root,
        encoding: 'utf8',
        maxBuffer: 1 << 24,
      });
      if (r.status !== 0) throw new Error(`${id} failed: ${r.stderr}`);
      return r.stdout;
    },
  };
}

/**
 * `virtual:slewsmith-demo-certificates`: the bundled demo's synergy-gap certificates, computed now
 * by the engine's own sources (main/demo-certificates.ts), for the pipeline worker to plant in its
 * certificate cache: its first pass then skips ~200 ms of certificate work on the demo. Any other
 * scenario misses the cache and computes its own.
 */
const demoCertificates = () => demoBuildModule('virtual:slewsmith-demo-certificates', 'main/demo-certificates.ts');

/**
 * `virtual:slewsmith-demo-validation`: the bundled demo's JSON value and its validation
 * (main/demo-validation.ts), planted by the page (main.tsx) and the pipeline worker so neither
 * validates the demo at start; any other scenario is validated as before.
 */
const demoValidation = () => demoBuildModule('virtual:slewsmith-demo-validation', 'main/demo-validation.ts');

/**
 * The app chunk (main.tsx), which app/boot.ts imports only after it has started the workers, is
 * announced in the page as a module preload (with the chunks it imports and its stylesheet), so
 * the browser fetches it alongside the small entry instead of after it.
 */
function preloadAppChunk(): Plugin {
  return {
    name: 'slewsmith-preload-app-chunk',
    apply: 'build',
    transformIndexHtml: {
      order: 'post',
      handler(html, ctx) {
        const chunks = Object.values(ctx.bundle ?? {}).filter((o) => o.type === 'chunk');
        const app = chunks.find((c) => c.facadeModuleId?.endsWith('/app/main.tsx'));
        if (!app) return html;
        const css = (app as { viteMetadata?: { importedCss: Set<string> } }).viteMetadata?.importedCss ?? new Set<string>();
        const tags = [
          ...[app.fileName, ...app.imports.filter((f) => !chunks.some((c) => c.fileName === f && c.isEntry))].map(
            (f) => `<link rel="modulepreload" crossorigin href="./${f}">`,
          ),
          ...[...css].map((f) => `<link rel="stylesheet" crossorigin href="./${f}">`),
        ];
        return html.replace('</head>', `  ${tags.join('\n    ')}\n  </head>`);
      },
    },
  };
}

export default defineConfig({
  root: path.join(root, electronConfig.entries.rendererRoot),
  base: './',
  publicDir: false,
  // demoCertificates, demoValidation: the worker bundles import them; the dev server serves workers
  // through these plugins.
  plugins: [react(), cspMeta(contentSecurityPolicy), demoScenario(), preloadAppChunk(), demoCertificates(), demoValidation()],
  worker: { plugins: () => [demoCertificates(), demoValidation()] },
  define: {
    __SLEWSMITH_VERSION__: JSON.stringify(pkg.version),
  },
  // satellite.js's root entry pulls in its WebAssembly build (top-level await), which the classic
  // workers cannot hold; the engine uses only the JavaScript SGP4 (app/satellite-core.ts).
  resolve: { alias: [{ find: /^satellite\.js$/, replacement: path.join(root, 'app/satellite-core.ts') }] },
  build: {
    outDir: path.join(root, electronConfig.output.rendererDir),
    emptyOutDir: true,
    target: 'es2022',
    // Not shipped: maps would publish the sources next to the app. SLEWSMITH_SOURCEMAP=1 builds
    // them for debugging a production bundle; no test needs them.
    sourcemap: process.env.SLEWSMITH_SOURCEMAP === '1',
    // Inlined data: URLs are allowed for images and fonts only; keep scripts and styles as files.
    assetsInlineLimit: 0,
  },
  preview: {
    host: '127.0.0.1',
    headers: { 'Content-Security-Policy': contentSecurityPolicy, 'X-Content-Type-Options': 'nosniff' },
  },
  server: { host: '127.0.0.1' },
});

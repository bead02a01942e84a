/**
 * Desktop settings in one place: read by the main process (main/) and by the builds
 * (vite.config.ts for the renderer, main/vite.electron.config.ts for main and preload).
 *
 * Paths are relative to the repository root; the main process resolves the built ones relative to
 * its own bundle (dist/main), so a packaged app needs no repository at run time.
 */

export const electronConfig = {
  /** Reverse-DNS id of our own; used for the app user model id and future packaging. */
  appId: 'org.slewsmith.desktop',
  productName: 'Slewsmith',

  window: {
    width: 1440,
    height: 900,
    minWidth: 1280,
    minHeight: 800,
    /** Painted before the renderer's first frame so the window does not flash white. */
    backgroundColor: '#11161c',
  },

  /**
   * The renderer is served from a privileged custom scheme instead of file:// (file:// pages share
   * one opaque origin with every local file; a custom scheme gives us one origin we control and a
   * place to attach the CSP header). The index is `app://slewsmith/index.html`.
   */
  protocol: { scheme: 'app', host: 'slewsmith', index: 'index.html' },

  entries: {
    main: 'main/electron-main.ts',
    preload: 'main/preload.ts',
    rendererRoot: 'app',
    rendererIndex: 'app/index.html',
  },

  output: {
    dir: 'dist',
    mainDir: 'dist/main',
    /** CommonJS: package.json "type" is module, so the extension must say cjs. */
    mainFile: 'main.cjs',
    /** Sandboxed preloads must be a single CommonJS file that requires only `electron`. */
    preloadFile: 'preload.cjs',
    rendererDir: 'dist/renderer',
    /** Relative to the main bundle's folder (dist/main). */
    rendererFromMain: '../renderer',
  },

  /** Opened as an untitled copy by `npm start` (Save then asks where to write). */
  demoScenario: 'assets/lumen6-imaging.scenario.json',
  /** Where the renderer build puts a copy of the demo for the browser build (`npm run web`). */
  demoScenarioUrl: 'scenarios/lumen6-imaging.scenario.json',

  recentFiles: { fileName: 'recent-files.json', max: 10 },

  /** Folders the app wrote to, swept for stale temporary files at the next start (main/temp-files.ts). */
  tempFiles: { foldersFileName: 'write-folders.json', maxFolders: 20 },

  limits: {
    /** A scenario file is a few kB; anything this large is not one of ours. */
    scenarioBytes: 20 * 1024 * 1024,
    /** Long runs exported as CSV can be large, but not unbounded. */
    exportBytes: 512 * 1024 * 1024,
  },
} as const;

/**
 * Content security policy, as directives. Applied three times: a `<meta>` tag injected into the
 * built index.html (so the plain-browser build has it too), the response header of the app://
 * protocol handler, and a header added to every other response of the session.
 *
 * - script-src 'self' only: no 'unsafe-eval' (so `eval`/`new Function` throw), no inline script,
 *   no remote origin. Vite's production build emits external module scripts only.
 * - style-src 'self' without 'unsafe-inline': Vite extracts CSS into files; React's `style` prop,
 *   uPlot and three.js set styles through the CSSOM (element.style.x = …), which CSP does not
 *   govern. Only `<style>` elements and markup style attributes would need 'unsafe-inline'; the
 *   smoke e2e test records every securitypolicyviolation so a library that needs it shows up.
 * - worker-src 'self': study workers are built as separate files by Vite. blob: is left out until a
 *   worker actually needs it (it would let any running script start code from a string).
 * - img-src data: blob: — canvas snapshots and small inlined images; font-src data: for fonts Vite
 *   inlines under its size limit.
 * - connect-src 'self': the browser build fetches its bundled demo scenario; nothing remote.
 * - object-src 'none', base-uri 'self', form-action 'none': close the remaining script vectors.
 *   (frame-ancestors is not honoured in a meta tag, so it is left to the header-free desktop case.)
 */
export const cspDirectives: Readonly<Record<string, readonly string[]>> = {
  'default-src': ["'self'"],
  'script-src': ["'self'"],
  'style-src': ["'self'"],
  'worker-src': ["'self'"],
  'img-src': ["'self'", 'data:', 'blob:'],
  'font-src': ["'self'", 'data:'],
  'connect-src': ["'self'"],
  'object-src': ["'none'"],
  'base-uri': ["'self'"],
  'form-action': ["'none'"],
};

export function serializeCsp(directives: Readonly<Record<string, readonly string[]>>): string {
  return Object.entries(directives)
    .map(([name, sources]) => `${name} ${sources.join(' ')}`)
    .join('; ');
}

export const contentSecurityPolicy: string = serializeCsp(cspDirectives);

export type ElectronConfig = typeof electronConfig;

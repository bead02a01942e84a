/**
 * The renderer in headless Chromium (Debian's /usr/bin/chromium, WebGL through SwiftShader),
 * against the production build served on 127.0.0.1 the way the desktop app loads it: the app's
 * protocol handler (`main/protocol.ts`) behind a small http server, files uncompressed
 * (`serveBuild.ts`). Until issue 12's third cold-start round it was `vite preview`, which gzips
 * every script on each request; on a loaded 2-core machine that delayed the scripts (a fresh
 * context has an empty cache) and so the cold-start figure, with no change in the app.
 * `SLEWSMITH_BENCH_SERVER=preview` serves through `vite preview` as before, so both figures can
 * be printed. Figures only, no assertions. Three measurements, each printed with its target:
 *
 *  1. Cold start to first plot: navigation start (performance.timeOrigin) → the five always-shown
 *     plots painted with data (coloured pixels on their canvases, checked every animation frame),
 *     in a fresh browser context each time (empty HTTP cache, new worker); median of 5 loads.
 *     Target ≤ 1.2 s (issue 12).
 *  2. Edit → updated plots on the demo (three controllers, each profiled and direct: six runs),
 *     two kinds of edit (browserEdit.ts): the vehicle's Jxx (every run changes) and one law's gain
 *     (only that law's two runs change), each timed from the input event to the first moment the
 *     error-angle plot's pixels change after the edited run's new output arrived, with the phases
 *     between. Median of 7 edits each. Target ≤ 50 ms. Two figures per kind: edit → first updated
 *     plot (the issue's figure), and edit → complete pass shown ('done' and the frame after it,
 *     when the comparison table, best marks and warnings are final).
 *  3. 3D scene update per new time with a ≥ 10,000-sample run: the demo at 30 Hz control with a
 *     60 s tail, opened through the app's Open command; per animation frame one setTime and one
 *     render() call of the view, script time by performance.now() in the page (render() is the
 *     JavaScript side plus GL command submission; SwiftShader's frame rate says nothing about a
 *     real GPU). Half playback-like steps, half random scrubbing; median and p95. Target ≤ 2 ms of
 *     script time per setTime (+ render shown separately).
 *
 * Run: `node --import tsx test/bench/browser.ts` or `npm run bench browser`.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core';
import { electronConfig } from '../../electron.config';
import { CHROMIUM_ARGS } from '../e2e/chromium-args';
import { editToPlots, type EditKind } from './browserEdit';
import { serveBuild } from './serveBuild';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const chromiumPath = process.env.SLEWSMITH_CHROMIUM ?? '/usr/bin/chromium';
const ARGS = [...CHROMIUM_ARGS];
const VIEWPORT = { width: 1440, height: 900 };
const PLOTS = ['error-angle', 'body-rate', 'wheel-momentum', 'wheel-torque', 'lyapunov'];

function median(v: number[]): number {
  const s = [...v].sort((a, b) => a - b);
  const m = s.length >> 1;
  return s.length % 2 ? s[m]! : 0.5 * (s[m - 1]! + s[m]!);
}

function quantile(v: number[], p: number): number {
  const s = [...v].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(p * s.length))]!;
}

const ms = (x: number) => `${x.toFixed(x < 10 ? 2 : 0)} ms`;

/**
 * Installed before the page's scripts (injected by the browser, so the page's CSP does not apply):
 * `__name` is a no-op for functions this file passes to page.evaluate (tsx compiles them with
 * esbuild's keepNames, which wraps named functions in a `__name` call the page does not define),
 * and a frame-by-frame probe that stamps when the run finished and when every always-shown plot
 * has data pixels.
 */
const INIT_SCRIPT = `
globalThis.__name = (f) => f;
(() => {
  const ids = ${JSON.stringify(PLOTS)};
  const marks = (window.__bench = { done: null, painted: null, firstWorker: null, firstPost: null, firstReply: null, view: { setRunsMs: 0, setRuns: 0, renderMs: 0, renders: 0 } });
  // When the app creates its first worker, first posts a run to a pipeline worker (none when the
  // worker starts the demo by itself: app/boot.ts) and when the first reply arrives.
  const NativeWorker = window.Worker;
  window.Worker = function (...args) {
    if (marks.firstWorker === null) marks.firstWorker = performance.now();
    const w = new NativeWorker(...args);
    const post = w.postMessage.bind(w);
    w.postMessage = (...m) => { if (marks.firstPost === null) marks.firstPost = performance.now(); post(...m); };
    w.addEventListener('message', () => { if (marks.firstReply === null) marks.firstReply = performance.now(); });
    return w;
  };
  // Time spent in the 3D view's setRuns and render (wrapped on the handle the app calls).
  const wrapView = () => {
    const v = window.__slewsmithView;
    if (!v || v.__benchWrapped) return;
    v.__benchWrapped = true;
    const setRuns = v.setRuns, render = v.render;
    v.setRuns = (...a) => { const t = performance.now(); setRuns(...a); marks.view.setRunsMs += performance.now() - t; marks.view.setRuns++; };
    v.render = () => { if (window.__benchSkipRender) return; const t = performance.now(); render(); marks.view.renderMs += performance.now() - t; marks.view.renders++; };
  };
  const hasData = (c) => {
    const d = c.getContext('2d').getImageData(0, 0, c.width, c.height).data;
    let n = 0;
    for (let i = 0; i < d.length; i += 4) {
      const mx = Math.max(d[i], d[i + 1], d[i + 2]), mn = Math.min(d[i], d[i + 1], d[i + 2]);
      if (d[i + 3] > 128 && mx - mn > 60 && ++n > 200) return true;
    }
    return false;
  };
  const tick = () => {
    wrapView();
    const st = document.querySelector('[data-testid=run-status]');
    if (st && st.getAttribute('data-status') === 'done') {
      if (marks.done === null) marks.done = performance.now();
      let all = true;
      for (const id of ids) {
        const c = document.querySelector('.plot-card[data-plot="' + id + '"] canvas');
        if (!c || !hasData(c)) { all = false; break; }
      }
      if (all) { marks.painted = performance.now(); return; }
    }
    requestAnimationFrame(tick);
  };
  requestAnimationFrame(tick);
})();
`;

async function newPage(browser: Browser, skip3d = false): Promise<{ context: BrowserContext; page: Page }> {
  const context = await browser.newContext({ viewport: VIEWPORT });
  await context.addInitScript({ content: INIT_SCRIPT + (skip3d ? '\nwindow.__benchSkipRender = true;' : '') });
  const page = await context.newPage();
  return { context, page };
}

async function waitForDone(page: Page): Promise<void> {
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
}

/** `skip3d`: the 3D view's render() does nothing (isolates the software-GL frames; see editToPlots). */
async function coldStart(browser: Browser, url: string, loads: number, skip3d: boolean): Promise<void> {
  const painted: number[] = [],
    done: number[] = [],
    dcl: number[] = [],
    engine: number[] = [],
    post: number[] = [],
    created: number[] = [],
    reply: number[] = [];
  for (let k = 0; k < loads; k++) {
    const { context, page } = await newPage(browser, skip3d);
    await page.goto(url, { waitUntil: 'load' });
    await page.waitForFunction(() => (window as unknown as { __bench: { painted: number | null } }).__bench.painted !== null, null, {
      timeout: 120_000,
    });
    const m = await page.evaluate(() => {
      const b = (
        window as unknown as {
          __bench: { done: number; painted: number; firstWorker: number; firstPost: number | null; firstReply: number };
        }
      ).__bench;
      const nav = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming;
      const out = (
        window as unknown as { __slewsmith: { store: { getState(): { output: { elapsedMs: number } } } } }
      ).__slewsmith.store.getState().output;
      return {
        painted: b.painted,
        done: b.done,
        dcl: nav.domContentLoadedEventEnd,
        engine: out.elapsedMs,
        post: b.firstPost,
        created: b.firstWorker,
        reply: b.firstReply,
      };
    });
    painted.push(m.painted);
    done.push(m.done);
    dcl.push(m.dcl);
    engine.push(m.engine);
    if (m.post !== null) post.push(m.post);
    created.push(m.created);
    reply.push(m.reply);
    await context.close();
  }
  console.log(
    `   ${skip3d ? 'same, 3D view render() skipped' : 'cold start → five plots with data'}: median ${ms(median(painted))} (min ${ms(Math.min(...painted))}, max ${ms(Math.max(...painted))}, ${loads} loads)${skip3d ? '' : '   [target ≤ 1200 ms]'}`,
  );
  console.log(
    `     of which (medians, from navigation start): DOMContentLoaded ${ms(median(dcl))}; first worker created ${ms(median(created))}; ` +
      `first run posted to a worker ${post.length ? ms(median(post)) : 'never (the worker started the demo itself)'}; ` +
      `its reply ${ms(median(reply))} (worker start-up + engine pipeline ${ms(median(engine))} for six runs + transfer); ` +
      `run status 'done' in the DOM ${ms(median(done))}; plots painted ${ms(median(painted))} (frame-probe resolution ≈ 17 ms)`,
  );
}

async function sceneUpdate(browser: Browser, url: string, dir: string): Promise<void> {
  const demo = JSON.parse(fs.readFileSync(path.join(root, electronConfig.demoScenario), 'utf8'));
  demo.name = 'Lumen-6 imaging pass at 30 Hz (bench copy)';
  demo.vehicle.controlRateHz = 30;
  demo.simulation.tailS = 60;
  const file = path.join(dir, 'lumen6-30hz.scenario.json');
  fs.writeFileSync(file, JSON.stringify(demo, null, 2));

  const { context, page } = await newPage(browser);
  await page.goto(url, { waitUntil: 'load' });
  await waitForDone(page);
  const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('cmd-open').click()]);
  await chooser.setFiles(file);
  await page.getByTestId('document-name').filter({ hasText: demo.name }).waitFor({ timeout: 20_000 });
  await waitForDone(page);

  const measure = (keys: string[]) =>
    page.evaluate(async (keys) => {
      type Run = { key: string; trace: { n: number; t: Float64Array } };
      const app = (
        window as unknown as {
          __slewsmith: { store: { getState(): { output: { runs: Run[] } }; selectRuns(k: string[]): void }; clock: { pause(): void } };
        }
      ).__slewsmith;
      app.clock.pause();
      app.store.selectRuns(keys);
      const raf = () => new Promise<number>((r) => requestAnimationFrame(r));
      await raf();
      await raf();
      const v = (
        window as unknown as {
          __slewsmithView: {
            setTime(t: number): void;
            render(): void;
            stats: { lastUpdateMs: number };
            model: { viewports: { runs: unknown[] }[] };
          };
        }
      ).__slewsmithView;
      const runs = app.store.getState().output.runs.filter((r) => keys.includes(r.key));
      const n = Math.min(...runs.map((r) => r.trace.n));
      const tr = runs[0]!.trace;
      const tEnd = tr.t[tr.n - 1]!;
      let seed = 12345;
      const rand = () => (seed = (Math.imul(seed, 1103515245) + 12345) >>> 0) / 4294967296;
      const set: number[] = [],
        ren: number[] = [],
        stat: number[] = [];
      const frames = 240,
        warm = 30;
      for (let k = 0; k < warm + frames; k++) {
        await raf();
        const j = k - warm;
        const t = j < frames / 2 ? (Math.max(0, j) * 0.5) % tEnd : rand() * tEnd;
        const a = performance.now();
        v.setTime(t);
        const b = performance.now();
        v.render();
        const c = performance.now();
        if (j >= 0) {
          set.push(b - a);
          ren.push(c - b);
          stat.push(v.stats.lastUpdateMs);
        }
      }
      // performance.now() is coarsened to 0.1 ms in a page that is not cross-origin isolated: a
      // batch of setTime calls gives the mean below that resolution.
      const batch = 2000;
      const b0 = performance.now();
      for (let k = 0; k < batch; k++) v.setTime(rand() * tEnd);
      const batchMeanMs = (performance.now() - b0) / batch;
      return { n, runs: runs.length, viewRuns: v.model.viewports.reduce((s, vp) => s + vp.runs.length, 0), set, ren, stat, batchMeanMs };
    }, keys);

  for (const keys of [['pd:follow-plan'], ['pd:follow-plan', 'hysteretic:follow-plan', 'synergistic:follow-plan']]) {
    const r = await measure(keys);
    const both = r.set.map((s, i) => s + r.ren[i]!);
    console.log(
      `   3D update, ${r.viewRuns} run(s) × ${r.n} samples (${keys.length > 1 ? 'overlay' : 'single'}): setTime median ${ms(median(r.set))} (p95 ${ms(quantile(r.set, 0.95))}; view's own lastUpdateMs median ${ms(median(r.stat))}; mean of 2000 back-to-back ${(r.batchMeanMs * 1000).toFixed(1)} µs); ` +
        `render() call median ${ms(median(r.ren))} (p95 ${ms(quantile(r.ren, 0.95))}); setTime + render ${ms(median(both))}   [target setTime ≤ 2 ms]`,
    );
  }
  await context.close();
}

export async function benchBrowser(): Promise<void> {
  if (!fs.existsSync(chromiumPath)) {
    console.log(`   skipped: no Chromium at ${chromiumPath} (apt-get install -y chromium, or set SLEWSMITH_CHROMIUM)`);
    return;
  }
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-bench-'));
  const outDir = path.join(dir, 'renderer');
  try {
    // A production build in a child process (NODE_ENV=production; see test/e2e/global-setup.ts),
    // into a temporary folder so a concurrent e2e run's dist/renderer is left alone.
    // SLEWSMITH_BENCH_DIST=<folder>: serve a build made before instead (before/after runs of two builds).
    const prebuilt = process.env.SLEWSMITH_BENCH_DIST;
    const t0 = performance.now();
    const built = prebuilt
      ? { status: 0, stderr: '', stdout: '' }
      : spawnSync(path.join(root, 'node_modules/.bin/vite'), ['build', '--logLevel', 'error', '--outDir', outDir, '--emptyOutDir'], {
          cwd: root,
          env: { ...process.env, NODE_ENV: 'production' },
          encoding: 'utf8',
        });
    if (built.status !== 0) throw new Error(`renderer build failed: ${built.stderr}${built.stdout}`);
    if (prebuilt) console.log(`   serving the build in ${prebuilt}`);
    else console.log(`   renderer built in ${ms(performance.now() - t0)} (vite build, production)`);
    const server = await serveBuild(root, prebuilt ? path.resolve(prebuilt) : outDir);
    const url = server.url;
    console.log(
      `   served by ${server.kind === 'app' ? "the app's protocol handler over http (uncompressed; SLEWSMITH_BENCH_SERVER=preview for vite preview)" : 'vite preview (gzip per request)'}`,
    );
    const browser = await chromium.launch({ executablePath: chromiumPath, args: ARGS, headless: true });
    try {
      // SLEWSMITH_BENCH_ONLY=edit: only the edit figures; =cold: only the cold start (SLEWSMITH_BENCH_LOADS
      // loads, default 5), for before/after runs on a shared machine.
      const only = process.env.SLEWSMITH_BENCH_ONLY;
      const loads = Number(process.env.SLEWSMITH_BENCH_LOADS) || 5;
      if (!only || only === 'cold') await coldStart(browser, url, loads, false);
      if (!only) await coldStart(browser, url, 3, true);
      if (only === 'cold') return;
      // SLEWSMITH_BENCH_EDITS=n: more edits than 7 for steadier medians on a shared machine. Two kinds
      // of edit: the vehicle's Jxx (every run changes) and one law's gain (only that law's runs).
      const open = () => newPage(browser);
      const edits = Number(process.env.SLEWSMITH_BENCH_EDITS ?? 7);
      // SLEWSMITH_BENCH_EDIT_KINDS=gain (or vehicle): one kind only.
      const kinds = (process.env.SLEWSMITH_BENCH_EDIT_KINDS ?? 'vehicle,gain').split(',') as EditKind[];
      for (const kind of kinds) await editToPlots(open, url, edits, false, kind);
      if (!only) await editToPlots(open, url, 5, true, 'vehicle');
      if (!only) await sceneUpdate(browser, url, dir);
    } finally {
      await browser.close();
      await server.close();
    }
  } finally {
    fs.rmSync(dir, { recursive: true, force: true });
  }
}

// Direct run: node --import tsx test/bench/browser.ts
if (process.argv[1] && pathToFileURL(process.argv[1]).href === import.meta.url) await benchBrowser();

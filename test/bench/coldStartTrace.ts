/**
 * Where the cold start's milliseconds go, thread by thread: one load of the renderer in headless
 * Chromium under a Chromium trace (playwright-core's browser.startTracing, the DevTools timeline
 * categories), summarised as the page's main thread and the pipeline worker's thread side by side:
 * script fetches, script evaluation (compile + run), tasks, frames and the user-timing marks, each
 * as start and duration in ms from navigation start. A diagnostic, not a bench figure:
 * `node --import tsx test/bench/coldStartTrace.ts [traceFile]`; `SLEWSMITH_BENCH_DIST=<folder>`
 * serves a build made before (otherwise a production build into a temporary folder, like
 * browser.ts); `TRACE_MIN_MS` (default 4) hides shorter events.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { preview } from 'vite';
import { electronConfig } from '../../electron.config';
import { CHROMIUM_ARGS } from '../e2e/chromium-args';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const chromiumPath = process.env.SLEWSMITH_CHROMIUM ?? '/usr/bin/chromium';
const MIN_MS = Number(process.env.TRACE_MIN_MS ?? 4);

interface TraceEvent {
  name: string;
  cat: string;
  ph: string;
  ts: number;
  dur?: number;
  pid: number;
  tid: number;
  args?: { name?: string; data?: { url?: string; functionName?: string; frame?: string; documentLoaderURL?: string } };
}

/** Event names worth a line (the DevTools timeline's own names). */
const SHOWN = new Set([
  'EvaluateScript',
  'v8.compile',
  'v8.compileModule',
  'v8.evaluateModule',
  'v8.produceModuleCache',
  'FunctionCall',
  'TimerFire',
  'FireAnimationFrame',
  'EventDispatch',
  'ParseHTML',
  'Layout',
  'UpdateLayoutTree',
  'Paint',
  'RunMicrotasks',
  'MajorGC',
  'MinorGC',
  'V8.GC_MARK_COMPACTOR',
  'HandlePostMessage',
  'v8.run',
  'ScheduleStyleRecalculation',
  'Commit',
  'CompositeLayers',
]);

function summarise(events: TraceEvent[], pageUrl: string): void {
  const threads = new Map<string, string>();
  for (const e of events) if (e.ph === 'M' && e.name === 'thread_name') threads.set(`${e.pid}:${e.tid}`, e.args?.name ?? '?');
  const nav = events.find(
    (e) => e.name === 'navigationStart' && e.cat.includes('blink.user_timing') && e.args?.data?.documentLoaderURL?.startsWith(pageUrl),
  );
  if (!nav) throw new Error('no navigationStart in the trace');
  const t0 = nav.ts;
  const at = (us: number) => ((us - t0) / 1000).toFixed(1).padStart(7);
  const rendererPid = nav.pid;
  const lines: { ts: number; text: string }[] = [];
  for (const e of events) {
    if (e.pid !== rendererPid) continue;
    const thread = threads.get(`${e.pid}:${e.tid}`) ?? String(e.tid);
    const short = thread.startsWith('CrRendererMain') ? 'main  ' : thread.includes('Worker') ? 'worker' : null;
    if (!short) continue;
    const url = e.args?.data?.url ? ` ${e.args.data.url.split('/').pop()}` : '';
    if (e.ph === 'R' || e.ph === 'I' || e.ph === 'n' || (e.ph === 'b' && e.cat.includes('user_timing'))) {
      if (e.cat.includes('blink.user_timing')) lines.push({ ts: e.ts, text: `${short} mark ${e.name}` });
      continue;
    }
    if (e.ph !== 'X' || !SHOWN.has(e.name)) continue;
    const ms = (e.dur ?? 0) / 1000;
    if (ms < MIN_MS) continue;
    lines.push({ ts: e.ts, text: `${short} ${e.name}${url} ${ms.toFixed(1)} ms` });
  }
  for (const e of events) {
    if (e.name === 'ResourceSendRequest' || e.name === 'ResourceFinish') {
      const url = e.args?.data?.url;
      if (url?.startsWith(pageUrl)) lines.push({ ts: e.ts, text: `net    ${e.name} ${url.split('/').pop()}` });
    }
  }
  lines.sort((a, b) => a.ts - b.ts);
  for (const l of lines) console.log(`${at(l.ts)} ms  ${l.text}`);
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-trace-'));
const prebuilt = process.env.SLEWSMITH_BENCH_DIST;
const outDir = prebuilt ? path.resolve(prebuilt) : path.join(dir, 'renderer');
try {
  if (!prebuilt) {
    const built = spawnSync(
      path.join(root, 'node_modules/.bin/vite'),
      ['build', '--logLevel', 'error', '--outDir', outDir, '--emptyOutDir'],
      {
        cwd: root,
        env: { ...process.env, NODE_ENV: 'production' },
        encoding: 'utf8',
      },
    );
    if (built.status !== 0) throw new Error(`renderer build failed: ${built.stderr}`);
  }
  const server = await preview({
    configFile: path.join(root, 'vite.config.ts'),
    root: path.join(root, electronConfig.entries.rendererRoot),
    logLevel: 'error',
    build: { outDir },
    preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('no preview URL');
  const browser = await chromium.launch({ executablePath: chromiumPath, args: [...CHROMIUM_ARGS], headless: true });
  try {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    const page = await context.newPage();
    await browser.startTracing(page, {
      categories: [
        'devtools.timeline',
        'disabled-by-default-devtools.timeline',
        'v8',
        'v8.execute',
        'blink.user_timing',
        'loading',
        '__metadata',
      ],
    });
    await page.goto(url, { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
    await page.waitForTimeout(800);
    const buf = await browser.stopTracing();
    if (process.argv[2]) fs.writeFileSync(process.argv[2], buf);
    const trace = JSON.parse(buf.toString('utf8')) as { traceEvents: TraceEvent[] };
    summarise(trace.traceEvents, url);
    await context.close();
  } finally {
    await browser.close();
    await server.close();
  }
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}

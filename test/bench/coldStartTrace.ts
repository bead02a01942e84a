/**
 * Where the cold start's milliseconds go, thread by thread: one load of the renderer in headless
 * Chromium under a Chromium trace (playwright-core's browser.startTracing, the DevTools timeline
 * categories), summarised as the page's main thread and the pipeline worker's thread side by side:
 * script fetches, script evaluation (compile + run), tasks, frames and the user-timing marks, each
 * as start and duration in ms from navigation start. A diagnostic, not a bench figure:
 * `node --import tsx test/bench/coldStartTrace.ts [traceFile]`; `SLEWSMITH_BENCH_DIST=<folder>`
 * serves a build made before (otherwise a production build into a temporary folder, like
 * browser.ts); served like browser.ts (`serveBuild.ts`: the app's protocol handler, or `vite
 * preview` with `SLEWSMITH_BENCH_SERVER=preview`); `TRACE_MIN_MS` (default 4) hides shorter events.
 *
 * CPU time (`TRACE_LOADS=n`, default 1: n loads, each in a fresh context): each thread's CPU time
 * (the trace's thread durations, `tdur`, of its top-level tasks) from navigation start to the
 * moment the run status reads 'done' (a user-timing mark the probe below sets), with the largest
 * kinds of work inside it, then the median and minimum over the loads. Unlike wall-clock figures,
 * these hardly move with the load of a shared machine, so old and new builds compare in them
 * (the trace's own overhead is in both). The worker's CPU is also given before its first timer:
 * its start and the demo's pass, without the validator's warm-up. The timeline is printed when there is one load only.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium } from 'playwright-core';
import { CHROMIUM_ARGS } from '../e2e/chromium-args';
import { serveBuild } from './serveBuild';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
const chromiumPath = process.env.SLEWSMITH_CHROMIUM ?? '/usr/bin/chromium';
const MIN_MS = Number(process.env.TRACE_MIN_MS ?? 4);

interface TraceEvent {
  name: string;
  cat: string;
  ph: string;
  ts: number;
  dur?: number;
  /** Thread (CPU) duration, µs. */
  tdur?: number;
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

/** Marks 'slewsmith-done' when the run status first reads 'done' (installed before the page's scripts). */
const DONE_PROBE = `
new MutationObserver((_, obs) => {
  if (document.querySelector('[data-testid=run-status][data-status=done]')) {
    performance.mark('slewsmith-done');
    obs.disconnect();
  }
}).observe(document, { subtree: true, childList: true, attributes: true, attributeFilter: ['data-status'] });
`;

/** Kinds of work whose CPU time is listed (nested inside the top-level tasks). */
const CPU_KINDS: Record<string, string> = {
  'v8.compile': 'compile',
  'v8.compileModule': 'compile',
  'v8.evaluateModule': 'evaluate',
  EvaluateScript: 'evaluate',
  FunctionCall: 'script',
  HandlePostMessage: 'message',
  TimerFire: 'script',
  FireAnimationFrame: 'frame',
  RunMicrotasks: 'script',
  Layout: 'layout',
  UpdateLayoutTree: 'style',
  Paint: 'paint',
  MinorGC: 'gc',
  MajorGC: 'gc',
};

interface CpuFigures {
  main: number;
  worker: number;
  /**
   * The worker's CPU before its first timer fires: its start and the demo's pass, without the
   * validator's warm-up (pipeline.worker.ts, 0.5 s after the pass), which often falls before 'done'
   * and, since the validator loads lazily, holds the schemas' construction that used to be at start.
   */
  workerPass: number;
  kinds: Map<string, number>;
  doneMs: number;
  /** When the pipeline worker's thread first ran a task (its script arrived and the page let it start). */
  workerStartMs: number;
  /**
   * From the browser process having the worker's script (DedicatedWorkerHost::DidStartScriptLoad)
   * to the worker thread's first task: the wait for the page's main thread to take that message.
   */
  workerHopMs: number;
}

/** CPU ms per thread from navigation start to the 'slewsmith-done' mark, and by kind on the main thread. */
function cpuToDone(events: TraceEvent[], pageUrl: string): CpuFigures {
  const threads = new Map<string, string>();
  for (const e of events) if (e.ph === 'M' && e.name === 'thread_name') threads.set(`${e.pid}:${e.tid}`, e.args?.name ?? '?');
  const nav = events.find(
    (e) => e.name === 'navigationStart' && e.cat.includes('blink.user_timing') && e.args?.data?.documentLoaderURL?.startsWith(pageUrl),
  );
  if (!nav) throw new Error('no navigationStart in the trace');
  const done = events.find((e) => e.name === 'slewsmith-done' && e.pid === nav.pid);
  if (!done) throw new Error('no slewsmith-done mark in the trace');
  const figures: CpuFigures = {
    main: 0,
    worker: 0,
    workerPass: 0,
    kinds: new Map(),
    doneMs: (done.ts - nav.ts) / 1000,
    workerStartMs: NaN,
    workerHopMs: NaN,
  };
  // Per thread, only outermost events of a kind count (a FunctionCall inside a FunctionCall once).
  const lastEnd = new Map<string, number>();
  const isWorkerEvent = (e: TraceEvent) => e.pid === nav.pid && (threads.get(`${e.pid}:${e.tid}`) ?? '').startsWith('DedicatedWorker');
  const firstTimer = Math.min(...events.filter((e) => e.name === 'TimerFire' && e.ts >= nav.ts && isWorkerEvent(e)).map((e) => e.ts));
  for (const e of [...events].sort((a, b) => a.ts - b.ts)) {
    if (e.pid !== nav.pid || e.ph !== 'X' || e.ts < nav.ts || e.ts > done.ts) continue;
    const thread = threads.get(`${e.pid}:${e.tid}`) ?? '';
    const isMain = thread.startsWith('CrRendererMain');
    const isWorker = thread.startsWith('DedicatedWorker');
    const cpu = (e.tdur ?? 0) / 1000;
    if (e.name === 'RunTask' && isMain) figures.main += cpu;
    if (e.name === 'RunTask' && isWorker) {
      figures.worker += cpu;
      if (e.ts < firstTimer) figures.workerPass += cpu;
      if (Number.isNaN(figures.workerStartMs)) figures.workerStartMs = (e.ts - nav.ts) / 1000;
    }
    const kind = CPU_KINDS[e.name];
    if (!kind || !isMain) continue;
    const key = `${e.tid}:${kind}`;
    if (e.ts < (lastEnd.get(key) ?? -Infinity)) continue;
    lastEnd.set(key, e.ts + (e.dur ?? 0));
    figures.kinds.set(kind, (figures.kinds.get(kind) ?? 0) + cpu);
  }
  const loaded = events.find((e) => e.name === 'DedicatedWorkerHost::DidStartScriptLoad' && e.ts >= nav.ts);
  figures.workerHopMs = loaded ? figures.workerStartMs - (loaded.ts - nav.ts) / 1000 : NaN;
  return figures;
}

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
  const server = await serveBuild(root, outDir);
  const url = server.url;
  console.log(
    `served by ${server.kind === 'app' ? "the app's protocol handler (SLEWSMITH_BENCH_SERVER=preview: vite preview)" : 'vite preview'}`,
  );
  const browser = await chromium.launch({ executablePath: chromiumPath, args: [...CHROMIUM_ARGS], headless: true });
  try {
    const loads = Number(process.env.TRACE_LOADS) || 1;
    const all: CpuFigures[] = [];
    for (let k = 0; k < loads; k++) {
      const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
      await context.addInitScript({ content: DONE_PROBE });
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
      const trace = JSON.parse(buf.toString('utf8')) as { traceEvents: TraceEvent[] };
      if (k === 0 && process.argv[2]) fs.writeFileSync(process.argv[2], buf);
      if (loads === 1) summarise(trace.traceEvents, url);
      const f = cpuToDone(trace.traceEvents, url);
      all.push(f);
      const kinds = [...f.kinds]
        .sort((a, b) => b[1] - a[1])
        .map(([n, v]) => `${n} ${v.toFixed(0)}`)
        .join(', ');
      console.log(
        `load ${k + 1}: CPU to 'done' (${f.doneMs.toFixed(0)} ms wall, traced): main ${f.main.toFixed(0)} ms (${kinds}), worker ${f.worker.toFixed(0)} ms (before its first timer ${f.workerPass.toFixed(0)} ms); worker thread started at ${f.workerStartMs.toFixed(0)} ms, ${f.workerHopMs.toFixed(0)} ms after its script arrived`,
      );
      await context.close();
    }
    const med = (v: number[]) => {
      const s2 = [...v].sort((a, b) => a - b);
      const m = s2.length >> 1;
      return s2.length % 2 ? s2[m]! : 0.5 * (s2[m - 1]! + s2[m]!);
    };
    const fig = (v: number[]) => `median ${med(v).toFixed(0)} ms, min ${Math.min(...v).toFixed(0)} ms`;
    console.log(
      `CPU to 'done' over ${loads} load(s): main thread ${fig(all.map((f) => f.main))}; worker ${fig(all.map((f) => f.worker))}, before its first timer ${fig(all.map((f) => f.workerPass))}; ` +
        `wall (traced) ${fig(all.map((f) => f.doneMs))}; worker thread started at ${fig(all.map((f) => f.workerStartMs))}, after its script arrived ${fig(all.map((f) => f.workerHopMs))}`,
    );
  } finally {
    await browser.close();
    await server.close();
  }
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}

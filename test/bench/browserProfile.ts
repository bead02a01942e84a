/**
 * Where the main thread's milliseconds go on one edit of the bundled demo: a CDP CPU profile
 * (Profiler domain, through playwright-core) of the renderer between the Jxx edit and the
 * updated error-angle plot, summarised as self time per function (top 40) and per source file.
 * A diagnostic, not a bench figure: `node --import tsx test/bench/browserProfile.ts [outDir]`
 * (builds with source maps off into a temporary folder, like browser.ts). `PROFILE_EDIT=gain`: the
 * hysteretic law's bandwidth instead of Jxx, with pd and hysteretic ticked (browserEdit.ts's gain
 * edit); `PROFILE_DIST=folder`: serve a build made before (A/B of two builds, `--minify false`
 * for names); `PROFILE_EDITS=n` edits profiled (default 4).
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

interface Node {
  id: number;
  callFrame: { functionName: string; url: string; lineNumber: number };
  children?: number[];
}
interface Profile {
  nodes: Node[];
  samples: number[];
  timeDeltas: number[];
}

function summarise(p: Profile, label: string): void {
  const byId = new Map(p.nodes.map((n) => [n.id, n]));
  const self = new Map<number, number>();
  p.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (p.timeDeltas[i] ?? 0) / 1000));
  const fn = new Map<string, number>();
  const file = new Map<string, number>();
  let total = 0;
  for (const [id, ms] of self) {
    const n = byId.get(id)!;
    const f = n.callFrame;
    const base = f.url ? f.url.split('/').pop()! : '(native)';
    const key = `${f.functionName || '(anon)'} ${base}:${f.lineNumber + 1}`;
    fn.set(key, (fn.get(key) ?? 0) + ms);
    file.set(base, (file.get(base) ?? 0) + ms);
    total += ms;
  }
  console.log(`\n== ${label}: ${total.toFixed(0)} ms sampled`);
  for (const [k, v] of [...file].sort((a, b) => b[1] - a[1]).slice(0, 12)) console.log(`  file ${v.toFixed(1).padStart(7)} ms  ${k}`);
  for (const [k, v] of [...fn].sort((a, b) => b[1] - a[1]).slice(0, 40)) console.log(`  ${v.toFixed(1).padStart(7)} ms  ${k}`);
  // Inclusive time: every distinct function on a sample's stack gets the sample once.
  const parent = new Map<number, number>();
  for (const n of p.nodes) for (const c of n.children ?? []) parent.set(c, n.id);
  const incl = new Map<string, number>();
  p.samples.forEach((id, i) => {
    const seen = new Set<string>();
    for (let cur: number | undefined = id; cur !== undefined; cur = parent.get(cur)) {
      const f = byId.get(cur)!.callFrame;
      if (!f.url) continue;
      const key = `${f.functionName || '(anon)'} ${f.url.split('/').pop()}:${f.lineNumber + 1}`;
      if (seen.has(key)) continue;
      seen.add(key);
      incl.set(key, (incl.get(key) ?? 0) + (p.timeDeltas[i] ?? 0) / 1000);
    }
  });
  console.log('  -- inclusive');
  for (const [k, v] of [...incl].sort((a, b) => b[1] - a[1]).slice(0, 60)) console.log(`  ${v.toFixed(1).padStart(7)} ms  ${k}`);
}

const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'slewsmith-prof-'));
const outDir = path.join(dir, 'renderer');
try {
  const prebuilt = process.env.PROFILE_DIST;
  const built = prebuilt
    ? { status: 0, stderr: '' }
    : spawnSync(
        path.join(root, 'node_modules/.bin/vite'),
        [
          'build',
          '--logLevel',
          'error',
          '--outDir',
          outDir,
          '--emptyOutDir',
          ...(process.env.PROFILE_MINIFY === '0' ? ['--minify', 'false'] : []),
        ],
        {
          cwd: root,
          env: { ...process.env, NODE_ENV: 'production' },
          encoding: 'utf8',
        },
      );
  if (built.status !== 0) throw new Error(`renderer build failed: ${built.stderr}`);
  const server = await preview({
    configFile: path.join(root, 'vite.config.ts'),
    root: path.join(root, electronConfig.entries.rendererRoot),
    logLevel: 'error',
    build: { outDir: prebuilt ? path.resolve(prebuilt) : outDir },
    preview: { host: '127.0.0.1', port: 0, strictPort: true, open: false },
  });
  const url = server.resolvedUrls?.local[0];
  if (!url) throw new Error('no preview URL');
  const browser = await chromium.launch({ executablePath: chromiumPath, args: [...CHROMIUM_ARGS], headless: true });
  try {
    const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
    await context.addInitScript({ content: 'globalThis.__name = (f) => f;' });
    const page = await context.newPage();
    const cdp = await context.newCDPSession(page);
    await cdp.send('Profiler.enable');
    await cdp.send('Profiler.setSamplingInterval', { interval: 200 });
    await cdp.send('Profiler.start');
    await page.goto(url, { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
    await page.waitForTimeout(1500);
    const cold = (await cdp.send('Profiler.stop')).profile as unknown as Profile;
    summarise(cold, 'cold start (navigation → done + 1.5 s)');
    const gain = process.env.PROFILE_EDIT === 'gain';
    const field = gain
      ? page.getByTestId('controller-hysteretic').getByLabel('Bandwidth ωn', { exact: true })
      : page.getByLabel('Jxx', { exact: true });
    const values = gain ? ['0.22', '0.18'] : ['0.13', '0.11'];
    if (gain)
      await page.evaluate(() =>
        (window as unknown as { __slewsmith: { store: { selectRuns(k: string[]): void } } }).__slewsmith.store.selectRuns([
          'pd:follow-plan',
          'hysteretic:follow-plan',
        ]),
      );
    const edits = Number(process.env.PROFILE_EDITS) || 4;
    for (let k = 0; k < 4; k++) {
      await field.fill(values[k % 2]!);
      await page.locator('[data-testid=run-status][data-status=done]').waitFor();
      await page.waitForTimeout(400);
    }
    await cdp.send('Profiler.start');
    for (let k = 0; k < edits; k++) {
      await field.fill(values[k % 2]!);
      await page.waitForTimeout(30);
      await page.locator('[data-testid=run-status][data-status=done]').waitFor();
      await page.waitForTimeout(400);
    }
    const edit = (await cdp.send('Profiler.stop')).profile as unknown as Profile;
    summarise(edit, `${edits} edits of ${gain ? 'the hysteretic bandwidth' : 'Jxx'} (main thread, each to done + 0.4 s)`);
    if (process.argv[2]) fs.writeFileSync(path.join(process.argv[2], 'edit.cpuprofile'), JSON.stringify(edit));
    await context.close();
  } finally {
    await browser.close();
    await server.close();
  }
} finally {
  fs.rmSync(dir, { recursive: true, force: true });
}

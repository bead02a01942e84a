/**
 * The app's export of a long run in the export worker (real Chromium, browser fallback bridge):
 * the bundled Lumen-6 example flown for 20,000 s with one controller in one mode (200,001 samples at
 * 10 Hz, over the display-trace limit), exported as CSV at 1 Hz. While the worker flies the run
 * again, the progress strip shows, the page's frames keep coming (largest gap between animation
 * frames measured, bound 250 ms; common practice, no source: a frozen window would show one gap
 * of seconds) and a 3D view checkbox still toggles. The file holds one row per second of the run.
 * A second export is cancelled: no download, a notice, the computed run untouched.
 * (The bytes are compared with the UI-thread export in test/unit/ui-export-worker.test.ts.)
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, screenshot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const example = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/lumen6-imaging.scenario.json'), 'utf8')) as {
  simulation: Record<string, unknown>;
  controllers: unknown[];
};
example.simulation.durationS = 20_000;
example.simulation.mode = 'follow-plan';
example.controllers = example.controllers.slice(0, 1);

interface RunInfo {
  key: string;
  traceKind: string | null;
  fullSamples: number | null;
}

async function shownRun(page: Page): Promise<RunInfo | null> {
  return page.evaluate(() => {
    const s = (
      window as unknown as {
        __slewsmith: {
          store: {
            getState(): {
              output: { runs: { key: string; traceKind?: string; display?: { fullSamples: number } }[] } | null;
            };
          };
        };
      }
    ).__slewsmith.store.getState();
    const r = s.output?.runs[0];
    return r ? { key: r.key, traceKind: r.traceKind ?? null, fullSamples: r.display?.fullSamples ?? null } : null;
  });
}

/** Largest gap (ms) between animation frames over `ms`, measured in the page. */
function frameGaps(page: Page, ms: number): Promise<{ frames: number; maxGapMs: number }> {
  return page.evaluate(
    (span) =>
      new Promise<{ frames: number; maxGapMs: number }>((done) => {
        const t0 = performance.now();
        let last = t0,
          maxGapMs = 0,
          frames = 0;
        const tick = (now: number) => {
          maxGapMs = Math.max(maxGapMs, now - last);
          last = now;
          frames++;
          if (now - t0 < span) requestAnimationFrame(tick);
          else done({ frames, maxGapMs });
        };
        requestAnimationFrame(tick);
      }),
    ms,
  );
}

async function startExport(page: Page): Promise<void> {
  await page.getByTestId('cmd-export').click();
  const dialog = page.getByTestId('export-dialog');
  await dialog.waitFor();
  await dialog.getByTestId('format-csv').check();
  await dialog.getByTestId('export-rate').fill('1');
  await dialog.getByTestId('export-go').click();
}

describe.skipIf(skipBrowser)('export of a long run in the export worker (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;
  let run: RunInfo | null;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.evaluate((json) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(json, 'lumen6-long.scenario.json', true);
    }, example);
    await page.waitForFunction(
      () =>
        (
          window as unknown as {
            __slewsmith: { store: { getState(): { output: { runs: { display?: { fullSamples: number } }[] } | null } } };
          }
        ).__slewsmith.store.getState().output?.runs[0]?.display?.fullSamples === 200_001,
      undefined,
      { timeout: 120_000, polling: 250 },
    );
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
    run = await shownRun(page);
  }, 180_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('the run kept a display trace (the export must fly it again)', () => {
    expect(run).toEqual({ key: 'pd:follow-plan', traceKind: 'display', fullSamples: 200_001 });
  });

  it('exports with progress while the window keeps painting and reacting; one row per second in the file', async () => {
    let downloaded = false;
    const download = page.waitForEvent('download', { timeout: 120_000 }).then((d) => {
      downloaded = true;
      return d;
    });
    await startExport(page);
    const strip = page.getByTestId('export-progress');
    await strip.waitFor({ timeout: 5_000 });
    expect(await page.getByTestId('export-dialog').isVisible()).toBe(false);
    await expect.poll(() => strip.textContent(), { timeout: 10_000, interval: 50 }).toMatch(/flying the run again at full rate, \d+ %/);
    const gaps = await frameGaps(page, 1_000);
    // The page still reacts: a 3D view switch toggles while the worker flies.
    const trail = page.getByRole('checkbox', { name: 'trail' });
    const before = await trail.isChecked();
    await trail.click();
    expect(await trail.isChecked()).toBe(!before);
    // On a fast machine the export may already be done by now; otherwise its strip is still up.
    await expect.poll(async () => downloaded || (await strip.isVisible()), { timeout: 10_000, interval: 50 }).toBe(true);
    await screenshot(page, 'export-worker-progress');
    console.info(`export worker: ${gaps.frames} frames in 1 s while exporting, largest gap ${gaps.maxGapMs.toFixed(0)} ms`);
    expect(gaps.maxGapMs).toBeLessThan(250);
    expect(gaps.frames).toBeGreaterThan(10);
    const d: Download = await download;
    expect(d.suggestedFilename()).toBe('lumen-6-imaging-pass-pd-follow-plan.csv');
    const rows = fs
      .readFileSync((await d.path())!, 'utf8')
      .split('\n')
      .filter((l) => /^\d/.test(l));
    // 20,000 s at 1 Hz: t = 0 … 20,000 s.
    expect(rows.length).toBe(20_001);
    await strip.waitFor({ state: 'hidden' });
    await trail.click();
  }, 150_000);

  it('Cancel stops the export: no file, a notice, the run still shown', async () => {
    let downloads = 0;
    page.on('download', () => downloads++);
    await startExport(page);
    const strip = page.getByTestId('export-progress');
    await strip.waitFor({ timeout: 5_000 });
    await page.getByTestId('export-cancel').click();
    await strip.waitFor({ state: 'hidden', timeout: 5_000 });
    await expect.poll(() => page.getByTestId('notice').textContent(), { timeout: 5_000 }).toBe('Export cancelled');
    await page.waitForTimeout(1_000);
    expect(downloads).toBe(0);
    expect(await shownRun(page)).toEqual(run);
    expect(w.errors).toEqual([]);
  }, 60_000);
});

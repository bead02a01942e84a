/**
 * Issue 12, "edit → updated plots": the pipeline worker posts a pass's first run before the rest.
 * In real Chromium, with the worker's final replies held back for a moment (a wrapper around
 * Worker installed before the page's scripts, so the partial state can be looked at), an edit
 * updates the error-angle plot while the comparison table, best marks, warnings and export still
 * say they wait for the remaining runs ("1 of 6 runs"); when the whole pass arrives the table is
 * complete (six runs, best marks back) and the notes are gone. Screenshots in test-output/screens/.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const screensDir = path.join(repoRoot, 'test-output/screens');
const HOLD_MS = 3000;

/** Delays the worker's 'result' replies by window.__holdResultsMs (0: none); other replies pass at once. */
const HOLD_SCRIPT = `
(() => {
  const Native = window.Worker;
  window.Worker = function (...args) {
    const w = new Native(...args);
    let handler = null;
    Object.defineProperty(w, 'onmessage', { get: () => handler, set: (fn) => { handler = fn; } });
    w.addEventListener('message', (ev) => {
      if (!handler) return;
      const hold = window.__holdResultsMs || 0;
      if (hold > 0 && ev.data && ev.data.type === 'result') setTimeout(() => handler(ev), hold);
      else handler(ev);
    });
    return w;
  };
})();
`;

async function shot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screensDir, { recursive: true });
  await page.screenshot({ path: path.join(screensDir, `${name}.png`) });
}

/** A hash of the error-angle plot's pixels. */
function plotSum(page: Page): Promise<number> {
  return page.evaluate(() => {
    const c = document.querySelector<HTMLCanvasElement>('.plot-card[data-plot="error-angle"] canvas');
    if (!c) return -1;
    const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
    let h = 0;
    for (let i = 0; i < d.length; i += 4) h = (Math.imul(h, 31) + d[i]! + 7 * d[i + 1]! + 13 * d[i + 2]!) | 0;
    return h;
  });
}

const runColumns = (page: Page) =>
  page.locator('[data-testid=comparison] th[data-run]').evaluateAll((ths) => ths.map((t) => (t as HTMLElement).dataset.run ?? ''));

describe.skipIf(skipBrowser)('partial pass: plots first, table when complete (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.addInitScript({ content: HOLD_SCRIPT });
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('an edit updates the plot with the first run; the comparison waits, then ends up complete', async () => {
    const before = await runColumns(page);
    expect(before).toHaveLength(6);
    expect(await page.locator('[data-testid=comparison] [data-best=true]').count()).toBeGreaterThan(0);
    const sum0 = await plotSum(page);

    await page.evaluate((ms) => ((window as unknown as { __holdResultsMs: number }).__holdResultsMs = ms), HOLD_MS);
    await page.getByLabel('Jxx', { exact: true }).fill('0.13');

    // Mid-pass: the first run has arrived, the whole pass is held back.
    const note = page.getByTestId('partial-note-comparison');
    await note.waitFor({ timeout: 30_000 });
    expect(await note.textContent()).toContain('1 of 6 runs');
    await expect.poll(() => plotSum(page), { timeout: HOLD_MS / 2 }).not.toBe(sum0);
    expect(await note.isVisible()).toBe(true); // the plot changed before the pass completed
    expect(await page.getByTestId('run-status').getAttribute('data-status')).toBe('running');
    expect(await page.getByTestId('run-status').textContent()).toContain('1 of 6 runs');
    // The demo has no engine warnings: the status line is the only "n of m" there (no warnings count shown).
    expect(await page.getByTestId('run-warnings').count()).toBe(0);
    // The table keeps the previous complete comparison, marked stale, without best marks.
    expect(await runColumns(page)).toEqual(before);
    expect(await page.getByTestId('comparison').getAttribute('class')).toContain('stale');
    expect(await page.locator('[data-testid=comparison] [data-best=true]').count()).toBe(0);
    await shot(page, 'partial-pass-mid-1280');
    await page.setViewportSize({ width: 1600, height: 1000 });
    await shot(page, 'partial-pass-mid-1600');
    await page.setViewportSize({ width: 1280, height: 800 });

    // Export waits for the whole pass too.
    await page.getByTestId('cmd-export').click();
    const dialog = page.getByTestId('export-dialog');
    await dialog.waitFor();
    expect(await dialog.getByTestId('partial-note-export').isVisible()).toBe(true);
    expect(await dialog.getByTestId('export-go').isDisabled()).toBe(true);
    await page.keyboard.press('Escape');

    // The whole pass: six runs, best marks back, no notes, current.
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.evaluate(() => ((window as unknown as { __holdResultsMs: number }).__holdResultsMs = 0));
    expect(await runColumns(page)).toEqual(before);
    expect(await page.locator('[data-testid=comparison] [data-best=true]').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('comparison').getAttribute('class')).not.toContain('stale');
    expect(await page.locator('.partial-note').count()).toBe(0);
    await shot(page, 'partial-pass-done-1280');
    await page.setViewportSize({ width: 1600, height: 1000 });
    await shot(page, 'partial-pass-done-1600');
    expect(w.errors).toEqual([]);
  });
});

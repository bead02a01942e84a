/**
 * The study view in real Chromium (browser fallback bridge), one engineer's session in order:
 * - the Study button swaps the centre for the study view; the demo has no study block, so the
 *   default one is offered; adding it and editing the case count are document edits (undo/redo,
 *   dirty marker, in the store's scenario);
 * - 24 cases run on Web Workers: the progress reaches 100 %, every histogram draws one bar set
 *   per controller whose counts add up to the 24 cases, the shares table has a row per controller,
 *   the outcome map has a point per case and they are visible in pixels (recolouring the map
 *   changes pixels);
 * - the cases CSV downloads with one row per case × controller, byte-identical for 1 and 2
 *   workers; the summary JSON parses and says 24 cases;
 * - a worst case opens as a normal run (untitled, that controller alone compared, plots drawn);
 * - on the Tern-12 example (near-reversal block, five laws, 200 cases) Cancel mid-way keeps the
 *   finished cases: the results and the CSV cover exactly those.
 * Screenshots: test-output/screens/study-running.png and study-results.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const screensDir = path.join(repoRoot, 'test-output/screens');

async function shot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screensDir, { recursive: true });
  const file = path.join(screensDir, `${name}.png`);
  await page.screenshot({ path: file });
  return file;
}

async function waitForRun(page: Page): Promise<void> {
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
}

const phase = (page: Page) => page.getByTestId('study-phase').getAttribute('data-phase');
const scenarioStudy = (page: Page) =>
  page.evaluate(
    () =>
      (window as unknown as { __slewsmith: { store: { getState(): { scenario: { study?: unknown } } } } }).__slewsmith.store.getState()
        .scenario.study,
  );

async function download(page: Page, testId: string): Promise<{ d: Download; text: string }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  return { d, text: fs.readFileSync((await d.path())!, 'utf8') };
}

function csvData(text: string): { head: string[]; rows: string[][] } {
  const lines = text.split('\n').filter((l) => l !== '' && !l.startsWith('#'));
  return { head: lines[0]!.split(','), rows: lines.slice(1).map((l) => l.split(',')) };
}

/** Per histogram: data-totals (runs drawn per controller) and the sum of the bar counts per controller. */
async function histograms(page: Page) {
  return page
    .getByTestId('study-histograms')
    .locator('figure')
    .evaluateAll((figs) =>
      figs.map((f) => {
        const sums: Record<string, number> = {};
        for (const r of Array.from(f.querySelectorAll('rect.bar'))) {
          const c = r.getAttribute('data-controller') ?? '?';
          sums[c] = (sums[c] ?? 0) + Number(r.getAttribute('data-count'));
        }
        return {
          id: f.getAttribute('data-testid'),
          totals: f.getAttribute('data-totals'),
          bars: f.querySelectorAll('rect.bar').length,
          sums,
        };
      }),
    );
}

/** The map canvas as RGBA bytes (the renderer keeps its drawing buffer for this). */
async function mapPixels(page: Page): Promise<number[]> {
  return page.evaluate(() => {
    const src = document.querySelector<HTMLCanvasElement>('[data-testid=study-map-canvas]')!;
    const c = document.createElement('canvas');
    c.width = src.width;
    c.height = src.height;
    const ctx = c.getContext('2d')!;
    ctx.drawImage(src, 0, 0);
    return Array.from(ctx.getImageData(0, 0, c.width, c.height).data);
  });
}

describe.skipIf(skipBrowser)('study view (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;
  let csvAuto = '';

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await waitForRun(page);
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('opens from the top bar and offers the default study block, added and edited as undoable document edits', async () => {
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('study-workspace').waitFor();
    expect(await page.getByTestId('view3d').count()).toBe(0);
    expect(await page.getByTestId('cmd-study').getAttribute('aria-pressed')).toBe('true');
    await page.getByTestId('study-no-block').waitFor();
    expect(await page.getByTestId('study-run').isDisabled()).toBe(true);
    await page.getByTestId('study-add-default').click();
    await page.getByTestId('study-setup').waitFor();
    expect(await scenarioStudy(page)).toEqual({ runs: 100, seed: 20300314, dispersions: { initialAttitude: { mode: 'uniform' } } });
    expect(await page.getByTestId('dirty-marker').count()).toBe(1);
    await page.getByTestId('cmd-undo').click();
    await page.getByTestId('study-no-block').waitFor();
    expect(await scenarioStudy(page)).toBeUndefined();
    await page.getByTestId('cmd-redo').click();
    await page.getByTestId('study-setup').waitFor();
    await page.locator('input[data-path="study.runs"]').fill('24');
    await expect.poll(() => scenarioStudy(page)).toMatchObject({ runs: 24 });
    // A bad value is named beside its field by the engine's validator and blocks the run.
    await page.locator('input[data-path="study.dispersions.sensors.adversarialEta"]').fill('1.5');
    await page.locator('.issue.error[data-path="study.dispersions.sensors.adversarialEta"]').waitFor();
    expect(await page.getByTestId('study-run').isDisabled()).toBe(true);
    expect(await page.getByTestId('study-blockers').locator('[data-path="study.dispersions.sensors.adversarialEta"]').count()).toBe(1);
    await page.locator('input[data-path="study.dispersions.sensors.adversarialEta"]').fill('');
    await expect
      .poll(() => scenarioStudy(page))
      .toEqual({ runs: 24, seed: 20300314, dispersions: { initialAttitude: { mode: 'uniform' } } });
    expect(await page.getByTestId('study-run').isDisabled()).toBe(false);
  });

  it('runs 24 cases on Web Workers to 100 % with histograms, shares and the map drawn', async () => {
    await page.getByTestId('study-run').click();
    await expect.poll(() => phase(page), { timeout: 120_000 }).toBe('done');
    const bar = page.getByTestId('study-progress');
    expect(await bar.getAttribute('aria-valuenow')).toBe('100');
    expect(await bar.getAttribute('data-done')).toBe('24');
    expect(await page.getByTestId('study-progress-text').textContent()).toMatch(/^24 \/ 24 cases × 3 controllers · \d+ runs not settled/);

    // The demo's three controllers, one row each in the shares table.
    expect(await page.getByTestId('study-shares').locator('tbody tr').count()).toBe(3);
    for (const id of ['pd', 'hysteretic', 'synergistic'])
      expect(await page.getByTestId(`share-unsettled-${id}`).textContent()).toMatch(/%$/);

    const hs = await histograms(page);
    expect(hs.map((h) => h.id)).toEqual([
      'hist-settleTimeS',
      'hist-rotationTravelledDeg',
      'hist-jumps',
      'hist-chatterPerS',
      'hist-peakWheelMomentumFraction',
      'hist-peakWheelTorqueFraction',
      'hist-finalErrorDeg',
    ]);
    for (const h of hs) {
      expect(h.totals, h.id!).toBe('24,24,24');
      expect(h.sums, h.id!).toEqual({ 0: 24, 1: 24, 2: 24 });
      expect(h.bars, h.id!).toBeGreaterThanOrEqual(3);
    }

    const map = page.getByTestId('study-map');
    expect(await map.getAttribute('data-points')).toBe('24');
    await expect.poll(() => map.getAttribute('data-drawn')).toBe('24');
    const before = await mapPixels(page);
    let lit = 0;
    for (let i = 0; i < before.length; i += 4) if (Math.max(before[i]!, before[i + 1]!, before[i + 2]!) > 60) lit++;
    expect(lit).toBeGreaterThan(2000); // sphere lines, axes and points on the dark background
    // Recolouring by outcome changes exactly the points: enough pixels for 24 of them.
    await page.getByTestId('map-colour').selectOption('outcome');
    await page.waitForTimeout(200);
    const after = await mapPixels(page);
    let changed = 0;
    for (let i = 0; i < after.length; i += 4)
      if (Math.abs(after[i]! - before[i]!) + Math.abs(after[i + 1]! - before[i + 1]!) + Math.abs(after[i + 2]! - before[i + 2]!) > 60)
        changed++;
    expect(changed).toBeGreaterThan(24 * 20);
    await page.getByTestId('map-colour').selectOption('settle');
    // Results widened (setup hidden): map and worst cases, then the histograms.
    await page.getByTestId('study-setup-toggle').click();
    await page.waitForTimeout(300);
    await shot(page, 'study-results');
    await page.getByTestId('study-histograms').scrollIntoViewIfNeeded();
    await shot(page, 'study-histograms');
    await page.getByTestId('study-setup-toggle').click();
    await page.getByTestId('study-setup').waitFor();
    expect(await page.getByTestId('study-worst').locator('button', { hasText: 'open' }).count()).toBe(15);
  });

  it('downloads the cases CSV (one row per case × controller, the same for 1 and 2 workers) and the summary JSON', async () => {
    const auto = await page.getByTestId('study-workers').locator('option[value=auto]').textContent();
    expect(auto).toMatch(/^auto \([1-4]\)$/);
    const first = await download(page, 'study-export-csv');
    expect(first.d.suggestedFilename()).toBe('lumen-6-imaging-pass-study-cases.csv');
    csvAuto = first.text;
    const { head, rows } = csvData(csvAuto);
    expect(head.slice(0, 3)).toEqual(['case', 'controller', 'outcome']);
    expect(rows.length).toBe(24 * 3);
    expect(new Set(rows.map((r) => `${r[0]}:${r[1]}`)).size).toBe(72);
    expect(csvAuto.startsWith('# CAUTION:')).toBe(true);

    const json = await download(page, 'study-export-json');
    expect(json.d.suggestedFilename()).toBe('lumen-6-imaging-pass-study-summary.json');
    const summary = JSON.parse(json.text);
    expect(summary.format).toBe('slewsmith-study-summary');
    expect(summary.summary.casesDone).toBe(24);
    expect(summary.map.length).toBe(24);

    // The other worker count: the same bytes.
    const other = auto === 'auto (1)' ? '2' : '1';
    await page.getByTestId('study-workers').selectOption(other);
    await page.getByTestId('study-run').click();
    await expect.poll(() => phase(page), { timeout: 120_000 }).toBe('done');
    expect(await page.getByTestId('study-progress-text').textContent()).toContain(`${other} worker`);
    const again = await download(page, 'study-export-csv');
    expect(again.text).toBe(csvAuto);
  });

  it('opens a worst case as a normal run: untitled, that controller alone compared, plots drawn', async () => {
    const button = page.getByTestId('study-worst').locator('[data-controller=hysteretic] button', { hasText: 'open' }).first();
    const testId = (await button.getAttribute('data-testid'))!;
    const index = Number(/-(\d+)$/.exec(testId)![1]);
    // The edited demo is unsaved: the browser bridge asks before replacing it.
    page.once('dialog', (d) => void d.accept());
    await button.click();
    await page.getByTestId('view3d').waitFor();
    expect(await page.getByTestId('study-workspace').count()).toBe(0);
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain(`study case ${index}`);
    await waitForRun(page);
    const runs = await page
      .locator('[data-testid=comparison] th[data-run]')
      .evaluateAll((ths) => ths.map((t) => (t as HTMLElement).dataset.run));
    expect(runs).toEqual(['hysteretic:step-target']);
    expect(await page.getByTestId('compare-pd').isChecked()).toBe(false);
    expect(await page.getByTestId('compare-hysteretic').isChecked()).toBe(true);
    expect(await page.getByTestId('dirty-marker').count()).toBe(0);
    // The error-angle plot draws the case's run (coloured pixels on its canvas).
    await page.getByTestId('plot-error-angle').locator('canvas').first().waitFor();
    await page.waitForTimeout(300);
    const painted = await page
      .getByTestId('plot-error-angle')
      .locator('canvas')
      .first()
      .evaluate((c: HTMLCanvasElement) => {
        const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
        let n = 0;
        for (let i = 0; i < d.length; i += 4)
          if (d[i + 3]! > 128 && Math.max(d[i]!, d[i + 1]!, d[i + 2]!) - Math.min(d[i]!, d[i + 1]!, d[i + 2]!) > 60) n++;
        return n;
      });
    expect(painted).toBeGreaterThan(200);
    // Back in the study view the results are still there, marked as for another scenario.
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('study-stale').waitFor();
    expect(await page.getByTestId('study-progress').getAttribute('data-done')).toBe('24');
    await page.getByTestId('study-close').click();
  });

  it('cancels a Tern-12 study mid-way and keeps the finished cases', async () => {
    const file = path.join(repoRoot, 'assets/tern12-reversal.scenario.json');
    const expected = JSON.parse(fs.readFileSync(file, 'utf8')) as { name: string; study: { runs: number; controllers: string[] } };
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('cmd-open').click()]);
    await chooser.setFiles(file);
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain(expected.name);
    await waitForRun(page);
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('study-setup').waitFor();
    expect(await page.locator('input[data-path="study.runs"]').inputValue()).toBe(String(expected.study.runs));
    await page.getByTestId('study-workers').selectOption('auto');
    await page.getByTestId('study-run').click();
    const bar = page.getByTestId('study-progress');
    await expect
      .poll(async () => Number(await bar.getAttribute('data-done')), { timeout: 120_000, interval: 100 })
      .toBeGreaterThanOrEqual(16);
    expect(await phase(page)).toBe('running');
    await page.waitForTimeout(300); // let the live results catch up for the picture
    await shot(page, 'study-running');
    await page.getByTestId('study-cancel').click();
    await expect.poll(() => phase(page), { timeout: 30_000 }).toBe('cancelled');
    const done = Number(await bar.getAttribute('data-done'));
    expect(done).toBeGreaterThanOrEqual(16);
    expect(done).toBeLessThan(expected.study.runs);
    expect(await page.getByTestId('study-results').textContent()).toContain(`${done} of ${expected.study.runs} cases`);
    expect(await page.getByTestId('study-map').getAttribute('data-points')).toBe(String(done));
    const hs = await histograms(page);
    for (const h of hs) for (const t of h.totals!.split(',')) expect(Number(t), h.id!).toBeLessThanOrEqual(done);
    expect(hs[0]!.totals!.split(',').length).toBe(expected.study.controllers.length);
    const csv = await download(page, 'study-export-csv');
    const { rows } = csvData(csv.text);
    expect(rows.length).toBe(done * expected.study.controllers.length);
    expect(csv.text).toContain(`# stopped early: ${done} of ${expected.study.runs} cases finished`);
    const indices = [...new Set(rows.map((r) => Number(r[0])))];
    expect(indices.length).toBe(done);
    expect(indices).toEqual([...indices].sort((a, b) => a - b));
    expect(w.errors).toEqual([]);
    expect(await w.cspViolations()).toEqual([]);
  });
});

/**
 * Campaigns in the app, real Chromium (browser fallback bridge):
 * - a study of 200,000 cases on the demo's three controllers (600,000 runs, above the desktop
 *   limit of 200,000 runs) shows the campaign hint; "Save as campaign…" downloads one bash
 *   script whose job array has 40 tasks (about 5,000 cases each) and which embeds the scenario;
 * - "Open results…" with a merged campaign's summary.json (made here by the engine: 30 cases of
 *   the Tern-12 example, two laws) shows the file's results: the shares with their 95 %
 *   intervals, the outcome map (one point per case, visible in pixels), the histograms and the
 *   worst cases; a worst case opens as a normal run of that case.
 * Screenshots (1280×800): test-output/screens/study-campaign-hint.png, study-campaign-open.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { runStudy, summaryJson } from '../../app/engine/study';

const screensDir = path.join(repoRoot, 'test-output/screens');
const workDir = path.join(repoRoot, 'test-output/e2e/campaign');

async function shot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screensDir, { recursive: true });
  await page.screenshot({ path: path.join(screensDir, `${name}.png`) });
}

const phase = (page: Page) => page.getByTestId('study-phase').getAttribute('data-phase');

describe.skipIf(skipBrowser)('campaigns in the study view (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('a study too large for the desktop is offered as a campaign and saved as one script', async () => {
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('study-workspace').waitFor();
    await page.getByTestId('study-add-default').click();
    await page.getByTestId('study-setup').waitFor();
    await page.locator('input[data-path="study.runs"]').fill('200000');
    await page.getByTestId('study-campaign-hint').waitFor();
    expect(await page.getByTestId('study-campaign-hint').textContent()).toContain('600,000 runs');
    await shot(page, 'study-campaign-hint');
    const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId('study-save-campaign').click()]);
    expect(d.suggestedFilename()).toBe('lumen-6-imaging-pass-campaign.sh');
    const text = fs.readFileSync((await d.path())!, 'utf8');
    expect(text).toContain('#SBATCH --array=0-39');
    expect(text).toContain('--shard "${SLURM_ARRAY_TASK_ID}/40"');
    expect(text).toMatch(/"runs": 200000,\n\s+"seed": 20300314/);
  });

  it('opens a merged campaign summary: shares with intervals, map, histograms, worst cases that open as runs', async () => {
    const tern = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/tern12-reversal.scenario.json'), 'utf8')) as unknown;
    const r = runStudy(tern, { runs: 30, seed: 5150, controllers: ['pd', 'hyst'] });
    if (!r.ok) throw new Error('study refused');
    fs.mkdirSync(workDir, { recursive: true });
    const file = path.join(workDir, 'summary.json');
    fs.writeFileSync(file, summaryJson(r.value.info, r.value.summary, r.value.map));

    await page.getByTestId('study-open-results').setInputFiles(file);
    await page.getByTestId('study-loaded-from').waitFor();
    expect(await phase(page)).toBe('done');
    expect(await page.getByTestId('study-loaded-from').textContent()).toContain('summary.json');
    const rows = await page
      .getByTestId('study-shares')
      .locator('tbody tr')
      .evaluateAll((trs) => trs.map((t) => t.getAttribute('data-controller')));
    expect(rows).toEqual(['pd', 'hyst']);
    for (const id of ['pd', 'hyst']) {
      const cell = page.getByTestId(`share-unwound-${id}`);
      const c = r.value.summary.controllers.find((x) => x.controllerId === id)!;
      // The interval is shown: "≤10 %" (rule of three, 3/30) at zero events, else the Wilson range.
      expect(await cell.textContent()).toMatch(c.unwound === 0 ? /^0\.0 % · ≤10 %$/ : /^\d+(\.\d)? % · \d/);
      expect(await cell.getAttribute('title')).toContain('95 % Wilson score interval');
    }
    expect(await page.getByTestId('study-histograms').locator('figure').count()).toBeGreaterThan(0);
    // The map shows the file's 30 points: some pixels differ from the empty background.
    const painted = await page.evaluate(() => {
      const src = document.querySelector<HTMLCanvasElement>('[data-testid=study-map-canvas]')!;
      const c = document.createElement('canvas');
      c.width = src.width;
      c.height = src.height;
      const ctx = c.getContext('2d')!;
      ctx.drawImage(src, 0, 0);
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      const seen = new Set<string>();
      for (let i = 0; i < d.length; i += 4 * 7) seen.add(`${d[i]},${d[i + 1]},${d[i + 2]}`);
      return seen.size;
    });
    expect(painted).toBeGreaterThan(3);
    await shot(page, 'study-campaign-open');
    // The cases table stays in the campaign's cases.csv: no export of an empty one.
    expect(await page.getByTestId('study-export-csv').isDisabled()).toBe(true);

    const button = page.getByTestId('study-worst').locator('[data-controller=hyst] button', { hasText: 'open' }).first();
    const index = Number(/-(\d+)$/.exec((await button.getAttribute('data-testid'))!)![1]);
    expect(r.value.summary.controllers[1]!.worst.map((x) => x.index)).toContain(index);
    page.once('dialog', (dlg) => void dlg.accept());
    await button.click();
    await page.getByTestId('view3d').waitFor();
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain(`case ${index}`);
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    expect(await page.getByTestId('compare-hyst').isChecked()).toBe(true);
    expect(await page.getByTestId('compare-pd').isChecked()).toBe(false);
    expect(w.errors).toEqual([]);
  });
});

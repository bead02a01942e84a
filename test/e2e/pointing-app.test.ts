/**
 * Pointing-only mode in the main window (real Chromium, browser fallback bridge, 1280×800): the
 * bundled Petrel-16 example loaded into the store runs; its targets show the "pointing only (roll
 * free)" choice checked and the plan's roll-free saving; the controllers panel offers the two
 * pointing laws from the registry, edits the warp azimuths as a list, and shows the live S²
 * certificate with δ* rounded down; the comparison has both runs. Screenshot to test-output/screens.
 * (Reference for the numbers: the engine's own output, checked against closed forms in
 * test/reference/sphere-example.test.ts; this test checks the wiring.)
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const screensDir = path.join(repoRoot, 'test-output/screens');
const example = fs.readFileSync(path.join(repoRoot, 'assets/petrel16-pointing.scenario.json'), 'utf8');

describe.skipIf(skipBrowser)('pointing-only mode in the app (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.evaluate((text) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(JSON.parse(text), 'petrel16-pointing.scenario.json', true);
    }, example);
    await page.getByTestId('plan-summary').filter({ hasText: 'Imager on the survey field' }).waitFor({ timeout: 60_000 });
    await page.locator('[data-testid=comparison] th[data-run="synergistic:step-target"]').waitFor({ timeout: 120_000 });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('targets and plan: pointing only checked, the saving of the roll-free slew shown in both', async () => {
    expect(await page.getByTestId('roll-free-0').isChecked()).toBe(true);
    expect(await page.getByTestId('roll-free-1').isChecked()).toBe(true);
    expect(await page.getByTestId('roll-free-saving-1').textContent()).toMatch(/^Pointing only: 102\.80° .*saves/);
    expect(await page.getByTestId('plan-roll-free-1').textContent()).toMatch(/^Pointing only: 102\.80° .*saves/);
  });

  it('controllers: both pointing laws offered, azimuths as a list, the S² certificate live and rounded down', async () => {
    const laws = await page.getByTestId('controller-synergistic').locator('select').first().locator('option').allTextContents();
    expect(laws).toContain('Pointing synergistic (roll free, hybrid)');
    expect(laws.some((l) => /^Pointing PD/.test(l))).toBe(true);
    expect(await page.getByTestId('list-warpAzimuthsDeg').locator('input').count()).toBe(3);
    const badge = await page.getByTestId('certificate-synergistic').textContent();
    expect(badge).toMatch(/admissible/);
    expect(badge).toMatch(/S² δ\* ≥ 0\.8249/);
  });

  it('comparison: the smooth law does not settle, the synergistic one does; no console errors', async () => {
    const cols = await page
      .locator('[data-testid=comparison] th[data-run]')
      .evaluateAll((ths) => ths.map((t) => (t as HTMLElement).dataset.run ?? ''));
    expect(cols.sort()).toEqual(['smooth:step-target', 'synergistic:step-target']);
    const table = (await page.getByTestId('comparison').textContent()) ?? '';
    expect(table).toMatch(/not settled/);
    expect(table).toMatch(/settled in/);
    fs.mkdirSync(screensDir, { recursive: true });
    await page.getByTestId('controller-synergistic').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'pointing-1280x800.png') });
    expect(w.errors).toEqual([]);
  });

  it('study setup: near-antipode starts and the worst-case pointing noise of the example, edited at their fields', async () => {
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('study-setup').waitFor();
    const mode = page.getByTestId('study-setup').locator('select').filter({ hasText: 'pointed axis near its antipode' });
    expect(await mode.inputValue()).toBe('near-antipode');
    expect(await page.locator('input[data-path="study.dispersions.initialAttitude.withinDeg"]').inputValue()).toBe('1');
    const noise = page.locator('input[data-path="study.dispersions.sensors.antipodalNoiseDeg"]');
    expect(await noise.inputValue()).toBe('2');
    // Above the schema's 90° bound: named at the field by the engine's validator, and the run is blocked.
    await noise.fill('120');
    await page.locator('.issue.error[data-path="study.dispersions.sensors.antipodalNoiseDeg"]').waitFor();
    expect(await page.getByTestId('study-run').isDisabled()).toBe(true);
    await noise.fill('2');
    await expect.poll(() => page.getByTestId('study-run').isDisabled()).toBe(false);
    expect(w.errors).toEqual([]);
  });
});

/**
 * Orbit scenarios in the main window (real Chromium, browser fallback bridge, 1280×800): the
 * bundled orbit-day example loaded into the store shows the Orbit panel with its TLE and sites,
 * the target cards of tracking targets, the passes-and-windows view with the ground track; a TLE
 * edited to a bad checksum shows the engine's message at the field, naming the line and column.
 * Text rules (≥ 13 px, contrast ≥ 4.5:1, textRules.ts) on the orbit panel and the passes view.
 * Screenshots to test-output/screens/orbit-passes-1280x800.png and orbit-1280x800.png.
 * (The pass times are the engine's, checked in its own tests; this test checks the wiring.)
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { TEXT_RULES_SCRIPT, type TextViolation } from './textRules';

const screensDir = path.join(repoRoot, 'test-output/screens');
const example = fs.readFileSync(path.join(repoRoot, 'assets/lumen6-orbit-day.scenario.json'), 'utf8');
const tle = (JSON.parse(example) as { orbit: { tle: string[] } }).orbit.tle;

describe.skipIf(skipBrowser)('orbit scenarios in the app (Chromium)', () => {
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
      s.store.load(JSON.parse(text), 'lumen6-orbit-day.scenario.json', true);
    }, example);
    await page.getByTestId('passes-table').filter({ hasText: 'Aldermoor' }).waitFor({ timeout: 240_000 });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 240_000 });
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('orbit panel: the TLE as pasted, the horizon and the three sites', async () => {
    expect(await page.getByTestId('orbit-tle').inputValue()).toBe(tle.join('\n'));
    expect(await page.getByTestId('orbit-panel').locator('[data-path="orbit.horizonS"]').inputValue()).toBe('7200');
    for (let i = 0; i < 3; i++) expect(await page.getByTestId(`orbit-site-${i}`).count()).toBe(1);
    expect(await page.getByTestId('orbit-site-0').locator('[data-path="orbit.sites[0].latitudeDeg"]').inputValue()).toBe('44');
  });

  it('tracking targets show what they track instead of an attitude form', async () => {
    const text = (await page.locator('[data-testid^=track-]').allTextContents()).join('\n');
    expect(text).toMatch(/Ground station.*Harrowgate station \(invented\) \(harrowgate\)/s);
    expect(text).toMatch(/held to its end/);
  });

  it('passes, eclipses, windows and window errors are listed; text rules hold there', async () => {
    const passes = page.getByTestId('passes-table').locator('tbody tr');
    expect(await passes.count()).toBeGreaterThanOrEqual(3);
    const first = await passes.first().locator('td').allTextContents();
    expect(first[1]).toMatch(/^(\d\d-\d\d )?\d\d:\d\d:\d\d$/);
    expect(Number(first[3])).toBeGreaterThan(0);
    expect(await page.getByTestId('windows-table').locator('tbody tr').count()).toBe(JSON.parse(example).targets.length);
    expect(await page.getByTestId('window-errors-table').locator('tbody tr').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('ground-track').locator('canvas').count()).toBe(1);
    const v = (await page.evaluate(TEXT_RULES_SCRIPT)) as TextViolation[];
    const ours = v.filter((x) => /passes|orbit|track|ground/.test(x.where));
    expect(ours.map((x) => `${x.rule} ${x.value} < ${x.needed} at ${x.where}: "${x.text}"`)).toEqual([]);
    fs.mkdirSync(screensDir, { recursive: true });
    await page.getByTestId('passes-view').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'orbit-passes-1280x800.png') });
  });

  it('a TLE with a bad checksum shows the message at the field, naming line and column', async () => {
    const bad = [tle[0], tle[1], tle[2]!.slice(0, 68) + String((Number(tle[2]!.slice(68)) + 1) % 10)].join('\n');
    await page.getByTestId('orbit-tle').fill(bad);
    const msg = page.getByTestId('orbit-tle-issues').locator('.issue.error[data-rule=checksum]');
    await msg.waitFor({ timeout: 10_000 });
    expect(await msg.textContent()).toMatch(/line 2, column 69: checksum must be \d/i);
    expect(await page.getByTestId('orbit-tle').getAttribute('aria-invalid')).toBe('true');
    fs.mkdirSync(screensDir, { recursive: true });
    await page.getByTestId('orbit-tle-issues').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'orbit-1280x800.png') });
    expect(w.errors).toEqual([]);
  });
});

/**
 * Orbit scenarios in the main window (real Chromium, browser fallback bridge, 1280×800): the
 * bundled orbit-day example loaded into the store shows the Orbit panel with its TLE and sites,
 * the target cards of tracking targets with their kind, station and window fields, a target switched
 * to a ground site with a pass window (the plan follows the pass; undo restores it), the sky view,
 * the passes-and-windows view with the ground track; a TLE
 * edited to a bad checksum shows the engine's message at the field, naming the line and column.
 * Text rules (≥ 13 px, contrast ≥ 4.5:1, textRules.ts) on the orbit panel and the passes view.
 * Screenshots to test-output/screens/orbit-passes-1280x800.png, orbit-1280x800.png,
 * orbit-target-site-1280x800.png and orbit-sky-1280x800.png / -1600x1000.png.
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

  it('tracking targets show their kind, station and window in editable fields', async () => {
    const card = page.getByTestId('target-4');
    await card.locator('summary .target-label').click();
    expect(await card.getByLabel('Target', { exact: true }).inputValue()).toBe('station');
    expect(await card.getByLabel('Station', { exact: true }).inputValue()).toBe('harrowgate');
    expect(await card.getByLabel('Due', { exact: true }).inputValue()).toBe('pass-to-end');
    expect(await card.locator('[data-path="targets[4].track.station.bodyAxis[0]"]').inputValue()).toBe('1');
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

  it('a target switched to a ground site with a pass window: the plan follows the pass; undo restores it; the sky view draws', async () => {
    type Out = { plan: { segments: { trackStartS?: number }[] }; orbit: { sites: { id: string; passes: { startS: number }[] }[] } };
    const state = () =>
      page.evaluate(() => {
        const st = (
          window as unknown as { __slewsmith: { store: { getState(): { output: unknown; scenario: unknown; outputScenario: unknown } } } }
        ).__slewsmith.store.getState();
        return { output: st.output as unknown, current: st.outputScenario === st.scenario };
      });
    const waitFresh = async () => {
      await page.waitForFunction(
        () => {
          const st = (
            window as unknown as { __slewsmith: { store: { getState(): { scenario: unknown; outputScenario: unknown } } } }
          ).__slewsmith.store.getState();
          return st.outputScenario === st.scenario;
        },
        undefined,
        { timeout: 240_000 },
      );
      await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 240_000 });
    };
    const before = (await state()).output as Out;
    const start0 = before.plan.segments[0]!.trackStartS;
    const card = page.getByTestId('target-0');
    await card.locator('summary .target-label').click();
    const kind = card.getByLabel('Target', { exact: true });
    expect(await kind.inputValue()).toBe('sun');
    await kind.selectOption('site');
    await card.getByLabel('Site', { exact: true }).selectOption('harrowgate');
    await card.getByLabel('Due', { exact: true }).selectOption('pass');
    expect(await card.getByTestId('track-editor-0').locator('.issue.error').count()).toBe(0);
    await waitFresh();
    const after = (await state()).output as Out;
    const passes = after.orbit.sites.find((x) => x.id === 'harrowgate')!.passes.map((p) => p.startS);
    // the slew now ends at the start of a Harrowgate pass (the engine's pass times, checked in its own tests)
    expect(passes.some((p) => Math.abs(p - after.plan.segments[0]!.trackStartS!) < 1e-6)).toBe(true);
    expect(after.plan.segments[0]!.trackStartS).not.toBe(start0);
    fs.mkdirSync(screensDir, { recursive: true });
    await card.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'orbit-target-site-1280x800.png') });
    // three undo steps (kind, site, window) bring the Sun target back, and its plan
    for (let k = 0; k < 3; k++) await page.getByRole('button', { name: 'Undo' }).click();
    expect(await kind.inputValue()).toBe('sun');
    await waitFresh();
    expect(((await state()).output as Out).plan.segments[0]!.trackStartS).toBe(start0);
    // the sky view: a chart with the boresight trail of the shown run
    const sky = page.getByTestId('sky-view');
    await sky.scrollIntoViewIfNeeded();
    expect(Number(await sky.getAttribute('data-points'))).toBeGreaterThan(10);
    const inked = await sky.locator('canvas').evaluate((c: HTMLCanvasElement) => {
      const g = c.getContext('2d')!;
      const d = g.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      // trail blue #0b5cad (within a little anti-aliasing)
      for (let i = 0; i < d.length; i += 4)
        if (Math.abs(d[i]! - 11) < 30 && Math.abs(d[i + 1]! - 92) < 30 && Math.abs(d[i + 2]! - 173) < 30) n++;
      return n;
    });
    expect(inked).toBeGreaterThan(50);
    await page.screenshot({ path: path.join(screensDir, 'orbit-sky-1280x800.png') });
    await page.setViewportSize({ width: 1600, height: 1000 });
    await sky.scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'orbit-sky-1600x1000.png') });
    await page.setViewportSize({ width: 1280, height: 800 });
    expect(w.errors).toEqual([]);
  }, 600_000);

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

/**
 * Sun and Moon keep-out cones of a scenario without an orbit, in the app (real Chromium): Lumen-6
 * (no orbit, an epoch) cut to its first target with a Sun cone on +Y and a Moon cone on −Z; the 3D
 * view draws both, the sky view on +Y draws the Sun's circle and names it. The directions are
 * checked against the engine and astronomy-engine in test/unit/ui-sky-cones-no-orbit.test.ts; this
 * checks the wiring. Screenshot: test-output/e2e/sky-cones-no-orbit.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, screenshot, skipBrowser, watchedPage, type WatchedPage } from './harness';

type Json = Record<string, unknown>;
function scenario(): Json {
  const s = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/lumen6-imaging.scenario.json'), 'utf8')) as Json;
  s.targets = [{ ...(s.targets as Json[])[0]!, holdS: 10 }];
  s.controllers = (s.controllers as Json[]).filter((c) => c.id === 'pd');
  (s.simulation as Json).tailS = 10;
  (s.simulation as Json).mode = 'follow-plan';
  delete s.keepOut;
  s.constraints = [
    { name: 'tracker sun', kind: 'keep-out', bodyAxis: [0, 1, 0], halfAngleDeg: 25, direction: { kind: 'sun' } },
    { name: 'radiator moon', kind: 'keep-out', bodyAxis: [0, 0, -1], halfAngleDeg: 15, direction: { kind: 'moon' } },
  ];
  return s;
}

/** Names of the 3D view's keep-out objects at playback time t (after two frames). */
function coneNames(page: Page, t: number): Promise<string[]> {
  return page.evaluate((time) => {
    const app = (window as unknown as { __slewsmith: { clock: { pause(): void; setTime(t: number): void } } }).__slewsmith;
    app.clock.pause();
    app.clock.setTime(time);
    return new Promise<string[]>((resolve) =>
      requestAnimationFrame(() =>
        requestAnimationFrame(() => {
          const v = (window as unknown as { __slewsmithView: any }).__slewsmithView;
          const names: string[] = [];
          for (const vp of v.model.viewports) for (const o of vp.common.keepOut.children) if (o.name) names.push(o.name);
          resolve(names);
        }),
      ),
    );
  }, t);
}

describe.skipIf(skipBrowser)('Sun and Moon cones without an orbit (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
    await page.evaluate((json) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(json, 'lumen6-sun-moon.scenario.json', true);
    }, scenario());
    await page.locator('[data-testid=comparison] th[data-run="pd:follow-plan"]').waitFor({ timeout: 120_000 });
    await page.getByTestId('plan-constraints').filter({ hasText: 'radiator moon' }).waitFor({ timeout: 120_000 });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('the 3D view draws the Sun and the Moon cone', async () => {
    const names = await coneNames(page, 5);
    expect(names.filter((n) => n.startsWith('keep-out:')).map((n) => n.split(':')[1])).toEqual(['tracker sun', 'radiator moon']);
  });

  it('the sky view on +Y draws the Sun cone and names it at the playback time', async () => {
    const sky = page.getByTestId('sky-view');
    await sky.scrollIntoViewIfNeeded();
    // The suggested axis carries a drawn cone: the first constraint's, the Sun's +Y.
    expect(await sky.getByRole('combobox').inputValue()).toBe('+Y');
    expect(await sky.getAttribute('data-moving-cones')).toBe('1');
    expect(await sky.locator('figcaption').textContent()).toContain('◯ tracker sun (keep-out, at the playback time)');
    await screenshot(page, 'sky-cones-no-orbit');
    expect(w.errors).toEqual([]);
  });
});

/**
 * The sky view at the playback time (real Chromium, browser fallback bridge): the bundled
 * orbit-day example with an Earth-centre keep-out cone on +X loaded into the store; with +X chosen
 * in the sky view, setting the shared playback clock (the one the 3D view and the plots follow)
 * moves the axis marker and the Earth cone's circle, and the canvas changes; playing moves the
 * marker on. (The geometry is checked in test/unit/ui-sky-playback.test.ts; this test checks the
 * wiring to the clock.) Screenshots to test-output/screens/sky-playback-1280x800.png and
 * -1600x1000.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const screensDir = path.join(repoRoot, 'test-output/screens');
const example = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/lumen6-orbit-day.scenario.json'), 'utf8')) as Record<
  string,
  unknown
>;
example.constraints = [
  { name: 'earth below', kind: 'keep-out', bodyAxis: [1, 0, 0], halfAngleDeg: 20, direction: { kind: 'earth-centre' } },
];

async function setTime(page: Page, t: number): Promise<void> {
  await page.evaluate((time) => {
    const c = (window as unknown as { __slewsmith: { clock: { pause(): void; setTime(t: number): void } } }).__slewsmith.clock;
    c.pause();
    c.setTime(time);
  }, t);
  // Two animation frames: the clock's tick, then the listeners.
  await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
}

interface Marker {
  t: number;
  ra: number;
  dec: number;
  cones: number;
  pixels: string;
}

async function marker(page: Page): Promise<Marker> {
  const sky = page.getByTestId('sky-view');
  const a = async (n: string) => (await sky.getAttribute(n)) ?? '';
  const pixels = await sky.locator('canvas').evaluate((c: HTMLCanvasElement) => {
    const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
    let h = 0;
    for (let i = 0; i < d.length; i += 4) h = (Math.imul(h, 31) + d[i]! + 3 * d[i + 1]! + 7 * d[i + 2]!) | 0;
    return String(h);
  });
  return {
    t: Number(await a('data-now-t')),
    ra: Number(await a('data-now-ra-deg')),
    dec: Number(await a('data-now-dec-deg')),
    cones: Number(await a('data-moving-cones')),
    pixels,
  };
}

describe.skipIf(skipBrowser)('sky view at the playback time (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.evaluate((json) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(json, 'lumen6-orbit-day-earth-cone.scenario.json', true);
    }, example);
    await page.getByTestId('passes-table').filter({ hasText: 'Aldermoor' }).waitFor({ timeout: 240_000 });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 240_000 });
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('the marker and the Earth cone move when the playback time changes, and while playing', async () => {
    const sky = page.getByTestId('sky-view');
    await sky.scrollIntoViewIfNeeded();
    await sky.getByLabel('Body axis').selectOption('+X');
    const tMax = await page.evaluate(() => (window as unknown as { __slewsmith: { clock: { tMax: number } } }).__slewsmith.clock.tMax);
    expect(tMax).toBeGreaterThan(4000);
    // The example holds +X still from about 60 s to 4000 s (a Sun-pointing hold) and slews before:
    // 60 s and 600 s are on either side of that slew (the engine's numbers, not this test's).
    const T2 = 600;
    await setTime(page, 60);
    const a = await marker(page);
    await setTime(page, T2);
    const b = await marker(page);
    expect(a.t).toBe(60);
    expect(b.t).toBe(T2);
    expect(a.cones).toBe(1);
    expect(b.cones).toBe(1);
    for (const m of [a, b]) {
      expect(m.ra).toBeGreaterThanOrEqual(0);
      expect(m.ra).toBeLessThan(360);
      expect(Math.abs(m.dec)).toBeLessThanOrEqual(90);
    }
    // the axis moved on the sky (the run slews and tracks over these minutes), and the canvas changed
    expect(Math.hypot(a.ra - b.ra, a.dec - b.dec)).toBeGreaterThan(1);
    expect(a.pixels).not.toBe(b.pixels);
    // back to the first time: the same picture
    await setTime(page, 60);
    expect(await marker(page)).toEqual(a);

    fs.mkdirSync(screensDir, { recursive: true });
    await setTime(page, T2);
    await page.screenshot({ path: path.join(screensDir, 'sky-playback-1280x800.png') });
    await page.setViewportSize({ width: 1600, height: 1000 });
    await sky.scrollIntoViewIfNeeded();
    await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
    await page.screenshot({ path: path.join(screensDir, 'sky-playback-1600x1000.png') });
    await page.setViewportSize({ width: 1280, height: 800 });

    // playing moves the marker on (the clock's frame loop), here through the slew after 60 s
    await setTime(page, 60);
    const before = await marker(page);
    await page.evaluate(() => {
      const c = (window as unknown as { __slewsmith: { clock: { setSpeed(s: number): void; play(): void } } }).__slewsmith.clock;
      c.setSpeed(200);
      c.play();
    });
    await page.waitForFunction(
      (t0) => Number(document.querySelector('[data-testid=sky-view]')?.getAttribute('data-now-t')) > t0 + 500,
      before.t,
      {
        timeout: 20_000,
      },
    );
    await page.evaluate(() => (window as unknown as { __slewsmith: { clock: { pause(): void } } }).__slewsmith.clock.pause());
    const after = await marker(page);
    expect(after.t).toBeGreaterThan(before.t + 500);
    expect(Math.hypot(after.ra - before.ra, after.dec - before.dec)).toBeGreaterThan(1);
    expect(after.pixels).not.toBe(before.pixels);
    expect(w.errors).toEqual([]);
  }, 120_000);
});

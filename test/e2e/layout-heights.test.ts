/**
 * Room for the 3D view (real Chromium, the bundled demo): at 1280×800 and 1600×1000 the 3D canvas
 * is at least 240 / 320 px tall (it was 177 / 242 px before the centre column gave it 58 % and the
 * comparison band a quarter of the window), while the plots keep at least 200 / 260 px and the
 * comparison band at least 180 px; the columns and the band fit the window without overlapping.
 * Thresholds are this project's layout goals (common practice, no source).
 */
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, screenshot, skipBrowser, watchedPage } from './harness';

interface Box {
  top: number;
  bottom: number;
  height: number;
}

describe.skipIf(skipBrowser)('layout heights (Chromium)', () => {
  let browser: Browser;

  beforeAll(async () => {
    browser = await launchBrowser();
  }, 60_000);

  afterAll(async () => {
    await browser?.close();
  });

  for (const [width, height, canvasMin, plotsMin] of [
    [1280, 800, 240, 200],
    [1600, 1000, 320, 260],
  ] as const) {
    it(`at ${width}×${height} the 3D view is at least ${canvasMin} px tall and the plots and comparison keep their room`, async () => {
      const w = await watchedPage(browser, { width, height });
      const page = w.page;
      await page.goto(appUrl(), { waitUntil: 'load' });
      await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
      // The 3D panel (a lazy chunk) mounts only once the first pass is over (App.tsx): 'done' can
      // come before its canvas exists.
      await page.locator('.view3d canvas').waitFor({ timeout: 60_000 });
      const b = await page.evaluate(() => {
        const box = (s: string) => {
          const r = document.querySelector(s)!.getBoundingClientRect();
          return { top: r.top, bottom: r.bottom, height: r.height };
        };
        return {
          canvas: box('.view3d canvas'),
          plots: box('.plots'),
          compare: box('.compare-band'),
          right: box('.right'),
          scrubber: box('.scrubber'),
          innerHeight,
        };
      });
      const { canvas, plots, compare, right, scrubber } = b as Record<'canvas' | 'plots' | 'compare' | 'right' | 'scrubber', Box>;
      console.info(`layout ${width}×${height}: canvas ${canvas.height} px, plots ${plots.height} px, comparison ${compare.height} px`);
      expect(canvas.height).toBeGreaterThanOrEqual(canvasMin);
      expect(plots.height).toBeGreaterThanOrEqual(plotsMin);
      expect(compare.height).toBeGreaterThanOrEqual(180);
      // Stacked without overlap, all above the playback bar.
      expect(plots.top).toBeGreaterThanOrEqual(canvas.bottom - 0.5);
      expect(compare.top).toBeGreaterThanOrEqual(Math.max(plots.bottom, right.bottom) - 0.5);
      expect(compare.bottom).toBeLessThanOrEqual(scrubber.top + 0.5);
      expect(scrubber.bottom).toBeLessThanOrEqual(b.innerHeight + 0.5);
      await screenshot(page, `layout-${width}x${height}`);
      expect(w.errors).toEqual([]);
      await page.context().close();
    }, 150_000);
  }
});

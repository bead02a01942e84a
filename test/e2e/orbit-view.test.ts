/**
 * The orbit in the 3D view and the orbit bands on the plots (real Chromium, browser fallback
 * bridge): the bundled orbit-day example loaded into the store; the 3D panel switched to its orbit
 * scene draws (canvas not blank: many distinct colours), with its labels (Sun, Moon, the vehicle,
 * the HUD's eclipse line); at a time inside the planned Aldermoor window the line of sight goes to
 * that site, and in the middle of an eclipse the HUD says so and the spacecraft marker is dimmer;
 * the plots carry the band legend and each planned window is shaded on the error-angle plot where
 * uPlot's own valToPos puts it (uPlot: the general-purpose plotting library the app uses).
 * Screenshots at 1280×800 and 1600×1000 to test-output/screens/orbit-view-*.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { TEXT_RULES_SCRIPT, type TextViolation } from './textRules';

const screensDir = path.join(repoRoot, 'test-output/screens');
const example = fs.readFileSync(path.join(repoRoot, 'assets/lumen6-orbit-day.scenario.json'), 'utf8');

interface Win {
  siteLabel: string | null;
  trackStartS: number;
  holdEndS: number;
}

/** The orbit view's scene state and label names, read in the page. */
async function orbitState(page: Page): Promise<{ state: Record<string, unknown>; names: string[]; craft: number[] }> {
  return page.evaluate(() => {
    const v = (
      window as unknown as {
        __slewsmithOrbitView: {
          model: {
            state: Record<string, unknown>;
            scene: { traverse(f: (o: { name: string; visible: boolean }) => void): void; getObjectByName(n: string): unknown };
            hudScene: { traverse(f: (o: { name: string; visible: boolean }) => void): void };
          };
        };
      }
    ).__slewsmithOrbitView;
    const names: string[] = [];
    v.model.scene.traverse((o) => {
      if (o.visible) names.push(o.name);
    });
    v.model.hudScene.traverse((o) => names.push(o.name));
    const craft = v.model.scene.getObjectByName('spacecraft') as { material: { color: { r: number; g: number; b: number } } };
    const c = craft.material.color;
    return { state: { ...v.model.state }, names, craft: [c.r, c.g, c.b] };
  });
}

async function setTime(page: Page, t: number): Promise<void> {
  await page.evaluate((time) => {
    const c = (window as unknown as { __slewsmith: { clock: { pause(): void; setTime(t: number): void } } }).__slewsmith.clock;
    c.pause();
    c.setTime(time);
  }, t);
  // Two animation frames: the clock's tick, then the render.
  await page.evaluate(() => new Promise((r) => requestAnimationFrame(() => requestAnimationFrame(r))));
}

describe.skipIf(skipBrowser)('orbit view and orbit bands (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;
  let windows: Win[];
  let eclipses: { startS: number; endS: number }[];
  /** On the default (no orbit) scenario: band legends shown and whether the orbit switch was enabled. */
  let noOrbit: { legends: number; orbitEnabled: boolean };

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    await page.getByTestId('plots').waitFor({ timeout: 60_000 });
    noOrbit = {
      legends: await page.getByTestId('window-band-legend').count(),
      orbitEnabled: await page.getByTestId('view-mode-orbit').isEnabled(),
    };
    await page.evaluate((text) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(JSON.parse(text), 'lumen6-orbit-day.scenario.json', true);
    }, example);
    await page.getByTestId('passes-table').filter({ hasText: 'Aldermoor' }).waitFor({ timeout: 240_000 });
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 240_000 });
    const orbit = await page.evaluate(() => {
      const st = (
        window as unknown as {
          __slewsmith: { store: { getState(): { output: { orbit: { windows: Win[]; eclipses: { startS: number; endS: number }[] } } } } };
        }
      ).__slewsmith.store.getState().output.orbit;
      return { windows: orbit0(st.windows), eclipses: st.eclipses.map((e) => ({ startS: e.startS, endS: e.endS })) };
      function orbit0(ws: Win[]) {
        return ws.map((x) => ({ siteLabel: x.siteLabel, trackStartS: x.trackStartS, holdEndS: x.holdEndS }));
      }
    });
    windows = orbit.windows;
    eclipses = orbit.eclipses;
  }, 300_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('a scenario without an orbit has no bands, no band legend and no orbit scene to switch to', () => {
    expect(noOrbit).toEqual({ legends: 0, orbitEnabled: false });
  });

  it('switches to the orbit scene, which draws the Earth, the orbit and its labels', async () => {
    const btn = page.getByTestId('view-mode-orbit');
    expect(await btn.isEnabled()).toBe(true);
    await btn.click();
    await page.getByTestId('orbit-view-canvas').waitFor();
    await setTime(page, 60);
    expect(await page.getByTestId('view3d-canvas').isVisible()).toBe(false);
    const colours = await page.evaluate(() => {
      const src = document.querySelector('[data-testid=orbit-view-canvas]') as HTMLCanvasElement;
      const c = document.createElement('canvas');
      c.width = src.width;
      c.height = src.height;
      const ctx = c.getContext('2d')!;
      ctx.drawImage(src, 0, 0);
      const d = ctx.getImageData(0, 0, c.width, c.height).data;
      const set = new Set<number>();
      for (let i = 0; i < d.length; i += 4 * 7) set.add((d[i]! << 16) | (d[i + 1]! << 8) | d[i + 2]!);
      return set.size;
    });
    // A blank canvas has one colour; the shaded globe, lines and labels give hundreds.
    expect(colours).toBeGreaterThan(100);
    const { names } = await orbitState(page);
    for (const n of ['earth', 'graticule', 'equator', 'prime-meridian', 'orbit-arc', 'spacecraft', 'sun-direction', 'moon-direction'])
      expect(names).toContain(n);
    expect(names).toContain('label:Sun');
    expect(names).toContain('label:Moon');
    expect(names).toContain('label:Lumen-6');
    expect(names.some((n) => n.startsWith('hud-shadow:'))).toBe(true);
    expect(await page.getByTestId('orbit-view-key').textContent()).toMatch(/EME2000/);
    // Text rules (≥ 13 px, contrast ≥ 4.5:1, textRules.ts) on the view bar and the band legend.
    const v = (await page.evaluate(TEXT_RULES_SCRIPT)) as TextViolation[];
    const ours = v.filter((x) => /view3d-bar|view-mode|orbit-view-key|orbit-follow|band-legend|band-key/.test(x.where));
    expect(ours.map((x) => `${x.rule} ${x.value} < ${x.needed} at ${x.where}: "${x.text}"`)).toEqual([]);
    fs.mkdirSync(screensDir, { recursive: true });
    await page.screenshot({ path: path.join(screensDir, 'orbit-view-1280x800.png') });
  });

  it('inside the planned Aldermoor window the line of sight goes to Aldermoor; in an eclipse the spacecraft dims', async () => {
    const win = windows.find((x) => x.siteLabel?.startsWith('Aldermoor'))!;
    expect(win).toBeDefined();
    await setTime(page, 0.5 * (win.trackStartS + win.holdEndS));
    const a = await orbitState(page);
    expect(a.state.linkSite).toBe(win.siteLabel);
    expect(a.state.tracking).toBe(true);
    expect(a.names).toContain('line-of-sight');
    expect(a.names).toContain(`label:line of sight: ${win.siteLabel}`);
    await page.screenshot({ path: path.join(screensDir, 'orbit-view-tracking-1280x800.png') });
    const lit = a.state.shadow === 0 ? a.craft : null;
    expect(eclipses.length).toBeGreaterThan(0);
    await setTime(page, 0.5 * (eclipses[0]!.startS + eclipses[0]!.endS));
    const e = await orbitState(page);
    expect(e.state.shadow).not.toBe(0);
    expect(e.names.some((n) => n.startsWith('hud-shadow:eclipse'))).toBe(true);
    if (lit) expect(e.craft.reduce((s, x) => s + x, 0)).toBeLessThan(lit.reduce((s, x) => s + x, 0));
  });

  it('the plots show the band legend and shade each planned window where uPlot puts it', async () => {
    expect(await page.getByTestId('window-band-legend').textContent()).toMatch(/planned window.*eclipse/);
    const host = page.getByTestId('plot-error-angle').locator('.plot-host');
    await host.scrollIntoViewIfNeeded();
    const sites = windows.filter((x) => x.siteLabel !== null);
    const res = await host.evaluate((el, ws) => {
      const u = (
        el as HTMLElement & {
          __slewsmithPlot: {
            bbox: { left: number; top: number; width: number; height: number };
            scales: { x: { min: number; max: number } };
            valToPos(v: number, s: string, c: boolean): number;
            ctx: CanvasRenderingContext2D;
          };
        }
      ).__slewsmithPlot;
      const { left, top, width, height } = u.bbox;
      const { min, max } = u.scales.x;
      return ws.map((b) => {
        const tMid = 0.5 * (b.trackStartS + b.holdEndS);
        // uPlot's own mapping against the affine map the band drawing uses (windowBands.ts bandPixels).
        const uplotX = u.valToPos(tMid, 'x', true);
        const affineX = left + ((tMid - min) * width) / (max - min);
        const x = Math.round(uplotX);
        const col = u.ctx.getImageData(x, top, 1, height).data;
        let tinted = 0;
        // The band's green tint (rgba(39, 134, 74, 0.13), over white or over the eclipse grey) leaves
        // green above red and blue by several units; the white background, the grey eclipse band,
        // grid lines and the blue run line do not.
        for (let i = 0; i < col.length; i += 4) if (col[i + 1]! - col[i]! >= 8 && col[i + 1]! - col[i + 2]! >= 4) tinted++;
        return { diff: Math.abs(uplotX - affineX), share: tinted / (col.length / 4) };
      });
    }, sites);
    expect(res.length).toBe(3);
    for (const r of res) {
      expect(r.diff).toBeLessThan(1e-6);
      expect(r.share).toBeGreaterThan(0.3);
    }
    await page.screenshot({ path: path.join(screensDir, 'orbit-bands-1280x800.png') });
    // The plot's PNG carries the bands too, with their legend entries (looked at by eye).
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('png-error-angle').click()]);
    const bytes = fs.readFileSync((await download.path())!);
    expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    fs.writeFileSync(path.join(screensDir, 'orbit-bands-plot.png'), bytes);
  });

  it('at 1600×1000 the orbit view still draws; no page errors', async () => {
    await page.setViewportSize({ width: 1600, height: 1000 });
    await page.getByTestId('view3d').scrollIntoViewIfNeeded();
    const win = windows.find((x) => x.siteLabel?.startsWith('Harrowgate'))!;
    await setTime(page, 0.5 * (win.trackStartS + win.holdEndS));
    const s = await orbitState(page);
    expect(s.state.linkSite).toBe(win.siteLabel);
    await page.screenshot({ path: path.join(screensDir, 'orbit-view-1600x1000.png') });
    expect(w.errors).toEqual([]);
  });
});

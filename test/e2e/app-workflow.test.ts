/**
 * The main window in real Chromium (browser fallback bridge), one engineer's session in order:
 * the demo loads and runs; every plot draws its data; an impossible inertia is named with its
 * rule beside the field and blocks running; fixing it updates the results; undo restores the
 * saved value and cleans the document; two controllers compared give two in the table; an AEM
 * export downloads and parses with the engine's own AEM reader; a plot exports as a PNG; the
 * playback bar moves time. Screenshots of the main screens go to test-output/screens/.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseAem } from '../../app/engine/export/aem-read';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

const screensDir = path.join(repoRoot, 'test-output/screens');

async function shot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(screensDir, { recursive: true });
  const file = path.join(screensDir, `${name}.png`);
  await page.screenshot({ path: file });
  return file;
}

async function waitForRun(page: Page): Promise<void> {
  // 'done' for the current document: the status resets to waiting/running on every edit.
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
}

/** Saturated (coloured) pixels per plot canvas: axes and grid are grey, data series are not. */
async function paintedPlots(page: Page): Promise<Record<string, number>> {
  return page.evaluate(() => {
    const out: Record<string, number> = {};
    for (const card of Array.from(document.querySelectorAll<HTMLElement>('.plot-card'))) {
      const c = card.querySelector('canvas');
      const id = card.dataset.plot ?? '?';
      if (!c) {
        out[id] = -1;
        continue;
      }
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < d.length; i += 4) {
        const mx = Math.max(d[i]!, d[i + 1]!, d[i + 2]!);
        const mn = Math.min(d[i]!, d[i + 1]!, d[i + 2]!);
        if (d[i + 3]! > 128 && mx - mn > 60) n++;
      }
      out[id] = n;
    }
    return out;
  });
}

async function runColumns(page: Page): Promise<string[]> {
  return page.locator('[data-testid=comparison] th[data-run]').evaluateAll((ths) => ths.map((t) => (t as HTMLElement).dataset.run ?? ''));
}

describe.skipIf(skipBrowser)('main window workflow (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

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

  it('loads the demo scenario under the caution strip and runs it', async () => {
    const strip = page.getByTestId('caution-strip');
    expect(await strip.textContent()).toContain(
      'Planning aid, not flight software — verify in your own simulations and reviews before any flight use.',
    );
    expect((await strip.boundingBox())?.y).toBe(0);
    expect(await page.getByTestId('document-name').textContent()).toContain('Lumen-6 imaging pass');
    expect(await page.getByTestId('plan-summary').textContent()).toContain('Image 1');
    // The demo compares three controllers, each following the plan and stepping to the targets.
    expect((await runColumns(page)).sort()).toEqual(
      [
        'hysteretic:step-target',
        'hysteretic:follow-plan',
        'pd:step-target',
        'pd:follow-plan',
        'synergistic:step-target',
        'synergistic:follow-plan',
      ].sort(),
    );
    // The engine marks a best value; the table shows it.
    expect(await page.locator('[data-testid=comparison] td[data-best=true]').count()).toBeGreaterThan(0);
    expect(await page.getByTestId('certificate-synergistic').textContent()).toMatch(/admissible/i);
    await page.waitForTimeout(400);
    await shot(page, 'main-1280x800');
  });

  it('draws every plot with data, the hybrid ones once a hybrid run is the detailed one', async () => {
    let painted = await paintedPlots(page);
    for (const id of ['error-angle', 'body-rate', 'wheel-momentum', 'wheel-torque', 'lyapunov'])
      expect(painted[id], id).toBeGreaterThan(200);
    // The first run is the smooth PD law: no logic variable, so no logic card; said once, in words.
    expect(await page.getByTestId('plot-logic').count()).toBe(0);
    expect(await page.getByTestId('hidden-note').textContent()).toMatch(/smooth law/);

    await page.getByTestId('show-synergistic:follow-plan').check();
    await page.locator('th[data-run="synergistic:follow-plan"] button', { hasText: 'detail' }).click();
    await page.getByTestId('plot-potential').locator('canvas').first().waitFor();
    await page.waitForTimeout(300);
    painted = await paintedPlots(page);
    for (const id of ['logic', 'potential', 'lyapunov', 'hybrid-time']) expect(painted[id], id).toBeGreaterThan(200);
    expect(await page.getByTestId('plot-hybrid-time').locator('.u-legend').textContent()).toMatch(/W.*j/);
    await shot(page, 'plots-synergistic-detail');
  });

  it('names the broken rule beside an impossible inertia and blocks running; fixing it updates the results', async () => {
    const before = await page.getByTestId('principal-moments').textContent();
    const jxx = page.getByLabel('Jxx', { exact: true });
    await jxx.fill('-0.11');
    const inertia = page.getByTestId('inertia-editor');
    await inertia.locator('.issue.error[data-rule=positive-definite]').waitFor();
    expect(await inertia.locator('.issue.error[data-rule=positive-definite]').textContent()).toMatch(/positive/i);
    expect(await page.getByTestId('run-button').isDisabled()).toBe(true);
    expect(await page.getByTestId('run-status').getAttribute('data-status')).toBe('invalid');
    expect(await page.getByTestId('blockers').locator('[data-rule=positive-definite]').count()).toBe(1);
    expect(await jxx.getAttribute('aria-invalid')).toBe('true');
    // No run starts while the scenario is invalid, however long we wait.
    await page.waitForTimeout(600);
    expect(await page.getByTestId('run-status').getAttribute('data-status')).toBe('invalid');
    await shot(page, 'invalid-inertia');

    await jxx.fill('0.135');
    await waitForRun(page);
    expect(await page.getByTestId('run-button').isDisabled()).toBe(false);
    expect(await inertia.locator('.issue.error').count()).toBe(0);
    const after = await page.getByTestId('principal-moments').textContent();
    expect(after).not.toBe(before);
    expect(after).toContain('0.135');
    expect(await page.getByTestId('dirty-marker').count()).toBe(1);
  });

  it('undoes from the keyboard back to the saved value, which cleans the document, and redoes', async () => {
    const jxx = () => page.getByLabel('Jxx', { exact: true }).inputValue();
    await page.getByTestId('plan-summary').click();
    // The two edits fold into one undo step when they came within the coalescing window (unit-
    // tested in ui-store); on a slow machine they are two, so press until the saved value is back.
    let presses = 0;
    while ((await jxx()) !== '0.11' && presses < 3) {
      await page.keyboard.press('Control+z');
      presses++;
      await page.waitForTimeout(100);
    }
    expect(await jxx()).toBe('0.11');
    expect(await page.getByTestId('dirty-marker').count()).toBe(0);
    await waitForRun(page);
    for (let i = 0; i < presses; i++) await page.keyboard.press('Control+Shift+Z');
    await expect.poll(jxx).toBe('0.135');
    expect(await page.getByTestId('dirty-marker').count()).toBe(1);
    // And back again from the toolbar.
    for (let i = 0; i < presses; i++) await page.getByTestId('cmd-undo').click();
    await expect.poll(jxx).toBe('0.11');
    await waitForRun(page);
  });

  it('compares the two controllers left ticked', async () => {
    await page.getByTestId('compare-hysteretic').uncheck();
    await waitForRun(page);
    await expect
      .poll(async () => (await runColumns(page)).sort())
      .toEqual(['pd:follow-plan', 'pd:step-target', 'synergistic:follow-plan', 'synergistic:step-target']);
    const labels = await page.locator('[data-testid=comparison] th[data-run] .run-name').allTextContents();
    expect(labels.some((l) => l.includes('Quaternion PD'))).toBe(true);
    expect(labels.some((l) => l.includes('Synergistic'))).toBe(true);
    await shot(page, 'two-controllers');
    // Unticking the rest too leaves nothing to run, and the UI says so.
    await page.getByTestId('compare-pd').uncheck();
    await page.getByTestId('compare-synergistic').uncheck();
    await page.getByTestId('blockers').locator('[data-rule=compare-none]').waitFor();
    expect(await page.getByTestId('run-button').isDisabled()).toBe(true);
    await page.getByTestId('compare-pd').check();
    await page.getByTestId('compare-synergistic').check();
    await waitForRun(page);
  });

  it('updates the synergistic certificate badge live: a margin above the certified gap is refused', async () => {
    const badge = page.getByTestId('certificate-synergistic');
    // δ* = 0.031249… is printed rounded down (issue 10), so the value shown is itself admissible.
    expect(await badge.textContent()).toMatch(/admissible.*δ\* = 0\.03124(?!\d)/i);
    const delta = page.locator('input[data-path="controllers[2].gapThreshold"]');
    await delta.fill('0.05');
    await expect.poll(() => badge.textContent()).toMatch(/not certified.*certified gap δ\* = 0\.031/i);
    expect(await page.getByTestId('run-button').isDisabled()).toBe(true);
    await shot(page, 'certificate-refused');
    await delta.fill('0.02');
    await waitForRun(page);
    await expect.poll(() => badge.textContent()).toMatch(/^admissible.*δ = 0\.02/i);
  });

  it('exports a run as CCSDS AEM that the engine reader accepts', async () => {
    await page.getByTestId('cmd-export').click();
    const dialog = page.getByTestId('export-dialog');
    await dialog.waitFor();
    await dialog.getByTestId('format-aem').check();
    await dialog.getByTestId('export-run').selectOption('synergistic:follow-plan');
    await dialog.getByTestId('export-rate').fill('1');
    await shot(page, 'export-dialog');
    const [download] = await Promise.all([page.waitForEvent('download'), dialog.getByTestId('export-go').click()]);
    expect(download.suggestedFilename()).toMatch(/^lumen-6-imaging-pass-synergistic-follow-plan\.aem$/);
    const text = fs.readFileSync((await download.path())!, 'utf8');
    const doc = parseAem(text);
    expect(doc.ok, doc.ok ? '' : JSON.stringify(doc.errors.slice(0, 5))).toBe(true);
    if (!doc.ok) return;
    expect(doc.value.segments.length).toBeGreaterThan(0);
    const first = doc.value.segments[0]!;
    expect(first.metadata.OBJECT_NAME!.toUpperCase()).toBe('LUMEN-6');
    expect(first.lines[0]!.epoch.startsWith('2030-03-14T10:00:00')).toBe(true);
    // Quaternion data lines have unit norm.
    for (const l of first.lines.slice(0, 20)) expect(Math.hypot(...l.values.slice(0, 4))).toBeCloseTo(1, 6);
    // At 1 Hz the 10 Hz run is thinned out: about one line per second of the run.
    const lines = doc.value.segments.reduce((n, s) => n + s.lines.length, 0);
    expect(lines).toBeLessThan(400);
    expect(await dialog.isVisible()).toBe(false);
  });

  it('exports a plot as PNG', async () => {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('png-error-angle').click()]);
    expect(download.suggestedFilename()).toBe('lumen-6-imaging-pass-error-angle.png');
    const bytes = fs.readFileSync((await download.path())!);
    expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    expect(bytes.length).toBeGreaterThan(5000);
  });

  it('plays and steps through hybrid time on the playback bar', async () => {
    // The exact clock time (the read-out rounds to 10 ms).
    const clockT = () => page.evaluate(() => (window as unknown as { __slewsmith: { clock: { t: number } } }).__slewsmith.clock.t);
    const shown = () => page.getByTestId('readout-t').textContent().then(Number);
    await page.getByTestId('play').click();
    await expect.poll(shown, { timeout: 5000 }).toBeGreaterThan(1);
    await page.getByTestId('play').click();
    const paused = await clockT();
    await page.waitForTimeout(300);
    expect(await clockT()).toBe(paused);
    expect(await shown()).toBeCloseTo(paused, 2);
    // One sample forward with the arrow key: to the next 10 Hz sample of the demo.
    await page.getByTestId('plan-summary').click();
    await page.keyboard.press('ArrowRight');
    await expect.poll(clockT).not.toBe(paused);
    const stepped = await clockT();
    expect(stepped).toBeGreaterThan(paused);
    expect(stepped - paused).toBeLessThanOrEqual(0.1 + 1e-9);
    expect(Math.abs(stepped * 10 - Math.round(stepped * 10))).toBeLessThan(1e-6);
    await page.keyboard.press('ArrowRight');
    await expect.poll(clockT).toBeCloseTo(stepped + 0.1, 6);
    // The slider and the read-out follow the clock (written by the frame loop, not by React).
    await expect.poll(async () => Number(await page.getByTestId('time-slider').inputValue())).toBeCloseTo(stepped + 0.1, 6);
    await expect.poll(shown).toBeCloseTo(stepped + 0.1, 2);
    expect(await page.getByTestId('readout-j').textContent()).toMatch(/^\d+$/);
  });

  it('shows the main window cleanly at 1440×900 and logs no errors or CSP violations', async () => {
    await page.setViewportSize({ width: 1440, height: 900 });
    await page.waitForTimeout(500);
    await shot(page, 'main-1440x900');
    expect(w.errors).toEqual([]);
    expect(await w.cspViolations()).toEqual([]);
  });
});

describe.skipIf(skipBrowser)('files through the browser bridge (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

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

  it('saves the edited demo under a new name (Save asks, as for any untitled copy) and is clean after', async () => {
    await page.getByLabel('Control rate', { exact: true }).fill('20');
    await waitForRun(page);
    expect(await page.getByTestId('dirty-marker').count()).toBe(1);
    page.once('dialog', (d) => void d.accept('lumen6-20hz'));
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByTestId('cmd-save').click()]);
    expect(download.suggestedFilename()).toBe('lumen6-20hz.json');
    const saved = JSON.parse(fs.readFileSync((await download.path())!, 'utf8'));
    expect(saved.vehicle.controlRateHz).toBe(20);
    expect(saved.format).toBe('slewsmith-scenario');
    await expect.poll(() => page.getByTestId('dirty-marker').count()).toBe(0);
    expect(await page.getByTestId('document-name').textContent()).toContain('lumen6-20hz.json');
  });

  it('opens another scenario file and runs it', async () => {
    const file = path.join(repoRoot, 'assets/tern12-reversal.scenario.json');
    const expected = JSON.parse(fs.readFileSync(file, 'utf8')) as { name: string; controllers: { id: string }[] };
    const [chooser] = await Promise.all([page.waitForEvent('filechooser'), page.getByTestId('cmd-open').click()]);
    await chooser.setFiles(file);
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain(expected.name);
    await waitForRun(page);
    const runs = await runColumns(page);
    for (const c of expected.controllers)
      expect(
        runs.some((k) => k.startsWith(`${c.id}:`)),
        c.id,
      ).toBe(true);
    // A freshly opened document has no history.
    expect(await page.getByTestId('cmd-undo').isDisabled()).toBe(true);
    await shot(page, 'opened-tern12');
    expect(w.errors).toEqual([]);
  });
});

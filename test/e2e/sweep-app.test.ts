/**
 * The Sweep tab of the study workspace in real Chromium (browser fallback bridge), on a scenario
 * built here: the setting of Mayhew, Sanfelice & Teel 2011 (test/reference/sweep-fixtures.ts, an
 * invented test vehicle) with the worst-case noise at the edge of the band, so that the hysteretic
 * law settles exactly where δ > ē (the published result; test/reference/sweep-mst.test.ts checks the
 * same through the engine). One engineer's session in order:
 * - bad input is named at its field and blocks Run: a value outside a parameter's limits, too many
 *   values on an axis, a hysteresis sweep with no hysteretic controller flown;
 * - a 3 × 3 (ē, δ) sweep with 2 cases per cell runs on Web Workers to 9 / 9 cells; the map has a
 *   tile per cell with share 1 where δ > ē and 0 where δ < ē, the measured boundary (4 crossings,
 *   worked out below) and the line ē = δ with its source; hovering a tile shows its numbers;
 * - changing the level redraws the boundary without running anything; the exports carry it;
 * - clicking a held cell opens its worst case as a normal run of that controller;
 * - a larger sweep cancelled mid-way keeps exactly its finished cells.
 * Screenshots at 1280 × 800 and 1600 × 1000: test-output/screens/sweep-*.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { TEXT_RULES_SCRIPT, type TextViolation } from './textRules';
import { mstScenario } from '../reference/sweep-fixtures';

const screensDir = path.join(repoRoot, 'test-output/screens');

/** The MST 2011 setting of sweep-mst.test.ts: 100 Hz, RK4 at 1 ms, 70 s, starts within 1° of 180°, settled = within 10° and 1°/s. */
function scenario() {
  const base = mstScenario({ controlRateHz: 100, rk4StepsPerSample: 10, durationS: 70, hysteresis: 0.4, noiseMode: 'band-edge' });
  return {
    ...base,
    name: 'MST sweep e2e',
    simulation: { ...base.simulation, settleAngleDeg: 10, settleRateDegPerS: 1 },
    study: { ...base.study, runs: 2, dispersions: { initialAttitude: { mode: 'near-reversal', withinDeg: 1 } } },
  };
}

async function load(page: Page) {
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
  await page.evaluate((json) => {
    const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
    s.store.load(json, 'mst-sweep.scenario.json', true);
  }, scenario());
  await page.getByTestId('document-name').filter({ hasText: 'MST sweep e2e' }).waitFor({ state: 'attached' });
}

async function shot(page: Page, name: string, w: number, h: number): Promise<string> {
  fs.mkdirSync(screensDir, { recursive: true });
  await page.setViewportSize({ width: w, height: h });
  await page.waitForTimeout(250);
  const file = path.join(screensDir, `${name}-${w}x${h}.png`);
  await page.screenshot({ path: file });
  return file;
}

async function download(page: Page, testId: string): Promise<{ d: Download; text: string }> {
  const [d] = await Promise.all([page.waitForEvent('download'), page.getByTestId(testId).click()]);
  return { d, text: fs.readFileSync((await d.path())!, 'utf8') };
}

const phase = (page: Page) => page.getByTestId('sweep-phase').getAttribute('data-phase');
const field = (page: Page, p: string) =>
  page.locator(`.sweep-setup [data-path="${p}"], [data-testid=sweep-results] input[data-path="${p}"]`);
const issueAt = (page: Page, p: string) => page.locator(`.sweep-setup .issue.error[data-path="${p}"]`);

async function markers(page: Page) {
  return page
    .getByTestId('sweep-map-hyst')
    .locator('circle.boundary-marker')
    .evaluateAll((cs) => cs.map((c) => [Number(c.getAttribute('cx')), Number(c.getAttribute('cy'))]));
}

describe.skipIf(skipBrowser)('sweep view (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await load(page);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('opens as the Sweep tab of the study workspace and names bad input at its field, with Run disabled', async () => {
    await page.getByTestId('cmd-study').click();
    // The Study tab's bar with the tabs added (its own spec covers the study itself).
    await page.getByTestId('study-run').waitFor();
    expect(await page.getByTestId('tab-study').getAttribute('aria-selected')).toBe('true');
    await shot(page, 'sweep-study-tab', 1280, 800);
    await page.getByTestId('tab-sweep').click();
    await page.getByTestId('sweep-setup').waitFor();
    expect(await page.getByTestId('tab-sweep').getAttribute('aria-selected')).toBe('true');

    await field(page, 'sweep.axes[0].parameter').selectOption('worst-case-eta');
    await page.getByTestId('sweep-axis-0').getByLabel('list').check();
    await field(page, 'sweep.axes[0].values').fill('0.05, 0.15, 1.5');
    await issueAt(page, 'sweep.axes[0].values[2]').waitFor();
    expect(await issueAt(page, 'sweep.axes[0].values[2]').textContent()).toContain('must lie in [0, 1)');
    expect(await page.getByTestId('sweep-run').isDisabled()).toBe(true);
    await shot(page, 'sweep-bad-input', 1280, 800);
    await field(page, 'sweep.axes[0].values').fill('0.05, 0.15, 0.25');

    await field(page, 'sweep.axes[1].parameter').selectOption('hysteresis');
    await field(page, 'sweep.axes[1].steps').fill('60');
    await issueAt(page, 'sweep.axes[1]').waitFor();
    expect(await issueAt(page, 'sweep.axes[1]').getAttribute('data-rule')).toBe('max-values');
    expect(await page.getByTestId('sweep-run').isDisabled()).toBe(true);
    await field(page, 'sweep.axes[1].lo').fill('0.1');
    await field(page, 'sweep.axes[1].hi').fill('0.3');
    await field(page, 'sweep.axes[1].steps').fill('3');
    await field(page, 'sweep.runs').fill('2');
    await field(page, 'sweep.seed').fill('11');

    // Only the sign law flown: a hysteresis sweep does not apply.
    await page.getByTestId('sweep-ctl-hyst').uncheck();
    await issueAt(page, 'sweep.axes[1].parameter').waitFor();
    expect(await issueAt(page, 'sweep.axes[1].parameter').getAttribute('data-rule')).toBe('needs-hysteretic');
    expect(await page.getByTestId('sweep-run').isDisabled()).toBe(true);
    await page.getByTestId('sweep-ctl-hyst').check();
    await page.getByTestId('sweep-ctl-sign').uncheck();
    await expect.poll(() => page.getByTestId('sweep-run').isDisabled()).toBe(false);
    expect(await page.getByTestId('sweep-grid-size').textContent()).toBe('9 cells × 2 cases × 1 controller = 18 runs');
    expect(await page.locator('.sweep-setup .issue.error').count()).toBe(0);
  });

  it('runs the 3 × 3 sweep to 9 / 9 cells with the boundary and the line ē = δ on the map', async () => {
    await page.getByTestId('sweep-run').click();
    await expect.poll(() => phase(page), { timeout: 120_000 }).toBe('done');
    const bar = page.getByTestId('sweep-progress');
    expect(await bar.getAttribute('data-done')).toBe('9');
    expect(await bar.getAttribute('data-total')).toBe('9');
    expect(await bar.getAttribute('aria-valuenow')).toBe('100');
    expect(await page.getByTestId('sweep-progress-text').textContent()).toMatch(/^9 \/ 9 cells · 18 \/ 18 cases · /);

    const map = page.getByTestId('sweep-map-hyst');
    expect(await map.getAttribute('data-tiles')).toBe('9');
    // Cell k sits at ē = E[k % 3], δ = D[⌊k / 3⌋] (axis 0 fastest); MST 2011: settles iff δ > ē.
    const E = [0.05, 0.15, 0.25];
    const D = [0.1, 0.2, 0.3];
    for (let k = 0; k < 9; k++) {
      const e = E[k % 3]!;
      const d = D[Math.floor(k / 3)]!;
      expect(await page.getByTestId(`sweep-cell-hyst-${k}`).getAttribute('data-share'), `cell ${k}`).toBe(d > e ? '1' : '0');
    }
    // Crossings at the 50 % level: rows δ = 0.1 (between ē 0.05 and 0.15) and δ = 0.2 (0.15–0.25); columns ē = 0.15
    // (δ 0.1–0.2) and ē = 0.25 (δ 0.2–0.3): four points, joined in the squares they share.
    expect(await map.getAttribute('data-boundary-points')).toBe('4');
    expect(Number(await map.getAttribute('data-boundary-segments'))).toBeGreaterThanOrEqual(2);
    expect(await map.locator('.sweep-lines .boundary').count()).toBe(Number(await map.getAttribute('data-boundary-segments')));
    expect(await map.getAttribute('data-theory')).toBe('ē = δ');
    expect(await map.getByTestId('sweep-theory-line').count()).toBe(1);
    expect(await page.getByTestId('sweep-theory-caption-hyst').textContent()).toContain('Mayhew, Sanfelice & Teel 2011');
    expect(await map.locator('.sweep-theory-label').getAttribute('title')).toContain('Mayhew, Sanfelice & Teel 2011');

    // Hover: the cell's numbers.
    await page.getByTestId('sweep-cell-hyst-2').hover();
    const tip = page.getByTestId('sweep-tip');
    await tip.waitFor();
    const text = (await tip.textContent())!;
    expect(text).toContain('cell 2');
    expect(text).toContain('worst-case noise ē 0.25');
    expect(text).toContain('hysteresis δ 0.1');
    expect(await tip.getByTestId('tip-settled').textContent()).toMatch(/^0\.0 % \(≤ /); // none of 2: rule of three
    expect(text).toMatch(/stalled100 % \(/);

    // Legibility (issue 10 rules) over the whole sweep view.
    const bad = ((await page.evaluate(TEXT_RULES_SCRIPT)) as TextViolation[]).filter((v) => /sweep|study/i.test(v.where + v.text));
    expect(bad).toEqual([]);
    await shot(page, 'sweep-map', 1280, 800);
    await shot(page, 'sweep-map', 1600, 1000);
    await page.getByTestId('sweep-cell-hyst-2').hover();
    await page.waitForTimeout(100);
    await shot(page, 'sweep-tip', 1600, 1000);
    await page.setViewportSize({ width: 1280, height: 800 });
  });

  it('redraws the boundary at a new level without running, and exports cells.csv and sweep.json at that level', async () => {
    const before = await markers(page);
    expect(before.length).toBe(4);
    await field(page, 'sweep.level').fill('25');
    await expect.poll(async () => JSON.stringify(await markers(page))).not.toBe(JSON.stringify(before));
    expect(await phase(page)).toBe('done');
    const after = await markers(page);
    expect(after.length).toBe(4);

    const csv = await download(page, 'sweep-export-csv');
    expect(csv.d.suggestedFilename()).toBe('mst-sweep-e2e-sweep-cells.csv');
    const lines = csv.text.trim().split('\n');
    expect(lines[0]!.startsWith('cell,worst-case-eta_value,hysteresis_value,cell_seed,controller')).toBe(true);
    expect(lines.length).toBe(1 + 9);
    const json = await download(page, 'sweep-export-json');
    const j = JSON.parse(json.text);
    expect(j.format).toBe('slewsmith-sweep');
    expect(j.level).toBe(0.25);
    expect(j.cellsDone).toBe(9);
    expect(j.boundaries[0].points.length).toBe(4);
    // At 25 %, a falling crossing between a settled (1) and a held (0) cell lies 3/4 of the way to the held one.
    const row = j.boundaries[0].points.find((p: { along: number; fixedValue: number }) => p.along === 0 && p.fixedValue === 0.1);
    expect(row.value).toBeCloseTo(0.05 + 0.75 * 0.1, 12);
    expect(j.theory[0].label).toBe('ē = δ');
    await field(page, 'sweep.level').fill('50');
  });

  it('opens a held cell’s worst case as a normal run of the hysteretic law', async () => {
    // Should the browser bridge ask about unsaved changes, answer yes.
    page.once('dialog', (d) => void d.accept());
    await page.getByTestId('sweep-cell-hyst-2').click();
    await page.getByTestId('view3d').waitFor({ timeout: 60_000 });
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain('sweep-cell-2-case-');
    await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 60_000 });
    const runs = await page
      .locator('[data-testid=comparison] th[data-run]')
      .evaluateAll((ths) => ths.map((t) => (t as HTMLElement).dataset.run));
    expect(runs).toEqual(['hyst:step-target']);
    // The cell's values are written into the opened scenario.
    const sc = await page.evaluate(
      () =>
        (
          window as unknown as { __slewsmith: { store: { getState(): { scenario: Record<string, unknown> } } } }
        ).__slewsmith.store.getState().scenario,
    );
    const ctl = (sc.controllers as { id: string; hysteresis?: number }[]).find((c) => c.id === 'hyst')!;
    expect(ctl.hysteresis).toBe(0.1);
    // Back in the workspace: the sweep tab and its results are still there, marked as for another scenario.
    await page.getByTestId('cmd-study').click();
    await page.getByTestId('sweep-stale').waitFor();
    expect(await page.getByTestId('sweep-progress').getAttribute('data-done')).toBe('9');
  });

  it('cancels a larger sweep mid-way and keeps exactly the finished cells', async () => {
    await page.getByTestId('sweep-close').click();
    await load(page);
    await page.getByTestId('cmd-study').click();
    await field(page, 'sweep.axes[0].values').fill('0.05, 0.1, 0.15, 0.2, 0.25, 0.3');
    await field(page, 'sweep.axes[1].steps').fill('6');
    // 20 cases per cell, so the sweep cannot finish while the screenshot below is taken (a study
    // case got faster; with 2 cases per cell a fast machine finished all 36 cells before the cancel).
    await field(page, 'sweep.runs').fill('20');
    await expect.poll(() => page.getByTestId('sweep-run').isDisabled()).toBe(false);
    await page.getByTestId('sweep-run').click();
    const bar = page.getByTestId('sweep-progress');
    await expect
      .poll(async () => Number(await bar.getAttribute('data-done')), { timeout: 120_000, interval: 100 })
      .toBeGreaterThanOrEqual(3);
    expect(await phase(page)).toBe('running');
    // The top bar's Study button shows the sweep's progress too (for when the workspace is closed).
    expect(await page.getByTestId('cmd-study').textContent()).toMatch(/^Study · sweep \d+ %$/);
    await shot(page, 'sweep-running', 1280, 800);
    await page.getByTestId('sweep-cancel').click();
    await expect.poll(() => phase(page), { timeout: 30_000 }).toBe('cancelled');
    const done = Number(await bar.getAttribute('data-done'));
    expect(done).toBeGreaterThanOrEqual(3);
    expect(done).toBeLessThan(36);
    expect(await bar.getAttribute('data-total')).toBe('36');
    expect(await page.getByTestId('sweep-map-hyst').getAttribute('data-tiles')).toBe(String(done));
    expect(await page.getByTestId('sweep-results').textContent()).toContain(`${done} of 36 cells`);
    const csv = await download(page, 'sweep-export-csv');
    expect(csv.text.trim().split('\n').length).toBe(1 + done);
    const j = JSON.parse((await download(page, 'sweep-export-json')).text);
    expect(j.complete).toBe(false);
    expect(j.cellsDone).toBe(done);
  });

  it('draws a one-axis sweep as a strip with its crossing', async () => {
    // ē across with the scenario's δ = 0.4: settles for ē < 0.4 (MST 2011), so one crossing between ē 0.3 and 0.45.
    await field(page, 'sweep.axes[1].parameter').selectOption('');
    await field(page, 'sweep.axes[0].values').fill('0.2, 0.3, 0.45, 0.5');
    await expect.poll(() => page.getByTestId('sweep-run').isDisabled()).toBe(false);
    await page.getByTestId('sweep-run').click();
    await expect.poll(() => phase(page), { timeout: 120_000 }).toBe('done');
    const map = page.getByTestId('sweep-map-hyst');
    expect(await map.getAttribute('data-tiles')).toBe('4');
    const shares = await map.locator('.sweep-tile').evaluateAll((ts) => ts.map((t) => t.getAttribute('data-share')));
    expect(shares).toEqual(['1', '1', '0', '0']);
    expect(await map.getAttribute('data-boundary-points')).toBe('1');
    expect(await map.getAttribute('data-boundary-segments')).toBe('1');
    // The one-axis theory line (MST 2011): ē = δ at the controller's fixed δ = 0.4, inside the ē range.
    expect(await map.getAttribute('data-theory')).toBe('ē = δ (δ = 0.4)');
    await shot(page, 'sweep-strip', 1280, 800);
    expect(w.errors).toEqual([]);
    expect(await w.cspViolations()).toEqual([]);
  });
});

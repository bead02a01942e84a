/**
 * The comparison view at 1280×800 in real Chromium (issue 10): all six runs of the demo side by
 * side with nothing cut at the right edge; every ticked run in every overlay plot; the per-run
 * plots of a smooth law hide the cards it has no data for and say why once; each metric's
 * definition and source opens from the keyboard; the text size and contrast rules hold over the
 * rendered DOM (textRules.ts, WCAG 2.1 contrast ratio); Export stays disabled with the reason while
 * the rate is invalid; Ctrl+Y redoes; New opens the starter scenario. Screenshots at 1280×800 and
 * 1600×1000 go to test-output/screens/ (looked at by hand).
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { COMPARISON_COLUMNS } from '../../app/engine/pipeline/comparison';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { TEXT_RULES_SCRIPT, type TextViolation } from './textRules';

const screensDir = path.join(repoRoot, 'test-output/screens');
const RUN_KEYS = [
  'pd:follow-plan',
  'pd:step-target',
  'hysteretic:follow-plan',
  'hysteretic:step-target',
  'synergistic:follow-plan',
  'synergistic:step-target',
];

async function shot(page: Page, name: string): Promise<void> {
  fs.mkdirSync(screensDir, { recursive: true });
  await page.screenshot({ path: path.join(screensDir, `${name}.png`) });
}

async function waitForRun(page: Page): Promise<void> {
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 90_000 });
}

async function textViolations(page: Page): Promise<TextViolation[]> {
  return (await page.evaluate(TEXT_RULES_SCRIPT)) as TextViolation[];
}

function describeViolations(v: TextViolation[]): string {
  return v
    .slice(0, 12)
    .map((x) => `${x.rule} ${x.value} < ${x.needed} at ${x.where}: "${x.text}"`)
    .join('\n');
}

/** Run names in an overlay plot's legend (uPlot's live legend; the first entry is the time axis). */
async function legendLabels(page: Page, plotId: string): Promise<string[]> {
  return page
    .locator(`[data-testid=plot-${plotId}] .u-legend .u-series .u-label`)
    .evaluateAll((els) => els.map((e) => (e.textContent ?? '').trim()));
}

describe.skipIf(skipBrowser)('comparison view at 1280×800 (Chromium)', () => {
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

  it('shows all six runs side by side, none cut at the right edge', async () => {
    const box = await page.evaluate(() => {
      const scroller = document.querySelector('[data-testid=comparison-scroll]')!;
      const clip = scroller.closest('.comparison')!.getBoundingClientRect();
      const ths = Array.from(document.querySelectorAll<HTMLElement>('[data-testid=comparison] th[data-run]'));
      return {
        innerWidth,
        clipRight: clip.right,
        runs: ths.map((t) => {
          const r = t.getBoundingClientRect();
          const name = t.querySelector('.run-name')!;
          return { key: t.dataset.run, left: r.left, right: r.right, nameCut: name.scrollWidth > name.clientWidth + 1 };
        }),
      };
    });
    expect(box.runs.map((r) => r.key).sort()).toEqual([...RUN_KEYS].sort());
    for (const r of box.runs) {
      expect(r.right, r.key).toBeLessThanOrEqual(Math.min(box.innerWidth, box.clipRight) + 0.5);
      expect(r.left, r.key).toBeGreaterThanOrEqual(0);
      expect(r.nameCut, `${r.key} name cut`).toBe(false);
    }
    await page.waitForTimeout(300);
    await shot(page, 'comparison-1280x800');
  });

  it('plots every ticked run in every overlay plot', async () => {
    for (const k of RUN_KEYS) await page.getByTestId(`show-${k}`).check();
    const names = await page.locator('[data-testid=comparison] th[data-run] .run-name').allTextContents();
    expect(names).toHaveLength(6);
    for (const id of ['error-angle', 'boresight', 'rate-magnitude', 'momentum-use']) {
      await expect.poll(async () => (await legendLabels(page, id)).length, { timeout: 10_000 }).toBeGreaterThanOrEqual(6);
      const labels = await legendLabels(page, id);
      for (const n of names)
        expect(
          labels.some((l) => l.startsWith(n.trim())),
          `${id} shows ${n}`,
        ).toBe(true);
    }
    await shot(page, 'comparison-all-ticked-1280x800');
  });

  it('hides the hybrid cards of a smooth law and says why once', async () => {
    await page.getByTestId('detail-run').selectOption('pd:follow-plan');
    const detail = page.getByTestId('detail-plots');
    await expect.poll(() => detail.locator('[data-plot]').count()).toBeGreaterThan(0);
    const ids = await detail.locator('[data-plot]').evaluateAll((els) => els.map((e) => (e as HTMLElement).dataset.plot));
    expect(ids).not.toContain('logic');
    expect(ids).not.toContain('potential');
    expect(ids).not.toContain('hybrid-time');
    expect(await page.getByTestId('hidden-note').count()).toBe(1);
    expect(await page.getByTestId('hidden-note').textContent()).toMatch(/smooth law/);
    // A hybrid law shows them.
    await page.getByTestId('detail-run').selectOption('synergistic:follow-plan');
    await expect.poll(() => detail.locator('[data-plot=potential]').count()).toBe(1);
  });

  it('opens each metric definition and source from the keyboard', async () => {
    const col = COMPARISON_COLUMNS.find((c) => c.key === 'settleTimeS')!;
    const info = page.getByTestId('info-settleTimeS');
    await info.focus();
    await page.keyboard.press('Enter');
    const pop = page.getByTestId('metric-info-settleTimeS');
    await pop.waitFor();
    const text = await pop.textContent();
    expect(text).toContain(col.definition);
    expect(text).toContain(col.source);
    expect(await textViolations(page), 'popover text').toEqual([]);
    await page.keyboard.press('Escape');
    await expect.poll(() => pop.count()).toBe(0);
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-testid'))).toBe('info-settleTimeS');
  });

  it('keeps DOM text at 13 px or more and at 4.5:1 contrast (3:1 disabled), wherever the editors are scrolled', async () => {
    for (const top of [0, 700, 1400, 2100, 1e6]) {
      await page.evaluate((y) => {
        document.querySelector('aside.left')!.scrollTop = y;
        const p = document.querySelector('.center .plots');
        if (p) p.scrollTop = y;
      }, top);
      const v = await textViolations(page);
      expect(v, `scrolled to ${top}:\n${describeViolations(v)}`).toEqual([]);
    }
  });

  it('keeps Export disabled with the reason while the sample rate is invalid', async () => {
    await page.getByTestId('cmd-export').click();
    const dialog = page.getByTestId('export-dialog');
    await dialog.waitFor();
    await dialog.getByTestId('export-rate').fill('abc');
    expect(await dialog.getByTestId('export-go').isDisabled()).toBe(true);
    expect(await dialog.getByTestId('export-rate-problem').textContent()).toMatch(/number of samples per second/);
    await dialog.getByTestId('export-rate').fill('1e9');
    expect(await dialog.getByTestId('export-go').isDisabled()).toBe(true);
    expect(await dialog.getByTestId('export-rate-problem').textContent()).toMatch(/at most the control rate/);
    const v = await textViolations(page);
    expect(v, describeViolations(v)).toEqual([]);
    await dialog.getByTestId('export-rate').fill('1');
    expect(await dialog.getByTestId('export-go').isDisabled()).toBe(false);
    await dialog.getByText('Cancel').click();
  });

  it('redoes with Ctrl+Y', async () => {
    const name = page.getByLabel('Scenario name', { exact: true });
    const before = await name.inputValue();
    await name.fill(`${before} (edited)`);
    await name.press('Tab');
    await page.getByTestId('plan-summary').click();
    await page.keyboard.press('Control+z');
    await expect.poll(() => name.inputValue()).toBe(before);
    await page.keyboard.press('Control+y');
    await expect.poll(() => name.inputValue()).toBe(`${before} (edited)`);
  });

  it('opens a starter scenario of our own on New', async () => {
    page.once('dialog', (d) => void d.accept());
    await page.getByTestId('cmd-new').click();
    await expect.poll(() => page.getByTestId('document-name').textContent()).toContain('New scenario');
    await waitForRun(page);
    expect(await page.getByTestId('plan-summary').textContent()).not.toContain('Image 1');
    expect(w.errors).toEqual([]);
  });

  it('looks right at 1600×1000', async () => {
    const w2 = await watchedPage(browser, { width: 1600, height: 1000 });
    await w2.page.goto(appUrl(), { waitUntil: 'load' });
    await waitForRun(w2.page);
    await w2.page.waitForTimeout(300);
    const v = await textViolations(w2.page);
    expect(v, describeViolations(v)).toEqual([]);
    await shot(w2.page, 'comparison-1600x1000');
    expect(w2.errors).toEqual([]);
    await w2.page.context().close();
  });
});

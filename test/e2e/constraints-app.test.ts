/**
 * Constraints in the main window (real Chromium, browser fallback bridge, 1280×800): a cut
 * Lumen-6 scenario without constraints shows no margin plot and "–" in the comparison's
 * constraint-margin row; a keep-out cone added in the Constraints panel (−Z body axis against the
 * fixed direction the vehicle starts pointing it at, 20°) runs, the margin plot appears with its
 * violated stretch shaded, the comparison row shows the margin (≈ −20° at the start: the axis sits
 * on the cone's centre line — the definition angle − half-angle, scenario/constraintSchema.ts), the
 * plan summary lists the cone as violated; a half-angle of 190 is named at the field with the
 * form's label and rule. Text of the panel, plan and plots ≥ 13 px at ≥ 4.5:1 (textRules.ts).
 * Screenshot to test-output/screens/constraints-1280x800.png.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';
import { TEXT_RULES_SCRIPT, type TextViolation } from './textRules';

type Json = Record<string, unknown>;
const screensDir = path.join(repoRoot, 'test-output/screens');
/** Lumen-6 cut to its first target, one controller, follow-plan only, without its keep-out cone. */
function scenario(): Json {
  const s = JSON.parse(fs.readFileSync(path.join(repoRoot, 'assets/lumen6-imaging.scenario.json'), 'utf8')) as Json;
  s.targets = [{ ...(s.targets as Json[])[0]!, holdS: 10 }];
  s.controllers = (s.controllers as Json[]).filter((c) => c.id === 'pd');
  (s.simulation as Json).tailS = 10;
  (s.simulation as Json).mode = 'follow-plan';
  delete s.keepOut;
  return s;
}
/** Lumen-6's initial −Z pointing direction (its `initial.attitude`). */
const START_DIR = ['0.9922', '-0.1148', '-0.0488'];

async function waitDone(page: Page): Promise<void> {
  await page.locator('[data-testid=run-status][data-status=done]').waitFor({ timeout: 120_000 });
}
const marginCell = (page: Page) => page.locator('[data-testid=comparison] tr[data-metric=constraintMarginDeg] td').first();

describe.skipIf(skipBrowser)('constraints in the app (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser, { width: 1280, height: 800 });
    page = w.page;
    await page.goto(appUrl(), { waitUntil: 'load' });
    await waitDone(page);
    await page.evaluate((json) => {
      const s = (window as unknown as { __slewsmith: { store: { load(j: unknown, name: string, clean: boolean): void } } }).__slewsmith;
      s.store.load(json, 'lumen6-cut.scenario.json', true);
    }, scenario());
    await page.locator('[data-testid=comparison] th[data-run="pd:follow-plan"]').waitFor({ timeout: 120_000 });
    await waitDone(page);
  }, 240_000);

  afterAll(async () => {
    await browser?.close();
  });

  it('without constraints: no margin plot, the comparison row shows –', async () => {
    expect(await page.getByTestId('plot-constraint-margin').count()).toBe(0);
    expect((await marginCell(page).textContent())?.trim()).toBe('–');
  });

  it('a keep-out cone added in the form: margin plot, comparison row and plan summary update', async () => {
    const panel = page.getByTestId('constraints-panel');
    await panel.getByTestId('add-constraint').click();
    const card = panel.getByTestId('constraint-0');
    await card.locator('input[data-path="constraints[0].name"]').fill('Imager start cone');
    await card.locator('input[data-path="constraints[0].bodyAxis[2]"]').fill('-1');
    await card.locator('input[data-path="constraints[0].halfAngleDeg"]').fill('20');
    await card.locator('select[aria-label="Direction"]').selectOption('fixed');
    for (let k = 0; k < 3; k++)
      await card.locator(`input[data-path="constraints[0].direction.inertialDirection[${k}]"]`).fill(START_DIR[k]!);
    await page.getByTestId('plot-constraint-margin').waitFor({ timeout: 120_000 });
    await page.getByTestId('plan-constraints').filter({ hasText: 'Imager start cone' }).waitFor({ timeout: 120_000 });
    await waitDone(page);
    const cell = Number((await marginCell(page).textContent())?.replace('−', '-'));
    // The vehicle starts with −Z on the cone's axis: angle ≈ 0 (plus its small initial rate), margin ≈ −20°.
    expect(cell).toBeLessThan(-19);
    expect(cell).toBeGreaterThanOrEqual(-20);
    const plot = page.getByTestId('plot-constraint-margin');
    expect(await plot.locator('.plot-note').textContent()).toMatch(/Shaded: .*violates Imager start cone/);
    expect(await plot.locator('canvas').count()).toBeGreaterThan(0);
    const row = page.locator('[data-testid=plan-constraints] tr[data-constraint="Imager start cone"]');
    expect(await row.textContent()).toMatch(/violated/);
    expect(await card.getByTestId('constraint-plan-0').textContent()).toMatch(/plan margin −?-?\d.*violated/);
  });

  it('3D view: the cone is drawn and coloured violated at the start, clear once the margin is positive', async () => {
    const cones = (t: number) =>
      page.evaluate((t) => {
        const app = (window as unknown as { __slewsmith: { clock: { pause(): void; setTime(t: number): void } } }).__slewsmith;
        app.clock.pause();
        app.clock.setTime(t);
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
    expect(await cones(0)).toEqual(['keep-out:Imager start cone:violated', 'label:Imager start cone (violated)']);
    // The plan summary gives the end of the violation; 5 s later the axis is well outside the cone.
    const text = (await page.locator('[data-testid=comparison] tr[data-metric=status] td').first().textContent()) ?? '';
    const until = Number(/violated ([\d.]+) s/.exec(text)?.[1]);
    expect(until).toBeGreaterThan(0);
    expect(await cones(until + 5)).toEqual(['keep-out:Imager start cone:clear', 'label:Imager start cone']);
  });

  it('a half-angle of 190 is named at its field with the form label and rule', async () => {
    const card = page.getByTestId('constraint-0');
    const input = card.locator('input[data-path="constraints[0].halfAngleDeg"]');
    await input.fill('190');
    const field = card.locator('.field').filter({ has: page.locator('input[data-path="constraints[0].halfAngleDeg"]') });
    const msg = field.locator('.issue.error');
    await msg.waitFor({ timeout: 10_000 });
    expect(await msg.count()).toBe(1);
    expect(await msg.locator('.issue-field').textContent()).toBe('Half-angle:');
    expect(await msg.textContent()).toMatch(/Must be < 180 \(got 190\)/);
    expect(await msg.getAttribute('data-rule')).toBe('max');
    // Only that field complains.
    expect(await card.locator('.issue.error').count()).toBe(1);
    expect(await input.getAttribute('aria-invalid')).toBe('true');
  });

  it('text ≥ 13 px at ≥ 4.5:1 in the panel, plan and plots; screenshot; no console errors', async () => {
    await page.getByTestId('constraints-panel').scrollIntoViewIfNeeded();
    await page.getByTestId('plot-constraint-margin').scrollIntoViewIfNeeded();
    const bad = ((await page.evaluate(TEXT_RULES_SCRIPT)) as TextViolation[]).filter((v) =>
      /constraint|plan|plot/i.test(v.where + ' ' + v.text),
    );
    expect(bad).toEqual([]);
    fs.mkdirSync(screensDir, { recursive: true });
    await page.getByTestId('constraint-0').scrollIntoViewIfNeeded();
    await page.screenshot({ path: path.join(screensDir, 'constraints-1280x800.png') });
    expect(w.errors).toEqual([]);
  });
});

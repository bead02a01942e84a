/**
 * The browser fallback of the bridge in real Chromium, under the app's CSP: file input to open,
 * downloads to save and export, prompt/confirm for the questions, keyboard commands. The page is
 * served through Playwright routes on the preview server's origin, so 'self' means what it does
 * for the app.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser, Download, Page } from 'playwright-core';
import { build } from 'vite';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { SlewsmithBridge } from '../../app/bridge/api';
import { contentSecurityPolicy, electronConfig } from '../../electron.config';
import { appUrl, launchBrowser, repoRoot, skipBrowser, watchedPage, type WatchedPage } from './harness';

type W = Window & { __bridge: SlewsmithBridge; __commands: string[] };

async function bundleFixture(): Promise<string> {
  const out = await build({
    configFile: false,
    logLevel: 'error',
    root: repoRoot,
    // As vite.config.ts: the engine's SGP4 comes from satellite.js's JavaScript part only (its root
    // entry also loads a WebAssembly build with top-level await, which this ES library build rejects).
    resolve: { alias: [{ find: /^satellite\.js$/, replacement: path.join(repoRoot, 'app/satellite-core.ts') }] },
    build: {
      write: false,
      minify: false,
      lib: { entry: path.join(repoRoot, 'test/e2e/fixtures/bridge-entry.ts'), formats: ['es'], fileName: 'bridge' },
    },
  });
  const outputs = Array.isArray(out) ? out : [out];
  for (const o of outputs) if ('output' in o) for (const chunk of o.output) if (chunk.type === 'chunk' && chunk.isEntry) return chunk.code;
  throw new Error('fixture bundle has no entry chunk');
}

async function downloadText(d: Download): Promise<string> {
  return fs.readFileSync((await d.path())!, 'utf8');
}

const demoPath = path.join(repoRoot, electronConfig.demoScenario);

describe.skipIf(skipBrowser)('browser fallback bridge (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  let page: Page;

  beforeAll(async () => {
    const code = await bundleFixture();
    browser = await launchBrowser();
    w = await watchedPage(browser);
    page = w.page;
    const html = `<!doctype html><html><head><meta charset="utf-8"><meta http-equiv="Content-Security-Policy" content="${contentSecurityPolicy}"><title>bridge</title></head><body><input id="field"><script type="module" src="./bridge.js"></script></body></html>`;
    await page.route(appUrl('__bridge__/index.html'), (r) =>
      r.fulfill({ body: html, contentType: 'text/html', headers: { 'Content-Security-Policy': contentSecurityPolicy } }),
    );
    await page.route(appUrl('__bridge__/bridge.js'), (r) => r.fulfill({ body: code, contentType: 'text/javascript' }));
    await page.goto(appUrl('__bridge__/index.html'));
    await page.locator('body[data-ready="yes"]').waitFor();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('reports the browser shell', async () => {
    const info = await page.evaluate(() => (window as unknown as W).__bridge.appInfo());
    expect(info).toMatchObject({ name: 'Slewsmith', version: '9.9.9-test', shell: 'browser' });
    expect(await page.evaluate(() => (window as unknown as W).__bridge.recentFiles())).toEqual([]);
  });

  it('opens the bundled demo as an untitled template, validated by the real scenario validator', async () => {
    const r = await page.evaluate(() => (window as unknown as W).__bridge.initialScenario());
    expect(r).toMatchObject({ status: 'opened', template: true, file: { path: null, name: path.basename(demoPath) } });
    if (r.status === 'opened') expect(r.scenario).toEqual(JSON.parse(fs.readFileSync(demoPath, 'utf8')));
  });

  it('opens a file chosen in the file input, and reports a broken one as invalid', async () => {
    const open = async (name: string, body: string) => {
      const chooser = page.waitForEvent('filechooser');
      const result = page.evaluate(() => (window as unknown as W).__bridge.openScenario());
      await (await chooser).setFiles({ name, mimeType: 'application/json', buffer: Buffer.from(body) });
      return result;
    };
    const good = await open('mine.scenario.json', fs.readFileSync(demoPath, 'utf8'));
    expect(good).toMatchObject({ status: 'opened', template: false, file: { path: null, name: 'mine.scenario.json' } });
    const bad = await open('broken.json', '{"format": ');
    expect(bad).toMatchObject({ status: 'invalid', file: { name: 'broken.json' } });
    if (bad.status === 'invalid') expect(bad.errors.map((e) => e.rule)).toEqual(['json-syntax']);
    const huge = await open('huge.json', ' '.repeat(70 * 1024));
    if (huge.status !== 'invalid') throw new Error(`expected invalid, got ${huge.status}`);
    expect(huge.errors[0]!.rule).toBe('max-size');
  });

  it('saves by downloading pretty JSON under the current name, and save-as asks for a name', async () => {
    const scenario = JSON.parse(fs.readFileSync(demoPath, 'utf8')) as unknown;
    const dl = page.waitForEvent('download');
    const saved = await page.evaluate((s) => (window as unknown as W).__bridge.saveScenario(s), scenario);
    const d = await dl;
    // The last file that opened successfully names the document (the invalid ones did not replace it).
    expect(saved).toEqual({ status: 'saved', file: { path: null, name: 'mine.scenario.json' } });
    expect(d.suggestedFilename()).toBe('mine.scenario.json');
    expect(await downloadText(d)).toBe(JSON.stringify(scenario, null, 2) + '\n');

    page.once('dialog', (dialog) => void dialog.accept('my-plan'));
    const dl2 = page.waitForEvent('download');
    const asNew = await page.evaluate((s) => (window as unknown as W).__bridge.saveScenarioAs(s), scenario);
    expect(asNew).toEqual({ status: 'saved', file: { path: null, name: 'my-plan.json' } });
    expect((await dl2).suggestedFilename()).toBe('my-plan.json');

    page.once('dialog', (dialog) => void dialog.dismiss());
    expect(await page.evaluate((s) => (window as unknown as W).__bridge.saveScenarioAs(s), scenario)).toEqual({ status: 'cancelled' });
    page.once('dialog', (dialog) => void dialog.accept('a/b'));
    const bad = await page.evaluate((s) => (window as unknown as W).__bridge.saveScenarioAs(s), scenario);
    expect(bad.status).toBe('invalid');
  });

  it('refuses to save an invalid scenario, listing its problems', async () => {
    const r = await page.evaluate(() => (window as unknown as W).__bridge.saveScenario({ format: 'slewsmith-scenario', version: 99 }));
    expect(r.status).toBe('invalid');
    if (r.status === 'invalid') expect(r.errors.length).toBeGreaterThan(0);
  });

  it('exports text and bytes as downloads with the suggested name; bad requests download nothing', async () => {
    const dl = page.waitForEvent('download');
    const r = await page.evaluate(() =>
      (window as unknown as W).__bridge.exportFile({ suggestedName: 'lumen6.csv', content: 't,angle\n0,1.5\n' }),
    );
    expect(r).toEqual({ status: 'exported', file: { path: null, name: 'lumen6.csv' } });
    const d = await dl;
    expect(d.suggestedFilename()).toBe('lumen6.csv');
    expect(await downloadText(d)).toBe('t,angle\n0,1.5\n');

    const dl2 = page.waitForEvent('download');
    await page.evaluate(() =>
      (window as unknown as W).__bridge.exportFile({ suggestedName: 'b.bin', content: new Uint8Array([0, 255, 7]) }),
    );
    expect([...fs.readFileSync((await (await dl2).path())!)]).toEqual([0, 255, 7]);

    const bad = await page.evaluate(() =>
      (window as unknown as W).__bridge.exportFile({ suggestedName: '../x.csv', content: 'y'.repeat(2000) }),
    );
    expect(bad.status).toBe('invalid');
    if (bad.status === 'invalid') expect(bad.errors.map((e) => e.rule).sort()).toEqual(['bare-name', 'max-size']);
  });

  it('asks before discarding unsaved changes', async () => {
    await page.evaluate(() => (window as unknown as W).__bridge.setDirty(true));
    const messages: string[] = [];
    page.once('dialog', (dialog) => {
      messages.push(`${dialog.type()}: ${dialog.message()}`);
      void dialog.dismiss();
    });
    expect(await page.evaluate(() => (window as unknown as W).__bridge.newScenario())).toEqual({ status: 'cancelled' });
    expect(messages[0]).toMatch(/^confirm: .* has unsaved changes\. Discard them and start a new scenario\?$/);
    page.once('dialog', (dialog) => void dialog.accept());
    expect(await page.evaluate(() => (window as unknown as W).__bridge.newScenario())).toEqual({ status: 'created' });
    // Clean now: no question.
    expect(await page.evaluate(() => (window as unknown as W).__bridge.newScenario())).toEqual({ status: 'created' });
  });

  it('turns the menu shortcuts into commands, leaving undo inside text fields to the field', async () => {
    await page.evaluate(() => ((window as unknown as W).__commands.length = 0));
    await page.locator('body').click();
    await page.keyboard.press('Control+s');
    await page.keyboard.press('Control+Shift+S');
    await page.keyboard.press('Control+r');
    await page.keyboard.press('Control+z');
    await page.locator('#field').focus();
    await page.keyboard.press('Control+z');
    await page.keyboard.press('Control+e');
    expect(await page.evaluate(() => (window as unknown as W).__commands.slice())).toEqual(['save', 'save-as', 'run', 'undo', 'export']);
  });

  it('did all of that without a console error or a CSP violation', async () => {
    expect(w.errors).toEqual([]);
    expect(await w.cspViolations()).toEqual([]);
  });
});

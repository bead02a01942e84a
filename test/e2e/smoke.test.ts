/**
 * Smoke test of the renderer in real Chromium: it loads, shows the caution strip, logs no errors,
 * trips no CSP rule, runs on the browser fallback with the bundled demo, and its CSP forbids eval
 * and inline script.
 */
import fs from 'node:fs';
import path from 'node:path';
import type { Browser } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { contentSecurityPolicy, electronConfig } from '../../electron.config';
import { appUrl, launchBrowser, repoRoot, screenshot, skipBrowser, watchedPage, type WatchedPage } from './harness';

describe.skipIf(skipBrowser)('renderer smoke (Chromium)', () => {
  let browser: Browser;
  let w: WatchedPage;
  // Found by its words, not by markup, so the test outlives changes to the UI.
  const cautionStrip = () => w.page.getByText(/planning aid, not flight software/i).first();

  beforeAll(async () => {
    browser = await launchBrowser();
    w = await watchedPage(browser);
    const res = await w.page.goto(appUrl(), { waitUntil: 'load' });
    expect(res?.status()).toBe(200);
    await cautionStrip().waitFor();
  });

  afterAll(async () => {
    await browser?.close();
  });

  it('shows the product name and the caution strip', async () => {
    expect(await w.page.title()).toBe('Slewsmith');
    expect(await cautionStrip().isVisible()).toBe(true);
    expect(await w.page.locator('body').innerText()).toContain('Slewsmith');
    await screenshot(w.page, 'smoke');
  });

  it('runs without a desktop bridge and serves the bundled demo for the browser fallback', async () => {
    expect(await w.page.evaluate(() => 'slewsmith' in window)).toBe(false);
    expect(fs.existsSync(path.join(repoRoot, electronConfig.demoScenario))).toBe(true);
    const res = await w.page.request.get(appUrl(electronConfig.demoScenarioUrl));
    expect(res.status()).toBe(200);
    const demo = JSON.parse(await res.text()) as { format?: unknown };
    expect(demo).toEqual(JSON.parse(fs.readFileSync(path.join(repoRoot, electronConfig.demoScenario), 'utf8')));
  });

  it('logs no console errors or uncaught exceptions and violates no CSP rule while loading', async () => {
    expect(w.errors).toEqual([]);
    expect(await w.cspViolations()).toEqual([]);
  });

  it('carries the configured CSP as a meta tag, and the server sends it too', async () => {
    const meta = await w.page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
    expect(meta).toBe(contentSecurityPolicy);
    const res = await w.page.request.get(appUrl());
    expect(res.headers()['content-security-policy']).toBe(contentSecurityPolicy);
  });

  it('forbids eval, new Function and inline script', async () => {
    // The attempts run in a timer task: code that DevTools evaluates directly is exempt from the
    // page's eval rule, a task the page itself runs is not.
    await w.page.evaluate(() => {
      const attempt = (f: () => unknown) => {
        try {
          f();
          return 'ran';
        } catch (e) {
          return (e as Error).name;
        }
      };
      const out = window as unknown as { __attempts?: Record<string, string> };
      setTimeout(() => {
        const s = document.createElement('script');
        s.textContent = 'window.__inlineRan = true';
        document.head.appendChild(s);
        out.__attempts = {
          eval: attempt(() => (0, eval)('1 + 1')),
          newFunction: attempt(() => new Function('return 1')()),
          inline: (window as unknown as { __inlineRan?: boolean }).__inlineRan === true ? 'ran' : 'blocked',
        };
      }, 0);
    });
    await w.page.waitForFunction(() => (window as unknown as { __attempts?: unknown }).__attempts !== undefined);
    const outcome = await w.page.evaluate(() => (window as unknown as { __attempts: Record<string, string> }).__attempts);
    expect(outcome).toEqual({ eval: 'EvalError', newFunction: 'EvalError', inline: 'blocked' });
    // Each attempt is reported once per enforced policy: the preview server's header and the meta
    // tag both carry the CSP, so two reports each (eval: script-src, inline: script-src-elem).
    await w.page.waitForFunction(() => (window as unknown as { __slewsmithCsp: unknown[] }).__slewsmithCsp.length >= 6);
    const v = await w.cspViolations();
    const count = (directive: string, blockedURI: string) =>
      v.filter((x) => x.directive === directive && x.blockedURI === blockedURI).length;
    expect(count('script-src', 'eval')).toBe(4);
    expect(count('script-src-elem', 'inline')).toBe(2);
    expect(v).toHaveLength(6);
  });
});

/**
 * Browser-test harness: the built renderer served by `vite preview` on 127.0.0.1 (an ephemeral
 * port), driven by playwright-core in Debian's Chromium. Never `npx playwright install`: it
 * downloads a browser of its own, which cannot work on these machines.
 *
 * - The build and the server start once per test run (test/e2e/global-setup.ts); tests read the
 *   server's address with `appUrl()`.
 * - Missing Chromium makes the browser tests fail with a message saying how to install it, unless
 *   SLEWSMITH_SKIP_BROWSER=1 (then they are skipped: `describe.skipIf(skipBrowser)`).
 * - Screenshots go to test-output/e2e/.
 */
import fs from 'node:fs';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type Browser, type ConsoleMessage, type Page } from 'playwright-core';
import { inject } from 'vitest';

export const repoRoot = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');
export const outputDir = path.join(repoRoot, 'test-output/e2e');

export const skipBrowser = process.env.SLEWSMITH_SKIP_BROWSER === '1';
export const chromiumPath = process.env.SLEWSMITH_CHROMIUM ?? '/usr/bin/chromium';

export { CHROMIUM_ARGS } from './chromium-args';
import { CHROMIUM_ARGS } from './chromium-args';

export function missingChromiumMessage(p: string): string {
  return (
    `Browser tests need Chromium at ${p}, which is missing. Install it with ` +
    '`apt-get update && apt-get install -y chromium` (.ci/run does this), point SLEWSMITH_CHROMIUM at another build, ' +
    'or set SLEWSMITH_SKIP_BROWSER=1 to skip the browser tests.'
  );
}

export async function launchBrowser(options: { headless?: boolean } = {}): Promise<Browser> {
  if (!fs.existsSync(chromiumPath)) throw new Error(missingChromiumMessage(chromiumPath));
  return chromium.launch({ executablePath: chromiumPath, args: [...CHROMIUM_ARGS], headless: options.headless ?? true });
}

declare module 'vitest' {
  export interface ProvidedContext {
    /** Base URL of the preview server started by the global setup, ending in '/'. */
    slewsmithAppUrl: string;
  }
}

/** The preview server's URL for `pathname` (relative to the renderer root). */
export function appUrl(pathname = ''): string {
  const base = inject('slewsmithAppUrl');
  if (!base) throw new Error('no preview server: the e2e global setup did not run (run the tests through vitest with vitest.config.ts)');
  return new URL(pathname, base).href;
}

export interface CspViolation {
  directive: string;
  blockedURI: string;
  sample: string;
}

export interface WatchedPage {
  page: Page;
  /** console.error messages and uncaught exceptions, as text. */
  errors: string[];
  /** Every console message, for diagnosis. */
  console: string[];
  /** securitypolicyviolation events recorded in the page. */
  cspViolations(): Promise<CspViolation[]>;
}

/** A fresh page that records errors and CSP violations from before its first script runs. */
export async function watchedPage(browser: Browser, viewport = { width: 1440, height: 900 }): Promise<WatchedPage> {
  const context = await browser.newContext({ viewport, acceptDownloads: true });
  const page = await context.newPage();
  const errors: string[] = [];
  const consoleLines: string[] = [];
  page.on('console', (m: ConsoleMessage) => {
    consoleLines.push(`${m.type()}: ${m.text()}`);
    if (m.type() === 'error') errors.push(`console.error: ${m.text()}`);
  });
  page.on('pageerror', (e) => errors.push(`uncaught: ${e.message}`));
  // Injected by the browser itself (not subject to the page's CSP), ahead of the page's scripts.
  await page.addInitScript(() => {
    const w = window as unknown as { __slewsmithCsp: unknown[] };
    w.__slewsmithCsp = [];
    document.addEventListener('securitypolicyviolation', (e) => {
      w.__slewsmithCsp.push({ directive: e.effectiveDirective || e.violatedDirective, blockedURI: e.blockedURI, sample: e.sample });
    });
  });
  return {
    page,
    errors,
    console: consoleLines,
    cspViolations: () => page.evaluate(() => (window as unknown as { __slewsmithCsp: CspViolation[] }).__slewsmithCsp.slice()),
  };
}

/** Saves a full-page screenshot as test-output/e2e/<name>.png and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  fs.mkdirSync(outputDir, { recursive: true });
  const file = path.join(outputDir, `${name.replace(/[^a-z0-9._-]+/gi, '-')}.png`);
  await page.screenshot({ path: file, fullPage: true });
  return file;
}

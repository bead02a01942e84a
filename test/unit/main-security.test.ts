/**
 * Window and session hardening. The list checked is Electron's security checklist
 * (electronjs.org/docs/latest/tutorial/security): context isolation, sandbox, no Node in the
 * renderer, web security on, no insecure content, no webview, navigation and new windows blocked,
 * permissions denied, a CSP on every response.
 */
import { describe, expect, it, vi } from 'vitest';
import { contentSecurityPolicy, cspDirectives, electronConfig } from '../../electron.config';
import {
  appIndexUrl,
  hardenSession,
  hardenWebContents,
  isAppUrl,
  mainWindowOptions,
  secureWebPreferences,
  withCspHeader,
  type HardenableContents,
} from '../../main/security';

describe('window options', () => {
  const o = mainWindowOptions('/app/dist/main/preload.cjs');
  const wp = o.webPreferences!;

  it('isolates and sandboxes the renderer without Node', () => {
    expect(wp.contextIsolation).toBe(true);
    expect(wp.sandbox).toBe(true);
    expect(wp.nodeIntegration).toBe(false);
    expect(wp.nodeIntegrationInWorker).toBe(false);
    expect(wp.nodeIntegrationInSubFrames).toBe(false);
  });

  it('keeps web security on and refuses insecure content, webviews and experimental features', () => {
    expect(wp.webSecurity).toBe(true);
    expect(wp.allowRunningInsecureContent).toBe(false);
    expect(wp.webviewTag).toBe(false);
    expect(wp.experimentalFeatures).toBe(false);
    expect(wp.navigateOnDragDrop).toBe(false);
  });

  it('uses the given preload and the configured sizes', () => {
    expect(wp.preload).toBe('/app/dist/main/preload.cjs');
    expect([o.width, o.height, o.minWidth, o.minHeight]).toEqual([1440, 900, 1280, 800]);
    expect(o.show).toBe(false);
  });

  it('sets nothing that would weaken the defaults', () => {
    const keys = Object.keys(secureWebPreferences('/p'));
    for (const k of ['enableBlinkFeatures', 'additionalArguments', 'disableBlinkFeatures', 'partition', 'devTools'] as const)
      expect(keys).not.toContain(k);
  });
});

describe('app URL check', () => {
  it('accepts our index and refuses every other origin', () => {
    expect(appIndexUrl()).toBe('app://slewsmith/index.html');
    expect(isAppUrl(appIndexUrl())).toBe(true);
    expect(isAppUrl('app://slewsmith/assets/index-abc.js')).toBe(true);
    for (const u of [
      'app://other/index.html',
      'file:///index.html',
      'https://slewsmith/index.html',
      'http://127.0.0.1/',
      'app://slewsmith.evil/',
      'javascript:alert(1)',
      'not a url',
      '',
    ])
      expect(isAppUrl(u), u).toBe(false);
  });
});

function fakeContents() {
  const handlers = new Map<string, (...a: unknown[]) => unknown>();
  let openHandler: ((d: { url: string }) => { action: string }) | null = null;
  const contents = {
    on(event: string, fn: (...a: unknown[]) => unknown) {
      handlers.set(event, fn);
      return contents;
    },
    setWindowOpenHandler(fn: (d: { url: string }) => { action: string }) {
      openHandler = fn;
    },
  };
  return { contents: contents as unknown as HardenableContents, handlers, open: (url: string) => openHandler!({ url }) };
}

describe('web contents hardening', () => {
  it('prevents every navigation and redirect, including to our own origin', () => {
    const f = fakeContents();
    const log = vi.fn();
    hardenWebContents(f.contents, log);
    for (const event of ['will-navigate', 'will-redirect'])
      for (const url of ['https://example.org/', 'app://slewsmith/index.html', 'file:///etc/passwd']) {
        const e = { preventDefault: vi.fn() };
        f.handlers.get(event)!(e, url);
        expect(e.preventDefault, `${event} ${url}`).toHaveBeenCalledOnce();
      }
    expect(log).toHaveBeenCalledWith('blocked navigation to https://example.org/');
  });

  it('prevents webviews and denies every new window', () => {
    const f = fakeContents();
    hardenWebContents(f.contents);
    const e = { preventDefault: vi.fn() };
    f.handlers.get('will-attach-webview')!(e);
    expect(e.preventDefault).toHaveBeenCalledOnce();
    for (const url of ['https://example.org/', 'app://slewsmith/index.html', 'about:blank'])
      expect(f.open(url)).toEqual({ action: 'deny' });
  });
});

describe('session hardening', () => {
  type Headers = { responseHeaders?: Record<string, string[]> };
  interface FakeSession {
    request: null | ((c: unknown, p: string, cb: (g: boolean) => void) => void);
    check: null | ((c: unknown, p: string) => boolean);
    headers: null | ((d: Headers, cb: (r: Headers) => void) => void);
    setPermissionRequestHandler(h: FakeSession['request']): void;
    setPermissionCheckHandler(h: FakeSession['check']): void;
    webRequest: { onHeadersReceived(h: NonNullable<FakeSession['headers']>): void };
  }
  function fakeSession(): FakeSession {
    const s: FakeSession = {
      request: null,
      check: null,
      headers: null,
      setPermissionRequestHandler(h) {
        s.request = h;
      },
      setPermissionCheckHandler(h) {
        s.check = h;
      },
      webRequest: {
        onHeadersReceived(h) {
          s.headers = h;
        },
      },
    };
    return s;
  }

  it('denies every permission request and check', () => {
    const s = fakeSession();
    hardenSession(s, contentSecurityPolicy);
    for (const p of ['media', 'geolocation', 'notifications', 'clipboard-read', 'fullscreen', 'openExternal', 'hid', 'serial']) {
      const cb = vi.fn();
      s.request!({}, p, cb);
      expect(cb, p).toHaveBeenCalledWith(false);
      expect(s.check!({}, p)).toBe(false);
    }
  });

  it('puts our CSP on every response, replacing any other CSP header', () => {
    const s = fakeSession();
    hardenSession(s, contentSecurityPolicy);
    const cb = vi.fn();
    s.headers!(
      { responseHeaders: { 'content-security-policy': ["default-src *; script-src 'unsafe-eval'"], 'Content-Type': ['text/html'] } },
      cb,
    );
    expect(cb).toHaveBeenCalledWith({
      responseHeaders: { 'Content-Type': ['text/html'], 'Content-Security-Policy': [contentSecurityPolicy] },
    });
    expect(withCspHeader(undefined, 'x')).toEqual({ 'Content-Security-Policy': ['x'] });
  });
});

describe('content security policy', () => {
  it('allows scripts from our own origin only: no eval, no inline, no remote', () => {
    expect(cspDirectives['script-src']).toEqual(["'self'"]);
    expect(cspDirectives['default-src']).toEqual(["'self'"]);
    expect(contentSecurityPolicy).not.toMatch(/unsafe-eval|unsafe-inline|wasm-unsafe-eval|https?:|\*/);
    expect(cspDirectives['object-src']).toEqual(["'none'"]);
    expect(cspDirectives['connect-src']).toEqual(["'self'"]);
  });

  it('serialises as directive;directive with every directive once', () => {
    const parts = contentSecurityPolicy.split('; ');
    expect(parts.map((p) => p.split(' ')[0])).toEqual(Object.keys(cspDirectives));
    expect(parts[0]).toBe("default-src 'self'");
  });

  it('is configured for the documented window and protocol', () => {
    expect(electronConfig.protocol).toEqual({ scheme: 'app', host: 'slewsmith', index: 'index.html' });
  });
});

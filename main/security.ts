/**
 * Window and session hardening. Pure functions over the small parts of Electron they touch, so the
 * unit tests check every rule without the Electron binary.
 *
 * The rules follow Electron's own security checklist: isolated, sandboxed renderer without Node;
 * load only our own index; no navigation, no new windows, no webviews; every permission denied; a
 * strict CSP on every response.
 */
import type { BrowserWindowConstructorOptions, WebPreferences } from 'electron';
import { electronConfig } from '../electron.config';

export function secureWebPreferences(preloadPath: string): WebPreferences {
  return {
    preload: preloadPath,
    contextIsolation: true,
    sandbox: true,
    nodeIntegration: false,
    nodeIntegrationInWorker: false,
    nodeIntegrationInSubFrames: false,
    webSecurity: true,
    allowRunningInsecureContent: false,
    webviewTag: false,
    experimentalFeatures: false,
    navigateOnDragDrop: false,
    spellcheck: false,
    safeDialogs: true,
  };
}

export function mainWindowOptions(preloadPath: string): BrowserWindowConstructorOptions {
  const w = electronConfig.window;
  return {
    width: w.width,
    height: w.height,
    minWidth: w.minWidth,
    minHeight: w.minHeight,
    backgroundColor: w.backgroundColor,
    title: electronConfig.productName,
    // Shown on 'ready-to-show' so the first paint is the app, not an empty frame.
    show: false,
    webPreferences: secureWebPreferences(preloadPath),
  };
}

/** The only URLs the renderer may be on: our scheme and host. */
export function isAppUrl(url: string): boolean {
  let u: URL;
  try {
    u = new URL(url);
  } catch {
    return false;
  }
  // Node's URL gives non-special schemes an opaque 'null' origin, so compare the parts.
  return u.protocol === `${electronConfig.protocol.scheme}:` && u.host === electronConfig.protocol.host;
}

/** Our index page itself (query and hash aside): the only page that may talk to main. */
export function isAppIndexUrl(url: string): boolean {
  if (!isAppUrl(url)) return false;
  const pathname = new URL(url).pathname;
  return pathname === '/' || pathname === `/${electronConfig.protocol.index}`;
}

export function appIndexUrl(): string {
  const p = electronConfig.protocol;
  return `${p.scheme}://${p.host}/${p.index}`;
}

/** The part of WebContents the hardening needs. */
export interface HardenableContents {
  on(event: 'will-navigate', listener: (event: { preventDefault(): void }, url: string) => void): unknown;
  on(event: 'will-redirect', listener: (event: { preventDefault(): void }, url: string) => void): unknown;
  on(event: 'will-attach-webview', listener: (event: { preventDefault(): void }) => void): unknown;
  setWindowOpenHandler(handler: (details: { url: string }) => { action: 'deny' }): void;
}

export interface HardeningLog {
  (message: string): void;
}

/**
 * Blocks every navigation away from the loaded page (the app never navigates: it is one page),
 * every redirect, webview and new window. Blocked URLs are logged so a surprise shows up.
 */
export function hardenWebContents(contents: HardenableContents, log: HardeningLog = () => {}): void {
  contents.on('will-navigate', (event, url) => {
    event.preventDefault();
    log(`blocked navigation to ${url}`);
  });
  contents.on('will-redirect', (event, url) => {
    event.preventDefault();
    log(`blocked redirect to ${url}`);
  });
  contents.on('will-attach-webview', (event) => {
    event.preventDefault();
    log('blocked a webview');
  });
  contents.setWindowOpenHandler(({ url }) => {
    log(`denied a new window for ${url}`);
    return { action: 'deny' };
  });
}

/** The part of Session the hardening needs. */
export interface HardenableSession {
  setPermissionRequestHandler(
    handler: ((webContents: unknown, permission: string, callback: (granted: boolean) => void) => void) | null,
  ): void;
  setPermissionCheckHandler(handler: ((webContents: unknown, permission: string) => boolean) | null): void;
  webRequest: {
    onHeadersReceived(
      listener: (
        details: { responseHeaders?: Record<string, string[]> },
        callback: (response: { responseHeaders?: Record<string, string[]> }) => void,
      ) => void,
    ): void;
  };
}

/** Denies every permission (camera, notifications, clipboard-read, …): the app needs none. */
export function hardenSession(session: HardenableSession, csp: string, log: HardeningLog = () => {}): void {
  session.setPermissionRequestHandler((_contents, permission, callback) => {
    log(`denied permission ${permission}`);
    callback(false);
  });
  session.setPermissionCheckHandler(() => false);
  session.webRequest.onHeadersReceived((details, callback) => {
    callback({ responseHeaders: withCspHeader(details.responseHeaders, csp) });
  });
}

/** Response headers with our CSP replacing any CSP already there (header names are case-insensitive). */
export function withCspHeader(headers: Record<string, string[]> | undefined, csp: string): Record<string, string[]> {
  const out: Record<string, string[]> = {};
  for (const [name, value] of Object.entries(headers ?? {})) {
    if (name.toLowerCase() !== 'content-security-policy') out[name] = value;
  }
  out['Content-Security-Policy'] = [csp];
  return out;
}

/**
 * main/app-main.ts with a fake Electron: the startup switches, the window it opens, the protocol
 * it serves, the session and web-contents locks, the IPC handlers, the menu and the close guard
 * are all wired as the modules' own tests assume.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import type { MenuItemConstructorOptions } from 'electron';
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import { EventChannels, InvokeChannels, NotifyChannels } from '../../app/bridge/channels';
import { contentSecurityPolicy } from '../../electron.config';
import { startDesktopApp, type ElectronModules } from '../../main/app-main';
import { flattenMenu } from '../../main/menu';
import { fakeValidator, GOOD_SCENARIO, OWN_FRAME, recordingIpc, tempDir } from './main-fakes';

type Listener = (...a: unknown[]) => unknown;

class FakeWindow {
  static instances: FakeWindow[] = [];
  readonly options: Record<string, unknown>;
  readonly listeners = new Map<string, Listener[]>();
  readonly webContents = { send: vi.fn() };
  readonly calls: string[] = [];
  title = '';
  constructor(options: Record<string, unknown>) {
    this.options = options;
    FakeWindow.instances.push(this);
  }
  on(event: string, fn: Listener) {
    this.listeners.set(event, [...(this.listeners.get(event) ?? []), fn]);
    return this;
  }
  once(event: string, fn: Listener) {
    return this.on(event, fn);
  }
  emit(event: string, ...args: unknown[]) {
    for (const fn of this.listeners.get(event) ?? []) fn(...args);
  }
  loadURL(url: string) {
    this.calls.push(`loadURL ${url}`);
    return Promise.resolve();
  }
  setTitle(t: string) {
    this.title = t;
  }
  setDocumentEdited(d: boolean) {
    this.calls.push(`edited ${d}`);
  }
  setRepresentedFilename() {}
  show() {
    this.calls.push('show');
  }
  isMinimized() {
    return false;
  }
  restore() {}
  focus() {}
  /** Like Electron: emits 'close' with a preventable event; closes unless prevented. */
  close() {
    let prevented = false;
    this.emit('close', { preventDefault: () => (prevented = true) });
    this.calls.push(prevented ? 'close prevented' : 'closed');
  }
}

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
  FakeWindow.instances = [];
  await fsp.mkdir(path.join(dir, 'dist/main'), { recursive: true });
  await fsp.mkdir(path.join(dir, 'dist/renderer'), { recursive: true });
  await fsp.writeFile(path.join(dir, 'dist/renderer/index.html'), '<!doctype html><title>Slewsmith</title>');
  await fsp.writeFile(path.join(dir, 'demo.scenario.json'), JSON.stringify(GOOD_SCENARIO));
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

function fakeElectron() {
  const appListeners = new Map<string, Listener>();
  const calls: string[] = [];
  let protocolHandler: ((r: { url: string; method: string }) => Promise<Response>) | null = null;
  let menuTemplate: MenuItemConstructorOptions[] = [];
  const messageAnswers: number[] = [];
  type PermissionHandler = null | ((c: unknown, p: string, cb: (g: boolean) => void) => void);
  const session: {
    permission: PermissionHandler;
    setPermissionRequestHandler(h: PermissionHandler): void;
    setPermissionCheckHandler(): void;
    webRequest: { onHeadersReceived(): void };
  } = {
    permission: null,
    setPermissionRequestHandler(h) {
      session.permission = h;
    },
    setPermissionCheckHandler() {},
    webRequest: { onHeadersReceived() {} },
  };
  const ipc = recordingIpc();
  const e = {
    app: {
      enableSandbox: () => calls.push('enableSandbox'),
      setName: (n: string) => calls.push(`setName ${n}`),
      setAppUserModelId: () => {},
      requestSingleInstanceLock: () => true,
      quit: () => calls.push('quit'),
      on: (event: string, fn: Listener) => appListeners.set(event, fn),
      whenReady: () => Promise.resolve(),
      getPath: (name: string) => path.join(dir, name),
      isPackaged: false,
      getVersion: () => '0.1.0',
    },
    protocol: {
      registerSchemesAsPrivileged: (schemes: unknown) => calls.push(`privileged ${JSON.stringify(schemes)}`),
      handle: (scheme: string, fn: typeof protocolHandler) => {
        calls.push(`handle ${scheme}`);
        protocolHandler = fn;
      },
    },
    session: { defaultSession: session },
    ipcMain: ipc,
    Menu: {
      buildFromTemplate: (t: MenuItemConstructorOptions[]) => {
        menuTemplate = t;
        return { t };
      },
      setApplicationMenu: () => calls.push('setApplicationMenu'),
    },
    dialog: {
      showMessageBox: async () => ({ response: messageAnswers.shift() ?? 2 }),
      showOpenDialog: async () => ({ canceled: true, filePaths: [] }),
      showSaveDialog: async () => ({ canceled: true }),
    },
    BrowserWindow: FakeWindow,
  };
  return {
    e: e as unknown as ElectronModules,
    calls,
    appListeners,
    ipc,
    session,
    messageAnswers,
    protocol: () => protocolHandler!,
    menu: () => menuTemplate,
  };
}

async function started(argv: string[] = ['electron', 'main.cjs']) {
  const f = fakeElectron();
  startDesktopApp(f.e, { mainDir: path.join(dir, 'dist/main'), argv, cwd: dir, validateScenario: fakeValidator, log: () => {} });
  await new Promise((r) => setTimeout(r, 0));
  return { ...f, win: FakeWindow.instances[0]! };
}

describe('desktop wiring', () => {
  it('registers the privileged app scheme and turns the sandbox on before ready', async () => {
    const f = await started();
    expect(f.calls[0]).toBe(
      'privileged [{"scheme":"app","privileges":{"standard":true,"secure":true,"supportFetchAPI":true,"corsEnabled":true}}]',
    );
    expect(f.calls[1]).toBe('enableSandbox');
  });

  it('opens one hardened window on our index with the built preload', async () => {
    const { win } = await started();
    expect(FakeWindow.instances).toHaveLength(1);
    const wp = win.options.webPreferences as Record<string, unknown>;
    expect(wp).toMatchObject({ contextIsolation: true, sandbox: true, nodeIntegration: false, webSecurity: true });
    expect(wp.preload).toBe(path.join(dir, 'dist/main/preload.cjs'));
    expect(win.calls).toContain('loadURL app://slewsmith/index.html');
    win.emit('ready-to-show');
    expect(win.calls).toContain('show');
  });

  it('serves dist/renderer through app:// with the CSP', async () => {
    const f = await started();
    const res = await f.protocol()({ url: 'app://slewsmith/index.html', method: 'GET' });
    expect(res.status).toBe(200);
    expect(await res.text()).toContain('<title>Slewsmith</title>');
    expect(res.headers.get('content-security-policy')).toBe(contentSecurityPolicy);
  });

  it('denies permissions on the session and locks every new web contents', async () => {
    const f = await started();
    const cb = vi.fn();
    f.session.permission!({}, 'media', cb);
    expect(cb).toHaveBeenCalledWith(false);
    const on = vi.fn();
    const setWindowOpenHandler = vi.fn();
    f.appListeners.get('web-contents-created')!({}, { on, setWindowOpenHandler });
    expect(on.mock.calls.map((c) => c[0]).sort()).toEqual(['will-attach-webview', 'will-navigate', 'will-redirect']);
    expect(setWindowOpenHandler.mock.calls[0]![0]({ url: 'https://example.org' })).toEqual({ action: 'deny' });
  });

  it('handles every bridge channel and opens the --demo file as a template', async () => {
    const f = await started(['electron', 'main.cjs', `--demo=${path.join(dir, 'demo.scenario.json')}`]);
    expect([...f.ipc.handlers.keys()].sort()).toEqual(Object.values(InvokeChannels).sort());
    const r = await f.ipc.handlers.get(InvokeChannels.initialScenario)!(OWN_FRAME);
    expect(r).toMatchObject({ status: 'opened', template: true, scenario: GOOD_SCENARIO });
    expect(f.win.title).toBe('demo.scenario.json — Slewsmith');
  });

  it('sends menu commands to the window and quits through the app', async () => {
    const f = await started();
    expect(f.calls).toContain('setApplicationMenu');
    const items = flattenMenu(f.menu());
    (items.find((i) => i.label === 'Save')!.click as () => void)();
    expect(f.win.webContents.send).toHaveBeenCalledWith(EventChannels.command, 'save');
    (items.find((i) => i.accelerator === 'CmdOrCtrl+Q')!.click as () => void)();
    expect(f.calls.at(-1)).toBe('quit');
  });

  it('guards closing with unsaved changes: Cancel keeps the window, Don\u2019t Save closes it', async () => {
    const f = await started();
    f.ipc.listeners.get(NotifyChannels.setDirty)!(OWN_FRAME, true);
    expect(f.win.title).toBe('• untitled.scenario.json — Slewsmith');
    f.messageAnswers.push(2);
    f.win.close();
    await new Promise((r) => setTimeout(r, 0));
    expect(f.win.calls.filter((c) => c.startsWith('close'))).toEqual(['close prevented']);
    f.messageAnswers.push(1);
    f.win.close();
    await new Promise((r) => setTimeout(r, 0));
    expect(f.win.calls.filter((c) => c.startsWith('close'))).toEqual(['close prevented', 'close prevented', 'closed']);
  });

  it('keeps the window title its own', async () => {
    const { win } = await started();
    const e = { preventDefault: vi.fn() };
    win.emit('page-title-updated', e);
    expect(e.preventDefault).toHaveBeenCalled();
  });
});

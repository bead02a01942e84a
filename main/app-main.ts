/**
 * Wires the desktop app together. Electron's modules arrive as a parameter (main/electron-main.ts
 * is the one file that imports `electron`), so this module loads in plain Node too.
 */
import type * as E from 'electron';
import path from 'node:path';
import fsp from 'node:fs/promises';
import { EventChannels } from '../app/bridge/channels';
import type { UiCommand } from '../app/bridge/api';
import { contentSecurityPolicy, electronConfig } from '../electron.config';
import { DocumentService, windowTitle, type DocumentState } from './documents';
import { registerIpc, type IpcMainLike } from './ipc';
import { parseLaunchArgs } from './launch-args';
import { buildMenuTemplate } from './menu';
import type { ScenarioValidator } from './payloads';
import { createAppProtocolHandler } from './protocol';
import { createRecentFiles } from './recent-files';
import { createWriteFolders, sweepWriteFolders } from './temp-files';
import {
  appIndexUrl,
  hardenSession,
  hardenWebContents,
  mainWindowOptions,
  type HardenableContents,
  type HardenableSession,
} from './security';

export interface ElectronModules {
  app: E.App;
  BrowserWindow: typeof E.BrowserWindow;
  Menu: typeof E.Menu;
  dialog: E.Dialog;
  ipcMain: E.IpcMain;
  protocol: E.Protocol;
  session: typeof E.session;
}

export interface DesktopOptions {
  /** Folder of the main bundle (dist/main); preload and renderer are found relative to it. */
  mainDir: string;
  argv: readonly string[];
  cwd: string;
  validateScenario: ScenarioValidator;
  log?: (message: string) => void;
}

/** Must run before the app is ready (scheme registration and sandbox switch are startup-only). */
export function startDesktopApp(e: ElectronModules, options: DesktopOptions): void {
  const { app } = e;
  const log = options.log ?? ((m: string) => console.log(`[slewsmith] ${m}`));
  const cfg = electronConfig;

  // standard: real origin and relative URLs; secure: a secure context like https; supportFetchAPI:
  // fetch() of the demo and assets; corsEnabled: module scripts and module workers load in CORS
  // mode, which Chromium allows only on CORS-enabled schemes (responses carry no
  // Access-Control-Allow-Origin, so other origins still cannot read them).
  e.protocol.registerSchemesAsPrivileged([
    { scheme: cfg.protocol.scheme, privileges: { standard: true, secure: true, supportFetchAPI: true, corsEnabled: true } },
  ]);
  app.enableSandbox();
  app.setName(cfg.productName);
  if (process.platform === 'win32') app.setAppUserModelId(cfg.appId);

  if (!app.requestSingleInstanceLock()) {
    app.quit();
    return;
  }

  // Every web contents, including any a bug might create, gets the same locks.
  app.on('web-contents-created', (_event, contents) => hardenWebContents(contents as unknown as HardenableContents, log));

  let win: E.BrowserWindow | null = null;
  app.on('second-instance', () => {
    if (!win) return;
    if (win.isMinimized()) win.restore();
    win.focus();
  });
  app.on('window-all-closed', () => app.quit());

  void app.whenReady().then(() => {
    const rendererDir = path.resolve(options.mainDir, cfg.output.rendererFromMain);
    e.protocol.handle(
      cfg.protocol.scheme,
      createAppProtocolHandler({ rootDir: rendererDir, csp: contentSecurityPolicy, readFile: (p) => fsp.readFile(p) }),
    );
    hardenSession(e.session.defaultSession as unknown as HardenableSession, contentSecurityPolicy, log);

    const send = (command: UiCommand) => win?.webContents.send(EventChannels.command, command);
    const userData = app.getPath('userData');
    const recent = createRecentFiles({
      fs: fsp,
      file: path.join(userData, cfg.recentFiles.fileName),
      max: cfg.recentFiles.max,
      log,
    });
    // Temporary files a killed write left in the folders we wrote to (and our data folder).
    const writeFolders = createWriteFolders({
      fs: fsp,
      file: path.join(userData, cfg.tempFiles.foldersFileName),
      max: cfg.tempFiles.maxFolders,
    });
    void writeFolders
      .list()
      .then((folders) => sweepWriteFolders(fsp, [userData, ...folders]))
      .then((removed) => {
        for (const f of removed) log(`removed a stale temporary file: ${f}`);
      });
    let allowClose = false;
    const documents = new DocumentService({
      noteWriteFolder: (dir) => writeFolders.note(dir),
      fs: fsp,
      validateScenario: options.validateScenario,
      recent,
      documentsDir: app.getPath('documents'),
      launch: parseLaunchArgs(options.argv, app.isPackaged, options.cwd),
      sendCommand: send,
      dialogs: {
        showOpenDialog: (o) => (win ? e.dialog.showOpenDialog(win, o) : e.dialog.showOpenDialog(o)),
        showSaveDialog: (o) => (win ? e.dialog.showSaveDialog(win, o) : e.dialog.showSaveDialog(o)),
        showMessageBox: (o) => (win ? e.dialog.showMessageBox(win, o) : e.dialog.showMessageBox(o)),
      },
      onStateChange: (state: Readonly<DocumentState>) => {
        if (!win) return;
        win.setTitle(windowTitle(state));
        win.setDocumentEdited(state.dirty);
        if (state.path) win.setRepresentedFilename(state.path);
      },
      closeWindow: () => {
        allowClose = true;
        win?.close();
      },
    });

    registerIpc(e.ipcMain as unknown as IpcMainLike, {
      documents,
      recentFiles: () => recent.list(),
      exportBytes: cfg.limits.exportBytes,
      log,
      appInfo: () => ({
        name: cfg.productName,
        version: app.getVersion(),
        shell: 'desktop',
        platform: process.platform,
        versions: { electron: process.versions.electron ?? '', chrome: process.versions.chrome ?? '', node: process.versions.node },
      }),
    });

    e.Menu.setApplicationMenu(
      e.Menu.buildFromTemplate(buildMenuTemplate({ platform: process.platform, send, quit: () => app.quit(), developer: !app.isPackaged })),
    );

    win = new e.BrowserWindow(mainWindowOptions(path.join(options.mainDir, cfg.output.preloadFile)));
    win.setTitle(windowTitle(documents.current));
    win.once('ready-to-show', () => win?.show());
    // The title is ours (document name and edited marker), not the page's <title>.
    win.on('page-title-updated', (event) => event.preventDefault());
    win.on('close', (event) => {
      if (allowClose) return;
      event.preventDefault();
      void documents.requestClose().then((decision) => {
        if (decision === 'close') {
          allowClose = true;
          win?.close();
        }
      });
    });
    win.on('closed', () => {
      win = null;
    });
    void win.loadURL(appIndexUrl());
  });
}

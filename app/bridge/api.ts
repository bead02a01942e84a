/**
 * The typed contract between the UI and its shell. In the desktop app the preload exposes an
 * object of this type as `window.slewsmith`; in a plain browser app/bridge/browser-fallback.ts
 * implements the same interface with file inputs and downloads. The UI gets one through
 * `getBridge()` (app/bridge/index.ts) and never knows which it has, except through `shell`.
 *
 * Everything crossing the bridge is structured-clonable data. Expected outcomes (the user cancelled,
 * the file is not a valid scenario, the disk refused) are results, never rejections; a rejected
 * promise means a programming error or a refused sender.
 *
 * The renderer never names a path to write: main keeps the current document's path and asks the
 * user through native dialogs. The only path the renderer may pass is one from `recentFiles()`.
 */
import type { Issue } from '../engine/errors';
import type { UiCommand } from './commands';

export type { MenuCommand, UiCommand } from './commands';
export type { Issue } from '../engine/errors';

export type ShellKind = 'desktop' | 'browser';

export interface FileRef {
  /** Absolute path on disk; null in the browser, where pages never see paths. */
  path: string | null;
  /** File name for titles and suggestions, e.g. `lumen6-imaging.scenario.json`. */
  name: string;
}

export type OpenResult =
  | {
      status: 'opened';
      file: FileRef;
      /**
       * The file's JSON, already accepted by the scenario validator on the shell side. Run
       * `validateScenario` on it in the renderer to get the typed value (it is cheap and keeps the
       * bridge free of engine classes).
       */
      scenario: unknown;
      warnings: Issue[];
      /** True for the bundled demo: an untitled copy, so Save asks where to write. */
      template: boolean;
    }
  | { status: 'cancelled' }
  | { status: 'invalid'; file: FileRef; errors: Issue[]; warnings: Issue[] }
  | { status: 'failed'; message: string };

export type SaveResult =
  | { status: 'saved'; file: FileRef }
  | { status: 'cancelled' }
  | { status: 'invalid'; errors: Issue[] }
  | { status: 'failed'; message: string };

export interface ExportRequest {
  /** A bare file name with its extension, e.g. `lumen6-slew1.aem`; no folders. */
  suggestedName: string;
  content: string | Uint8Array;
}

export type ExportResult =
  | { status: 'exported'; file: FileRef }
  | { status: 'cancelled' }
  | { status: 'invalid'; errors: Issue[] }
  | { status: 'failed'; message: string };

export type NewResult = { status: 'created' } | { status: 'cancelled' };

export interface RecentFile {
  path: string;
  name: string;
  /** ISO 8601 UTC. */
  openedAt: string;
}

export interface AppInfo {
  name: string;
  version: string;
  shell: ShellKind;
  platform: string;
  /** Runtime versions worth showing in an About box (electron, chrome, node, or the user agent). */
  versions: Record<string, string>;
}

export interface SlewsmithBridge {
  readonly shell: ShellKind;
  /** Asks about unsaved changes first, then shows an open dialog. */
  openScenario(): Promise<OpenResult>;
  /** `path` must be one returned by recentFiles(); anything else is refused. */
  openRecent(path: string): Promise<OpenResult>;
  /**
   * The document the shell was launched with (the demo under `npm start` and `npm run web`), or
   * none. Call it at startup; each call opens that document again and makes it current.
   */
  initialScenario(): Promise<OpenResult | { status: 'none' }>;
  /** Asks about unsaved changes, then forgets the current path so the next Save asks. */
  newScenario(): Promise<NewResult>;
  /** Writes to the current document's path, or asks for one when there is none. */
  saveScenario(scenario: unknown): Promise<SaveResult>;
  saveScenarioAs(scenario: unknown): Promise<SaveResult>;
  /**
   * The answer to the shell's 'save-before-close' command: saves like `saveScenario`, and the
   * shell closes the window when it succeeds. Every other save leaves the window open.
   */
  saveBeforeClose(scenario: unknown): Promise<SaveResult>;
  /** Asks where to write (suggesting `suggestedName`) and writes `content` there. */
  exportFile(request: ExportRequest): Promise<ExportResult>;
  recentFiles(): Promise<RecentFile[]>;
  appInfo(): Promise<AppInfo>;
  /** Tell the shell whether there are unsaved edits; it guards close and open with this. */
  setDirty(dirty: boolean): void;
  /** Menu items, shortcuts and the shell's own requests; returns an unsubscribe function. */
  onCommand(listener: (command: UiCommand) => void): () => void;
}

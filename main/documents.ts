/**
 * The open document and everything that reads or writes files for it: open, save, save as, export,
 * recent files, and the unsaved-changes guard on open, new and close.
 *
 * Main writes a scenario only to a path the user chose in one of main's own dialogs this session
 * (open, save as) or gave on the command line. A document opened from the recent-files list (a
 * path the renderer names) gets a confirmation from main before the first write to it, so a
 * compromised renderer cannot overwrite a listed file without the user seeing a native dialog.
 *
 * Dialogs, the file system, the scenario validator and the way to reach the renderer are all
 * parameters; main/app-main.ts passes Electron's and Node's, the tests pass fakes.
 */
import path from 'node:path';
import type { MessageBoxOptions, OpenDialogOptions, SaveDialogOptions } from 'electron';
import type { ExportRequest, ExportResult, FileRef, NewResult, OpenResult, SaveResult, UiCommand } from '../app/bridge/api';
import { electronConfig } from '../electron.config';
import { writeFileAtomic, type AtomicFs } from './atomic-write';
import { readScenarioFile } from './scenario-file';
import { checkScenarioForSave, UNTITLED_SCENARIO, withJsonExtension, type ScenarioValidator } from '../app/bridge/checks';
import type { RecentFiles } from './recent-files';

export interface Dialogs {
  showOpenDialog(options: OpenDialogOptions): Promise<{ canceled: boolean; filePaths: string[] }>;
  showSaveDialog(options: SaveDialogOptions): Promise<{ canceled: boolean; filePath?: string }>;
  showMessageBox(options: MessageBoxOptions): Promise<{ response: number }>;
}

export interface DocumentFs extends AtomicFs {
  /** The raw bytes: decoding is the shared reader's job (strict UTF-8, no replacement characters). */
  readFile(filePath: string): Promise<Uint8Array>;
  stat(filePath: string): Promise<{ mode: number; size: number; isFile(): boolean; isDirectory(): boolean }>;
}

export interface DocumentState {
  /** Where Save writes; null for an untitled document (Save then asks). */
  path: string | null;
  name: string;
  dirty: boolean;
}

/** What the app was launched with: a file to open, or the demo to open as an untitled copy. */
export type LaunchDocument = { kind: 'file'; path: string } | { kind: 'template'; path: string } | null;

export interface DocumentServiceDeps {
  fs: DocumentFs;
  dialogs: Dialogs;
  validateScenario: ScenarioValidator;
  recent: RecentFiles;
  /** Default folder for save dialogs (the user's documents folder). */
  documentsDir: string;
  launch?: LaunchDocument;
  sendCommand(command: UiCommand): void;
  /**
   * Told about a folder before the first byte is written there (best effort), so the next start
   * can sweep stale temporary files a killed write left behind (main/temp-files.ts).
   */
  noteWriteFolder?(dir: string): void;
  /** Called after every change of path, name or dirty flag (window title, macOS edited dot). */
  onStateChange?(state: Readonly<DocumentState>): void;
  /** Closes the window for real (after the guard said yes). */
  closeWindow(): void;
  limits?: { scenarioBytes: number; exportBytes: number };
}

export type CloseDecision = 'close' | 'keep';

export const UNTITLED = UNTITLED_SCENARIO;

const SCENARIO_FILTERS = [
  { name: 'Slewsmith scenario', extensions: ['json'] },
  { name: 'All files', extensions: ['*'] },
];

const EXPORT_FILTER_NAMES: Readonly<Record<string, string>> = {
  csv: 'CSV table',
  json: 'JSON',
  aem: 'CCSDS attitude ephemeris message',
  txt: 'Text',
  png: 'PNG image',
  svg: 'SVG image',
};

function fileRef(p: string): FileRef {
  return { path: p, name: path.basename(p) };
}

export class DocumentService {
  private readonly deps: DocumentServiceDeps;
  private readonly limits: { scenarioBytes: number; exportBytes: number };
  private readonly state: DocumentState = { path: null, name: UNTITLED, dirty: false };
  /** A close is waiting for the renderer's save-before-close; ordinary saves never close. */
  private closePending = false;
  private lastExportDir: string | null = null;
  /** Paths the user chose in main's dialogs (or on the command line) this session. */
  private readonly chosen = new Set<string>();

  constructor(deps: DocumentServiceDeps) {
    this.deps = deps;
    this.limits = deps.limits ?? electronConfig.limits;
    if (deps.launch?.kind === 'file') this.chosen.add(path.resolve(deps.launch.path));
  }

  get current(): Readonly<DocumentState> {
    return { ...this.state };
  }

  setDirty(dirty: boolean): void {
    if (this.state.dirty === dirty) return;
    this.state.dirty = dirty;
    this.changed();
  }

  async newScenario(): Promise<NewResult> {
    if (!(await this.confirmDiscard('start a new scenario'))) return { status: 'cancelled' };
    this.setDocument(null, UNTITLED);
    return { status: 'created' };
  }

  async openScenario(): Promise<OpenResult> {
    if (!(await this.confirmDiscard('open another scenario'))) return { status: 'cancelled' };
    const r = await this.deps.dialogs.showOpenDialog({
      title: 'Open scenario',
      defaultPath: this.state.path ? path.dirname(this.state.path) : this.deps.documentsDir,
      properties: ['openFile'],
      filters: SCENARIO_FILTERS,
    });
    if (r.canceled || r.filePaths.length === 0) return { status: 'cancelled' };
    const picked = r.filePaths[0]!;
    const opened = await this.openPath(picked, false);
    if (opened.status === 'opened') this.chosen.add(path.resolve(picked));
    return opened;
  }

  /** `filePath` came from the renderer: it must be on the recent list. */
  async openRecent(filePath: string): Promise<OpenResult> {
    if (!(await this.deps.recent.has(filePath))) return { status: 'failed', message: `${filePath} is not on the recent-files list` };
    if (!(await this.confirmDiscard('open another scenario'))) return { status: 'cancelled' };
    const r = await this.openPath(filePath, false);
    if (r.status === 'failed') await this.deps.recent.remove(filePath);
    return r;
  }

  /**
   * The launch document. Each call opens it again and makes it current, so a renderer reload (or
   * React's development double effects) ends up where main's document state is.
   */
  async initialScenario(): Promise<OpenResult | { status: 'none' }> {
    const launch = this.deps.launch;
    if (!launch) return { status: 'none' };
    return this.openPath(launch.path, launch.kind === 'template');
  }

  async saveScenario(scenario: unknown): Promise<SaveResult> {
    const checked = checkScenarioForSave(scenario, this.deps.validateScenario, this.limits.scenarioBytes);
    if (!checked.ok) return { status: 'invalid', errors: checked.errors };
    if (this.state.path === null) return this.askAndWrite(checked.value.text);
    return this.writeScenario(checked.value.text, this.state.path);
  }

  async saveScenarioAs(scenario: unknown): Promise<SaveResult> {
    // Validate before asking: an invalid scenario should not cost the user a dialog.
    const checked = checkScenarioForSave(scenario, this.deps.validateScenario, this.limits.scenarioBytes);
    if (!checked.ok) return { status: 'invalid', errors: checked.errors };
    return this.askAndWrite(checked.value.text);
  }

  /**
   * The renderer's answer to a close-with-save ('save-before-close'): an ordinary save that closes
   * the window when it succeeds and a close is still waiting. However it ends (saved, cancelled,
   * invalid, failed, thrown), the waiting close is over: a later ordinary Save never closes.
   */
  async saveBeforeClose(scenario: unknown): Promise<SaveResult> {
    const wasPending = this.closePending;
    try {
      const r = await this.saveScenario(scenario);
      if (wasPending && this.closePending && r.status === 'saved') this.deps.closeWindow();
      return r;
    } finally {
      this.closePending = false;
    }
  }

  async exportFile(request: ExportRequest): Promise<ExportResult> {
    const ext = path.extname(request.suggestedName).slice(1).toLowerCase();
    const filters = ext
      ? [
          { name: EXPORT_FILTER_NAMES[ext] ?? ext.toUpperCase(), extensions: [ext] },
          { name: 'All files', extensions: ['*'] },
        ]
      : [];
    const r = await this.deps.dialogs.showSaveDialog({
      title: 'Export',
      defaultPath: path.join(this.lastExportDir ?? this.deps.documentsDir, request.suggestedName),
      filters,
      properties: ['createDirectory', 'showOverwriteConfirmation'],
    });
    if (r.canceled || !r.filePath) return { status: 'cancelled' };
    this.deps.noteWriteFolder?.(path.dirname(r.filePath));
    const w = await writeFileAtomic(this.deps.fs, r.filePath, request.content);
    if (!w.ok) return { status: 'failed', message: w.message };
    this.lastExportDir = path.dirname(r.filePath);
    return { status: 'exported', file: fileRef(r.filePath) };
  }

  /**
   * The window wants to close. Clean: close. Dirty: ask Save / Don't Save / Cancel. Save asks the
   * renderer to save (main does not hold the document) with 'save-before-close'; the window closes
   * when that save (saveBeforeClose) succeeds.
   */
  async requestClose(): Promise<CloseDecision> {
    if (!this.state.dirty) return 'close';
    const { response } = await this.deps.dialogs.showMessageBox({
      type: 'warning',
      title: electronConfig.productName,
      message: `Save the changes to ${this.state.name} before closing?`,
      detail: 'Your changes are lost if you close without saving.',
      buttons: ['Save', "Don't Save", 'Cancel'],
      defaultId: 0,
      cancelId: 2,
      noLink: true,
    });
    if (response === 0) {
      this.closePending = true;
      this.deps.sendCommand('save-before-close');
      return 'keep';
    }
    if (response === 1) {
      this.setDirty(false);
      return 'close';
    }
    return 'keep';
  }

  private async confirmDiscard(action: string): Promise<boolean> {
    if (!this.state.dirty) return true;
    const { response } = await this.deps.dialogs.showMessageBox({
      type: 'warning',
      title: electronConfig.productName,
      message: `${this.state.name} has unsaved changes.`,
      detail: `Discard them and ${action}?`,
      buttons: ['Discard Changes', 'Cancel'],
      defaultId: 1,
      cancelId: 1,
      noLink: true,
    });
    return response === 0;
  }

  private async openPath(filePath: string, template: boolean): Promise<OpenResult> {
    const file = fileRef(filePath);
    const read = await readScenarioFile(this.deps.fs, filePath, this.limits.scenarioBytes);
    if (read.status === 'unreadable') return { status: 'failed', message: read.message };
    if (read.status === 'invalid') return { status: 'invalid', file, errors: read.errors, warnings: [] };
    const json = read.document.json;
    const v = this.deps.validateScenario(json);
    if (!v.ok) return { status: 'invalid', file, errors: v.errors, warnings: v.warnings };
    if (template) {
      this.setDocument(null, path.basename(filePath));
    } else {
      this.setDocument(filePath, file.name);
      await this.deps.recent.add(filePath);
    }
    return { status: 'opened', file: template ? { path: null, name: file.name } : file, scenario: json, warnings: v.warnings, template };
  }

  private async askAndWrite(text: string): Promise<SaveResult> {
    const r = await this.deps.dialogs.showSaveDialog({
      title: 'Save scenario as',
      defaultPath: withJsonExtension(this.state.path ?? path.join(this.deps.documentsDir, this.state.name)),
      filters: SCENARIO_FILTERS,
      properties: ['createDirectory', 'showOverwriteConfirmation'],
    });
    if (r.canceled || !r.filePath) return { status: 'cancelled' };
    // The dialog confirmed an overwrite of the name as typed; with `.json` added it may name another
    // file (GTK dialogs do not add the filter's extension): ask again for that one.
    const target = withJsonExtension(r.filePath);
    if (target !== r.filePath && (await this.exists(target)) && !(await this.confirmReplace(target))) return { status: 'cancelled' };
    this.chosen.add(path.resolve(target));
    return this.writeScenario(text, target);
  }

  private async writeScenario(text: string, target: string): Promise<SaveResult> {
    if (!this.chosen.has(path.resolve(target))) {
      if (!(await this.confirmUnchosenTarget(target))) return { status: 'cancelled' };
      this.chosen.add(path.resolve(target));
    }
    this.deps.noteWriteFolder?.(path.dirname(target));
    const w = await writeFileAtomic(this.deps.fs, target, text);
    if (!w.ok) return { status: 'failed', message: w.message };
    this.state.path = target;
    this.state.name = path.basename(target);
    this.state.dirty = false;
    this.changed();
    await this.deps.recent.add(target);
    return { status: 'saved', file: fileRef(target) };
  }

  private async exists(p: string): Promise<boolean> {
    try {
      await this.deps.fs.stat(p);
      return true;
    } catch {
      return false;
    }
  }

  private async confirmReplace(target: string): Promise<boolean> {
    const { response } = await this.deps.dialogs.showMessageBox({
      type: 'warning',
      title: electronConfig.productName,
      message: `${path.basename(target)} already exists. Replace it?`,
      detail: `${target}\n\nThe name you typed gets the .json extension, and a file of that name is already there.`,
      buttons: ['Replace', 'Cancel'],
      defaultId: 1,
      cancelId: 1,
      noLink: true,
    });
    return response === 0;
  }

  /** Main's own question before the first write to a path the user did not choose in a dialog. */
  private async confirmUnchosenTarget(target: string): Promise<boolean> {
    const { response } = await this.deps.dialogs.showMessageBox({
      type: 'question',
      title: electronConfig.productName,
      message: `Save over ${path.basename(target)}?`,
      detail: `${target}\n\nThis file was opened from the recent-files list. Slewsmith asks once per session before it first writes to such a file.`,
      buttons: ['Save', 'Cancel'],
      defaultId: 0,
      cancelId: 1,
      noLink: true,
    });
    return response === 0;
  }

  private setDocument(p: string | null, name: string): void {
    this.state.path = p;
    this.state.name = name;
    this.state.dirty = false;
    this.changed();
  }

  private changed(): void {
    this.deps.onStateChange?.({ ...this.state });
  }
}

/** Window title: product name, document name and an edited marker. */
export function windowTitle(state: Readonly<DocumentState>): string {
  return `${state.dirty ? '• ' : ''}${state.name} — ${electronConfig.productName}`;
}

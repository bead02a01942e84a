/**
 * The open document and everything that reads or writes files for it: open, save, save as, export,
 * recent files, and the unsaved-changes guard on open, new and close.
 *
 * Dialogs, the file system, the scenario validator and the way to reach the renderer are all
 * parameters; main/app-main.ts passes Electron's and Node's, the tests pass fakes.
 */
import path from 'node:path';
import type { MessageBoxOptions, OpenDialogOptions, SaveDialogOptions } from 'electron';
import type { ExportRequest, ExportResult, FileRef, MenuCommand, NewResult, OpenResult, SaveResult } from '../app/bridge/api';
import { issue } from '../app/engine/errors';
import { electronConfig } from '../electron.config';
import { writeFileAtomic, type AtomicFs } from './atomic-write';
import {
  checkScenarioForSave,
  parseScenarioText,
  UNTITLED_SCENARIO,
  withJsonExtension,
  type ScenarioValidator,
} from '../app/bridge/checks';
import type { RecentFiles } from './recent-files';

export interface Dialogs {
  showOpenDialog(options: OpenDialogOptions): Promise<{ canceled: boolean; filePaths: string[] }>;
  showSaveDialog(options: SaveDialogOptions): Promise<{ canceled: boolean; filePath?: string }>;
  showMessageBox(options: MessageBoxOptions): Promise<{ response: number }>;
}

export interface DocumentFs extends AtomicFs {
  readFile(filePath: string, encoding: 'utf8'): Promise<string>;
  stat(filePath: string): Promise<{ mode: number; size: number; isFile(): boolean }>;
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
  sendCommand(command: MenuCommand): void;
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

function message(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

function fileRef(p: string): FileRef {
  return { path: p, name: path.basename(p) };
}

export class DocumentService {
  private readonly deps: DocumentServiceDeps;
  private readonly limits: { scenarioBytes: number; exportBytes: number };
  private readonly state: DocumentState = { path: null, name: UNTITLED, dirty: false };
  private closeAfterSave = false;
  private lastExportDir: string | null = null;

  constructor(deps: DocumentServiceDeps) {
    this.deps = deps;
    this.limits = deps.limits ?? electronConfig.limits;
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
    return this.openPath(r.filePaths[0]!, false);
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
    if (!checked.ok) return this.saveEnded({ status: 'invalid', errors: checked.errors });
    if (this.state.path === null) return this.askAndWrite(checked.value.text);
    return this.writeScenario(checked.value.text, this.state.path);
  }

  async saveScenarioAs(scenario: unknown): Promise<SaveResult> {
    // Validate before asking: an invalid scenario should not cost the user a dialog.
    const checked = checkScenarioForSave(scenario, this.deps.validateScenario, this.limits.scenarioBytes);
    if (!checked.ok) return this.saveEnded({ status: 'invalid', errors: checked.errors });
    return this.askAndWrite(checked.value.text);
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
    const w = await writeFileAtomic(this.deps.fs, r.filePath, request.content);
    if (!w.ok) return { status: 'failed', message: w.message };
    this.lastExportDir = path.dirname(r.filePath);
    return { status: 'exported', file: fileRef(r.filePath) };
  }

  /**
   * The window wants to close. Clean: close. Dirty: ask Save / Don't Save / Cancel. Save asks the
   * renderer to save (main does not hold the document) and closes once that save succeeds.
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
      this.closeAfterSave = true;
      this.deps.sendCommand('save');
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
    let text: string;
    try {
      const st = await this.deps.fs.stat(filePath);
      if (!st.isFile()) return { status: 'failed', message: `${filePath} is not a file` };
      if (st.size > this.limits.scenarioBytes)
        return {
          status: 'invalid',
          file,
          errors: [issue('', 'max-size', `the file is ${st.size} bytes; a scenario is at most ${this.limits.scenarioBytes}`)],
          warnings: [],
        };
      text = await this.deps.fs.readFile(filePath, 'utf8');
    } catch (e) {
      return { status: 'failed', message: `Could not read ${filePath}: ${message(e)}` };
    }
    const v = parseScenarioText(text, this.deps.validateScenario);
    if (!v.ok) return { status: 'invalid', file, errors: v.errors, warnings: v.warnings };
    if (template) {
      this.setDocument(null, path.basename(filePath));
    } else {
      this.setDocument(filePath, file.name);
      await this.deps.recent.add(filePath);
    }
    return { status: 'opened', file: template ? { path: null, name: file.name } : file, scenario: v.value, warnings: v.warnings, template };
  }

  private async askAndWrite(text: string): Promise<SaveResult> {
    const r = await this.deps.dialogs.showSaveDialog({
      title: 'Save scenario as',
      defaultPath: this.state.path ?? path.join(this.deps.documentsDir, this.state.name),
      filters: SCENARIO_FILTERS,
      properties: ['createDirectory', 'showOverwriteConfirmation'],
    });
    if (r.canceled || !r.filePath) return this.saveEnded({ status: 'cancelled' });
    return this.writeScenario(text, withJsonExtension(r.filePath));
  }

  private async writeScenario(text: string, target: string): Promise<SaveResult> {
    const w = await writeFileAtomic(this.deps.fs, target, text);
    if (!w.ok) return this.saveEnded({ status: 'failed', message: w.message });
    this.state.path = target;
    this.state.name = path.basename(target);
    this.state.dirty = false;
    this.changed();
    await this.deps.recent.add(target);
    return this.saveEnded({ status: 'saved', file: fileRef(target) });
  }

  /** Finishes a save that a close was waiting for: close on success, stay open otherwise. */
  private saveEnded(r: SaveResult): SaveResult {
    if (this.closeAfterSave) {
      this.closeAfterSave = false;
      if (r.status === 'saved') this.deps.closeWindow();
    }
    return r;
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

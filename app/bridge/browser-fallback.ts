/**
 * The bridge in a plain browser (`npm run web`): the same typed API as the desktop preload, with
 * the file operations a page is allowed — a file input to open, downloads to save and export,
 * `confirm`/`prompt` for the questions a native dialog would ask, and a keyboard handler that
 * sends the same commands as the desktop menu.
 *
 * Pages never see paths, so every FileRef has `path: null` and there is no recent-files list.
 */
import type { AppInfo, ExportResult, OpenResult, SaveResult, SlewsmithBridge, UiCommand } from './api';
import {
  checkExportRequest,
  checkFileName,
  checkScenarioForSave,
  parseScenarioBytes,
  UNTITLED_SCENARIO,
  withJsonExtension,
  type ScenarioValidator,
} from './checks';
import { commandForChord } from './commands';
import { checkScenarioSize } from './scenario-bytes';

export interface BrowserBridgeOptions {
  validateScenario: ScenarioValidator;
  /** URL of the demo scenario, relative to the page; `initialScenario()` opens it once. */
  demoUrl?: string;
  version: string;
  limits: { scenarioBytes: number; exportBytes: number };
  win?: Window;
}

function isEditable(target: EventTarget | null): boolean {
  const el = target as HTMLElement | null;
  if (!el || typeof el.tagName !== 'string') return false;
  const tag = el.tagName.toLowerCase();
  return tag === 'input' || tag === 'textarea' || tag === 'select' || el.isContentEditable === true;
}

export function createBrowserBridge(o: BrowserBridgeOptions): SlewsmithBridge {
  const win = o.win ?? window;
  const doc = win.document;
  let name = UNTITLED_SCENARIO;
  let dirty = false;
  let demoBytes: Promise<Uint8Array | null> | null = null;

  // The page's own unsaved-changes guard: the browser shows its standard leave-page question.
  win.addEventListener('beforeunload', (event) => {
    if (!dirty) return;
    event.preventDefault();
    event.returnValue = '';
  });

  function confirmDiscard(action: string): boolean {
    return !dirty || win.confirm(`${name} has unsaved changes. Discard them and ${action}?`);
  }

  function download(fileName: string, content: string | Uint8Array, type: string): void {
    const blob = new Blob([content as BlobPart], { type });
    const url = URL.createObjectURL(blob);
    const a = doc.createElement('a');
    a.href = url;
    a.download = fileName;
    a.rel = 'noopener';
    a.hidden = true;
    doc.body.appendChild(a);
    a.click();
    a.remove();
    // Revoking at once can cancel the download in some browsers; a minute is plenty.
    win.setTimeout(() => URL.revokeObjectURL(url), 60_000);
  }

  /** One file from a hidden file input, or null when the user closes the picker. */
  function pickFile(): Promise<File | null> {
    return new Promise((resolve) => {
      const input = doc.createElement('input');
      input.type = 'file';
      input.accept = '.json,application/json';
      input.hidden = true;
      const done = (file: File | null) => {
        input.remove();
        resolve(file);
      };
      input.addEventListener('change', () => done(input.files?.[0] ?? null), { once: true });
      input.addEventListener('cancel', () => done(null), { once: true });
      doc.body.appendChild(input);
      input.click();
    });
  }

  /** Bytes, not File.text(): text() would turn invalid UTF-8 into replacement characters. */
  async function openBytes(fileName: string, bytes: Uint8Array, template: boolean): Promise<OpenResult> {
    const file = { path: null, name: fileName };
    const v = parseScenarioBytes(bytes, o.validateScenario, o.limits.scenarioBytes);
    if (!v.ok) return { status: 'invalid', file, errors: v.errors, warnings: v.warnings };
    name = fileName;
    dirty = false;
    return { status: 'opened', file, scenario: v.value, warnings: v.warnings, template };
  }

  function save(scenario: unknown, fileName: string): SaveResult {
    const checked = checkScenarioForSave(scenario, o.validateScenario, o.limits.scenarioBytes);
    if (!checked.ok) return { status: 'invalid', errors: checked.errors };
    download(fileName, checked.value.text, 'application/json');
    name = fileName;
    dirty = false;
    return { status: 'saved', file: { path: null, name } };
  }

  const isMac = /Mac|iPhone|iPad/.test(win.navigator.platform);
  const listeners = new Set<(command: UiCommand) => void>();
  win.addEventListener(
    'keydown',
    (event) => {
      if (listeners.size === 0) return;
      const command = commandForChord(event, isMac);
      if (!command) return;
      // Text fields keep their own undo/redo.
      if ((command === 'undo' || command === 'redo') && isEditable(event.target)) return;
      event.preventDefault();
      for (const l of listeners) l(command);
    },
    { capture: true },
  );

  return {
    shell: 'browser',
    async openScenario() {
      if (!confirmDiscard('open another scenario')) return { status: 'cancelled' };
      const file = await pickFile();
      if (!file) return { status: 'cancelled' };
      // Refuse an oversized file before reading it into memory.
      const tooBig = checkScenarioSize(file.size, o.limits.scenarioBytes);
      if (tooBig.length) return { status: 'invalid', file: { path: null, name: file.name }, errors: tooBig, warnings: [] };
      try {
        return await openBytes(file.name, new Uint8Array(await file.arrayBuffer()), false);
      } catch (e) {
        return { status: 'failed', message: `Could not read ${file.name}: ${(e as Error).message}` };
      }
    },
    async openRecent() {
      return { status: 'failed', message: 'Recent files are not available in the browser; use Open.' };
    },
    async initialScenario() {
      const demoUrl = o.demoUrl;
      if (!demoUrl) return { status: 'none' };
      // Fetched once; each call reopens it (see the interface).
      demoBytes ??= win
        .fetch(new URL(demoUrl, doc.baseURI))
        .then(async (res) => (res.ok ? new Uint8Array(await res.arrayBuffer()) : null))
        .catch(() => null);
      const bytes = await demoBytes;
      if (bytes === null) return { status: 'none' };
      return openBytes(demoUrl.split('/').pop() ?? UNTITLED_SCENARIO, bytes, true);
    },
    async newScenario() {
      if (!confirmDiscard('start a new scenario')) return { status: 'cancelled' };
      name = UNTITLED_SCENARIO;
      dirty = false;
      return { status: 'created' };
    },
    async saveScenario(scenario) {
      return save(scenario, name);
    },
    // The page's close guard is the browser's own (beforeunload); this only mirrors the desktop API.
    async saveBeforeClose(scenario) {
      return save(scenario, name);
    },
    async saveScenarioAs(scenario) {
      const checked = checkScenarioForSave(scenario, o.validateScenario, o.limits.scenarioBytes);
      if (!checked.ok) return { status: 'invalid', errors: checked.errors };
      const typed = win.prompt('Save scenario as', name);
      if (typed === null) return { status: 'cancelled' };
      const fileName = withJsonExtension(typed.trim());
      const errors = checkFileName(fileName, 'name');
      if (errors.length) return { status: 'invalid', errors };
      return save(scenario, fileName);
    },
    async exportFile(request): Promise<ExportResult> {
      const r = checkExportRequest(request, o.limits.exportBytes);
      if (!r.ok) return { status: 'invalid', errors: r.errors };
      const type = typeof r.value.content === 'string' ? 'text/plain;charset=utf-8' : 'application/octet-stream';
      download(r.value.suggestedName, r.value.content, type);
      return { status: 'exported', file: { path: null, name: r.value.suggestedName } };
    },
    async recentFiles() {
      return [];
    },
    async appInfo(): Promise<AppInfo> {
      return {
        name: 'Slewsmith',
        version: o.version,
        shell: 'browser',
        platform: win.navigator.platform,
        versions: { userAgent: win.navigator.userAgent },
      };
    },
    setDirty(d) {
      dirty = d === true;
    },
    onCommand(listener) {
      listeners.add(listener);
      return () => {
        listeners.delete(listener);
      };
    },
  };
}

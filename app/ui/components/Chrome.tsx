/** The caution strip, the top bar (file commands, undo/redo, document name) and notices. */
import { useState } from 'react';
import { useApp, useAppState } from '../context';
import { useStoreSlice } from '../store/hooks';
import { COMMAND_ACCELERATORS, type MenuCommand } from '../../bridge/commands';
import type { RecentFile } from '../../bridge/api';
import { StudyToggle } from '../study/StudyToggle';

export function CautionStrip() {
  return (
    <div className="caution" role="note" data-testid="caution-strip">
      <strong>Caution:</strong> Planning aid, not flight software — verify in your own simulations and reviews before any flight use.
    </div>
  );
}

const isMac = typeof navigator !== 'undefined' && /Mac|iPhone|iPad/.test(navigator.platform);
function shortcut(c: MenuCommand): string {
  return COMMAND_ACCELERATORS[c].replace('CmdOrCtrl', isMac ? '⌘' : 'Ctrl');
}

const OTHER_KEYS: [string, string][] = [
  ...(isMac ? [] : ([['Ctrl+Y', 'Redo (as Ctrl+Shift+Z)']] as [string, string][])),
  ['Space', 'Play / pause'],
  ['← / →', 'Previous / next sample'],
  ['Shift + ← / →', 'Previous / next logic jump'],
  ['Home / End', 'Start / end of the run'],
  ['Click on a plot', 'Move playback to that time'],
  ['Drag on a plot', 'Zoom time on every plot (double-click resets)'],
];

const COMMAND_NAMES: [MenuCommand, string][] = [
  ['new', 'New scenario'],
  ['open', 'Open…'],
  ['save', 'Save'],
  ['save-as', 'Save as…'],
  ['export', 'Export a run…'],
  ['undo', 'Undo'],
  ['redo', 'Redo'],
  ['run', 'Run now'],
];

function Shortcuts({ onClose }: { onClose: () => void }) {
  return (
    <div className="shortcuts" role="dialog" aria-label="Keyboard shortcuts" data-testid="shortcuts">
      <div className="panel-head">
        Keyboard shortcuts
        <button className="small push-right" onClick={onClose}>
          close
        </button>
      </div>
      <table>
        <tbody>
          {COMMAND_NAMES.map(([c, label]) => (
            <tr key={c}>
              <td>
                <kbd>{shortcut(c)}</kbd>
              </td>
              <td>{label}</td>
            </tr>
          ))}
          {OTHER_KEYS.map(([k, label]) => (
            <tr key={k}>
              <td>
                <kbd>{k}</kbd>
              </td>
              <td>{label}</td>
            </tr>
          ))}
        </tbody>
      </table>
    </div>
  );
}

/** Desktop only: the shell's recent files (the browser has no paths to remember). */
function RecentMenu() {
  const app = useApp();
  const [items, setItems] = useState<RecentFile[] | null>(null);
  if (app.bridge.shell !== 'desktop') return null;
  return (
    <span className="recent">
      <button
        className="toolbar-button"
        onClick={() => (items ? setItems(null) : void app.bridge.recentFiles().then(setItems))}
        title="Open a recently used scenario"
        data-testid="cmd-recent"
      >
        Recent ▾
      </button>
      {items && (
        <div className="recent-list" role="menu">
          {items.length === 0 && <div className="muted">No recent files</div>}
          {items.map((f) => (
            <button
              key={f.path}
              role="menuitem"
              title={f.path}
              onClick={() => {
                setItems(null);
                app.openRecent(f.path);
              }}
            >
              {f.name}
            </button>
          ))}
        </div>
      )}
    </span>
  );
}

function CmdButton({ c, label, disabled }: { c: MenuCommand; label: string; disabled?: boolean }) {
  const app = useApp();
  return (
    <button
      className="toolbar-button"
      onClick={() => app.command(c)}
      disabled={disabled}
      title={`${label} (${shortcut(c)})`}
      data-testid={`cmd-${c}`}
    >
      {label}
    </button>
  );
}

export function TopBar() {
  const app = useApp();
  const fileName = useAppState((s) => s.fileName);
  const dirty = useAppState((s) => s.dirty);
  const undo = useAppState((s) => s.undoStack[s.undoStack.length - 1]);
  const redo = useAppState((s) => s.redoStack[s.redoStack.length - 1]);
  const name = useAppState((s) => (s.scenario as { name?: unknown } | null)?.name);
  const notice = useStoreSlice(app.ui, (u) => u.notice);
  const [keys, setKeys] = useState(false);
  return (
    <header className="topbar">
      <h1 className="brand">Slewsmith</h1>
      <nav className="toolbar">
        <CmdButton c="new" label="New" />
        <CmdButton c="open" label="Open…" />
        <RecentMenu />
        <CmdButton c="save" label="Save" />
        <CmdButton c="save-as" label="Save as…" />
        <span className="sep" />
        <button
          className="toolbar-button"
          disabled={!undo}
          onClick={() => app.command('undo')}
          title={undo ? `Undo ${undo.label} (${shortcut('undo')})` : 'Nothing to undo'}
          data-testid="cmd-undo"
        >
          Undo
        </button>
        <button
          className="toolbar-button"
          disabled={!redo}
          onClick={() => app.command('redo')}
          title={redo ? `Redo ${redo.label} (${shortcut('redo')})` : 'Nothing to redo'}
          data-testid="cmd-redo"
        >
          Redo
        </button>
        <span className="sep" />
        <CmdButton c="export" label="Export…" />
        <StudyToggle />
        <span className="sep" />
        <button className="toolbar-button" onClick={() => setKeys(!keys)} title="Keyboard shortcuts" data-testid="show-shortcuts">
          Keys
        </button>
      </nav>
      {keys && <Shortcuts onClose={() => setKeys(false)} />}
      <span className="doc" data-testid="document-name">
        {typeof name === 'string' ? name : ''} <span className="muted">— {fileName}</span>
        {dirty && (
          <span className="dirty" title="Unsaved changes" data-testid="dirty-marker">
            {' '}
            ●
          </span>
        )}
      </span>
      <span
        className="shell muted"
        data-testid="shell-status"
        title={
          app.bridge.shell === 'browser'
            ? 'Running in a web browser: Open picks a file from your disk; Save and Export download the file.'
            : 'Running as the desktop app: files open and save in place.'
        }
      >
        {app.bridge.shell === 'browser' ? 'in browser — files via downloads' : 'desktop app'}
      </span>
      {notice && (
        <span className={`notice ${notice.kind}`} role="status" data-testid="notice">
          {notice.text}
        </span>
      )}
    </header>
  );
}

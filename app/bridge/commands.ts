/**
 * The named commands the menu (desktop) or the keyboard handler (browser) sends to the UI, with
 * their accelerators in Electron's notation. One table so the two shells cannot drift apart.
 */
export const MENU_COMMANDS = ['new', 'open', 'save', 'save-as', 'export', 'undo', 'redo', 'run'] as const;
export type MenuCommand = (typeof MENU_COMMANDS)[number];

export const COMMAND_ACCELERATORS: Readonly<Record<MenuCommand, string>> = {
  new: 'CmdOrCtrl+N',
  open: 'CmdOrCtrl+O',
  save: 'CmdOrCtrl+S',
  'save-as': 'CmdOrCtrl+Shift+S',
  export: 'CmdOrCtrl+E',
  undo: 'CmdOrCtrl+Z',
  redo: 'CmdOrCtrl+Shift+Z',
  run: 'CmdOrCtrl+R',
};

/**
 * Second chords for a command, off macOS only: Ctrl+Y redoes on Windows and Linux, as in most
 * editors there. Electron menus take one accelerator per item, so the renderer answers these
 * itself (App.tsx) as well as through the browser bridge.
 */
export const ALTERNATE_CHORDS: readonly { command: MenuCommand; accelerator: string }[] = [{ command: 'redo', accelerator: 'Ctrl+Y' }];

/** Quit is handled by the shell itself (through the unsaved-changes guard), not by the UI. */
export const QUIT_ACCELERATOR = 'CmdOrCtrl+Q';

function isMenuCommand(v: unknown): v is MenuCommand {
  return typeof v === 'string' && (MENU_COMMANDS as readonly string[]).includes(v);
}

/**
 * Commands only the shell sends, never a menu item: 'save-before-close' asks the UI to save for a
 * waiting close (it answers with `saveBeforeClose`, so an ordinary Save can never close the window).
 */
const SHELL_COMMANDS = ['save-before-close'] as const;
export type ShellCommand = (typeof SHELL_COMMANDS)[number];
/** Everything the UI's command listener can receive. */
export type UiCommand = MenuCommand | ShellCommand;

export function isUiCommand(v: unknown): v is UiCommand {
  return isMenuCommand(v) || (typeof v === 'string' && (SHELL_COMMANDS as readonly string[]).includes(v));
}

export interface KeyChord {
  key: string;
  ctrlKey: boolean;
  metaKey: boolean;
  shiftKey: boolean;
  altKey: boolean;
}

/**
 * The command a keyboard chord stands for, or null. `CmdOrCtrl` is Meta on macOS and Ctrl elsewhere,
 * as in Electron's accelerators.
 */
export function commandForChord(chord: KeyChord, isMac: boolean): MenuCommand | null {
  const primary = isMac ? chord.metaKey : chord.ctrlKey;
  const other = isMac ? chord.ctrlKey : chord.metaKey;
  if (!primary || other || chord.altKey) return null;
  const key = chord.key.length === 1 ? chord.key.toUpperCase() : chord.key;
  for (const command of MENU_COMMANDS) {
    const parts = COMMAND_ACCELERATORS[command].split('+');
    const wantShift = parts.includes('Shift');
    if (parts[parts.length - 1] === key && wantShift === chord.shiftKey) return command;
  }
  return isMac ? null : alternateCommandForChord(chord, isMac);
}

/** The command an alternate chord (ALTERNATE_CHORDS, not a menu accelerator) stands for, or null. */
export function alternateCommandForChord(chord: KeyChord, isMac: boolean): MenuCommand | null {
  if (isMac || !chord.ctrlKey || chord.metaKey || chord.altKey) return null;
  const key = chord.key.length === 1 ? chord.key.toUpperCase() : chord.key;
  for (const a of ALTERNATE_CHORDS) {
    const parts = a.accelerator.split('+');
    if (parts[parts.length - 1] === key && parts.includes('Shift') === chord.shiftKey) return a.command;
  }
  return null;
}

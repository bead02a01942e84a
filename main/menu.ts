/**
 * The application menu as a template (plain data plus click callbacks), built without Electron so
 * tests can read labels and accelerators. The app's own items send a named command to the
 * renderer; clipboard and window items use Electron's roles; Quit goes through the shell so the
 * unsaved-changes guard runs.
 */
import type { MenuItemConstructorOptions } from 'electron';
import { COMMAND_ACCELERATORS, QUIT_ACCELERATOR, type MenuCommand } from '../app/bridge/commands';
import { electronConfig } from '../electron.config';

export interface MenuDeps {
  platform: string;
  send(command: MenuCommand): void;
  quit(): void;
  /** Adds the developer tools toggle (unpackaged runs only). */
  developer?: boolean;
}

export function buildMenuTemplate(deps: MenuDeps): MenuItemConstructorOptions[] {
  const isMac = deps.platform === 'darwin';
  const item = (label: string, command: MenuCommand): MenuItemConstructorOptions => ({
    label,
    accelerator: COMMAND_ACCELERATORS[command],
    click: () => deps.send(command),
  });
  const quit: MenuItemConstructorOptions = {
    label: isMac ? `Quit ${electronConfig.productName}` : 'Quit',
    accelerator: QUIT_ACCELERATOR,
    click: () => deps.quit(),
  };

  const template: MenuItemConstructorOptions[] = [];
  if (isMac) {
    template.push({
      label: electronConfig.productName,
      submenu: [
        { role: 'about' },
        { type: 'separator' },
        { role: 'services' },
        { type: 'separator' },
        { role: 'hide' },
        { role: 'hideOthers' },
        { role: 'unhide' },
        { type: 'separator' },
        quit,
      ],
    });
  }
  template.push(
    {
      label: 'File',
      submenu: [
        item('New Scenario', 'new'),
        item('Open…', 'open'),
        { type: 'separator' },
        item('Save', 'save'),
        item('Save As…', 'save-as'),
        item('Export…', 'export'),
        ...(isMac ? [] : [{ type: 'separator' } as MenuItemConstructorOptions, quit]),
      ],
    },
    {
      label: 'Edit',
      submenu: [
        item('Undo', 'undo'),
        item('Redo', 'redo'),
        { type: 'separator' },
        { role: 'cut' },
        { role: 'copy' },
        { role: 'paste' },
        { role: 'selectAll' },
      ],
    },
    { label: 'Simulation', submenu: [item('Run', 'run')] },
    {
      label: 'View',
      submenu: [
        { role: 'resetZoom' },
        { role: 'zoomIn' },
        { role: 'zoomOut' },
        { type: 'separator' },
        { role: 'togglefullscreen' },
        ...(deps.developer
          ? [{ type: 'separator' } as MenuItemConstructorOptions, { role: 'toggleDevTools' } as MenuItemConstructorOptions]
          : []),
      ],
    },
    { role: 'windowMenu' },
    { role: 'help', submenu: [{ role: 'about', label: `About ${electronConfig.productName}` }] },
  );
  return template;
}

/** Every item of a template, depth first (for tests and for checks on accelerators). */
export function flattenMenu(template: readonly MenuItemConstructorOptions[]): MenuItemConstructorOptions[] {
  const out: MenuItemConstructorOptions[] = [];
  for (const entry of template) {
    out.push(entry);
    if (Array.isArray(entry.submenu)) out.push(...flattenMenu(entry.submenu));
  }
  return out;
}

/** The menu: the usual accelerators, each app item sending its named command; Quit goes to the shell. */
import type { MenuItemConstructorOptions } from 'electron';
import { describe, expect, it } from 'vitest';
import { MENU_COMMANDS } from '../../app/bridge/commands';
import { buildMenuTemplate, flattenMenu } from '../../main/menu';

function setup(platform: string) {
  const sent: string[] = [];
  let quits = 0;
  const template = buildMenuTemplate({ platform, send: (c) => sent.push(c), quit: () => quits++ });
  const items = flattenMenu(template);
  const byLabel = (label: string) => {
    const found = items.filter((i) => i.label === label);
    expect(found, label).toHaveLength(1);
    return found[0]!;
  };
  const click = (i: MenuItemConstructorOptions) => (i.click as () => void)();
  return { sent, quits: () => quits, template, items, byLabel, click };
}

// The accelerators the brief and common desktop practice expect (common practice, no source).
const EXPECTED: Array<[string, string, string]> = [
  ['New Scenario', 'CmdOrCtrl+N', 'new'],
  ['Open…', 'CmdOrCtrl+O', 'open'],
  ['Save', 'CmdOrCtrl+S', 'save'],
  ['Save As…', 'CmdOrCtrl+Shift+S', 'save-as'],
  ['Export…', 'CmdOrCtrl+E', 'export'],
  ['Undo', 'CmdOrCtrl+Z', 'undo'],
  ['Redo', 'CmdOrCtrl+Shift+Z', 'redo'],
  ['Run', 'CmdOrCtrl+R', 'run'],
];

describe.each(['linux', 'win32', 'darwin'])('menu on %s', (platform) => {
  it('has each command with its accelerator, and clicking sends that command', () => {
    const m = setup(platform);
    for (const [label, accelerator, command] of EXPECTED) {
      const item = m.byLabel(label);
      expect(item.accelerator, label).toBe(accelerator);
      m.click(item);
      expect(m.sent.at(-1)).toBe(command);
    }
    expect(m.sent).toEqual(EXPECTED.map((e) => e[2]));
    expect([...MENU_COMMANDS].sort()).toEqual(EXPECTED.map((e) => e[2]).sort());
  });

  it('has Quit on CmdOrCtrl+Q, handled by the shell rather than sent to the page', () => {
    const m = setup(platform);
    const quit = m.items.filter((i) => i.accelerator === 'CmdOrCtrl+Q');
    expect(quit).toHaveLength(1);
    m.click(quit[0]!);
    expect(m.quits()).toBe(1);
    expect(m.sent).toEqual([]);
  });

  it('uses each accelerator once and keeps clipboard roles for text fields', () => {
    const m = setup(platform);
    const accels = m.items.map((i) => i.accelerator).filter(Boolean);
    expect(new Set(accels).size).toBe(accels.length);
    const roles = m.items.map((i) => i.role);
    for (const r of ['cut', 'copy', 'paste', 'selectAll']) expect(roles).toContain(r);
    // CmdOrCtrl+R is Run: no reload role may take it.
    expect(roles).not.toContain('reload');
    expect(roles).not.toContain('forceReload');
  });
});

it('macOS gets the application menu first; other platforms keep Quit in File', () => {
  expect(setup('darwin').template[0]!.label).toBe('Slewsmith');
  expect(setup('linux').template[0]!.label).toBe('File');
  const file = setup('linux').template[0]!.submenu as MenuItemConstructorOptions[];
  expect(file.at(-1)?.accelerator).toBe('CmdOrCtrl+Q');
});

it('adds the developer tools toggle only when asked', () => {
  const roles = (developer: boolean) =>
    flattenMenu(buildMenuTemplate({ platform: 'linux', send: () => {}, quit: () => {}, developer })).map((i) => i.role);
  expect(roles(false)).not.toContain('toggleDevTools');
  expect(roles(true)).toContain('toggleDevTools');
});

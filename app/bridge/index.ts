/**
 * The UI's one way to reach its shell: `getBridge()` returns the desktop bridge exposed by the
 * preload when there is one, and otherwise the browser fallback (created once).
 */
import { electronConfig } from '../../electron.config';
import { validateScenario } from '../engine/scenario/validate';
import type { SlewsmithBridge } from './api';
import { createBrowserBridge } from './browser-fallback';

export type * from './api';
export { MENU_COMMANDS, COMMAND_ACCELERATORS } from './commands';

let browserBridge: SlewsmithBridge | null = null;

export function getBridge(): SlewsmithBridge {
  if (window.slewsmith) return window.slewsmith;
  browserBridge ??= createBrowserBridge({
    validateScenario,
    demoUrl: electronConfig.demoScenarioUrl,
    version: typeof __SLEWSMITH_VERSION__ === 'string' ? __SLEWSMITH_VERSION__ : '0.0.0-dev',
    limits: electronConfig.limits,
  });
  return browserBridge;
}

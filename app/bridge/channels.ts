/**
 * Every IPC channel name, in one map. The preload and the main process both import this file, so a
 * renamed channel is a compile error on both sides rather than a silent no-op.
 *
 * Renderer → main (invoke/handle, each answers with a typed result) and renderer → main
 * notifications (send/on) are listed separately from main → renderer events.
 */
export const InvokeChannels = {
  openScenario: 'slewsmith:scenario/open',
  openRecent: 'slewsmith:scenario/open-recent',
  initialScenario: 'slewsmith:scenario/initial',
  newScenario: 'slewsmith:scenario/new',
  saveScenario: 'slewsmith:scenario/save',
  saveScenarioAs: 'slewsmith:scenario/save-as',
  saveBeforeClose: 'slewsmith:scenario/save-before-close',
  exportFile: 'slewsmith:export/file',
  recentFiles: 'slewsmith:recent/list',
  appInfo: 'slewsmith:app/info',
} as const;

export const NotifyChannels = {
  /** The renderer says whether the open document has unsaved edits. */
  setDirty: 'slewsmith:document/dirty',
} as const;

export const EventChannels = {
  /** A menu item or accelerator fired, or the shell asks for something; the payload is a UiCommand name. */
  command: 'slewsmith:menu/command',
} as const;

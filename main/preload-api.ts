/**
 * The object the preload exposes as `window.slewsmith`: one named function per operation, each
 * bound to its own channel. There is no generic send or invoke, and listeners never receive
 * Electron's event object (it would hand the page `ipcRenderer` itself).
 *
 * Kept apart from main/preload.ts so it can be tested with a fake ipcRenderer.
 */
import type { SlewsmithBridge } from '../app/bridge/api';
import { EventChannels, InvokeChannels, NotifyChannels } from '../app/bridge/channels';
import { isUiCommand } from '../app/bridge/commands';

export interface IpcRendererLike {
  invoke(channel: string, ...args: unknown[]): Promise<unknown>;
  send(channel: string, ...args: unknown[]): void;
  on(channel: string, listener: (event: unknown, ...args: unknown[]) => void): unknown;
  removeListener(channel: string, listener: (event: unknown, ...args: unknown[]) => void): unknown;
}

export function createDesktopBridge(ipc: IpcRendererLike): SlewsmithBridge {
  // Each wrapper passes exactly the declared arguments, whatever the page calls it with.
  const call = <T>(channel: string, ...args: unknown[]) => ipc.invoke(channel, ...args) as Promise<T>;
  return {
    shell: 'desktop',
    openScenario: () => call(InvokeChannels.openScenario),
    openRecent: (filePath) => call(InvokeChannels.openRecent, filePath),
    initialScenario: () => call(InvokeChannels.initialScenario),
    newScenario: () => call(InvokeChannels.newScenario),
    saveScenario: (scenario) => call(InvokeChannels.saveScenario, scenario),
    saveScenarioAs: (scenario) => call(InvokeChannels.saveScenarioAs, scenario),
    saveBeforeClose: (scenario) => call(InvokeChannels.saveBeforeClose, scenario),
    exportFile: (request) => call(InvokeChannels.exportFile, { suggestedName: request?.suggestedName, content: request?.content }),
    recentFiles: () => call(InvokeChannels.recentFiles),
    appInfo: () => call(InvokeChannels.appInfo),
    setDirty: (dirty) => ipc.send(NotifyChannels.setDirty, dirty === true),
    onCommand: (listener) => {
      const wrapped = (_event: unknown, command: unknown) => {
        if (isUiCommand(command)) listener(command);
      };
      ipc.on(EventChannels.command, wrapped);
      return () => {
        ipc.removeListener(EventChannels.command, wrapped);
      };
    },
  };
}

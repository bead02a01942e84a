/**
 * The preload's exposed object: exactly the named functions of SlewsmithBridge, each on its own
 * channel with exactly its declared arguments; no generic send; listeners never see the event.
 */
import { describe, expect, it } from 'vitest';
import { EventChannels, InvokeChannels, NotifyChannels } from '../../app/bridge/channels';
import { createDesktopBridge, type IpcRendererLike } from '../../main/preload-api';

function fakeIpc() {
  const calls: Array<{ kind: string; channel: string; args: unknown[] }> = [];
  const listeners = new Map<string, Set<(e: unknown, ...a: unknown[]) => void>>();
  const ipc: IpcRendererLike = {
    invoke: async (channel, ...args) => {
      calls.push({ kind: 'invoke', channel, args });
      return { channel };
    },
    send: (channel, ...args) => {
      calls.push({ kind: 'send', channel, args });
    },
    on: (channel, l) => {
      if (!listeners.has(channel)) listeners.set(channel, new Set());
      listeners.get(channel)!.add(l);
    },
    removeListener: (channel, l) => {
      listeners.get(channel)?.delete(l);
    },
  };
  const emit = (channel: string, ...args: unknown[]) => {
    for (const l of listeners.get(channel) ?? []) l({ sender: 'the ipcRenderer object' }, ...args);
  };
  return { ipc, calls, listeners, emit };
}

describe('desktop bridge', () => {
  it('exposes only the named operations', () => {
    const b = createDesktopBridge(fakeIpc().ipc);
    expect(Object.keys(b).sort()).toEqual(
      [
        'appInfo',
        'exportFile',
        'initialScenario',
        'newScenario',
        'onCommand',
        'openRecent',
        'openScenario',
        'recentFiles',
        'saveBeforeClose',
        'saveScenario',
        'saveScenarioAs',
        'setDirty',
        'shell',
      ].sort(),
    );
    for (const k of ['send', 'invoke', 'on', 'ipcRenderer', 'removeListener']) expect(b).not.toHaveProperty(k);
    expect(b.shell).toBe('desktop');
  });

  it('maps each operation to its own channel, passing exactly the declared arguments', async () => {
    const f = fakeIpc();
    const b = createDesktopBridge(f.ipc);
    const loose = b as unknown as Record<'openScenario' | 'saveScenario' | 'setDirty', (...a: unknown[]) => unknown>;
    await loose.openScenario('smuggled');
    await b.openRecent('/a.json');
    await b.initialScenario();
    await b.newScenario();
    await loose.saveScenario({ s: 1 }, 'smuggled');
    await b.saveScenarioAs({ s: 2 });
    await b.saveBeforeClose({ s: 3 });
    await b.exportFile({ suggestedName: 'a.csv', content: 'x', extra: 'dropped' } as never);
    await b.recentFiles();
    await b.appInfo();
    b.setDirty(true);
    loose.setDirty('yes');
    expect(f.calls).toEqual([
      { kind: 'invoke', channel: InvokeChannels.openScenario, args: [] },
      { kind: 'invoke', channel: InvokeChannels.openRecent, args: ['/a.json'] },
      { kind: 'invoke', channel: InvokeChannels.initialScenario, args: [] },
      { kind: 'invoke', channel: InvokeChannels.newScenario, args: [] },
      { kind: 'invoke', channel: InvokeChannels.saveScenario, args: [{ s: 1 }] },
      { kind: 'invoke', channel: InvokeChannels.saveScenarioAs, args: [{ s: 2 }] },
      { kind: 'invoke', channel: InvokeChannels.saveBeforeClose, args: [{ s: 3 }] },
      { kind: 'invoke', channel: InvokeChannels.exportFile, args: [{ suggestedName: 'a.csv', content: 'x' }] },
      { kind: 'invoke', channel: InvokeChannels.recentFiles, args: [] },
      { kind: 'invoke', channel: InvokeChannels.appInfo, args: [] },
      { kind: 'send', channel: NotifyChannels.setDirty, args: [true] },
      { kind: 'send', channel: NotifyChannels.setDirty, args: [false] },
    ]);
  });

  it('delivers menu commands without the event object, drops unknown ones, and unsubscribes', () => {
    const f = fakeIpc();
    const b = createDesktopBridge(f.ipc);
    const got: unknown[][] = [];
    const off = b.onCommand((...a: unknown[]) => got.push(a));
    f.emit(EventChannels.command, 'save');
    f.emit(EventChannels.command, 'format-disk');
    f.emit(EventChannels.command, 42);
    f.emit(EventChannels.command, 'save-before-close');
    expect(got).toEqual([['save'], ['save-before-close']]);
    off();
    f.emit(EventChannels.command, 'run');
    expect(got).toEqual([['save'], ['save-before-close']]);
    expect(f.listeners.get(EventChannels.command)?.size).toBe(0);
  });

  it('uses channel names that are unique across all three maps', () => {
    const all = [...Object.values(InvokeChannels), ...Object.values(NotifyChannels), ...Object.values(EventChannels)];
    expect(new Set(all).size).toBe(all.length);
    for (const c of all) expect(c).toMatch(/^slewsmith:[a-z]+\/[a-z-]+$/);
  });
});

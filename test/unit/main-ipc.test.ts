/**
 * IPC: every channel has a handler; a foreign sender is refused before anything happens; malformed
 * calls are refused; content the user can fix comes back as `invalid`; nothing reaches a dialog
 * or the disk unless the message passed both checks.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { InvokeChannels, NotifyChannels } from '../../app/bridge/channels';
import { DocumentService } from '../../main/documents';
import { registerIpc, senderProblem, type SenderEvent } from '../../main/ipc';
import { createRecentFiles } from '../../main/recent-files';
import { fakeValidator, failingFs, GOOD_SCENARIO, OWN_FRAME, recordingIpc, scriptedDialogs, tempDir } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

function setup() {
  const fs = failingFs(null);
  const dialogs = scriptedDialogs();
  const sent: string[] = [];
  const logs: string[] = [];
  const recent = createRecentFiles({ fs, file: path.join(dir, 'recent.json'), max: 10 });
  const documents = new DocumentService({
    fs,
    dialogs,
    validateScenario: fakeValidator,
    recent,
    documentsDir: dir,
    sendCommand: (c) => sent.push(c),
    closeWindow: () => sent.push('closed'),
  });
  const ipc = recordingIpc();
  registerIpc(ipc, {
    documents,
    recentFiles: () => recent.list(),
    exportBytes: 1000,
    log: (m) => logs.push(m),
    appInfo: () => ({ name: 'Slewsmith', version: '0.1.0', shell: 'desktop', platform: 'linux', versions: {} }),
  });
  const invoke = async (event: SenderEvent, channel: string, ...args: unknown[]) => ipc.handlers.get(channel)!(event, ...args);
  return { fs, dialogs, ipc, invoke, documents, logs, sent };
}

const FOREIGN: Record<string, SenderEvent> = {
  'another origin': { senderFrame: { url: 'https://example.org/', parent: null } },
  'a file page': { senderFrame: { url: 'file:///tmp/index.html', parent: null } },
  'a lookalike host': { senderFrame: { url: 'app://slewsmith.example/index.html', parent: null } },
  'another page of our origin': { senderFrame: { url: 'app://slewsmith/assets/other.html', parent: null } },
  'a subframe of our page': { senderFrame: { url: 'app://slewsmith/index.html', parent: {} } },
  'a destroyed frame': { senderFrame: null },
};

describe('registration', () => {
  it('handles every invoke channel and listens on every notify channel, once each', () => {
    const { ipc } = setup();
    expect([...ipc.handlers.keys()].sort()).toEqual(Object.values(InvokeChannels).sort());
    expect([...ipc.listeners.keys()]).toEqual(Object.values(NotifyChannels));
  });
});

describe('sender check', () => {
  it('accepts only the top frame of our own page', () => {
    expect(senderProblem(OWN_FRAME)).toBeNull();
    expect(senderProblem({ senderFrame: { url: 'app://slewsmith/index.html#/study?x=1', parent: null } })).toBeNull();
    expect(senderProblem({ senderFrame: { url: 'app://slewsmith/', parent: null } })).toBeNull();
    for (const [what, e] of Object.entries(FOREIGN)) expect(senderProblem(e), what).not.toBeNull();
  });

  it('refuses foreign senders on every channel before any dialog or file access', async () => {
    const { invoke, dialogs, fs, logs } = setup();
    const argsFor: Record<string, unknown[]> = {
      [InvokeChannels.openRecent]: [path.join(dir, 'a.json')],
      [InvokeChannels.saveScenario]: [GOOD_SCENARIO],
      [InvokeChannels.saveScenarioAs]: [GOOD_SCENARIO],
      [InvokeChannels.exportFile]: [{ suggestedName: 'a.csv', content: 'x' }],
    };
    for (const channel of Object.values(InvokeChannels))
      for (const [what, event] of Object.entries(FOREIGN))
        await expect(invoke(event, channel, ...(argsFor[channel] ?? [])), `${channel} from ${what}`).rejects.toThrow(/refused/);
    expect(dialogs.log).toEqual([]);
    expect(fs.calls).toEqual([]);
    expect(logs.length).toBe(Object.values(InvokeChannels).length * Object.keys(FOREIGN).length);
  });

  it('ignores dirty-state notes from foreign senders', async () => {
    const { ipc, documents } = setup();
    for (const e of Object.values(FOREIGN)) ipc.listeners.get(NotifyChannels.setDirty)!(e, true);
    expect(documents.current.dirty).toBe(false);
    ipc.listeners.get(NotifyChannels.setDirty)!(OWN_FRAME, true);
    expect(documents.current.dirty).toBe(true);
  });
});

describe('payload checks', () => {
  it('refuses wrong argument counts', async () => {
    const { invoke, dialogs } = setup();
    await expect(invoke(OWN_FRAME, InvokeChannels.openScenario, 'extra')).rejects.toThrow(/expected 0 arguments, got 1/);
    await expect(invoke(OWN_FRAME, InvokeChannels.saveScenario)).rejects.toThrow(/expected 1 argument, got 0/);
    await expect(invoke(OWN_FRAME, InvokeChannels.exportFile, {}, {})).rejects.toThrow(/arity|expected 1/);
    expect(dialogs.log).toEqual([]);
  });

  it('refuses recent paths that are not strings, not absolute, contain NUL, or are not on the list', async () => {
    const { invoke, fs, dialogs } = setup();
    await expect(invoke(OWN_FRAME, InvokeChannels.openRecent, 42)).rejects.toThrow(/path must be a string/);
    await expect(invoke(OWN_FRAME, InvokeChannels.openRecent, 'relative/a.json')).rejects.toThrow(/absolute/);
    await expect(invoke(OWN_FRAME, InvokeChannels.openRecent, '/a\0b.json')).rejects.toThrow(/NUL/);
    const secret = path.join(dir, 'secret.json');
    await fsp.writeFile(secret, JSON.stringify(GOOD_SCENARIO));
    expect(await invoke(OWN_FRAME, InvokeChannels.openRecent, secret)).toEqual({
      status: 'failed',
      message: `${secret} is not on the recent-files list`,
    });
    expect(fs.calls.filter((c) => c.startsWith('readFile') && !c.includes('recent'))).toEqual([]);
    expect(dialogs.log).toEqual([]);
  });

  it('returns every scenario problem and writes nothing when the scenario is invalid', async () => {
    const { invoke, fs, dialogs } = setup();
    const r = await invoke(OWN_FRAME, InvokeChannels.saveScenarioAs, { format: 'other', durationS: 'long' });
    expect(r).toEqual({
      status: 'invalid',
      errors: [
        { path: 'format', rule: 'format', message: 'format must be slewsmith-scenario' },
        { path: 'durationS', rule: 'finite', message: 'durationS must be finite' },
      ],
    });
    expect(dialogs.log).toEqual([]);
    expect(fs.calls).toEqual([]);
  });

  it('refuses a scenario with a cycle (structured clone allows one, JSON does not)', async () => {
    const { invoke } = setup();
    const s: Record<string, unknown> = { ...GOOD_SCENARIO };
    s.self = s;
    const r = (await invoke(OWN_FRAME, InvokeChannels.saveScenario, s)) as { status: string; errors: { rule: string }[] };
    expect(r.status).toBe('invalid');
    expect(r.errors[0]!.rule).toBe('serialisable');
  });

  it('checks export requests: bare names, string or bytes, size limit, no extra fields — all reported together', async () => {
    const { invoke, dialogs } = setup();
    await expect(invoke(OWN_FRAME, InvokeChannels.exportFile, 'a.csv')).rejects.toThrow(/must be an object/);
    await expect(invoke(OWN_FRAME, InvokeChannels.exportFile, null)).rejects.toThrow(/must be an object/);
    const r = (await invoke(OWN_FRAME, InvokeChannels.exportFile, {
      suggestedName: '../../.bashrc',
      content: 'x'.repeat(1001),
      mode: 0o777,
    })) as { status: string; errors: { path: string; rule: string }[] };
    expect(r.status).toBe('invalid');
    expect(r.errors.map((e) => `${e.path}:${e.rule}`).sort()).toEqual([
      'content:max-size',
      'mode:unknown-field',
      'suggestedName:bare-name',
    ]);
    const names = ['', 'a/b.csv', 'a\\b.csv', 'CON.txt', 'nul', 'a\u0007.csv', 'a.csv.', '..', 'x'.repeat(201)];
    for (const suggestedName of names) {
      const rr = (await invoke(OWN_FRAME, InvokeChannels.exportFile, { suggestedName, content: 'x' })) as { status: string };
      expect(rr.status, JSON.stringify(suggestedName)).toBe('invalid');
    }
    const bad = (await invoke(OWN_FRAME, InvokeChannels.exportFile, { suggestedName: 'a.csv', content: { length: 3 } })) as {
      errors: { rule: string }[];
    };
    expect(bad.errors).toEqual([{ path: 'content', rule: 'type', message: 'content must be a string or a Uint8Array' }]);
    expect(dialogs.log).toEqual([]);
  });

  it('ignores dirty-state notes that are not one boolean', () => {
    const { ipc, documents, logs } = setup();
    const l = ipc.listeners.get(NotifyChannels.setDirty)!;
    l(OWN_FRAME, 'yes');
    l(OWN_FRAME, 1);
    l(OWN_FRAME, true, true);
    l(OWN_FRAME);
    expect(documents.current.dirty).toBe(false);
    expect(logs).toHaveLength(4);
  });
});

describe('well-formed calls from our page', () => {
  it('export: asks where, then writes the content there', async () => {
    const { invoke, dialogs } = setup();
    const target = path.join(dir, 'out.csv');
    dialogs.saveAnswers.push({ canceled: false, filePath: target });
    const r = await invoke(OWN_FRAME, InvokeChannels.exportFile, { suggestedName: 'lumen6.csv', content: 't,q\n0,1\n' });
    expect(r).toEqual({ status: 'exported', file: { path: target, name: 'out.csv' } });
    expect(dialogs.log).toEqual([`save ${path.join(dir, 'lumen6.csv')}`]);
    expect(await fsp.readFile(target, 'utf8')).toBe('t,q\n0,1\n');
  });

  it('app info passes through', async () => {
    const { invoke } = setup();
    expect(await invoke(OWN_FRAME, InvokeChannels.appInfo)).toMatchObject({ name: 'Slewsmith', shell: 'desktop' });
  });
});

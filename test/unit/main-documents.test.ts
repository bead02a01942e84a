/**
 * The document service: open/save/save-as/export through (scripted) native dialogs, atomic writes
 * through the service, recent files, and the unsaved-changes guard on open, new and close.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DocumentService, UNTITLED, windowTitle, type LaunchDocument } from '../../main/documents';
import { createRecentFiles } from '../../main/recent-files';
import { fakeValidator, failingFs, GOOD_SCENARIO, scriptedDialogs, tempDir, type FsStep } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

function setup(opts: { failAt?: FsStep; launch?: LaunchDocument } = {}) {
  const fs = failingFs(opts.failAt ?? null);
  const dialogs = scriptedDialogs();
  const events: string[] = [];
  const titles: string[] = [];
  const recent = createRecentFiles({ fs: failingFs(null), file: path.join(dir, 'recent.json'), max: 10 });
  const docs = new DocumentService({
    fs,
    dialogs,
    validateScenario: fakeValidator,
    recent,
    documentsDir: dir,
    launch: opts.launch,
    sendCommand: (c) => events.push(`command ${c}`),
    closeWindow: () => events.push('close'),
    onStateChange: (s) => titles.push(windowTitle(s)),
  });
  return { fs, dialogs, events, titles, recent, docs };
}

async function writeScenario(name: string, body: unknown = GOOD_SCENARIO): Promise<string> {
  const p = path.join(dir, name);
  await fsp.writeFile(p, typeof body === 'string' ? body : JSON.stringify(body));
  return p;
}

describe('open', () => {
  it('opens a valid file, makes it the current document and lists it as recent', async () => {
    const { docs, dialogs, recent, titles } = setup();
    const p = await writeScenario('lumen.scenario.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    const r = await docs.openScenario();
    expect(r).toEqual({
      status: 'opened',
      file: { path: p, name: 'lumen.scenario.json' },
      scenario: GOOD_SCENARIO,
      warnings: [],
      template: false,
    });
    expect(docs.current).toEqual({ path: p, name: 'lumen.scenario.json', dirty: false });
    expect((await recent.list()).map((f) => f.path)).toEqual([p]);
    expect(titles.at(-1)).toBe('lumen.scenario.json — Slewsmith');
  });

  it('reports bad JSON and schema problems as invalid, keeping the current document', async () => {
    const { docs, dialogs } = setup();
    const broken = await writeScenario('broken.json', '{"format": "slewsmith-scenario",');
    const wrong = await writeScenario('wrong.json', { format: 'x', durationS: null });
    dialogs.openAnswers.push({ canceled: false, filePaths: [broken] }, { canceled: false, filePaths: [wrong] });
    const a = await docs.openScenario();
    expect(a.status).toBe('invalid');
    if (a.status === 'invalid') expect(a.errors.map((e) => e.rule)).toEqual(['json-syntax']);
    const b = await docs.openScenario();
    if (b.status !== 'invalid') throw new Error('expected invalid');
    expect(b.errors.map((e) => e.path)).toEqual(['format', 'durationS']);
    expect(docs.current.path).toBeNull();
  });

  it('refuses files over the size limit without reading them', async () => {
    const fs = failingFs(null);
    const dialogs = scriptedDialogs();
    const recent = createRecentFiles({ fs, file: path.join(dir, 'recent.json'), max: 10 });
    const docs = new DocumentService({
      fs,
      dialogs,
      validateScenario: fakeValidator,
      recent,
      documentsDir: dir,
      sendCommand: () => {},
      closeWindow: () => {},
      limits: { scenarioBytes: 10, exportBytes: 10 },
    });
    const p = await writeScenario('big.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    const r = await docs.openScenario();
    expect(r.status).toBe('invalid');
    expect(fs.calls.filter((c) => c === 'readFile big.json')).toEqual([]);
  });

  it('asks before discarding unsaved changes; Cancel stops before the open dialog', async () => {
    const { docs, dialogs } = setup();
    docs.setDirty(true);
    dialogs.messageAnswers.push(1); // Cancel
    expect(await docs.openScenario()).toEqual({ status: 'cancelled' });
    expect(dialogs.log).toEqual([`message ${UNTITLED} has unsaved changes.`]);
    expect(dialogs.lastMessage?.buttons).toEqual(['Discard Changes', 'Cancel']);
    dialogs.messageAnswers.push(0); // Discard
    dialogs.openAnswers.push({ canceled: true, filePaths: [] });
    expect(await docs.openScenario()).toEqual({ status: 'cancelled' });
    expect(dialogs.log.at(-1)).toBe('open');
  });

  it('opens recent files again, and drops one that has disappeared', async () => {
    const { docs, dialogs, recent } = setup();
    const p = await writeScenario('r.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    expect((await docs.openRecent(p)).status).toBe('opened');
    await fsp.rm(p);
    expect((await docs.openRecent(p)).status).toBe('failed');
    expect(await recent.list()).toEqual([]);
  });

  it('reopens the launch document on each call; a template opens untitled so Save asks where', async () => {
    const demo = await writeScenario('demo.scenario.json');
    const { docs, dialogs } = setup({ launch: { kind: 'template', path: demo } });
    const r = await docs.initialScenario();
    expect(r).toMatchObject({ status: 'opened', template: true, file: { path: null, name: 'demo.scenario.json' } });
    docs.setDirty(true);
    expect(await docs.initialScenario()).toEqual(r);
    expect(docs.current).toEqual({ path: null, name: 'demo.scenario.json', dirty: false });
    dialogs.saveAnswers.push({ canceled: true });
    expect(await docs.saveScenario(GOOD_SCENARIO)).toEqual({ status: 'cancelled' });
    expect(dialogs.log).toEqual([`save ${path.join(dir, 'demo.scenario.json')}`]);
    const none = setup();
    expect(await none.docs.initialScenario()).toEqual({ status: 'none' });
  });

  it('new asks about unsaved changes and forgets the path', async () => {
    const { docs, dialogs } = setup();
    const p = await writeScenario('n.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    docs.setDirty(true);
    dialogs.messageAnswers.push(1);
    expect(await docs.newScenario()).toEqual({ status: 'cancelled' });
    expect(docs.current.path).toBe(p);
    dialogs.messageAnswers.push(0);
    expect(await docs.newScenario()).toEqual({ status: 'created' });
    expect(docs.current).toEqual({ path: null, name: UNTITLED, dirty: false });
  });
});

describe('save', () => {
  it('save-as asks, adds .json to a bare name, writes pretty JSON and clears dirty', async () => {
    const { docs, dialogs, titles } = setup();
    docs.setDirty(true);
    expect(titles.at(-1)).toBe(`• ${UNTITLED} — Slewsmith`);
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(dir, 'plan') });
    const r = await docs.saveScenarioAs(GOOD_SCENARIO);
    const target = path.join(dir, 'plan.json');
    expect(r).toEqual({ status: 'saved', file: { path: target, name: 'plan.json' } });
    expect(await fsp.readFile(target, 'utf8')).toBe(JSON.stringify(GOOD_SCENARIO, null, 2) + '\n');
    expect(docs.current).toEqual({ path: target, name: 'plan.json', dirty: false });
  });

  it('save writes to the current path without a dialog', async () => {
    const { docs, dialogs } = setup();
    const p = await writeScenario('cur.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    const changed = { ...GOOD_SCENARIO, durationS: 300 };
    expect((await docs.saveScenario(changed)).status).toBe('saved');
    expect(JSON.parse(await fsp.readFile(p, 'utf8'))).toEqual(changed);
    expect(dialogs.log).toEqual(['open']);
  });

  it('a failed write reports failed, keeps the old file and keeps the document dirty', async () => {
    const { docs, dialogs } = setup({ failAt: 'rename' });
    const p = await writeScenario('keep.json');
    const before = await fsp.readFile(p, 'utf8');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    docs.setDirty(true);
    const r = await docs.saveScenario({ ...GOOD_SCENARIO, durationS: 1 });
    expect(r.status).toBe('failed');
    expect(await fsp.readFile(p, 'utf8')).toBe(before);
    expect(docs.current.dirty).toBe(true);
    expect((await fsp.readdir(dir)).filter((f) => f.endsWith('.tmp'))).toEqual([]);
  });
});

describe('close guard', () => {
  it('closes at once when there is nothing to save', async () => {
    const { docs, dialogs } = setup();
    expect(await docs.requestClose()).toBe('close');
    expect(dialogs.log).toEqual([]);
  });

  it("Don't Save closes, Cancel keeps the window", async () => {
    const { docs, dialogs } = setup();
    docs.setDirty(true);
    dialogs.messageAnswers.push(2);
    expect(await docs.requestClose()).toBe('keep');
    expect(dialogs.lastMessage?.buttons).toEqual(['Save', "Don't Save", 'Cancel']);
    dialogs.messageAnswers.push(1);
    expect(await docs.requestClose()).toBe('close');
  });

  it('Save asks the renderer to save and closes only after the save succeeds', async () => {
    const { docs, dialogs, events } = setup();
    docs.setDirty(true);
    dialogs.messageAnswers.push(0);
    expect(await docs.requestClose()).toBe('keep');
    expect(events).toEqual(['command save-before-close']);
    // The renderer answers the command with a save; the user cancels the dialog: stay open.
    dialogs.saveAnswers.push({ canceled: true });
    await docs.saveBeforeClose(GOOD_SCENARIO);
    expect(events).toEqual(['command save-before-close']);
    // Second attempt, saved this time: the window closes.
    dialogs.messageAnswers.push(0);
    await docs.requestClose();
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(dir, 'final.json') });
    expect((await docs.saveBeforeClose(GOOD_SCENARIO)).status).toBe('saved');
    expect(events).toEqual(['command save-before-close', 'command save-before-close', 'close']);
  });

  it('a close-with-save that never completes does not make the next ordinary Save close the window', async () => {
    const { docs, dialogs, events } = setup();
    const p = await writeScenario('work.json');
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    docs.setDirty(true);
    dialogs.messageAnswers.push(0); // Save
    expect(await docs.requestClose()).toBe('keep');
    // The renderer never answers (its save failed before reaching main). Later the user saves.
    expect((await docs.saveScenario(GOOD_SCENARIO)).status).toBe('saved');
    expect(events).toEqual(['command save-before-close']);
    // A save-before-close that throws inside main ends the waiting close too.
    docs.setDirty(true);
    dialogs.messageAnswers.push(0);
    await docs.requestClose();
    const throwing = { ...GOOD_SCENARIO };
    Object.defineProperty(throwing, 'format', {
      enumerable: true,
      get() {
        throw new Error('getter blew up');
      },
    });
    await expect(docs.saveBeforeClose(throwing)).rejects.toThrow('getter blew up');
    expect((await docs.saveScenario(GOOD_SCENARIO)).status).toBe('saved');
    expect((await docs.saveBeforeClose(GOOD_SCENARIO)).status).toBe('saved');
    expect(events).toEqual(['command save-before-close', 'command save-before-close']);
  });
});

describe('export', () => {
  it('suggests the name in the documents folder, then in the last export folder; cancel writes nothing', async () => {
    const { docs, dialogs } = setup();
    const sub = path.join(dir, 'exports');
    await fsp.mkdir(sub);
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(sub, 'a.aem') }, { canceled: true });
    expect((await docs.exportFile({ suggestedName: 'a.aem', content: 'CCSDS_AEM_VERS = 1.0\n' })).status).toBe('exported');
    expect(await docs.exportFile({ suggestedName: 'b.csv', content: 'x' })).toEqual({ status: 'cancelled' });
    expect(dialogs.log).toEqual([`save ${path.join(dir, 'a.aem')}`, `save ${path.join(sub, 'b.csv')}`]);
    expect(await fsp.readdir(sub)).toEqual(['a.aem']);
  });

  it('a failed export leaves an existing file intact', async () => {
    const { docs, dialogs } = setup({ failAt: 'writeFile' });
    const target = await writeScenario('old.csv', 'old contents');
    dialogs.saveAnswers.push({ canceled: false, filePath: target });
    const r = await docs.exportFile({ suggestedName: 'old.csv', content: 'new contents, longer than before' });
    expect(r.status).toBe('failed');
    expect(await fsp.readFile(target, 'utf8')).toBe('old contents');
  });
});

/**
 * The document service's guards at the edges: the shared scenario reader on open (BOM, invalid
 * UTF-8 with its byte offset, non-object documents named), Save As re-confirming an overwrite when
 * `.json` is added after the dialog, main's own confirmation before writing to a path the user did
 * not pick in a dialog this session (a recent file the renderer named), and the folders noted for
 * the start-up temp-file sweep.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { DocumentService, type LaunchDocument } from '../../main/documents';
import { createRecentFiles } from '../../main/recent-files';
import { fakeValidator, failingFs, GOOD_SCENARIO, scriptedDialogs, tempDir } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

function setup(launch?: LaunchDocument) {
  const fs = failingFs(null);
  const dialogs = scriptedDialogs();
  const folders: string[] = [];
  const recent = createRecentFiles({ fs: failingFs(null), file: path.join(dir, 'recent.json'), max: 10 });
  const docs = new DocumentService({
    fs,
    dialogs,
    validateScenario: fakeValidator,
    recent,
    documentsDir: dir,
    launch,
    sendCommand: () => {},
    closeWindow: () => {},
    noteWriteFolder: (d) => folders.push(d),
  });
  return { fs, dialogs, recent, docs, folders };
}

async function put(name: string, body: string | Uint8Array): Promise<string> {
  const p = path.join(dir, name);
  await fsp.writeFile(p, body);
  return p;
}

async function openFile(p: string) {
  const s = setup();
  s.dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
  return { ...s, r: await s.docs.openScenario() };
}

describe('open through the shared reader', () => {
  it('accepts a UTF-8 byte-order mark', async () => {
    const p = await put('bom.json', Buffer.concat([Buffer.from([0xef, 0xbb, 0xbf]), Buffer.from(JSON.stringify(GOOD_SCENARIO))]));
    const { r } = await openFile(p);
    expect(r).toMatchObject({ status: 'opened', scenario: GOOD_SCENARIO });
  });

  it('refuses invalid UTF-8 with the offset of the first bad sequence, never replacement characters', async () => {
    const text = Buffer.from(JSON.stringify({ ...GOOD_SCENARIO, name: 'ab' }));
    const at = text.indexOf('ab');
    text[at] = 0xc3; // a 2-byte lead followed by "b" (0x62), not a continuation byte
    const { r } = await openFile(await put('latin.json', text));
    if (r.status !== 'invalid') throw new Error(`expected invalid, got ${r.status}`);
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]!.rule).toBe('utf-8');
    expect(r.errors[0]!.message).toContain(`byte offset ${at} (0xC3 0x62`);
  });

  it('names a document that is not an object', async () => {
    for (const [body, what] of [
      ['null', 'JSON null'],
      ['[1, 2]', 'a JSON array of 2 items'],
      ['42', 'a JSON number (42)'],
      ['"x"', 'a JSON string of 1 character'],
    ]) {
      const { r } = await openFile(await put('odd.json', body!));
      if (r.status !== 'invalid') throw new Error(`expected invalid for ${body}`);
      expect(r.errors).toEqual([{ path: '', rule: 'json-type', message: `the file holds ${what}; a scenario is a JSON object` }]);
    }
  });

  it('reports a folder as a failure to read, not a crash', async () => {
    const sub = path.join(dir, 'folder.json');
    await fsp.mkdir(sub);
    const { r } = await openFile(sub);
    expect(r).toEqual({ status: 'failed', message: `${sub} is a folder, not a scenario file` });
  });
});

describe('Save As adds .json after the dialog', () => {
  it('asks again before replacing an existing mission.json the dialog did not confirm; Cancel writes nothing', async () => {
    const { docs, dialogs } = setup();
    const existing = await put('mission.json', 'old');
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(dir, 'mission') });
    dialogs.messageAnswers.push(1); // Cancel
    expect(await docs.saveScenarioAs(GOOD_SCENARIO)).toEqual({ status: 'cancelled' });
    expect(dialogs.log).toEqual([`save ${path.join(dir, 'untitled.scenario.json')}`, 'message mission.json already exists. Replace it?']);
    expect(await fsp.readFile(existing, 'utf8')).toBe('old');
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(dir, 'mission') });
    dialogs.messageAnswers.push(0); // Replace
    expect((await docs.saveScenarioAs(GOOD_SCENARIO)).status).toBe('saved');
    expect(JSON.parse(await fsp.readFile(existing, 'utf8'))).toEqual(GOOD_SCENARIO);
  });

  it('does not ask again when the typed name already had the extension (the dialog confirmed it)', async () => {
    const { docs, dialogs } = setup();
    await put('mission.json', 'old');
    dialogs.saveAnswers.push({ canceled: false, filePath: path.join(dir, 'mission.json') });
    expect((await docs.saveScenarioAs(GOOD_SCENARIO)).status).toBe('saved');
    expect(dialogs.log).toHaveLength(1);
  });
});

describe('writes to paths the user did not pick in a dialog', () => {
  async function openedFromRecent() {
    const s = setup();
    const p = await put('listed.json', JSON.stringify(GOOD_SCENARIO));
    await s.recent.add(p); // listed in an earlier session
    expect((await s.docs.openRecent(p)).status).toBe('opened');
    return { ...s, p };
  }

  it('Save to a file opened from the recent list asks in main first; Cancel leaves the file untouched', async () => {
    const { docs, dialogs, p } = await openedFromRecent();
    dialogs.messageAnswers.push(1);
    expect(await docs.saveScenario({ ...GOOD_SCENARIO, durationS: 1 })).toEqual({ status: 'cancelled' });
    expect(dialogs.log).toEqual(['message Save over listed.json?']);
    expect(dialogs.lastMessage?.buttons).toEqual(['Save', 'Cancel']);
    expect(JSON.parse(await fsp.readFile(p, 'utf8'))).toEqual(GOOD_SCENARIO);
    // Confirmed once, the path is the user's for the rest of the session.
    dialogs.messageAnswers.push(0);
    expect((await docs.saveScenario({ ...GOOD_SCENARIO, durationS: 2 })).status).toBe('saved');
    expect((await docs.saveScenario({ ...GOOD_SCENARIO, durationS: 3 })).status).toBe('saved');
    expect(dialogs.log).toHaveLength(2);
    expect(JSON.parse(await fsp.readFile(p, 'utf8')).durationS).toBe(3);
  });

  it('paths picked in the open or save dialog, or given on the command line, are written without asking', async () => {
    const { docs, dialogs } = setup();
    const p = await put('picked.json', JSON.stringify(GOOD_SCENARIO));
    dialogs.openAnswers.push({ canceled: false, filePaths: [p] });
    await docs.openScenario();
    expect((await docs.saveScenario(GOOD_SCENARIO)).status).toBe('saved');
    expect(dialogs.log).toEqual(['open']);
    const launched = await put('argv.json', JSON.stringify(GOOD_SCENARIO));
    const l = setup({ kind: 'file', path: launched });
    await l.docs.initialScenario();
    expect((await l.docs.saveScenario(GOOD_SCENARIO)).status).toBe('saved');
    expect(l.dialogs.log).toEqual([]);
  });

  it('notes each folder before writing there, for the start-up sweep of stale temp files', async () => {
    const { docs, dialogs, folders } = setup();
    const sub = path.join(dir, 'exports');
    await fsp.mkdir(sub);
    dialogs.saveAnswers.push(
      { canceled: false, filePath: path.join(sub, 'a.csv') },
      { canceled: false, filePath: path.join(dir, 's.json') },
    );
    await docs.exportFile({ suggestedName: 'a.csv', content: 'x' });
    await docs.saveScenarioAs(GOOD_SCENARIO);
    expect(folders).toEqual([sub, dir]);
  });
});

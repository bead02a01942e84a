/** Recent files: most recent first, no duplicates, capped, persisted, and tolerant of a damaged file. */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createRecentFiles, parseRecentList } from '../../main/recent-files';
import { failingFs, tempDir } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

describe('recent files', () => {
  it('puts the latest first, moves repeats to the top, caps the list and persists it', async () => {
    const file = path.join(dir, 'recent.json');
    let t = Date.UTC(2026, 0, 1);
    const r = createRecentFiles({ fs: failingFs(null), file, max: 3, now: () => new Date((t += 1000)) });
    for (const n of ['a', 'b', 'c', 'a', 'd']) await r.add(path.join(dir, `${n}.json`));
    expect((await r.list()).map((f) => f.name)).toEqual(['d.json', 'a.json', 'c.json']);
    const again = createRecentFiles({ fs: failingFs(null), file, max: 3 });
    expect(await again.list()).toEqual(await r.list());
    expect((await again.list())[0]!.openedAt).toBe('2026-01-01T00:00:05.000Z');
    expect(await again.has(path.join(dir, 'b.json'))).toBe(false);
    await again.remove(path.join(dir, 'a.json'));
    expect((await again.list()).map((f) => f.name)).toEqual(['d.json', 'c.json']);
  });

  it('serialises quick successive adds', async () => {
    const r = createRecentFiles({ fs: failingFs(null), file: path.join(dir, 'recent.json'), max: 10 });
    await Promise.all(['a', 'b', 'c'].map((n) => r.add(path.join(dir, `${n}.json`))));
    expect((await r.list()).map((f) => f.name)).toEqual(['c.json', 'b.json', 'a.json']);
  });

  it('treats a missing or damaged list as empty and skips bad entries', async () => {
    expect(parseRecentList('not json', 10)).toEqual([]);
    expect(parseRecentList('{"format":"other","version":1,"files":[]}', 10)).toEqual([]);
    const text = JSON.stringify({
      format: 'slewsmith-recent-files',
      version: 1,
      files: [
        { path: '/ok/a.json', openedAt: '2026-01-01T00:00:00Z' },
        { path: 'relative.json', openedAt: '2026-01-01T00:00:00Z' },
        { path: '/ok/a.json', openedAt: '2026-01-02T00:00:00Z' },
        { path: '/ok/b.json', openedAt: 'yesterday' },
        { path: 7 },
        null,
        { path: '/ok/c.json', openedAt: '2026-01-03T00:00:00Z' },
      ],
    });
    expect(parseRecentList(text, 10).map((f) => f.path)).toEqual(['/ok/a.json', '/ok/c.json']);
    const r = createRecentFiles({ fs: failingFs(null), file: path.join(dir, 'missing.json'), max: 10 });
    expect(await r.list()).toEqual([]);
  });

  it('keeps working for the session when the list cannot be written', async () => {
    const logs: string[] = [];
    const file = path.join(dir, 'recent.json');
    const r = createRecentFiles({ fs: failingFs('rename'), file, max: 10, log: (m) => logs.push(m) });
    await r.add(path.join(dir, 'a.json'));
    expect((await r.list()).map((f) => f.name)).toEqual(['a.json']);
    expect(logs[0]).toMatch(/^recent files not saved: Could not replace the old file/);
    await expect(fsp.access(file)).rejects.toThrow();
  });
});

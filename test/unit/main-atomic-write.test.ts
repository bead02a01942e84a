/**
 * Atomic save: a failure at any step (create, write, fsync, close, rename) leaves the old file
 * byte for byte and no temporary file behind. Checked on a real temporary folder with a file
 * system wrapper that fails at the chosen step.
 */
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { tempPathFor, writeFileAtomic } from '../../main/atomic-write';
import { failingFs, tempDir, type FsStep } from './main-fakes';

let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

const OLD = '{"old": true}\n';
const NEW = '{"new": true, "padding": "' + 'x'.repeat(10_000) + '"}\n';

describe('writeFileAtomic', () => {
  it('replaces the file and leaves nothing else in the folder', async () => {
    const target = path.join(dir, 'a.scenario.json');
    await fsp.writeFile(target, OLD);
    const fs = failingFs(null);
    expect(await writeFileAtomic(fs, target, NEW)).toEqual({ ok: true });
    expect(await fsp.readFile(target, 'utf8')).toBe(NEW);
    expect(await fsp.readdir(dir)).toEqual(['a.scenario.json']);
    // The sequence that makes it atomic: exclusive temp create, write, fsync, close, rename, then the folder.
    expect(fs.calls[0]).toMatch(/^open \.a\.scenario\.json\..*\.tmp wx$/);
    expect(fs.calls[1]).toMatch(/^rename \.a\.scenario\.json\..*\.tmp -> a\.scenario\.json$/);
    expect(fs.calls[2]).toBe(`open ${path.basename(dir)} r`);
  });

  it('creates a new file when none exists', async () => {
    const target = path.join(dir, 'fresh.csv');
    expect((await writeFileAtomic(failingFs(null), target, new Uint8Array([1, 2, 3]))).ok).toBe(true);
    expect([...(await fsp.readFile(target))]).toEqual([1, 2, 3]);
  });

  it.each<FsStep>(['open', 'writeFile', 'sync', 'close', 'rename'])('keeps the old file intact when %s fails', async (step) => {
    const target = path.join(dir, 'keep.json');
    await fsp.writeFile(target, OLD);
    const r = await writeFileAtomic(failingFs(step), target, NEW);
    expect(r.ok).toBe(false);
    if (!r.ok) {
      expect(r.message).toContain(target);
      expect(r.message).toContain(`injected failure at ${step}`);
      expect(r.code).toBe('EIO');
    }
    expect(await fsp.readFile(target, 'utf8')).toBe(OLD);
    expect(await fsp.readdir(dir)).toEqual(['keep.json']);
  });

  it('keeps the permissions of the file it replaces', async () => {
    const target = path.join(dir, 'private.json');
    await fsp.writeFile(target, OLD, { mode: 0o600 });
    await fsp.chmod(target, 0o600);
    await writeFileAtomic(failingFs(null), target, NEW);
    expect((await fsp.stat(target)).mode & 0o777).toBe(0o600);
  });

  it('reports a missing folder as a failure, not an exception', async () => {
    const r = await writeFileAtomic(failingFs(null), path.join(dir, 'no/such/folder/x.json'), NEW);
    expect(r).toMatchObject({ ok: false, code: 'ENOENT' });
  });

  it('names temp files beside the target, hidden', () => {
    expect(tempPathFor('/a/b/c.json', 'u1')).toBe(path.join('/a/b', '.c.json.u1.tmp'));
  });
});

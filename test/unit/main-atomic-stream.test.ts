/**
 * The streaming atomic writer (main/atomic-stream.ts) and the start-up sweep of stale temporary
 * files (main/temp-files.ts): the target is the old file or the complete new one at every moment,
 * back-pressure holds the producer, abort and every failure remove the temporary file, and a
 * process killed (SIGKILL) in the middle of a large write leaves the old target intact and a temp
 * file that the next start of the real CLI removes.
 */
import { spawn } from 'node:child_process';
import fsp from 'node:fs/promises';
import path from 'node:path';
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createAtomicStreamWriter, nodeStreamFs, type AtomicStreamFs } from '../../main/atomic-stream';
import { OWN_TEMP_NAME } from '../../main/atomic-write';
import { STALE_TEMP_AGE_MS, createWriteFolders, sweepStaleTempFiles } from '../../main/temp-files';
import { failingFs, tempDir } from './main-fakes';

const root = path.resolve(__dirname, '../..');
let dir: string;
beforeEach(async () => {
  dir = await tempDir();
});
afterEach(() => fsp.rm(dir, { recursive: true, force: true }));

const OLD = 'old contents\n';
const ls = () => fsp.readdir(dir);

/** node's fs with a chosen step failing, and a gate that holds every write until released. */
function scriptedFs(
  failAt: 'open' | 'write' | 'sync' | 'rename' | null,
  gate?: { wait: Promise<void> },
): AtomicStreamFs & { writes: number } {
  const boom = () => Object.assign(new Error(`injected ${failAt}`), { code: 'EIO' });
  const f: AtomicStreamFs & { writes: number } = {
    writes: 0,
    open: async (p, flags, mode) => {
      if (failAt === 'open' && flags === 'wx') throw boom();
      const h = await nodeStreamFs.open(p, flags, mode);
      return {
        write: async (d) => {
          if (gate) await gate.wait;
          f.writes++;
          if (failAt === 'write' && f.writes === 2) throw boom();
          return h.write(d);
        },
        sync: async () => {
          if (failAt === 'sync' && flags === 'wx') throw boom();
          return h.sync();
        },
        close: () => h.close(),
      };
    },
    rename: async (a, b) => {
      if (failAt === 'rename') throw boom();
      return nodeStreamFs.rename(a, b);
    },
    unlink: (p) => nodeStreamFs.unlink(p),
    stat: (p) => nodeStreamFs.stat(p),
  };
  return f;
}

describe('createAtomicStreamWriter', () => {
  it('streams chunks into a hidden temp file and replaces the target only on commit', async () => {
    const target = path.join(dir, 'run.csv');
    await fsp.writeFile(target, OLD);
    const w = createAtomicStreamWriter(target, { highWaterMark: 64 });
    expect(path.basename(w.tempPath)).toMatch(OWN_TEMP_NAME);
    const lines = Array.from({ length: 2000 }, (_, i) => `${i},${(i * 0.001).toFixed(3)},é\n`);
    for (const l of lines) expect(await w.write(l)).toBe(true);
    expect(await fsp.readFile(target, 'utf8')).toBe(OLD);
    expect((await ls()).sort()).toEqual([path.basename(w.tempPath), 'run.csv'].sort());
    expect(await w.commit()).toEqual({ ok: true });
    expect(await fsp.readFile(target, 'utf8')).toBe(lines.join(''));
    expect(await ls()).toEqual(['run.csv']);
    expect(await w.write('late')).toBe(false);
  });

  it('holds the producer while more than highWaterMark bytes wait for the disk (back-pressure)', async () => {
    let release!: () => void;
    const gate = { wait: new Promise<void>((r) => (release = r)) };
    const w = createAtomicStreamWriter(path.join(dir, 'bp.bin'), { fs: scriptedFs(null, gate), highWaterMark: 10 });
    expect(await w.write('12345')).toBe(true); // 5 bytes queued: under the mark, no wait
    let resolved = false;
    const second = w.write('6789012345').then((v) => ((resolved = true), v)); // 15 > 10: waits
    await new Promise((r) => setTimeout(r, 30));
    expect(resolved).toBe(false);
    release();
    expect(await second).toBe(true);
    expect(await w.commit()).toEqual({ ok: true });
    expect(await fsp.readFile(path.join(dir, 'bp.bin'), 'utf8')).toBe('123456789012345');
  });

  it('abort keeps the old target and removes the temp file', async () => {
    const target = path.join(dir, 'keep.aem');
    await fsp.writeFile(target, OLD);
    const w = createAtomicStreamWriter(target);
    await w.write('x'.repeat(100_000));
    await w.abort();
    expect(await fsp.readFile(target, 'utf8')).toBe(OLD);
    expect(await ls()).toEqual(['keep.aem']);
    expect(await w.write('more')).toBe(false);
    expect((await w.commit()).ok).toBe(false);
  });

  it.each(['open', 'write', 'sync', 'rename'] as const)(
    'a failure at %s keeps the target, removes the temp file, and commit says why',
    async (step) => {
      const target = path.join(dir, 'f.json');
      await fsp.writeFile(target, OLD);
      const w = createAtomicStreamWriter(target, { fs: scriptedFs(step), highWaterMark: 4 });
      for (let i = 0; i < 5; i++) if (!(await w.write(`chunk ${i}\n`))) break;
      const r = await w.commit();
      expect(r.ok).toBe(false);
      if (!r.ok) {
        expect(r.message).toContain(target);
        expect(r.message).toContain(`injected ${step}`);
        expect(r.code).toBe('EIO');
      }
      expect(await fsp.readFile(target, 'utf8')).toBe(OLD);
      expect(await ls()).toEqual(['f.json']);
    },
  );
});

describe('sweepStaleTempFiles', () => {
  it('removes only our own temp files older than the stated age, never other files, links or folders', async () => {
    const now = Date.now();
    const old = (now - STALE_TEMP_AGE_MS - 60_000) / 1000;
    const names = {
      stale: '.run.csv.slewsmith-4242-lz1a2b-7.tmp',
      fresh: '.run.json.slewsmith-4242-lz1a2b-8.tmp',
      foreign: '.run.csv.4242-lz1a2b-7.tmp', // the older pattern without our tag: not provably ours
      editor: '.run.csv.swp',
      folder: '.x.slewsmith-1-a-1.tmp',
    };
    for (const n of [names.stale, names.fresh, names.foreign, names.editor]) await fsp.writeFile(path.join(dir, n), 'x');
    await fsp.mkdir(path.join(dir, names.folder));
    for (const n of [names.stale, names.foreign, names.editor, names.folder]) await fsp.utimes(path.join(dir, n), old, old);
    await fsp.symlink('/etc/hostname', path.join(dir, '.y.slewsmith-1-a-2.tmp'));
    const removed = await sweepStaleTempFiles({ readdir: fsp.readdir, lstat: fsp.lstat, unlink: fsp.unlink }, dir, { now });
    expect(removed).toEqual([path.join(dir, names.stale)]);
    expect((await ls()).sort()).toEqual([names.fresh, names.foreign, names.editor, names.folder, '.y.slewsmith-1-a-2.tmp'].sort());
    expect(await sweepStaleTempFiles({ readdir: fsp.readdir, lstat: fsp.lstat, unlink: fsp.unlink }, path.join(dir, 'missing'))).toEqual(
      [],
    );
  });

  it('the app remembers the folders it wrote to, newest first, across restarts', async () => {
    const file = path.join(dir, 'write-folders.json');
    const a = createWriteFolders({ fs: failingFs(null), file, max: 2 });
    a.note('/data/one');
    a.note('/data/two');
    a.note('/data/one');
    a.note('/data/three');
    await a.flush();
    const b = createWriteFolders({ fs: failingFs(null), file, max: 2 });
    expect(await b.list()).toEqual(['/data/three', '/data/one']);
  });
});

describe('killed in the middle of a large streamed write (SIGKILL)', () => {
  it('leaves the target as the complete old file, and the next CLI start removes the temp file', async () => {
    const target = path.join(dir, 'lumen6-imaging.pd.follow-plan.csv');
    await fsp.writeFile(target, OLD);
    const child = spawn(process.execPath, ['--import', 'tsx', path.join(root, 'test/unit/fixtures/stream-writer-child.ts'), target], {
      cwd: root,
      stdio: ['ignore', 'pipe', 'inherit'],
    });
    // The child says "writing" after its first megabytes are on disk, then keeps streaming.
    await new Promise<void>((resolve, reject) => {
      child.stdout.on('data', (d: Buffer) => d.toString().includes('writing') && resolve());
      child.on('exit', (code) => reject(new Error(`child ended early with ${code}`)));
    });
    child.kill('SIGKILL');
    await new Promise((r) => child.on('exit', r));
    expect(await fsp.readFile(target, 'utf8')).toBe(OLD);
    const temps = (await ls()).filter((n) => OWN_TEMP_NAME.test(n));
    expect(temps).toHaveLength(1);
    expect((await fsp.stat(path.join(dir, temps[0]!))).size).toBeGreaterThan(1 << 20);

    // An hour later (mtime moved back) the CLI writes into the same folder: the sweep removes it.
    const then = (Date.now() - STALE_TEMP_AGE_MS - 60_000) / 1000;
    await fsp.utimes(path.join(dir, temps[0]!), then, then);
    const run = spawn(
      process.execPath,
      [
        path.join(root, 'bin/slewsmith.mjs'),
        'fly',
        path.join(root, 'assets/lumen6-imaging.scenario.json'),
        '--controller',
        'pd',
        '--mode',
        'follow-plan',
        '--format',
        'csv',
        '--out',
        dir,
      ],
      { cwd: root, stdio: 'ignore' },
    );
    expect(await new Promise((r) => run.on('exit', r))).toBe(0);
    expect((await ls()).filter((n) => OWN_TEMP_NAME.test(n))).toEqual([]);
    expect(await fsp.readFile(target, 'utf8')).toContain('Slewsmith');
  });
});

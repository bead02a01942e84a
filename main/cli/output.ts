/**
 * Where the CLI writes: the output folder is made (or checked) and probed before any work, so a
 * bad --out fails in milliseconds with one clear line; files are written atomically through the
 * streaming writer, which an interrupt can abort mid-file without touching the target.
 *
 * Why not `mkdir(dir, { recursive: true })`: Node's recursive mkdir walks back to the parent on
 * ENOENT and forward again on EEXIST, so a folder whose parent exists but refuses children (under
 * /proc, or below a dangling symbolic link) makes it loop forever inside libuv — no error, no
 * return, a CPU spinning (seen with Node 20: `mkdirSync('/proc/x', { recursive: true })` never
 * returns). `ensureFolder` below makes one folder at a time from the deepest existing ancestor
 * down, so it takes at most one mkdir per missing level and any refusal ends it: no timeout needed.
 */
import { lstat, mkdir, open, readdir, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import type { Issue } from '../../app/engine/errors';
import { createAtomicStreamWriter } from '../atomic-stream';
import type { ChunkPull } from './compute';
import { errorCode, newTempPath } from '../atomic-write';
import { sweepStaleTempFiles } from '../temp-files';

export type FolderOutcome = { ok: true } | { ok: false; message: string };

const REASONS: Record<string, string> = {
  ENOENT: 'no such file or folder',
  EACCES: 'permission denied',
  EPERM: 'operation not permitted',
  EROFS: 'read-only file system',
  ENOSPC: 'no space left on the device',
  EDQUOT: 'disk quota exceeded',
  ENOTDIR: 'a part of the path is a file, not a folder',
  ENAMETOOLONG: 'the name is too long',
  ELOOP: 'too many symbolic links',
  EEXIST: 'it already exists',
};

/** `enoent`: what ENOENT means where it happened (on mkdir or create, the folder refuses entries). */
function why(e: unknown, enoent = REASONS.ENOENT!): string {
  const code = errorCode(e);
  if (code === 'ENOENT') return enoent;
  return (code && REASONS[code]) ?? (e instanceof Error ? e.message : String(e));
}

/** Makes `dir` and any missing parents, one level at a time; every refusal is a message. */
export async function ensureFolder(dir: string, option: string): Promise<FolderOutcome> {
  if (dir.trim() === '' || dir.includes('\0')) return { ok: false, message: `${option} needs a folder name (got ${JSON.stringify(dir)})` };
  const abs = path.resolve(dir);
  const missing: string[] = [];
  for (let p = abs; ; p = path.dirname(p)) {
    try {
      const st = await stat(p);
      if (!st.isDirectory())
        return {
          ok: false,
          message: p === abs ? `${option} ${dir} names an existing file; give a folder` : `${option} ${dir}: ${p} is a file, not a folder`,
        };
      break;
    } catch (e) {
      const code = errorCode(e);
      // ENOTDIR: a file further up; the walk reaches it and names it.
      if (code !== 'ENOENT' && code !== 'ENOTDIR') return { ok: false, message: `${option} ${dir}: cannot use ${p}: ${why(e)}` };
      missing.push(p);
      if (path.dirname(p) === p) return { ok: false, message: `${option} ${dir}: no such drive or root` };
    }
  }
  for (const p of missing.reverse()) {
    try {
      await mkdir(p);
    } catch (e) {
      // Another process may have made it meanwhile; a folder is all we need.
      if (errorCode(e) === 'EEXIST' && (await stat(p).catch(() => null))?.isDirectory()) continue;
      return {
        ok: false,
        message: `${option} ${dir}: cannot create the folder ${p}: ${why(e, 'the folder above it does not accept new folders')}`,
      };
    }
  }
  return { ok: true };
}

/** Creates and removes one temporary file in `dir`: the only sure test that we may write there. */
async function probeWritable(dir: string, option: string): Promise<FolderOutcome> {
  const probe = newTempPath(path.join(dir, 'write-probe'));
  try {
    const h = await open(probe, 'wx', 0o600);
    await h.close();
    await unlink(probe);
    return { ok: true };
  } catch (e) {
    await unlink(probe).catch(() => {});
    return { ok: false, message: `${option} ${dir}: cannot write there: ${why(e, 'the folder does not accept new files')}` };
  }
}

/**
 * The output folder, ready to take files: made if missing, probed for writing, and swept of our
 * own stale temporary files (a previous run killed mid-write).
 */
export async function prepareOutputFolder(dir: string, option: string): Promise<FolderOutcome> {
  const made = await ensureFolder(dir, option);
  if (!made.ok) return made;
  const probe = await probeWritable(dir, option);
  if (!probe.ok) return probe;
  await sweepStaleTempFiles({ readdir: (d) => readdir(d), lstat: (p) => lstat(p), unlink: (p) => unlink(p) }, dir);
  return { ok: true };
}

/** `--csv FILE` and the like: the file's folder must be usable and the name must not be a folder. */
export async function prepareOutputFile(file: string, option: string): Promise<FolderOutcome> {
  if (file.trim() === '' || file.includes('\0') || /[\\/]$/.test(file))
    return { ok: false, message: `${option} needs a file name (got ${JSON.stringify(file)})` };
  const st = await stat(file).catch(() => null);
  if (st?.isDirectory()) return { ok: false, message: `${option} ${file} names a folder; give a file name` };
  return prepareOutputFolder(path.dirname(path.resolve(file)), option);
}

export type WriteResult = { ok: true } | { ok: false; message: string; interrupted?: boolean; errors?: Issue[] };

/** 1 MiB per chunk: the interrupt check runs between chunks, and memory stays flat. */
const CHUNK_CHARS = 1 << 20;

/** Writes `text` to `file` atomically; an abort signal drops the partial temp file and keeps the target. */
export async function writeTextAtomic(file: string, text: string, signal?: AbortSignal): Promise<WriteResult> {
  const w = createAtomicStreamWriter(file);
  let i = 0;
  while (i < text.length) {
    if (signal?.aborted) break;
    // Slicing between the halves of a surrogate pair would write two replacement characters.
    let end = Math.min(text.length, i + CHUNK_CHARS);
    const last = text.charCodeAt(end - 1);
    if (end < text.length && last >= 0xd800 && last <= 0xdbff) end++;
    if (!(await w.write(text.slice(i, end)))) break;
    i = end;
  }
  if (signal?.aborted) {
    await w.abort();
    return { ok: false, message: `${file} not written: interrupted`, interrupted: true };
  }
  const r = await w.commit();
  return r.ok ? { ok: true } : { ok: false, message: r.message };
}

/**
 * Writes a streamed export to `file` atomically, pulling one chunk at a time (the source waits for
 * the disk). The text is committed only when the source ends without a problem; a problem found
 * while writing (`errors`), a write failure or an abort drops the temporary file and keeps the target.
 */
export async function writeStreamAtomic(file: string, pull: ChunkPull, signal?: AbortSignal): Promise<WriteResult> {
  const w = createAtomicStreamWriter(file);
  const dropped = async (r: WriteResult): Promise<WriteResult> => {
    await w.abort();
    return r;
  };
  const stopped = () => dropped({ ok: false, message: `${file} not written: interrupted`, interrupted: true });
  for (;;) {
    if (signal?.aborted) return stopped();
    let next: Awaited<ReturnType<ChunkPull>>;
    try {
      next = await pull();
    } catch (e) {
      if (signal?.aborted) return stopped();
      return dropped({ ok: false, message: e instanceof Error ? e.message : String(e) });
    }
    if ('done' in next) {
      if (next.done.length) return dropped({ ok: false, message: `${file} not written`, errors: next.done });
      break;
    }
    if (!(await w.write(next.chunk))) break;
  }
  if (signal?.aborted) return stopped();
  const r = await w.commit();
  return r.ok ? { ok: true } : { ok: false, message: r.message };
}

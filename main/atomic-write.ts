/**
 * Atomic file replacement: write a temporary file in the target's folder, fsync it, then rename it
 * over the target. rename(2) within one file system is atomic, so a reader sees either the old file
 * or the complete new one; a failure at any step leaves the old file untouched and removes the
 * temporary file. (Common practice, no source; it is what POSIX rename guarantees.)
 *
 * The file system is a parameter: node:fs/promises satisfies `AtomicFs`, and tests inject one that
 * fails at a chosen step.
 */
import path from 'node:path';

export interface AtomicFileHandle {
  writeFile(data: string | Uint8Array): Promise<void>;
  sync(): Promise<void>;
  close(): Promise<void>;
}

export interface AtomicFs {
  open(filePath: string, flags: string, mode?: number): Promise<AtomicFileHandle>;
  rename(from: string, to: string): Promise<void>;
  unlink(filePath: string): Promise<void>;
  stat(filePath: string): Promise<{ mode: number }>;
}

export type WriteOutcome = { ok: true } | { ok: false; message: string; code?: string };

let counter = 0;

/** A temp name beside the target: same folder (so rename stays on one file system), hidden, unique. */
export function tempPathFor(target: string, unique: string): string {
  return path.join(path.dirname(target), `.${path.basename(target)}.${unique}.tmp`);
}

/**
 * The names of our own temporary files, `.<target>.slewsmith-<pid>-<ms, base 36>-<n>.tmp`, and
 * nothing else: the start-up sweep (main/temp-files.ts) removes only names of this form.
 */
export const OWN_TEMP_NAME = /^\..+\.slewsmith-(\d+)-([0-9a-z]+)-(\d+)\.tmp$/;

/** A fresh temp path for `target` in our naming pattern. */
export function newTempPath(target: string): string {
  counter = (counter + 1) % 1_000_000;
  return tempPathFor(target, `slewsmith-${process.pid}-${Date.now().toString(36)}-${counter}`);
}

export function errorCode(e: unknown): string | undefined {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : undefined;
}

export function errorMessage(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

/** The existing file's permissions (kept on replace), or rw-r--r-- (before umask) for a new file. */
export async function modeFor(fs: Pick<AtomicFs, 'stat'>, target: string): Promise<number> {
  try {
    return (await fs.stat(target)).mode & 0o777;
  } catch {
    return 0o644;
  }
}

export async function writeFileAtomic(fs: AtomicFs, target: string, data: string | Uint8Array): Promise<WriteOutcome> {
  const mode = await modeFor(fs, target);
  const tmp = newTempPath(target);
  let handle: AtomicFileHandle | null = null;
  let step = 'create the temporary file';
  try {
    // 'wx': fail rather than reuse a file someone else made under the same name.
    handle = await fs.open(tmp, 'wx', mode);
    step = 'write';
    await handle.writeFile(data);
    step = 'flush to disk';
    await handle.sync();
    step = 'close';
    const h = handle;
    handle = null;
    await h.close();
    step = 'replace the old file';
    await fs.rename(tmp, target);
  } catch (e) {
    if (handle) await handle.close().catch(() => {});
    await fs.unlink(tmp).catch(() => {});
    return { ok: false, message: `Could not ${step} for ${target}: ${errorMessage(e)}`, code: errorCode(e) };
  }
  await syncDirectory(fs, path.dirname(target));
  return { ok: true };
}

/**
 * Makes the rename itself durable. Best effort: Windows cannot open a folder this way, and the file
 * is already complete and in place at this point.
 */
export async function syncDirectory(
  fs: { open(filePath: string, flags: string): Promise<Pick<AtomicFileHandle, 'sync' | 'close'>> },
  dir: string,
): Promise<void> {
  try {
    const h = await fs.open(dir, 'r');
    try {
      await h.sync();
    } finally {
      await h.close();
    }
  } catch {
    // Not supported here; nothing to undo.
  }
}

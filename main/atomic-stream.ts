/**
 * Atomic replacement for output too large to hold as one string: chunks stream into a temporary
 * file beside the target (our naming pattern, created exclusively), and only `commit()` makes them
 * the target — fsync, close, rename, then fsync of the folder, as in main/atomic-write.ts. Until
 * then a reader sees the old file or none; `abort()`, a failed write or a failed commit step
 * removes the temporary file. A process killed mid-stream leaves only the temporary file, which
 * the next start sweeps (main/temp-files.ts).
 *
 * Back-pressure: `write` queues the chunk and, when more than `highWaterMark` bytes are waiting for
 * the disk, resolves only once the queue has drained, so a fast producer cannot fill memory.
 */
import { open, rename, stat, unlink } from 'node:fs/promises';
import path from 'node:path';
import { errorCode, errorMessage, modeFor, newTempPath, syncDirectory, type WriteOutcome } from './atomic-write';

export interface StreamFileHandle {
  /** Writes from `data`; may write fewer bytes than given (the writer loops). */
  write(data: Uint8Array): Promise<{ bytesWritten: number }>;
  sync(): Promise<void>;
  close(): Promise<void>;
}

export interface AtomicStreamFs {
  open(filePath: string, flags: string, mode?: number): Promise<StreamFileHandle>;
  rename(from: string, to: string): Promise<void>;
  unlink(filePath: string): Promise<void>;
  stat(filePath: string): Promise<{ mode: number }>;
}

export const nodeStreamFs: AtomicStreamFs = {
  open: async (p, flags, mode) => {
    const h = await open(p, flags, mode);
    return { write: (d) => h.write(d), sync: () => h.sync(), close: () => h.close() };
  },
  rename: (a, b) => rename(a, b),
  unlink: (p) => unlink(p),
  stat: async (p) => ({ mode: (await stat(p)).mode }),
};

export interface AtomicStreamWriter {
  readonly target: string;
  readonly tempPath: string;
  /**
   * Queues a chunk (strings as UTF-8). Resolves true when the caller may go on; false once the
   * writer has failed or was aborted or committed (stop producing; `commit()` says why).
   */
  write(chunk: string | Uint8Array): Promise<boolean>;
  /** Flushes, fsyncs and renames over the target. Every outcome is a result, never a rejection. */
  commit(): Promise<WriteOutcome>;
  /** Drops everything written so far and removes the temporary file; the target is untouched. */
  abort(): Promise<void>;
}

export interface AtomicStreamOptions {
  fs?: AtomicStreamFs;
  /** Bytes queued before `write` waits for the disk (default 1 MiB). */
  highWaterMark?: number;
}

const encoder = new TextEncoder();

export function createAtomicStreamWriter(target: string, options: AtomicStreamOptions = {}): AtomicStreamWriter {
  const fs = options.fs ?? nodeStreamFs;
  const highWaterMark = options.highWaterMark ?? 1 << 20;
  const tempPath = newTempPath(target);
  const queue: Uint8Array[] = [];
  let queued = 0;
  let state: 'open' | 'failed' | 'aborted' | 'committed' = 'open';
  let failure: { step: string; error: unknown } | null = null;
  let pump: Promise<void> | null = null;
  let drained: Array<() => void> = [];
  // Opened at once so a folder that cannot take the file fails on the first write, not at commit.
  const handle: Promise<StreamFileHandle | null> = modeFor(fs, target)
    .then((mode) => fs.open(tempPath, 'wx', mode))
    .catch((e: unknown) => {
      fail('create the temporary file', e);
      return null;
    });
  let cleanup: Promise<void> | null = null;
  let closing = false;

  function outcomeOf(f: { step: string; error: unknown }): WriteOutcome {
    return { ok: false, message: `Could not ${f.step} for ${target}: ${errorMessage(f.error)}`, code: errorCode(f.error) };
  }

  function wakeWriters(): void {
    const waiting = drained;
    drained = [];
    for (const w of waiting) w();
  }

  function fail(step: string, error: unknown): void {
    if (state !== 'open') return;
    state = 'failed';
    failure = { step, error };
    queue.length = 0;
    queued = 0;
    wakeWriters();
    void removeTemp();
  }

  /** Closes the handle and unlinks the temporary file, once. */
  function removeTemp(): Promise<void> {
    cleanup ??= (async () => {
      if (pump) await pump;
      const h = await handle;
      if (h) await h.close().catch(() => {});
      await fs.unlink(tempPath).catch(() => {});
    })();
    return cleanup;
  }

  async function drainQueue(): Promise<void> {
    const h = await handle;
    while (h && state === 'open' && queue.length > 0) {
      const chunk = queue[0]!;
      try {
        let off = 0;
        while (off < chunk.length) off += (await h.write(chunk.subarray(off))).bytesWritten;
      } catch (e) {
        pump = null;
        fail('write', e);
        return;
      }
      queue.shift();
      queued -= chunk.length;
    }
    pump = null;
    wakeWriters();
  }

  return {
    target,
    tempPath,
    async write(chunk) {
      if (state !== 'open' || closing) return false;
      const bytes = typeof chunk === 'string' ? encoder.encode(chunk) : chunk;
      if (bytes.length === 0) return true;
      queue.push(bytes);
      queued += bytes.length;
      pump ??= drainQueue();
      if (queued > highWaterMark) await new Promise<void>((resolve) => drained.push(resolve));
      return state === 'open';
    },
    async commit() {
      const refused = (why: string): WriteOutcome => ({ ok: false, message: `${target}: ${why}` });
      if (closing) return refused('commit was already called');
      closing = true;
      const h = await handle;
      while (pump) await pump;
      if (state === 'failed' && failure) {
        await removeTemp();
        return outcomeOf(failure);
      }
      if (state !== 'open' || !h) return refused(`the stream was ${state}`);
      state = 'committed';
      let step = 'flush to disk';
      try {
        await h.sync();
        step = 'close';
        await h.close();
        step = 'replace the old file';
        await fs.rename(tempPath, target);
      } catch (e) {
        if (step !== 'replace the old file') await h.close().catch(() => {});
        await fs.unlink(tempPath).catch(() => {});
        return outcomeOf({ step, error: e });
      }
      await syncDirectory(fs, path.dirname(target));
      return { ok: true };
    },
    async abort() {
      if (state === 'committed') return;
      if (state === 'open') state = 'aborted';
      queue.length = 0;
      queued = 0;
      wakeWriters();
      await removeTemp();
    },
  };
}

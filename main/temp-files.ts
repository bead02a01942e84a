/**
 * Clean-up of temporary files a killed write left behind. Atomic writes (main/atomic-write.ts,
 * main/atomic-stream.ts) never leave a partial target, but a process killed between creating the
 * temporary file and renaming it leaves that hidden file beside the target. On the next start the
 * app and the CLI sweep the folders they write to and remove such files when
 * - the name matches our own pattern exactly (OWN_TEMP_NAME: `.<name>.slewsmith-<pid>-<t>-<n>.tmp`),
 *   so no other program's file is ever touched;
 * - it is a regular file (not a folder or a link), and
 * - it was last modified more than STALE_TEMP_AGE_MS ago (a live write keeps touching its file;
 *   one hour also spares a second instance writing into the same folder right now).
 *
 * The desktop app remembers the folders it wrote to in a small JSON list in its user-data folder
 * (the CLI sweeps the folder it is about to write to).
 */
import path from 'node:path';
import { OWN_TEMP_NAME, writeFileAtomic, type AtomicFs } from './atomic-write';

export const STALE_TEMP_AGE_MS = 60 * 60 * 1000;

export interface SweepFs {
  readdir(dir: string): Promise<string[]>;
  lstat(filePath: string): Promise<{ mtimeMs: number; isFile(): boolean }>;
  unlink(filePath: string): Promise<void>;
}

export interface SweepOptions {
  now?: number;
  olderThanMs?: number;
}

/** Removes our stale temp files in `dir`; returns the paths removed. Never throws. */
export async function sweepStaleTempFiles(fs: SweepFs, dir: string, o: SweepOptions = {}): Promise<string[]> {
  const now = o.now ?? Date.now();
  const age = o.olderThanMs ?? STALE_TEMP_AGE_MS;
  let names: string[];
  try {
    names = await fs.readdir(dir);
  } catch {
    return [];
  }
  const removed: string[] = [];
  for (const name of names) {
    if (!OWN_TEMP_NAME.test(name)) continue;
    const p = path.join(dir, name);
    try {
      const st = await fs.lstat(p);
      if (!st.isFile() || now - st.mtimeMs <= age) continue;
      await fs.unlink(p);
      removed.push(p);
    } catch {
      // Gone already, or not ours to remove: leave it.
    }
  }
  return removed;
}

export interface WriteFoldersFs extends AtomicFs {
  readFile(filePath: string, encoding: 'utf8'): Promise<string>;
}

/** The folders the app wrote to, newest first, persisted so the next start knows where to sweep. */
export interface WriteFolders {
  note(dir: string): void;
  list(): Promise<string[]>;
  /** Resolves once every noted folder has been persisted (tests, shutdown). */
  flush(): Promise<void>;
}

const FORMAT = 'slewsmith-write-folders';

export function createWriteFolders(deps: { fs: WriteFoldersFs; file: string; max: number }): WriteFolders {
  let cache: string[] | null = null;
  let queue: Promise<unknown> = Promise.resolve();

  async function load(): Promise<string[]> {
    if (cache) return cache;
    try {
      const d = JSON.parse(await deps.fs.readFile(deps.file, 'utf8')) as { format?: unknown; folders?: unknown };
      const list = d.format === FORMAT && Array.isArray(d.folders) ? d.folders : [];
      cache = list.filter((f): f is string => typeof f === 'string' && path.isAbsolute(f) && !f.includes('\0')).slice(0, deps.max);
    } catch {
      cache = [];
    }
    return cache;
  }

  return {
    note(dir) {
      const abs = path.resolve(dir);
      queue = queue
        .then(async () => {
          const now = await load();
          if (now[0] === abs) return;
          cache = [abs, ...now.filter((f) => f !== abs)].slice(0, deps.max);
          await writeFileAtomic(deps.fs, deps.file, JSON.stringify({ format: FORMAT, folders: cache }, null, 2) + '\n');
        })
        .catch(() => {});
    },
    async list() {
      await queue;
      return (await load()).slice();
    },
    async flush() {
      await queue;
    },
  };
}

/** The start-up sweep of the app: every folder it remembers writing to, plus its own data folder. */
export async function sweepWriteFolders(fs: SweepFs, folders: readonly string[], o: SweepOptions = {}): Promise<string[]> {
  const removed: string[] = [];
  for (const dir of new Set(folders)) removed.push(...(await sweepStaleTempFiles(fs, dir, o)));
  return removed;
}

/**
 * The recent-files list, persisted as JSON in the user-data folder (written atomically).
 * A missing or damaged list file is an empty list, never a crash; entries are checked one by one.
 */
import path from 'node:path';
import type { RecentFile } from '../app/bridge/api';
import { writeFileAtomic, type AtomicFs } from './atomic-write';

export interface RecentFilesFs extends AtomicFs {
  readFile(filePath: string, encoding: 'utf8'): Promise<string>;
}

export interface RecentFilesDeps {
  fs: RecentFilesFs;
  /** Absolute path of the JSON file, e.g. `<userData>/recent-files.json`. */
  file: string;
  max: number;
  now?: () => Date;
  log?: (message: string) => void;
}

export interface RecentFiles {
  list(): Promise<RecentFile[]>;
  /** Puts `filePath` first (moving it if already listed) and persists. */
  add(filePath: string): Promise<RecentFile[]>;
  remove(filePath: string): Promise<RecentFile[]>;
  has(filePath: string): Promise<boolean>;
}

const FORMAT = 'slewsmith-recent-files';
const VERSION = 1;

export function parseRecentList(text: string, max: number): RecentFile[] {
  let data: unknown;
  try {
    data = JSON.parse(text);
  } catch {
    return [];
  }
  if (typeof data !== 'object' || data === null) return [];
  const d = data as { format?: unknown; version?: unknown; files?: unknown };
  if (d.format !== FORMAT || d.version !== VERSION || !Array.isArray(d.files)) return [];
  const out: RecentFile[] = [];
  const seen = new Set<string>();
  for (const f of d.files as unknown[]) {
    if (typeof f !== 'object' || f === null) continue;
    const { path: p, openedAt } = f as { path?: unknown; openedAt?: unknown };
    if (typeof p !== 'string' || !path.isAbsolute(p) || p.includes('\0') || seen.has(p)) continue;
    if (typeof openedAt !== 'string' || Number.isNaN(Date.parse(openedAt))) continue;
    seen.add(p);
    out.push({ path: p, name: path.basename(p), openedAt });
    if (out.length >= max) break;
  }
  return out;
}

export function createRecentFiles(deps: RecentFilesDeps): RecentFiles {
  const now = deps.now ?? (() => new Date());
  const log = deps.log ?? (() => {});
  let cache: RecentFile[] | null = null;
  // Serialise changes so two quick opens cannot interleave their writes.
  let queue: Promise<unknown> = Promise.resolve();

  async function load(): Promise<RecentFile[]> {
    if (cache) return cache;
    try {
      cache = parseRecentList(await deps.fs.readFile(deps.file, 'utf8'), deps.max);
    } catch {
      cache = [];
    }
    return cache;
  }

  async function persist(files: RecentFile[]): Promise<void> {
    cache = files;
    const body = JSON.stringify(
      { format: FORMAT, version: VERSION, files: files.map(({ path: p, openedAt }) => ({ path: p, openedAt })) },
      null,
      2,
    );
    const r = await writeFileAtomic(deps.fs, deps.file, body + '\n');
    // The list still works for this session when the disk refuses; say so and carry on.
    if (!r.ok) log(`recent files not saved: ${r.message}`);
  }

  function change(fn: (files: RecentFile[]) => RecentFile[]): Promise<RecentFile[]> {
    const next = queue.then(async () => {
      const files = fn(await load());
      await persist(files);
      return files.slice();
    });
    queue = next.catch(() => {});
    return next;
  }

  return {
    async list() {
      await queue;
      return (await load()).slice();
    },
    add(filePath) {
      const abs = path.resolve(filePath);
      return change((files) =>
        [{ path: abs, name: path.basename(abs), openedAt: now().toISOString() }, ...files.filter((f) => f.path !== abs)].slice(0, deps.max),
      );
    },
    remove(filePath) {
      return change((files) => files.filter((f) => f.path !== filePath));
    },
    async has(filePath) {
      return (await this.list()).some((f) => f.path === filePath);
    },
  };
}

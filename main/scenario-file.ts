/**
 * Reads a scenario file from disk for the CLI and the desktop app alike: one reader, so both
 * accept and refuse exactly the same files. The checks on the bytes (size, UTF-8 with an optional
 * BOM, JSON, a JSON object) are app/bridge/scenario-bytes.ts; this module adds the file system:
 * the path must name a regular file (a folder, a FIFO or a device is refused before any read, so
 * `/dev/zero` cannot hang us) whose size is within the limit before it is read.
 */
import type { Issue } from '../app/engine/errors';
import { checkScenarioSize, scenarioDocumentFromBytes, type ScenarioDocument } from '../app/bridge/scenario-bytes';

export interface ScenarioFileFs {
  stat(filePath: string): Promise<{ size: number; isFile(): boolean; isDirectory(): boolean }>;
  readFile(filePath: string): Promise<Uint8Array>;
}

export type ScenarioFileRead =
  | { status: 'ok'; document: ScenarioDocument }
  /** The file could not be read at all (missing, a folder, permissions). */
  | { status: 'unreadable'; message: string; code?: string }
  /** Read, but not a scenario document (too large, not UTF-8, not JSON, not an object). */
  | { status: 'invalid'; errors: Issue[] };

function errorCode(e: unknown): string | undefined {
  const code = (e as { code?: unknown } | null)?.code;
  return typeof code === 'string' ? code : undefined;
}

function reason(e: unknown): string {
  const code = errorCode(e);
  if (code === 'ENOENT') return 'no such file';
  if (code === 'EACCES' || code === 'EPERM') return 'permission denied';
  if (code === 'ENOTDIR') return 'a folder on the way is a file';
  if (code === 'ENAMETOOLONG') return 'the name is too long';
  if (code === 'ELOOP') return 'too many symbolic links';
  return e instanceof Error ? e.message : String(e);
}

export async function readScenarioFile(fs: ScenarioFileFs, filePath: string, maxBytes: number): Promise<ScenarioFileRead> {
  let bytes: Uint8Array;
  try {
    const st = await fs.stat(filePath);
    if (st.isDirectory()) return { status: 'unreadable', message: `${filePath} is a folder, not a scenario file`, code: 'EISDIR' };
    if (!st.isFile()) return { status: 'unreadable', message: `${filePath} is not a regular file (a device, pipe or socket)` };
    const tooBig = checkScenarioSize(st.size, maxBytes);
    if (tooBig.length) return { status: 'invalid', errors: tooBig };
    bytes = await fs.readFile(filePath);
  } catch (e) {
    return { status: 'unreadable', message: `cannot read ${filePath}: ${reason(e)}`, code: errorCode(e) };
  }
  // The file may have grown between stat and read; scenarioDocumentFromBytes checks the size again.
  const doc = scenarioDocumentFromBytes(bytes, maxBytes);
  if (!doc.ok) return { status: 'invalid', errors: doc.errors };
  return { status: 'ok', document: doc.value };
}

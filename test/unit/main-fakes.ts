/**
 * Fakes for the main-process tests: a file system that fails at a chosen step, scripted dialogs,
 * an ipcMain that records handlers, and a stand-in scenario validator.
 */
import fsp from 'node:fs/promises';
import os from 'node:os';
import path from 'node:path';
import { fail, issue, ok, type Result } from '../../app/engine/errors';
import type { AtomicFileHandle } from '../../main/atomic-write';
import type { Dialogs, DocumentFs } from '../../main/documents';
import type { IpcMainLike, SenderEvent } from '../../main/ipc';
import type { RecentFilesFs } from '../../main/recent-files';

export type FsStep = 'open' | 'writeFile' | 'sync' | 'close' | 'rename';

/** node:fs/promises, except that `failAt` throws an EIO-like error (only for files, not folders). */
export function failingFs(failAt: FsStep | null, calls: string[] = []): DocumentFs & RecentFilesFs & { calls: string[] } {
  const boom = (step: string) => Object.assign(new Error(`injected failure at ${step}`), { code: 'EIO' });
  // Bytes for the scenario reader, text for the recent-files list.
  const readFile = ((p: string, enc?: 'utf8') => {
    calls.push(`readFile ${path.basename(p)}`);
    return enc ? fsp.readFile(p, enc) : fsp.readFile(p);
  }) as DocumentFs['readFile'] & RecentFilesFs['readFile'];
  return {
    calls,
    readFile,
    stat: (p) => fsp.stat(p),
    unlink: (p) => {
      calls.push(`unlink ${path.basename(p)}`);
      return fsp.unlink(p);
    },
    rename: async (a, b) => {
      calls.push(`rename ${path.basename(a)} -> ${path.basename(b)}`);
      if (failAt === 'rename') throw boom('rename');
      return fsp.rename(a, b);
    },
    open: async (p, flags, mode) => {
      const isDir = flags === 'r';
      calls.push(`open ${path.basename(p)} ${flags}`);
      if (failAt === 'open' && !isDir) throw boom('open');
      const h = await fsp.open(p, flags, mode);
      const wrapped: AtomicFileHandle = {
        writeFile: async (d) => {
          if (failAt === 'writeFile' && !isDir) {
            // Fail half way through, as a full disk would: some bytes are already in the temp file.
            await h.writeFile(typeof d === 'string' ? d.slice(0, Math.floor(d.length / 2)) : d.subarray(0, d.length >> 1));
            throw boom('writeFile');
          }
          return h.writeFile(d);
        },
        sync: async () => {
          if (failAt === 'sync' && !isDir) throw boom('sync');
          return h.sync();
        },
        close: async () => {
          await h.close();
          if (failAt === 'close' && !isDir) throw boom('close');
        },
      };
      return wrapped;
    },
  };
}

export async function tempDir(): Promise<string> {
  return fsp.mkdtemp(path.join(os.tmpdir(), 'slewsmith-main-'));
}

export interface ScriptedDialogs extends Dialogs {
  log: string[];
  openAnswers: Array<{ canceled: boolean; filePaths: string[] }>;
  saveAnswers: Array<{ canceled: boolean; filePath?: string }>;
  messageAnswers: number[];
  lastMessage: { buttons?: string[]; message: string } | null;
}

/** Dialogs that answer from queues and log what was asked; an unscripted dialog is a test failure. */
export function scriptedDialogs(): ScriptedDialogs {
  const d: ScriptedDialogs = {
    log: [],
    openAnswers: [],
    saveAnswers: [],
    messageAnswers: [],
    lastMessage: null,
    async showOpenDialog() {
      d.log.push('open');
      const a = d.openAnswers.shift();
      if (!a) throw new Error('unexpected open dialog');
      return a;
    },
    async showSaveDialog(o) {
      d.log.push(`save ${o.defaultPath ?? ''}`);
      const a = d.saveAnswers.shift();
      if (!a) throw new Error('unexpected save dialog');
      return a;
    },
    async showMessageBox(o) {
      d.log.push(`message ${o.message}`);
      d.lastMessage = { buttons: o.buttons, message: o.message };
      const a = d.messageAnswers.shift();
      if (a === undefined) throw new Error('unexpected message box');
      return { response: a };
    },
  };
  return d;
}

/** Stand-in for validateScenario: an object with the right format tag and a finite `durationS`. */
export function fakeValidator(json: unknown): Result<unknown> {
  if (typeof json !== 'object' || json === null || Array.isArray(json)) return fail([issue('', 'type', 'must be an object')]);
  const o = json as Record<string, unknown>;
  const errors = [];
  if (o.format !== 'slewsmith-scenario') errors.push(issue('format', 'format', 'format must be slewsmith-scenario'));
  if (typeof o.durationS !== 'number' || !Number.isFinite(o.durationS))
    errors.push(issue('durationS', 'finite', 'durationS must be finite'));
  return errors.length ? fail(errors) : ok(json);
}

export const GOOD_SCENARIO = { format: 'slewsmith-scenario', durationS: 120, name: 'test' };

export type Handler = (event: SenderEvent, ...args: unknown[]) => unknown;

export function recordingIpc(): IpcMainLike & { handlers: Map<string, Handler>; listeners: Map<string, Handler> } {
  const handlers = new Map<string, Handler>();
  const listeners = new Map<string, Handler>();
  return {
    handlers,
    listeners,
    handle(channel, fn) {
      if (handlers.has(channel)) throw new Error(`second handler for ${channel}`);
      handlers.set(channel, fn);
    },
    on(channel, fn) {
      listeners.set(channel, fn);
    },
  };
}

export const OWN_FRAME: SenderEvent = { senderFrame: { url: 'app://slewsmith/index.html', parent: null } };

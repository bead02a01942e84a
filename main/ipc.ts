/**
 * The main side of the bridge: one handler per channel in app/bridge/channels.ts.
 *
 * Every message is checked twice before anything else happens: the sender must be the top frame
 * of our own page (app://slewsmith/…), and the arguments must have the declared shape. A foreign
 * sender or a malformed call is refused (the renderer's promise rejects and nothing touches a
 * dialog or the disk); content problems the user can fix (an invalid scenario, a bad export name)
 * come back as `invalid` results.
 */
import path from 'node:path';
import { InvokeChannels, NotifyChannels } from '../app/bridge/channels';
import { formatIssues, issue, type Issue } from '../app/engine/errors';
import type { AppInfo, RecentFile } from '../app/bridge/api';
import type { DocumentService } from './documents';
import { checkAbsolutePath, checkArgCount, checkExportRequest } from './payloads';
import { isAppIndexUrl } from './security';

/** The part of an IPC event the checks read. */
export interface SenderEvent {
  senderFrame: { url: string; parent: unknown } | null;
}

export interface IpcMainLike {
  handle(channel: string, listener: (event: SenderEvent, ...args: unknown[]) => unknown): void;
  on(channel: string, listener: (event: SenderEvent, ...args: unknown[]) => void): void;
}

class RefusedMessage extends Error {
  constructor(channel: string, reason: string) {
    super(`Slewsmith refused ${channel}: ${reason}`);
    this.name = 'RefusedMessage';
  }
}

/** Only the top frame of our own index may talk to main: not an iframe, another page or origin. */
export function senderProblem(event: SenderEvent, isTrustedUrl: (url: string) => boolean = isAppIndexUrl): string | null {
  const frame = event.senderFrame;
  if (!frame) return 'the sending frame is gone';
  if (frame.parent !== null) return 'the sender is a subframe';
  if (!isTrustedUrl(frame.url)) return `the sender ${JSON.stringify(frame.url)} is not the Slewsmith page`;
  return null;
}

export interface IpcDeps {
  documents: DocumentService;
  appInfo(): AppInfo;
  recentFiles(): Promise<RecentFile[]>;
  exportBytes: number;
  isTrustedUrl?: (url: string) => boolean;
  log?: (message: string) => void;
}

export function registerIpc(ipc: IpcMainLike, deps: IpcDeps): void {
  const log = deps.log ?? (() => {});
  const docs = deps.documents;

  function handle(channel: string, expectedArgs: number, fn: (args: unknown[]) => unknown): void {
    ipc.handle(channel, (event, ...args) => {
      const problem = senderProblem(event, deps.isTrustedUrl);
      if (problem) {
        log(`refused ${channel}: ${problem}`);
        throw new RefusedMessage(channel, problem);
      }
      const arity = checkArgCount(args, expectedArgs);
      if (arity.length) throw malformed(channel, arity);
      return fn(args);
    });
  }

  function malformed(channel: string, issues: Issue[]): RefusedMessage {
    log(`refused ${channel}: ${formatIssues(issues)}`);
    return new RefusedMessage(channel, formatIssues(issues));
  }

  handle(InvokeChannels.openScenario, 0, () => docs.openScenario());
  handle(InvokeChannels.initialScenario, 0, () => docs.initialScenario());
  handle(InvokeChannels.newScenario, 0, () => docs.newScenario());
  handle(InvokeChannels.recentFiles, 0, () => deps.recentFiles());
  handle(InvokeChannels.appInfo, 0, () => deps.appInfo());
  handle(InvokeChannels.openRecent, 1, ([p]) => {
    const issues = checkAbsolutePath(p, path.isAbsolute);
    if (issues.length) throw malformed(InvokeChannels.openRecent, issues);
    return docs.openRecent(p as string);
  });
  // Scenario content is checked inside the service (validator + size), giving `invalid` results.
  handle(InvokeChannels.saveScenario, 1, ([scenario]) => docs.saveScenario(scenario));
  handle(InvokeChannels.saveScenarioAs, 1, ([scenario]) => docs.saveScenarioAs(scenario));
  handle(InvokeChannels.saveBeforeClose, 1, ([scenario]) => docs.saveBeforeClose(scenario));
  handle(InvokeChannels.exportFile, 1, ([request]) => {
    if (typeof request !== 'object' || request === null || Array.isArray(request))
      throw malformed(InvokeChannels.exportFile, [issue('', 'type', 'the export request must be an object')]);
    const r = checkExportRequest(request, deps.exportBytes);
    if (!r.ok) return { status: 'invalid', errors: r.errors };
    return docs.exportFile(r.value);
  });

  ipc.on(NotifyChannels.setDirty, (event, ...args) => {
    const problem = senderProblem(event, deps.isTrustedUrl);
    if (problem) return log(`refused ${NotifyChannels.setDirty}: ${problem}`);
    if (args.length !== 1 || typeof args[0] !== 'boolean') return log(`refused ${NotifyChannels.setDirty}: expected one boolean`);
    docs.setDirty(args[0]);
  });
}

/// <reference lib="webworker" />
/**
 * Writes the app's exports off the UI thread: a long run (display trace) is flown again here and
 * its file formatted, with progress; the renderer cancels by terminating this worker
 * (exportClient.ts), which holds nothing else.
 */
// First, as in app/index.html: the CSP forbids eval in workers too (zod must not probe it).
import '../../no-eval';
import { answerExport } from './answerExport';
import type { ExportRequest } from './exportProtocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;

scope.onmessage = (ev: MessageEvent<ExportRequest>) => {
  const req = ev.data;
  if (!req || req.type !== 'export') return;
  answerExport(req, (reply) => scope.postMessage(reply));
};

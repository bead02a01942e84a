/// <reference lib="webworker" />
/**
 * One sweep worker of the renderer: runs the grid cells it is handed, one at a time
 * (app/ui/study/sweepWorkerCore.ts over the engine's runSweepCell), posting a message per finished
 * case (progress) and the finished cell. A shared cancel flag, when the page allows one, stops it
 * inside a cell; a half-run cell is never reported.
 */
// First, as in app/index.html: the CSP forbids eval in workers too (zod must not probe it).
import '../../no-eval';
import { createSweepWorkerHandler } from '../study/sweepWorkerCore';
import type { FromSweepWorker, ToSweepWorker } from '../study/sweepProtocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const handle = createSweepWorkerHandler((m: FromSweepWorker) => scope.postMessage(m));

scope.onmessage = (ev: MessageEvent<ToSweepWorker>) => {
  const msg = ev.data;
  if (!msg || typeof msg !== 'object') return;
  if (msg.type === 'close') {
    scope.close();
    return;
  }
  handle(msg);
};

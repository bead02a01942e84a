/// <reference lib="webworker" />
/**
 * Runs the engine's pipeline off the UI thread. One request at a time; the client (client.ts)
 * keeps only the newest request waiting and discards replies that are no longer wanted.
 */
// First, as in app/index.html: the CSP forbids eval in workers too (zod must not probe it).
import '../../no-eval';
import { createOrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import type { RunRequest } from './protocol';
import { answerRun } from './answerRun';

const scope = self as unknown as DedicatedWorkerGlobalScope;
// Orbit scenarios: the view samples of an unchanged ephemeris are not computed again at each edit.
const orbitViewCache = createOrbitViewCache();

scope.onmessage = (ev: MessageEvent<RunRequest>) => {
  const req = ev.data;
  if (!req || req.type !== 'run') return;
  answerRun(req, (reply, transfer) => scope.postMessage(reply, transfer), orbitViewCache);
};

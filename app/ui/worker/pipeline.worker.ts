/// <reference lib="webworker" />
/**
 * Runs the engine's pipeline off the UI thread. One request at a time; the client (client.ts)
 * keeps only the newest request waiting and discards replies that are no longer wanted.
 */
// First, as in app/index.html: the CSP forbids eval in workers too (zod must not probe it).
import '../../no-eval';
import { runPipeline } from '../../engine/pipeline/run';
import { createOrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import type { RunReply, RunRequest } from './protocol';
import { transferables } from './protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
// Orbit scenarios: the view samples of an unchanged ephemeris are not computed again at each edit.
const orbitViewCache = createOrbitViewCache();

scope.onmessage = (ev: MessageEvent<RunRequest>) => {
  const req = ev.data;
  if (!req || req.type !== 'run') return;
  let reply: RunReply;
  let transfer: ArrayBuffer[] = [];
  try {
    const result = runPipeline(req.scenario, { ...(req.options as object), orbitViewCache });
    reply = { type: 'result', id: req.id, result };
    if (result.ok) transfer = transferables(result.value);
  } catch (e) {
    // A throw here is an engine bug, not bad input (bad input comes back as errors); say so.
    reply = { type: 'crash', id: req.id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) };
  }
  scope.postMessage(reply, transfer);
};

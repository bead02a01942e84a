/**
 * The simulation thread of `fly` and `compare` (see compute-thread.ts): runs one job from
 * workerData and posts progress lines and the result. Started through compute-worker.mjs, which
 * registers the TypeScript loader first.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { computeJob, type ComputeJob } from './compute';
import type { FromComputeWorker } from './compute-thread';

const port = parentPort;
if (!port) throw new Error('compute-worker.ts must run in a worker thread');
const post = (m: FromComputeWorker) => port.postMessage(m);
try {
  post({ type: 'done', result: computeJob(workerData as ComputeJob, (line) => post({ type: 'progress', line })) });
} catch (e) {
  // An exception here is an engine bug, not bad input (bad input comes back as issues).
  post({ type: 'crash', message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
}

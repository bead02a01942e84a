/**
 * The simulation thread of `fly` and `compare` (see compute-thread.ts): runs one job from
 * workerData and posts progress lines and the result, then serves the export files' text chunk by
 * chunk as the main thread asks for it (it never writes files itself). Started through
 * compute-worker.mjs, which registers the TypeScript loader first.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { computeJobSources, type ComputeJob } from './compute';
import type { FromComputeWorker, ToComputeWorker } from './compute-thread';

const port = parentPort;
if (!port) throw new Error('compute-worker.ts must run in a worker thread');
const post = (m: FromComputeWorker) => port.postMessage(m);
try {
  const { result, sources } = computeJobSources(workerData as ComputeJob, (line) => post({ type: 'progress', line }));
  port.on('message', (m: ToComputeWorker) => {
    try {
      const src = sources[m.index];
      if (!src)
        return post({ type: 'end', index: m.index, errors: [{ path: 'file', rule: 'internal', message: 'this export has no text' }] });
      const r = src.next();
      post(r.done ? { type: 'end', index: m.index, errors: r.value } : { type: 'chunk', index: m.index, chunk: r.value });
    } catch (e) {
      post({ type: 'crash', message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
    }
  });
  post({ type: 'done', result });
} catch (e) {
  // An exception here is an engine bug, not bad input (bad input comes back as issues).
  post({ type: 'crash', message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
}

/**
 * One study worker thread: the engine's worker half (createStudyWorker) wired to parentPort.
 * Started through study-worker.mjs, which registers the TypeScript loader first.
 */
import { parentPort } from 'node:worker_threads';
import { createStudyWorker, type ToWorker } from '../../app/engine/study/parallel';

const port = parentPort;
if (!port) throw new Error('study-worker.ts must run in a worker thread');
const handle = createStudyWorker((msg) => port.postMessage(msg));
port.on('message', (msg: ToWorker) => {
  if (msg.type === 'close') {
    port.close();
    return;
  }
  handle(msg);
});

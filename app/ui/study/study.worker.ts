/// <reference lib="webworker" />
/**
 * A study worker in the renderer: the engine's worker half (createStudyWorker) on a Web Worker.
 */
import { createStudyWorker, type ToWorker } from '../../engine/study/parallel';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const handle = createStudyWorker((msg) => scope.postMessage(msg));
scope.onmessage = (ev: MessageEvent<ToWorker>) => {
  const msg = ev.data;
  if (!msg) return;
  if (msg.type === 'close') {
    scope.close();
    return;
  }
  handle(msg);
};

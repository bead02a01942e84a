/**
 * One sweep worker thread: runs the grid cells it is handed (app/engine/study/sweepRun.ts
 * runSweepCell) and posts each finished cell back; a shared flag stops it between and inside
 * cases. Started through sweep-worker.mjs, which registers the TypeScript loader first.
 */
import { parentPort } from 'node:worker_threads';
import type { SweepDefinition } from '../../app/engine/study/sweep';
import { runSweepCell } from '../../app/engine/study/sweepRun';
import type { SweepFromWorker, SweepToWorker } from './sweep-messages';

const port = parentPort;
if (!port) throw new Error('sweep-worker.ts must run in a worker thread');
let json: unknown = null;
let def: SweepDefinition | null = null;
let flag: Int32Array | null = null;
const post = (m: SweepFromWorker) => port.postMessage(m);
port.on('message', (msg: SweepToWorker) => {
  if (msg.type === 'close') {
    port.close();
    return;
  }
  if (msg.type === 'init') {
    json = msg.json;
    def = msg.def;
    flag = new Int32Array(msg.cancelFlag);
    return;
  }
  const stop = () => flag !== null && Atomics.load(flag, 0) !== 0;
  const r = runSweepCell(json, def!, msg.index, { onCase: () => post({ type: 'case' }), shouldStop: stop });
  if (!r.ok) post({ type: 'error', index: msg.index, errors: r.errors });
  else if (r.value) post({ type: 'cell', cell: r.value });
  else post({ type: 'stopped', index: msg.index });
});

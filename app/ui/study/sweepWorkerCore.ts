/**
 * The sweep worker's logic without the worker scope (app/ui/worker/sweep.worker.ts wires it to
 * `self`; tests run it in-thread): init keeps the scenario, the definition and the cancel flag;
 * info answers sweepInfo; run answers one cell (runSweepCell), a message per finished case first.
 */
import { runSweepCell, sweepInfo, type SweepDefinition } from '../../engine/study';
import type { FromSweepWorker, ToSweepWorker } from './sweepProtocol';

export function createSweepWorkerHandler(post: (m: FromSweepWorker) => void): (msg: ToSweepWorker) => void {
  let json: unknown = null;
  let def: SweepDefinition | null = null;
  let flag: Int32Array | null = null;
  const stop = () => flag !== null && Atomics.load(flag, 0) !== 0;
  return (msg) => {
    try {
      if (msg.type === 'init') {
        json = msg.json;
        def = msg.def;
        flag = msg.cancelFlag ? new Int32Array(msg.cancelFlag) : null;
      } else if (msg.type === 'info') {
        post({ type: 'info', result: sweepInfo(json, def!) });
      } else if (msg.type === 'run') {
        const index = msg.index;
        const r = runSweepCell(json, def!, index, { onCase: () => post({ type: 'case', index }), shouldStop: stop });
        if (!r.ok) post({ type: 'error', index, errors: r.errors });
        else if (r.value) post({ type: 'cell', cell: r.value });
        else post({ type: 'stopped', index });
      }
    } catch (e) {
      // A throw is an engine bug, not bad input (bad input comes back as issues).
      post({ type: 'crash', message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
    }
  };
}

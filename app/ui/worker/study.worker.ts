/// <reference lib="webworker" />
/**
 * One study worker of the renderer: the engine's worker half (createStudyWorker builds the study
 * context once and runs the chunks of cases it is sent), plus the one-off "case as a scenario"
 * request the study view uses to open a worst case as a normal run.
 */
// First, as in app/index.html: the CSP forbids eval in workers too (zod must not probe it).
import '../../no-eval';
import { createStudyWorker, studyCaseScenario } from '../../engine/study';
import type { FromStudyWorker, ToStudyWorker } from '../study/protocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const post = (m: FromStudyWorker) => scope.postMessage(m);
const handle = createStudyWorker(post);

scope.onmessage = (ev: MessageEvent<ToStudyWorker>) => {
  const msg = ev.data;
  if (!msg || typeof msg !== 'object') return;
  if (msg.type === 'case-scenario') {
    try {
      post({ type: 'case-scenario', id: msg.id, result: studyCaseScenario(msg.json, msg.overrides, msg.index) });
    } catch (e) {
      // A throw is an engine bug, not bad input (bad input comes back as issues).
      post({ type: 'case-scenario-crash', id: msg.id, message: e instanceof Error ? `${e.name}: ${e.message}` : String(e) });
    }
    return;
  }
  if (msg.type === 'close') {
    scope.close();
    return;
  }
  handle(msg);
};

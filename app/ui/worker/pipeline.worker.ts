/// <reference lib="webworker" />
/**
 * Runs the engine's pipeline off the UI thread. One request at a time; the client (client.ts)
 * keeps only the newest request waiting and discards replies that are no longer wanted.
 */
// No zod here: the validator and its schemas (with app/no-eval.ts, zod's CSP setting, first) are
// loaded on first need, i.e. for any input that is not the bundled demo (workerValidator.ts).
import demoCertificates from 'virtual:slewsmith-demo-certificates';
import demoValidation from 'virtual:slewsmith-demo-validation';
import { plantCertificateCache } from '../../engine/control/certificate';
import { plantValidation } from '../../engine/scenario/knownValidation';
import { createOrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import { createRunCache } from '../../engine/pipeline/runCache';
import type { RunReply, RunRequest, WorkerMessage } from './protocol';
import { answerRunWith, crash, type WaitForRest } from './answerPass';
import { loadValidator, validatorNow } from './workerValidator';
import { prestartRequest } from './prestart';

const scope = self as unknown as DedicatedWorkerGlobalScope;
// The bundled demo's certificates, computed when the app was built (vite.config.ts); a scenario
// whose certificate inputs differ misses them (the key holds every input) and computes its own.
plantCertificateCache(demoCertificates);
// Its validation too (main/demo-validation.ts): only an input equal to the demo in every value
// takes it, so the early pass validates nothing; any other scenario is validated as before.
plantValidation(...demoValidation);
// Orbit scenarios: the view samples of an unchanged ephemeris are not computed again at each edit.
// And the runs of the last pass: an edit flies only the runs whose inputs it changed (runCache.ts).
const caches = { orbitViewCache: createOrbitViewCache(), runCache: createRunCache() };

// A pass waiting for the renderer to paint its first run (answerPass.ts): resumed by a 'continue'
// message, or after REST_AFTER_MS if none comes (a hidden window paints no frames).
const REST_AFTER_MS = 250;
// The validator's warm-up after the early pass (below).
const WARM_AFTER_MS = 500;
let pending: { id: number; resume: (go: boolean) => void; timer: ReturnType<typeof setTimeout> } | null = null;

function resumePending(id: number, go: boolean) {
  const p = pending;
  if (!p || p.id !== id) return;
  pending = null;
  clearTimeout(p.timer);
  p.resume(go);
}

const post = (reply: RunReply, transfer: ArrayBuffer[]) => scope.postMessage(reply, transfer);

/**
 * Answers `req` now when the validator is loaded or the input is the demo; otherwise once the
 * validator has loaded (the requests that wait for it are answered in the order they came).
 */
function answer(req: RunRequest, wait?: () => WaitForRest | undefined): void {
  const now = validatorNow(req.scenario);
  if (now) return answerRunWith(now, req, post, caches, wait?.());
  loadValidator().then(
    (v) => answerRunWith(v.validateScenario, req, post, caches, wait?.()),
    (e: unknown) => post(crash(req.id, e), []),
  );
}

scope.onmessage = (ev: MessageEvent<WorkerMessage>) => {
  const req = ev.data;
  if (req?.type === 'continue') return resumePending(req.id, req.go);
  if (!req || req.type !== 'run') return;
  // When the pass starts (after the validator loaded, if it had to), a pass still waiting for its
  // 'continue' is dropped: this newer request replaces it.
  answer(req, () => {
    if (pending) resumePending(pending.id, false);
    return req.partialWait
      ? (resume: (go: boolean) => void) => {
          const timer = setTimeout(() => resumePending(req.id, true), REST_AFTER_MS);
          pending = { id: req.id, resume, timer };
        }
      : undefined;
  });
};

// A worker app/boot.ts started for the demo flies it now, before any message could arrive.
const early = prestartRequest(scope.name);
if (early) {
  answer(early);
  // The validator's load and first run, once the page has had time to show the pass (they would
  // compete with that for the cores): the first edit then finds it loaded and warm. An edit before
  // it pays both itself.
  setTimeout(
    () =>
      void loadValidator().then(
        (v) => v.validateScenarioAfresh(early.scenario),
        () => undefined, // a failed load is reported to the request that needs the validator
      ),
    WARM_AFTER_MS,
  );
}

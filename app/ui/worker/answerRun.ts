/**
 * answerPass.ts with scenario/validate.ts's validator bound: the worker's reply code as the tests
 * fly it (the worker itself loads the validator lazily: workerValidator.ts).
 */
import type { OrbitViewCache } from '../../engine/orbit/viewSamplesCache';
import { validateScenario } from '../../engine/scenario/validate';
import type { RunRequest } from './protocol';
import { answerRunWith, type PostReply, type WaitForRest, type WorkerCaches } from './answerPass';

export type { PostReply, WaitForRest, WorkerCaches } from './answerPass';

export function answerRun(req: RunRequest, post: PostReply, caches: OrbitViewCache | WorkerCaches, wait?: WaitForRest): void {
  answerRunWith(validateScenario, req, post, caches, wait);
}

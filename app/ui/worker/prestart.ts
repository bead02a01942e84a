/**
 * The bundled demo's pass, started before the app itself has loaded. app/boot.ts spawns the
 * pipeline workers under a name that says "fly the demo now" (slot i of n); each worker starts
 * that pass as soon as its own script has run, without a message from the page: a message posted
 * to a worker that is still starting is handed over by the page's main thread only once that
 * thread is free, and at start it is busy compiling and running the app for some 200 ms.
 *
 * The runner (client.ts) takes the workers over, and its first pass adopts the early pass only
 * when it would post exactly the same messages (samePass): otherwise it posts its own pass as
 * usual, and the early pass's reply, under PRESTART_ID (the runner numbers its passes from 1), is
 * ignored as stale.
 */
import demo from '../../../assets/lumen6-imaging.scenario.json';
import type { RunReply, RunRequest } from './protocol';
import type { WorkerLike } from './client';

/** The id of the early pass: the runner numbers its own passes from 1. */
export const PRESTART_ID = 0;

export interface PrestartedPass {
  workers: WorkerLike[];
  /** What each worker flies, by slot, as if the runner had posted it. */
  messages: RunRequest[];
  /**
   * Replies and errors that came before the runner took the workers over (a worker can answer
   * before the app has loaded), by slot, in order; replayEarly hands them to the runner.
   */
  early: EarlyEvent[][];
}

type EarlyEvent = { kind: 'message'; ev: MessageEvent<RunReply> } | { kind: 'error'; ev: ErrorEvent };

/** The run message for worker `slot` of `slots` (a shared pass flies every slots-th run: runSlice). */
export function passMessage(
  id: number,
  scenario: unknown,
  options: Record<string, unknown>,
  slot: number,
  slots: number,
  early: Pick<RunRequest, 'partialAfterRuns' | 'partialWait'> = {},
): RunRequest {
  const opts = slots > 1 ? { ...options, runSlice: { index: slot, of: slots } } : options;
  return { type: 'run', id, scenario, options: opts, ...early };
}

/** Whether `mine` (the runner's first pass, under its own id) asks for what the early pass asked. */
export function samePass(early: readonly RunRequest[], mine: readonly RunRequest[]): boolean {
  if (early.length !== mine.length) return false;
  const strip = (m: RunRequest) => JSON.stringify({ ...m, id: 0 });
  return early.every((m, i) => strip(m) === strip(mine[i]!));
}

/**
 * The demo's pass for worker `slot` of `slots`: every controller of the file compared (none
 * excluded, in file order, as appController.ts's first request asks).
 */
export function demoPassMessage(slot: number, slots: number): RunRequest {
  const ids = (demo.controllers as { id: string }[]).map((c) => c.id);
  return passMessage(PRESTART_ID, demo, { controllers: ids }, slot, slots);
}

const NAME = /^pipeline:demo:(\d+)\/(\d+)$/;

/** The worker name that asks for the demo's pass at start. */
export function prestartName(slot: number, slots: number): string {
  return `pipeline:demo:${slot}/${slots}`;
}

/** The pass a worker of this name flies at start (null for any other name). */
export function prestartRequest(name: string): RunRequest | null {
  const m = NAME.exec(name);
  if (!m) return null;
  const slot = Number(m[1]),
    slots = Number(m[2]);
  return slots >= 1 && slot < slots ? demoPassMessage(slot, slots) : null;
}

let waiting: PrestartedPass | null = null;

/** Spawn `slots` workers named to fly the demo's pass at start (`spawn` gets each worker's name). */
export function prestartDemoPass(spawn: (name: string) => WorkerLike, slots: number): void {
  const workers = Array.from({ length: slots }, (_, i) => spawn(prestartName(i, slots)));
  const early = workers.map((w) => {
    const kept: EarlyEvent[] = [];
    w.onmessage = (ev) => kept.push({ kind: 'message', ev });
    w.onerror = (ev) => kept.push({ kind: 'error', ev });
    return kept;
  });
  waiting = { workers, messages: workers.map((_, i) => demoPassMessage(i, slots)), early };
}

/**
 * Hands what worker `slot` said before it was taken over to its handlers now in place: its errors
 * always, its replies only when the runner adopted the early pass (otherwise they are stale).
 */
export function replayEarly(p: PrestartedPass, slot: number, withReplies: boolean): void {
  const w = p.workers[slot];
  const kept = p.early[slot] ?? [];
  p.early[slot] = [];
  if (!w) return;
  for (const e of kept) {
    if (e.kind === 'error') w.onerror?.(e.ev);
    else if (withReplies) w.onmessage?.(e.ev);
  }
}

/** The early pass, once (null when none was started or it was taken). */
export function takePrestartedPass(): PrestartedPass | null {
  const p = waiting;
  waiting = null;
  return p;
}

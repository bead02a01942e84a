/**
 * The UI's pipeline runner: debounce, latest-wins, stale replies discarded, a stuck stale worker
 * replaced, crashes reported. Behaviour specified in app/ui/worker/client.ts (our own design).
 */
import { describe, expect, it } from 'vitest';
import { createPipelineRunner, type WorkerLike } from '../../app/ui/worker/client';
import type { RunReply, RunRequest } from '../../app/ui/worker/protocol';

class FakeWorker implements WorkerLike {
  received: RunRequest[] = [];
  terminated = false;
  onmessage: ((ev: MessageEvent<RunReply>) => void) | null = null;
  onerror: ((ev: ErrorEvent) => void) | null = null;
  postMessage(m: RunRequest) {
    this.received.push(m);
  }
  terminate() {
    this.terminated = true;
  }
  reply(id: number, value: string) {
    this.onmessage?.({
      data: { type: 'result', id, result: { ok: true, value: value as never, warnings: [] } },
    } as unknown as MessageEvent<RunReply>);
  }
}

function setup(workerCount = 1, leadingEdge = false) {
  let clock = 0;
  const timers: { at: number; fn: () => void; live: boolean }[] = [];
  const workers: FakeWorker[] = [];
  const results: { value: unknown; scenario: unknown }[] = [];
  const crashes: string[] = [];
  const runner = createPipelineRunner({
    spawn: () => {
      const w = new FakeWorker();
      workers.push(w);
      return w;
    },
    debounceMs: 150,
    staleKillMs: 2000,
    workers: workerCount,
    leadingEdge,
    merge: (parts) => parts.join('+') as never,
    now: () => clock,
    setTimer: (fn, ms) => {
      const h = { at: clock + ms, fn, live: true };
      timers.push(h);
      return h;
    },
    clearTimer: (h) => ((h as { live: boolean }).live = false),
    onResult: (r, scenario) => results.push({ value: r.ok ? r.value : null, scenario }),
    onCrash: (m) => crashes.push(m),
  });
  const advance = (ms: number) => {
    clock += ms;
    for (const t of timers)
      if (t.live && t.at <= clock) {
        t.live = false;
        t.fn();
      }
  };
  return { runner, workers, results, crashes, advance };
}

describe('pipeline runner', () => {
  it('leading edge: an edit after a quiet spell is sent at once; a burst after it is debounced to its newest', () => {
    const { runner, workers, advance } = setup(1, true);
    runner.schedule('s1');
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s1']); // no timer waited for
    workers[0]!.reply(1, 'r1');
    advance(50);
    runner.schedule('s2'); // 50 ms after s1: inside the window, debounced
    advance(100);
    runner.schedule('s3');
    advance(149);
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s1']);
    advance(1);
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s1', 's3']);
    // Quiet again but s3 is still in flight: debounced, then it waits for s3's reply.
    advance(500);
    runner.schedule('s4');
    expect(workers[0]!.received).toHaveLength(2);
    advance(150);
    expect(workers[0]!.received).toHaveLength(2);
    workers[0]!.reply(2, 'r3');
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s1', 's3', 's4']);
    // Idle and quiet: the next edit goes at once again.
    workers[0]!.reply(3, 'r4');
    advance(500);
    runner.schedule('s5');
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s1', 's3', 's4', 's5']);
  });

  it('debounces a burst of edits into one run of the newest scenario', () => {
    const { runner, workers, advance } = setup();
    runner.schedule('s1');
    advance(100);
    runner.schedule('s2');
    advance(100);
    runner.schedule('s3');
    advance(149);
    expect(workers).toHaveLength(0);
    advance(1);
    expect(workers[0]!.received.map((r) => r.scenario)).toEqual(['s3']);
  });

  it('keeps only the newest waiting request while busy and discards the stale reply', () => {
    const { runner, workers, results, advance } = setup();
    runner.runNow('a');
    runner.runNow('b');
    runner.runNow('c');
    const w = workers[0]!;
    expect(w.received.map((r) => r.scenario)).toEqual(['a']);
    w.reply(w.received[0]!.id, 'out-a');
    expect(results).toEqual([]); // 'a' is stale: 'c' was requested after it
    expect(w.received.map((r) => r.scenario)).toEqual(['a', 'c']);
    w.reply(w.received[1]!.id, 'out-c');
    expect(results).toEqual([{ value: 'out-c', scenario: 'c' }]);
    advance(1000);
    expect(runner.busy).toBe(false);
  });

  it('replaces a worker stuck on a stale job', () => {
    const { runner, workers, results, advance } = setup();
    runner.runNow('slow');
    advance(2500);
    runner.runNow('new');
    expect(workers[0]!.terminated).toBe(true);
    expect(workers[1]!.received.map((r) => r.scenario)).toEqual(['new']);
    workers[1]!.reply(workers[1]!.received[0]!.id, 'out-new');
    expect(results.map((r) => r.value)).toEqual(['out-new']);
  });

  it('cancel makes the running reply stale', () => {
    const { runner, workers, results } = setup();
    runner.runNow('x');
    runner.cancel();
    workers[0]!.reply(workers[0]!.received[0]!.id, 'out-x');
    expect(results).toEqual([]);
  });

  it('reports a crash of the newest job and recovers with a fresh worker', () => {
    const { runner, workers, crashes, results } = setup();
    runner.runNow('boom');
    workers[0]!.onerror?.({ message: 'worker died', preventDefault() {} } as ErrorEvent);
    expect(crashes).toEqual(['worker died']);
    expect(workers[0]!.terminated).toBe(true);
    runner.runNow('ok');
    expect(workers).toHaveLength(2);
    workers[1]!.reply(workers[1]!.received[0]!.id, 'fine');
    expect(results.map((r) => r.value)).toEqual(['fine']);
  });

  it('shares a pass over two workers (run slices) and merges the parts in slot order, whatever order they reply in', () => {
    const { runner, workers, results } = setup(2);
    runner.runNow('two');
    expect(workers).toHaveLength(2);
    expect(workers.map((w) => w.received[0]!.options)).toEqual([{ runSlice: { index: 0, of: 2 } }, { runSlice: { index: 1, of: 2 } }]);
    workers[1]!.reply(workers[1]!.received[0]!.id, 'B');
    expect(results).toEqual([]); // waits for the other part
    expect(runner.busy).toBe(true);
    workers[0]!.reply(workers[0]!.received[0]!.id, 'A');
    expect(results).toEqual([{ value: 'A+B', scenario: 'two' }]);
    expect(runner.busy).toBe(false);
  });

  it('a shared pass: a failed part is the result; a stale pass is dropped whole', () => {
    const { runner, workers, results } = setup(2);
    runner.runNow('p');
    runner.runNow('q');
    const [a, b] = workers as [FakeWorker, FakeWorker];
    a.reply(a.received[0]!.id, 'pa');
    b.reply(b.received[0]!.id, 'pb');
    expect(results).toEqual([]); // 'p' is stale
    expect(a.received.map((r) => r.scenario)).toEqual(['p', 'q']);
    a.onmessage?.({
      data: {
        type: 'result',
        id: a.received[1]!.id,
        result: { ok: false, errors: [{ path: 'x', rule: 'r', message: 'm' }], warnings: [] },
      },
    } as unknown as MessageEvent<RunReply>);
    b.reply(b.received[1]!.id, 'qb');
    expect(results).toEqual([{ value: null, scenario: 'q' }]);
  });
});

/**
 * The app's export worker (app/ui/worker/answerExport.ts through its message handler, and the
 * renderer's client app/ui/exportClient.ts over a fake worker in this thread).
 *
 * Reference for the bytes: the export of the same pass flown with every sample kept (the undivided
 * computation; the closed loop is deterministic for a scenario and seed, design.md "Data flow"),
 * as test/unit/pipeline-display-trace.test.ts does for the UI-thread path. Messages cross a
 * structuredClone (HTML Living Standard §2.7, the algorithm postMessage uses) as they would
 * between threads. Equality is === on the strings (ECMA-262 §7.2.15 IsStrictlyEqual: same code
 * units).
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import type { DisplayTraceLimit } from '../../app/engine/pipeline/displayTrace';
import type { PipelineOutput } from '../../app/engine/pipeline/types';
import { exportRunWith, type ExportChoice } from '../../app/ui/exporting';
import { answerExport } from '../../app/ui/worker/answerExport';
import { exportOutputOf, type ExportReply, type ExportRequest } from '../../app/ui/worker/exportProtocol';
import { createExportClient, type ExportWorkerLike } from '../../app/ui/exportClient';
import { loadExample } from './scenario-fixtures';

const SMALL: DisplayTraceLimit = { fullUpToSamples: 500, displaySamples: 400 };
const META = { toolVersion: '9.8.7', creationDateUtc: '2026-01-02T03:04:05Z' };

function pass(limit?: DisplayTraceLimit): PipelineOutput {
  const json = loadExample('lumen6-imaging');
  json.simulation.durationS = 200;
  const r = runPipeline(json, limit ? { displayTrace: limit } : {});
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const full = pass();
const shown = pass(SMALL);

/** The worker's handler as a thread would see it: the request and every reply cloned. */
function throughWorker(out: PipelineOutput, choice: ExportChoice, id = 7): ExportReply[] {
  const req: ExportRequest = structuredClone({
    type: 'export',
    id,
    output: exportOutputOf(out, choice.runKey),
    runKey: choice.runKey,
    format: choice.format,
    sampleRateHz: choice.sampleRateHz,
    ...META,
  });
  const replies: ExportReply[] = [];
  answerExport(req, (r) => replies.push(structuredClone(r)));
  return replies;
}

describe('export worker handler', () => {
  it('a display-trace run: the bytes equal the full pass exported on the UI thread (csv, json, aem; every sample and 2 Hz)', () => {
    for (const k of [0, 4]) {
      const key = shown.runs[k]!.key;
      expect(shown.runs[k]!.traceKind).toBe('display');
      for (const format of ['csv', 'json', 'aem'] as const)
        for (const sampleRateHz of [null, 2]) {
          const choice = { format, runKey: key, sampleRateHz };
          const replies = throughWorker(shown, choice);
          const last = replies[replies.length - 1]!;
          if (last.type !== 'done' || !last.result.ok) throw new Error(`${key} ${format}: ${JSON.stringify(last)}`);
          const ref = exportRunWith(full, choice, META);
          if (!ref.ok) throw new Error('reference export');
          expect(last.id).toBe(7);
          expect(last.result.value.content === ref.value.content, `${key} ${format} ${sampleRateHz}`).toBe(true);
          expect(last.result.value.name).toBe(ref.value.name);
        }
    }
  });

  it('progress: fly steps rise to the full sample count of the pass, then one write step, then done', () => {
    const run = shown.runs[1]!;
    const replies = throughWorker(shown, { format: 'csv', runKey: run.key, sampleRateHz: null });
    const fly = replies.flatMap((r) => (r.type === 'progress' && r.phase === 'fly' ? [r] : []));
    // 2,001 samples in 100 steps of ceil(2001/100) = 21 samples: 95 reports (floor(2001/21)).
    expect(fly.length).toBe(Math.floor(2001 / Math.ceil(2001 / 100)));
    expect(fly.every((r) => r.total === run.display!.fullSamples && r.total === 2001)).toBe(true);
    for (let i = 1; i < fly.length; i++) expect(fly[i]!.done).toBeGreaterThan(fly[i - 1]!.done);
    expect(fly[fly.length - 1]!.done).toBeGreaterThan(2001 - 21);
    expect(replies.slice(-2).map((r) => (r.type === 'progress' ? r.phase : r.type))).toEqual(['write', 'done']);
  });

  it('a run that kept its full trace is written without a re-flight (no fly progress), same bytes as the UI thread', () => {
    const choice = { format: 'aem' as const, runKey: full.runs[2]!.key, sampleRateHz: null };
    const replies = throughWorker(full, choice);
    expect(replies.some((r) => r.type === 'progress' && r.phase === 'fly')).toBe(false);
    const last = replies[replies.length - 1]!;
    const ref = exportRunWith(full, choice, META);
    if (last.type !== 'done' || !last.result.ok || !ref.ok) throw new Error('export');
    expect(last.result.value.content === ref.value.content).toBe(true);
  });

  it('a run not in the output comes back as an issue naming the run field, not a crash', () => {
    const replies = throughWorker(full, { format: 'csv', runKey: 'nope:follow-plan', sampleRateHz: null });
    expect(replies).toHaveLength(1);
    const r = replies[0]!;
    if (r.type !== 'done' || r.result.ok) throw new Error('accepted');
    expect(r.result.errors[0]).toMatchObject({ path: 'run', rule: 'exists' });
  });
});

/** A worker in this thread: answers each request on a later task, as a real one would. */
function fakeWorker(log: { spawned: number; terminated: number }): ExportWorkerLike {
  log.spawned++;
  let alive = true;
  const w: ExportWorkerLike = {
    onmessage: null,
    onerror: null,
    terminate: () => {
      alive = false;
      log.terminated++;
    },
    postMessage(m) {
      const req = structuredClone(m);
      setTimeout(() => {
        if (!alive) return;
        answerExport(req, (r) => {
          // A terminated worker posts nothing more (HTML §10.2.6.3: its event loop is discarded).
          if (alive) w.onmessage?.({ data: structuredClone(r) } as MessageEvent<ExportReply>);
        });
      }, 0);
    },
  };
  return w;
}

describe('export client', () => {
  it('start → progress → done with the same bytes; the worker is reused for the next export', async () => {
    const log = { spawned: 0, terminated: 0 };
    const client = createExportClient(() => fakeWorker(log));
    const choice = { format: 'csv' as const, runKey: shown.runs[3]!.key, sampleRateHz: null };
    const seen: string[] = [];
    const o = await client.start(shown, choice, META, (p) => seen.push(p.phase)).done;
    if (o.status !== 'done' || !o.result.ok) throw new Error(JSON.stringify(o));
    const ref = exportRunWith(full, choice, META);
    if (!ref.ok) throw new Error('reference');
    expect(o.result.value.content === ref.value.content).toBe(true);
    expect(seen.includes('fly') && seen[seen.length - 1] === 'write').toBe(true);
    const again = await client.start(full, { ...choice, runKey: full.runs[0]!.key }, META).done;
    expect(again.status).toBe('done');
    expect(log).toEqual({ spawned: 1, terminated: 0 });
  });

  it('cancel stops the worker, resolves as cancelled, drops its late replies; the next export gets a fresh worker', async () => {
    const log = { spawned: 0, terminated: 0 };
    const client = createExportClient(() => fakeWorker(log));
    const choice = { format: 'json' as const, runKey: shown.runs[0]!.key, sampleRateHz: null };
    const progress: number[] = [];
    const job = client.start(shown, choice, META, () => progress.push(1));
    job.cancel();
    expect(await job.done).toEqual({ status: 'cancelled' });
    await new Promise((r) => setTimeout(r, 20));
    expect(progress).toEqual([]);
    expect(log).toEqual({ spawned: 1, terminated: 1 });
    const next = await client.start(shown, choice, META).done;
    expect(next.status).toBe('done');
    expect(log.spawned).toBe(2);
  });

  it('a second export replaces a running one (the first resolves as cancelled)', async () => {
    const log = { spawned: 0, terminated: 0 };
    const client = createExportClient(() => fakeWorker(log));
    const a = client.start(shown, { format: 'csv', runKey: shown.runs[0]!.key, sampleRateHz: 1 }, META);
    const b = client.start(shown, { format: 'csv', runKey: shown.runs[1]!.key, sampleRateHz: 1 }, META);
    expect(await a.done).toEqual({ status: 'cancelled' });
    expect((await b.done).status).toBe('done');
  });

  it('a worker error resolves as a crash with its message', async () => {
    const client = createExportClient(() => {
      const w: ExportWorkerLike = {
        onmessage: null,
        onerror: null,
        terminate: () => undefined,
        postMessage: () => setTimeout(() => w.onerror?.({ message: 'boom in the worker' } as ErrorEvent), 0),
      };
      return w;
    });
    expect(await client.start(full, { format: 'csv', runKey: full.runs[0]!.key, sampleRateHz: null }, META).done).toEqual({
      status: 'crash',
      message: 'boom in the worker',
    });
  });
});

/**
 * Display traces of long runs (pipeline/displayTrace.ts, sim/displayTrace.ts) and exports flown
 * again at full rate (pipeline/refly.ts, main/cli/fullRunExports.ts, app/ui/exporting.ts).
 *
 * The display limit is shrunk through runPipeline's `displayTrace` option so a 200 s run (2,001
 * samples) stands for a day-long one and the test stays fast.
 *
 * References: the export bytes of a display-trace run are compared with the export of the same
 * pass flown with every sample kept (the reference is the undivided computation itself; the
 * engine's closed loop is deterministic for a given scenario and seed, design.md "Data flow").
 * The kept samples are checked against the rule stated in sim/displayTrace.ts by a brute-force
 * scan of the full trace written here independently; peaks against Math.max / Math.min over every
 * sample (ECMA-262 §21.3.2.24–25); "bit for bit" is Object.is on each number (ECMA-262 §20.1.2.13,
 * SameValue, which tells −0 from +0 and compares NaN equal to itself).
 */
import { describe, expect, it } from 'vitest';
import { runPipeline } from '../../app/engine/pipeline/run';
import { DISPLAY_TRACE_LIMIT, displaySamplesBound, displayStride, type DisplayTraceLimit } from '../../app/engine/pipeline/displayTrace';
import { fullRun } from '../../app/engine/pipeline/refly';
import { exportRun, EXPORT_FORMATS, type RunExportOptions } from '../../app/engine/export/runExport';
import { collectChunks } from '../../app/engine/export/chunks';
import { TRACE_CHANNELS, channelWidth } from '../../app/engine/sim/trace';
import type { RunTrace } from '../../app/engine/sim/types';
import type { ControllerRun, PipelineOutput } from '../../app/engine/pipeline/types';
import { fullRunExports } from '../../main/cli/fullRunExports';
import { exportRun as appExportRun } from '../../app/ui/exporting';
import { loadExample } from './scenario-fixtures';

const SMALL: DisplayTraceLimit = { fullUpToSamples: 500, displaySamples: 400 };
const EXPORT: RunExportOptions = { toolName: 'slewsmith-test', toolVersion: '1.2.3', creationDateUtc: '2026-01-02T03:04:05Z' };

function pass(limit?: DisplayTraceLimit): PipelineOutput {
  const json = loadExample('lumen6-imaging');
  json.simulation.durationS = 200;
  const r = runPipeline(json, limit ? { displayTrace: limit } : {});
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  return r.value;
}

const full = pass();
const shown = pass(SMALL);

/** Indices of the full trace the display trace holds, found by matching time stamps (t increases; duplicates in order). */
function matchIndices(fullTr: RunTrace, d: RunTrace): number[] {
  const out: number[] = [];
  let i = 0;
  for (let k = 0; k < d.n; k++) {
    while (i < fullTr.n && !Object.is(fullTr.t[i], d.t[k])) i++;
    out.push(i++);
  }
  return out;
}

describe('display traces', () => {
  it('short runs (the bundled examples) keep their full trace, unmarked', () => {
    expect(full.runs.length).toBe(6);
    for (const r of full.runs) {
      expect(r.traceKind).toBeUndefined();
      expect(r.trace.n).toBe(2001);
    }
    expect(DISPLAY_TRACE_LIMIT.fullUpToSamples).toBeGreaterThan(2001);
  });

  it('a long run keeps a marked subset: every number bit for bit, first and last, every change of j, segment and logic, bucket peaks', () => {
    for (const [k, r] of shown.runs.entries()) {
      const f = full.runs[k]!.trace;
      const d = r.trace;
      expect(r.traceKind).toBe('display');
      expect(r.display).toEqual({ fullSamples: f.n, stride: displayStride(f.n, SMALL), kept: d.n });
      expect(d.n).toBeLessThan(f.n);
      const idx = matchIndices(f, d);
      expect(idx.every((i) => i < f.n)).toBe(true);
      // Every channel copied bit for bit.
      for (const name of TRACE_CHANNELS) {
        const w = channelWidth(name, f.nWheels);
        for (let m = 0; m < d.n; m++)
          for (let c = 0; c < w; c++)
            if (!Object.is(d[name][m * w + c], f[name][idx[m]! * w + c])) throw new Error(`${r.key} ${name}[${m}]`);
      }
      for (let m = 0; m < d.n; m++) expect([d.j[m], d.segment[m]]).toEqual([f.j[idx[m]!], f.segment[idx[m]!]]);
      // Brute force: the samples the rule requires.
      const kept = new Set(idx);
      const must = new Set<number>([0, f.n - 1]);
      let changes = 0;
      for (let i = 1; i < f.n; i++)
        if (f.j[i] !== f.j[i - 1] || f.segment[i] !== f.segment[i - 1] || f.logic[i] !== f.logic[i - 1]) {
          must.add(i - 1).add(i);
          changes++;
        }
      const stride = r.display!.stride;
      for (let b = 0; b < f.n; b += stride) must.add(b);
      for (const i of must) expect(kept.has(i), `${r.key} sample ${i}`).toBe(true);
      // Each bucket's errorAngle max and min survive (value, not index: ties may pick another sample).
      for (let b = 0; b < f.n; b += stride) {
        const all = Array.from(f.errorAngle.subarray(b, Math.min(f.n, b + stride)));
        const inD = idx.flatMap((i, m) => (i >= b && i < b + stride ? [d.errorAngle[m]!] : []));
        expect(Math.max(...inD)).toBe(Math.max(...all));
        expect(Math.min(...inD)).toBe(Math.min(...all));
      }
      // Size: the bound the budget counts plus two per change at most.
      expect(d.n).toBeLessThanOrEqual(displaySamplesBound(f.n, SMALL) + 2 * changes);
      // The constraint margin series (lumen6 has keep-out cones) follow the same samples.
      const fc = full.runs[k]!.constraints!;
      expect(r.constraints!.marginRad.length).toBe(fc.marginRad.length);
      for (const [c, m] of r.constraints!.marginRad.entries()) expect(Array.from(m)).toEqual(idx.map((i) => fc.marginRad[c]![i]));
    }
    // Lumen6's hybrid controllers switch within 200 s: the change rule was exercised.
    expect(shown.runs.some((r) => r.trace.j[r.trace.n - 1]! > 0)).toBe(true);
  });

  it('the pass says so once in its warnings, naming the field that makes the runs long', () => {
    expect(full.warnings.some((w) => w.rule === 'display-trace')).toBe(false);
    const w = shown.warnings.filter((x) => x.rule === 'display-trace');
    expect(w.map((x) => x.path)).toEqual(['simulation.durationS']);
    expect(w[0]!.message).toContain(`runs of more than 500 samples keep a display trace`);
    expect(w[0]!.message).toContain(`${shown.runs[0]!.trace.n} of 2,001 samples in the first`);
  });

  it('metrics, verdicts and the comparison come from the full trace: the same in both passes', () => {
    expect(shown.comparison).toEqual(full.comparison);
    expect(shown.best).toEqual(full.best);
    for (const [k, r] of shown.runs.entries()) {
      const f = full.runs[k]!;
      expect([r.metrics, r.monitor, r.verdict, r.outcome, r.jumps]).toEqual([f.metrics, f.monitor, f.verdict, f.outcome, f.jumps]);
      expect({ ...r.constraints, marginRad: [] }).toEqual({ ...f.constraints, marginRad: [] });
    }
  });
});

describe('the trace arena of a pass of long runs (sim/trace.ts traceArena)', () => {
  it('a run that stops early keeps its full trace in memory of its own, not in the arena the next run overwrites', () => {
    const settleEarly = (limit?: DisplayTraceLimit) => {
      const json = loadExample('lumen6-imaging');
      json.simulation.durationS = 200;
      json.simulation.endWhenSettledForS = 5;
      const r = runPipeline(json, limit ? { displayTrace: limit } : {});
      if (!r.ok) throw new Error(JSON.stringify(r.errors));
      return r.value;
    };
    // The pass is estimated at 2,001 samples per run (over 1,000: arena and display traces); the step-target runs settle within 70 s.
    const limit = { fullUpToSamples: 1000, displaySamples: 400 };
    const a = settleEarly(limit);
    const b = settleEarly();
    const early = a.runs.filter((r) => r.mode === 'step-target');
    expect(early.length).toBe(3);
    for (const r of early) expect([r.traceKind, r.trace.n <= limit.fullUpToSamples]).toEqual([undefined, true]);
    expect(a.runs.filter((r) => r.traceKind === 'display').length).toBe(3);
    // Each early run's trace: bit for bit the one a pass without the arena keeps, and on a buffer no other run shares.
    for (const [k, r] of a.runs.entries()) if (r.traceKind !== 'display') expect(r.trace).toEqual(b.runs[k]!.trace);
    const buffers = a.runs.map((r) => r.trace.q.buffer);
    expect(new Set(buffers).size).toBe(a.runs.length);
  });
});

describe('exports of a display-trace run', () => {
  it('exporting the display trace directly is refused, naming run.trace and saying what to do', () => {
    const r = exportRun('csv', shown.runs[0]!, shown, EXPORT);
    if (r.ok) throw new Error('exported a display trace');
    expect(r.errors).toHaveLength(1);
    expect(r.errors[0]!.path).toBe('run.trace');
    expect(r.errors[0]!.rule).toBe('display-trace');
    expect(r.errors[0]!.message).toContain(
      `run ${shown.runs[0]!.key} kept only a display trace (${shown.runs[0]!.trace.n} of its 2,001 samples`,
    );
    expect(r.errors[0]!.message).toContain('fly the run again at full rate');
  });

  it('fullRun flies it again: the export bytes equal those of the pass that kept every sample (csv, json, aem)', () => {
    for (const [k, r] of shown.runs.entries()) {
      const again = fullRun(shown, r);
      if (!again.ok) throw new Error(JSON.stringify(again.errors));
      expect(again.value.trace.n).toBe(full.runs[k]!.trace.n);
      for (const f of EXPORT_FORMATS) {
        const a = exportRun(f, again.value, shown, EXPORT);
        const b = exportRun(f, full.runs[k]!, full, EXPORT);
        if (!a.ok || !b.ok) throw new Error(f);
        expect(a.value === b.value, `${r.key} ${f}`).toBe(true);
      }
    }
  });

  it("the CLI's lazy sources (fullRunExports) stream the same bytes, with a lower export rate too", () => {
    const exporter = fullRunExports(shown);
    for (const k of [0, 3]) {
      for (const f of EXPORT_FORMATS) {
        const o = { ...EXPORT, sampleRateHz: 2 };
        const a = collectChunks(exporter(f, shown.runs[k]!, shown, o));
        const b = exportRun(f, full.runs[k]!, full, o);
        if (!a.ok || !b.ok) throw new Error(f);
        expect(a.value === b.value, `${shown.runs[k]!.key} ${f}`).toBe(true);
      }
    }
  });

  it("the app's export writes the full-rate file of a display-trace run", () => {
    const run = shown.runs[1]!;
    const a = appExportRun(shown, { format: 'csv', runKey: run.key, sampleRateHz: null });
    const b = appExportRun(full, { format: 'csv', runKey: run.key, sampleRateHz: null });
    if (!a.ok || !b.ok) throw new Error('export');
    expect(a.value.content === b.value.content).toBe(true);
    expect(a.value.name).toBe(b.value.name);
  });

  it('a run whose flight cannot be repeated (the scenario changed) is refused, not exported short', () => {
    const run: ControllerRun = { ...shown.runs[0]!, display: { ...shown.runs[0]!.display!, fullSamples: 12345 } };
    const r = fullRun(shown, run);
    if (r.ok) throw new Error('accepted');
    expect(r.errors[0]!.rule).toBe('refly');
    expect(r.errors[0]!.message).toContain('recorded 2,001 samples, not the 12,345 of the pass');
  });
});

/**
 * The pipeline's resource budget (app/engine/pipeline/budget.ts): the estimate against what a run
 * really records and holds, and the refusals — a 10-day run at 100 Hz refused before any flight,
 * naming duration and rate; a 24 h run at 10 Hz with three controllers in two modes inside the budget
 * (one full trace in flight plus display traces, pipeline/displayTrace.ts).
 *
 * References: element sizes of Float64Array (8 bytes) and Int32Array (4 bytes) are ECMA-262's
 * TypedArray table (§23.2, "Element Size"); the sample count of a zero-order-hold loop at rate f
 * over [0, T] is ⌊T f⌋ + 1 instants (common practice, no source). The byte count of a real trace is
 * measured from its arrays' byteLength, which does not go through the estimate.
 */
import { describe, expect, it } from 'vitest';
import { budgetIssues, DEFAULT_BUDGET, estimateBudget, traceBytesPerSample } from '../../app/engine/pipeline/budget';
import { preparePipeline, runPipeline } from '../../app/engine/pipeline/run';
import { TRACE_CHANNELS } from '../../app/engine/sim/trace';
import type { RunTrace } from '../../app/engine/sim/types';
import { loadExample } from './scenario-fixtures';

function traceBytes(tr: RunTrace): number {
  let b = tr.j.byteLength + tr.segment.byteLength;
  for (const c of TRACE_CHANNELS) b += tr[c].byteLength;
  return b;
}

/** A pipeline option that fails the test if any flight starts. */
const noFlight = {
  shouldStop: () => {
    throw new Error('a flight started');
  },
};

describe('the estimate', () => {
  it('bytes per sample: 27 + 4N doubles and two Int32 counters (N = 4: 352 bytes)', () => {
    // Counted by hand from sim/types.ts RunTrace: t(1) q(4) omega(3) qRef(4) omegaRef(3)
    // torqueCmdBody(3) torqueBody(3) logic errorAngle potential potentialMin gap lyapunov(6) = 27,
    // plus hWheel, wheelTorqueCmd, wheelTorque, wheelTorqueNet (N each).
    for (const N of [3, 4, 6, 12]) expect(traceBytesPerSample(N)).toBe(8 * (27 + 4 * N) + 2 * 4);
  });

  it('matches the samples and bytes of the real traces of the bundled examples (sampled loop)', () => {
    for (const name of ['lumen6-imaging', 'tern12-reversal', 'kestrel60-momentum'] as const) {
      const json = loadExample(name);
      const p = preparePipeline(json);
      if (!p.ok) throw new Error(name);
      const e = estimateBudget(p.value.scenario, p.value.plan, 1, ['follow-plan']);
      const r = runPipeline(json, { controllers: [p.value.controllers[0]!.id], modes: ['follow-plan'] });
      if (!r.ok) throw new Error(name);
      const tr = r.value.runs[0]!.trace;
      // ⌊T f⌋ + 1 sample instants plus the end state when T is not on the sample grid.
      const T = r.value.runs[0]!.outcome.t;
      const f = p.value.scenario.vehicle.controlRateHz;
      expect(tr.n, name).toBe(Math.floor(T * f + 1e-9) + 1 + (Math.abs(T * f - Math.round(T * f)) > 1e-9 ? 1 : 0));
      expect(e.samplesPerRun, name).toBeGreaterThanOrEqual(tr.n);
      expect(e.samplesPerRun - tr.n, name).toBeLessThanOrEqual(1);
      expect(traceBytes(tr), name).toBe(tr.n * e.bytesPerSample);
    }
  });

  it('a 24 h run at 10 Hz with three controllers in two modes fits: one full trace in flight plus six display traces', () => {
    const json = loadExample('lumen6-imaging');
    json.simulation.durationS = 86400;
    json.simulation.mode = 'follow-plan';
    const p = preparePipeline(json);
    if (!p.ok) throw new Error('prepare');
    const one = estimateBudget(p.value.scenario, p.value.plan, 3, ['follow-plan']);
    expect(one.samplesPerRun).toBe(864_001);
    // The display rule (pipeline/displayTrace.ts): stride ⌈4 · 864,001 / 20,000⌉ = 173, so ⌈864,001 / 173⌉ = 4,995
    // buckets of at most 4 samples, plus the last: 19,981 samples (arithmetic by hand).
    expect(one.display).toBe(true);
    expect(one.keptSamplesPerRun).toBe(19_981);
    expect(one.keptBytesPerRun).toBe(19_981 * 352);
    expect(one.traceBytes).toBe((864_001 + 3 * 19_981) * 352);
    expect(budgetIssues(one, p.value.scenario, p.value.plan)).toEqual([]);
    const both = estimateBudget(p.value.scenario, p.value.plan, 3, ['follow-plan', 'step-target']);
    expect(both.traceBytes).toBe((864_001 + 6 * 19_981) * 352); // 346 MB, under 1 GiB
    expect(budgetIssues(both, p.value.scenario, p.value.plan)).toEqual([]);
    // With the display limit off (every run keeps its full trace) the six runs would hold 1.82 GB: refused as before.
    const off = estimateBudget(p.value.scenario, p.value.plan, 3, ['follow-plan', 'step-target'], {
      fullUpToSamples: Infinity,
      displaySamples: 1,
    });
    expect(off.display).toBe(false);
    expect(off.traceBytes).toBe(6 * 864_001 * 352);
    const refused = budgetIssues(off, p.value.scenario, p.value.plan);
    expect(refused.map((i) => [i.path, i.rule])).toEqual([['controllers', 'budget-memory']]);
    expect(refused[0]!.message).toContain('would hold 1.82 GB of traces (864,001 samples each');
  });

  it('a pass of display traces over the memory budget names the duration and rate that drive its full trace', () => {
    const json = loadExample('lumen6-imaging');
    json.simulation.durationS = 86400;
    const p = preparePipeline(json);
    if (!p.ok) throw new Error('prepare');
    const e = estimateBudget(p.value.scenario, p.value.plan, 3, ['follow-plan', 'step-target']);
    const issues = budgetIssues(e, p.value.scenario, p.value.plan, { ...DEFAULT_BUDGET, maxTraceBytes: 200e6 });
    expect(issues.map((i) => [i.path, i.rule])).toEqual([['simulation.durationS', 'budget-memory']]);
    expect(issues[0]!.message).toContain('one full trace of 864,001 samples in flight');
    expect(issues[0]!.message).toContain('plus 6 display traces of 19,981 samples');
    expect(issues[0]!.message).toContain('vehicle.controlRateHz = 10 Hz');
  });
});

describe('refusals before any flight', () => {
  it('a 10-day run at 100 Hz: refused at once, naming the duration, the rate and the limit', () => {
    const json = loadExample('lumen6-imaging');
    json.simulation.durationS = 864000;
    json.vehicle.controlRateHz = 100;
    const t0 = Date.now();
    const r = runPipeline(json, noFlight);
    expect(Date.now() - t0).toBeLessThan(10_000); // validation and certificates only; no simulation
    if (r.ok) throw new Error('accepted');
    const samples = r.errors.find((e) => e.rule === 'budget-samples')!;
    expect(samples.path).toBe('simulation.durationS');
    expect(samples.message).toContain('each run would record 86,400,001 samples');
    expect(samples.message).toContain('simulation.durationS = 864000 s');
    expect(samples.message).toContain('vehicle.controlRateHz = 100 Hz');
    expect(samples.message).toContain(`the budget is 1,000,000 samples per run`);
    expect(r.errors.map((e) => e.rule).sort()).toEqual(['budget-memory', 'budget-samples', 'budget-time']);
  });

  it('a cant angle of 89.999° plans a 2.8-day maneuver: fly refuses it and names the plan as the driver', () => {
    const json = loadExample('lumen6-imaging');
    json.vehicle.wheels.cantAngleDeg = 89.999;
    const r = runPipeline(json, noFlight);
    if (r.ok) throw new Error('accepted');
    const e = r.errors.find((x) => x.rule === 'budget-samples')!;
    expect(e.path).toBe('planning');
    expect(e.message).toMatch(/the planned slews \(\d+ s, see the plan\)/);
  });

  it('continuous-ideal with many RK4 steps is refused on estimated time, naming rk4StepsPerSample and timing', () => {
    const json = loadExample('lumen6-imaging');
    json.simulation.durationS = 36000;
    json.simulation.timing = 'continuous-ideal';
    json.simulation.rk4StepsPerSample = 20;
    const r = runPipeline(json, noFlight);
    if (r.ok) throw new Error('accepted');
    expect(r.errors.map((e) => e.rule)).toEqual(['budget-time']);
    expect(r.errors[0]!.path).toBe('simulation.rk4StepsPerSample');
    expect(r.errors[0]!.message).toContain('simulation.timing = continuous-ideal');
    expect(r.errors[0]!.message).toContain(`the budget is ${DEFAULT_BUDGET.maxComputeS / 60} min`);
  });

  it('a caller may set a smaller budget (the lumen6 demo against 1,000 samples per run)', () => {
    const json = loadExample('lumen6-imaging');
    const p = preparePipeline(json);
    if (!p.ok) throw new Error('prepare');
    const n = estimateBudget(p.value.scenario, p.value.plan, 1, ['follow-plan']).samplesPerRun;
    const r = runPipeline(json, { ...noFlight, budget: { maxSamplesPerRun: 1000 } });
    if (r.ok) throw new Error('accepted');
    expect(r.errors.map((e) => e.rule)).toEqual(['budget-samples']);
    expect(r.errors[0]!.message).toContain(`each run would record ${n.toLocaleString('en-US')} samples`);
    expect(r.errors[0]!.message).toContain('the budget is 1,000 samples per run');
  });
});

/**
 * validateTraceForExport and the writers' refusal to write from a bad trace. Expectations are
 * this module's own contract (every problem names the channel and sample; no partial output).
 */
import { describe, expect, it } from 'vitest';
import { validateTraceForExport } from '../../app/engine/export/trace-check';
import { writeCsv } from '../../app/engine/export/csv';
import { writeJson } from '../../app/engine/export/json';
import { writeAem } from '../../app/engine/export/aem-write';
import { exampleSummary } from './scenario-fixtures';
import { META, makeTrace } from './export-fixtures';

const q0 = [0, 0, 0, 1];
const base = () => makeTrace({ n: 50, dt: 0.1, nWheels: 4, q0, omega: [0.01, -0.02, 0.03], jumpsAfter: [20] });
const pairs = (r: ReturnType<typeof validateTraceForExport>) => (r.ok ? [] : r.errors.map((e) => `${e.path} ${e.rule}`));

describe('validateTraceForExport', () => {
  it('accepts a good trace, including a repeated instant across a logic jump', () => {
    const tr = base();
    expect(tr.t[21]).toBe(tr.t[20]);
    expect(validateTraceForExport(tr).ok).toBe(true);
  });
  it('names channel, sample and component of non-finite values', () => {
    const tr = base();
    tr.omega[3 * 7 + 1] = Number.NaN;
    tr.hWheel[4 * 9 + 3] = Infinity;
    const r = validateTraceForExport(tr);
    expect(pairs(r)).toEqual(['trace.omega[7] finite', 'trace.hWheel[9] finite']);
    if (!r.ok) expect(r.errors[0]!.message).toMatch(/sample 7 \(t = 0\.7 s\): trace\.omega component 1 is NaN/);
  });
  it('time must increase; a repeat needs a jump', () => {
    const tr = base();
    tr.t[30] = tr.t[29]!;
    tr.t[40] = tr.t[38]!;
    expect(pairs(validateTraceForExport(tr))).toEqual(['trace.t[30] increasing', 'trace.t[40] increasing']);
  });
  it('quaternions must be unit within the tolerance', () => {
    const tr = base();
    tr.q[4 * 12 + 3]! *= 1.001;
    tr.qRef[4 * 3] = 0.5;
    expect(pairs(validateTraceForExport(tr))).toEqual(['trace.q[12] unit-norm', 'trace.qRef[3] unit-norm']);
    expect(validateTraceForExport(tr, { unitNormTolerance: 1 }).ok).toBe(true);
  });
  it('lengths, counts and empty traces', () => {
    const tr = base();
    tr.wheelTorque = tr.wheelTorque.subarray(0, 10);
    expect(pairs(validateTraceForExport(tr))).toEqual(['trace.wheelTorque length']);
    expect(pairs(validateTraceForExport({ ...base(), n: 0 }))).toEqual(['trace.n min-samples']);
    const neg = base();
    neg.segment[5] = -1;
    expect(pairs(validateTraceForExport(neg))).toEqual(['trace.segment[5] integer']);
  });
  it('many bad samples: the first five and a count', () => {
    const tr = base();
    for (let k = 0; k < 40; k++) tr.errorAngle[k] = Number.NaN;
    const r = validateTraceForExport(tr);
    expect(pairs(r)).toEqual([...[0, 1, 2, 3, 4].map((k) => `trace.errorAngle[${k}] finite`), 'trace.errorAngle finite']);
    if (!r.ok) expect(r.errors[5]!.message).toContain('35 more');
  });
});

describe('writers never write from a bad trace', () => {
  const res = { ok: true as const, value: exampleSummary('lumen6-imaging') };
  if (!res.ok) throw new Error('fixture');
  const scenario = res.value;
  it('CSV, JSON and AEM all fail with the same issues and no text', () => {
    const tr = base();
    tr.q[4 * 5] = Number.NaN;
    for (const r of [
      writeCsv(tr, scenario, META),
      writeJson(tr, scenario, META),
      writeAem(tr, scenario, META, { creationDateUtc: '2030-03-13T08:00:00Z' }),
    ]) {
      expect(r.ok).toBe(false);
      expect('value' in r).toBe(false);
      if (!r.ok) expect(r.errors.map((e) => `${e.path} ${e.rule}`)).toEqual(['trace.q[5] finite']);
    }
  });
  it('a wheel count that differs from the scenario is refused', () => {
    const tr = makeTrace({ n: 5, dt: 0.1, nWheels: 3, q0, omega: [0, 0, 0] });
    const r = writeCsv(tr, scenario, META);
    expect(r.ok ? [] : r.errors.map((e) => e.rule)).toEqual(['wheel-count']);
  });
  it('missing metadata strings are named', () => {
    const r = writeCsv(base(), scenario, { toolName: '', toolVersion: '1', controllerLabel: ' ' });
    expect(r.ok ? [] : r.errors.map((e) => e.path)).toEqual(['meta.toolName', 'meta.controllerLabel']);
  });
});

/**
 * CSV and JSON exports: the header states tool, conventions, units and the caution; the table
 * carries the trace's numbers exactly (shortest round-trip decimals re-read bit for bit); column
 * names carry units; decimation; strict JSON for opaque inputs. Contract tests of our own format.
 */
import { describe, expect, it } from 'vitest';
import { writeCsv } from '../../app/engine/export/csv';
import { writeJson } from '../../app/engine/export/json';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { ScenarioSummary } from '../../app/engine/pipeline/types';
import { exampleSummary, loadExample } from './scenario-fixtures';
import { META, makeTrace } from './export-fixtures';

function lumen(): ScenarioSummary {
  const r = { ok: true as const, value: exampleSummary('lumen6-imaging') };
  if (!r.ok) throw new Error('fixture');
  return r.value;
}
const q0 = [0.1, -0.2, 0.3, Math.sqrt(0.86)];
const trace = () => makeTrace({ n: 101, dt: 0.1, nWheels: 4, q0, omega: [0.01, -0.02, 0.03], segmentStarts: [3, 6.5], jumpsAfter: [40] });

function parseCsv(text: string) {
  const lines = text.split('\n').filter((l) => l !== '');
  const comments = lines.filter((l) => l.startsWith('#'));
  const rest = lines.filter((l) => !l.startsWith('#'));
  return { comments, header: rest[0]!.split(','), rows: rest.slice(1).map((l) => l.split(',').map(Number)), raw: rest };
}

describe('CSV export', () => {
  const s = lumen();
  const tr = trace();
  const r = writeCsv(tr, s, META);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const csv = parseCsv(r.value);

  it('comment header: tool and version, caution, quaternion order and meaning, frames, units, epoch', () => {
    expect(csv.comments[0]).toBe('# Slewsmith 0.1.0-test - run export (CSV)');
    expect(csv.comments).toContain(`# CAUTION: ${CAUTION_TEXT}`);
    const all = csv.comments.join('\n');
    expect(all).toContain('[x, y, z, w]');
    expect(all).toContain('Hamilton');
    expect(all).toContain('qInertialFromBody rotates body-frame vectors into the inertial frame');
    expect(all).toContain('frames:');
    expect(all).toContain('units: SI');
    expect(all).toContain('2030-03-14T10:00:00Z');
    expect(all).toContain('Hysteretic (delta 0.2) (id hysteretic)');
    // Every comment line is one line; the table starts right after.
    expect(r.value.split('\n').findIndex((l) => !l.startsWith('#'))).toBe(csv.comments.length);
  });

  it('column names carry units, per wheel columns for all four wheels', () => {
    expect(csv.header.slice(0, 10)).toEqual([
      't_s',
      'j',
      'segment',
      'q_x',
      'q_y',
      'q_z',
      'q_w',
      'omega_x_radps',
      'omega_y_radps',
      'omega_z_radps',
    ]);
    for (const name of [
      'qref_w',
      'omegaref_z_radps',
      'torque_cmd_x_Nm',
      'torque_y_Nm',
      'wheel4_torque_cmd_Nm',
      'wheel1_torque_motor_Nm',
      'wheel2_torque_net_Nm',
      'wheel3_h_Nms',
      'logic',
      'error_angle_deg',
    ]) {
      expect(csv.header).toContain(name);
    }
    expect(csv.header.filter((h) => /^wheel\d_h_Nms$/.test(h))).toHaveLength(4);
    for (const row of csv.rows) expect(row).toHaveLength(csv.header.length);
  });

  it('one row per sample, numbers re-read exactly, error angle in degrees', () => {
    expect(csv.rows).toHaveLength(tr.n);
    const col = (name: string) => csv.header.indexOf(name);
    for (let k = 0; k < tr.n; k++) {
      const row = csv.rows[k]!;
      expect(row[col('t_s')]).toBe(tr.t[k]);
      expect(row[col('j')]).toBe(tr.j[k]);
      expect(row[col('segment')]).toBe(tr.segment[k]);
      for (let i = 0; i < 4; i++) expect(row[col('q_x') + i]).toBe(tr.q[4 * k + i]);
      expect(row[col('omega_z_radps')]).toBe(tr.omega[3 * k + 2]);
      expect(row[col('wheel2_h_Nms')]).toBe(tr.hWheel[4 * k + 1]);
      expect(row[col('wheel3_torque_motor_Nm')]).toBe(tr.wheelTorque[4 * k + 2]);
      expect(row[col('wheel3_torque_net_Nm')]).toBe(tr.wheelTorqueNet[4 * k + 2]);
      expect(row[col('error_angle_deg')]).toBe(tr.errorAngle[k]! * (180 / Math.PI));
    }
    // The jump: same t, j + 1, logic flipped.
    expect(csv.rows[41]![col('t_s')]).toBe(csv.rows[40]![col('t_s')]);
    expect(csv.rows[41]![col('j')]).toBe(1);
    expect(csv.rows[41]![col('logic')]).toBe(-csv.rows[40]![col('logic')]!);
  });

  it('no NaN, no Infinity, no negative zero in the text', () => {
    const t2 = trace();
    t2.torqueBody[0] = -0;
    const r2 = writeCsv(t2, s, META);
    if (!r2.ok) throw new Error('write');
    const body = parseCsv(r2.value).raw.join('\n');
    expect(body).not.toMatch(/NaN|Infinity|(^|,)-0(,|$)/m);
  });

  it('decimation to 2 Hz from 10 Hz keeps the grid points and the last sample', () => {
    const d = writeCsv(tr, s, META, { sampleRateHz: 2 });
    if (!d.ok) throw new Error('write');
    const p = parseCsv(d.value);
    const times = p.rows.map((row) => row[0]);
    expect(times).toEqual(Array.from({ length: 21 }, (_, m) => tr.t[m * 5 + (m * 5 > 40 ? 1 : 0)]));
    expect(p.comments.join('\n')).toContain('samples: 21 of 102');
    const bad = writeCsv(tr, s, META, { sampleRateHz: 0 });
    expect(bad.ok ? [] : bad.errors.map((e) => `${e.path} ${e.rule}`)).toEqual(['options.sampleRateHz positive']);
  });

  it('CRLF on request', () => {
    const c = writeCsv(tr, s, META, { lineEnding: '\r\n' });
    if (!c.ok) throw new Error('write');
    expect(c.value.split('\r\n').length).toBe(r.value.split('\n').length);
  });
});

describe('JSON export', () => {
  const s = lumen();
  const tr = trace();
  const metrics = { settleTimeS: 42.5, perSegment: [{ k: 1 }], peaks: new Float64Array([0.5, 0.25]) };
  const plan = { feasible: true, segments: [{ index: 0, binding: 'momentum' }] };
  const jumps = [{ t: 4, j: 1, what: 'logic', from: 1, to: -1, why: 'h·η = -0.21 ≤ -δ' }];
  const r = writeJson(tr, s, { ...META, metrics, plan, jumpEvents: jumps });
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const doc = JSON.parse(r.value);

  it('carries caution, conventions, tool, scenario, plan, metrics, jumps and derived segments', () => {
    expect(doc.format).toBe('slewsmith-run');
    expect(doc.version).toBe(1);
    expect(doc.caution).toBe(CAUTION_TEXT);
    expect(doc.tool).toEqual({ name: 'Slewsmith', version: '0.1.0-test' });
    expect(doc.conventions.quaternionOrder).toEqual(['x', 'y', 'z', 'w']);
    expect(doc.conventions.quaternion).toContain('Hamilton');
    expect(doc.conventions.units.wheel1_h_Nms).toBe('N m s');
    expect(doc.scenario).toEqual(loadExample('lumen6-imaging'));
    expect(doc.plan).toEqual(plan);
    expect(doc.metrics).toEqual({ settleTimeS: 42.5, perSegment: [{ k: 1 }], peaks: [0.5, 0.25] });
    expect(doc.jumpEvents).toEqual(jumps);
    expect(doc.controller).toEqual({ id: 'hysteretic', label: 'Hysteretic (delta 0.2)' });
    expect(doc.segments.map((g: any) => [g.index, g.label, g.startS, g.stopS])).toEqual([
      [0, 'Image 1', 0, tr.t[30]],
      [1, 'Image 2 (cross-track step)', tr.t[30], tr.t[66]], // index 66: one extra sample at the jump after 40
      [2, 'Image 3', tr.t[66], tr.t[tr.n - 1]],
    ]);
    expect(doc.resolved.targets[3].qInertialFromBody).toEqual(Array.from(s.targets[3]!.q));
  });

  it('channels equal the CSV columns and the trace, exactly', () => {
    const c = writeCsv(tr, s, META);
    if (!c.ok) throw new Error('write');
    const csv = parseCsv(c.value);
    expect(Object.keys(doc.channels)).toEqual(csv.header);
    csv.header.forEach((name, i) => expect(doc.channels[name]).toEqual(csv.rows.map((row) => row[i])));
    expect(doc.channels.q_w[17]).toBe(tr.q[4 * 17 + 3]);
  });

  it('carries what the metrics were computed with, the monitor flags, the outcome and the verdict when given, and omits them otherwise', () => {
    const metricInputs = { settleAngleRad: 0.001, plannedSwitchTimesS: new Float64Array([0, 12.5]), liftDependent: true };
    const monitor = [{ kind: 'flow-rise', tStart: 3, tEnd: 4, amount: 1e-6, message: 'W rose' }];
    const outcome = { status: 'completed', message: 'ran to the end', t: 10, j: 1 };
    const verdict = { kind: 'settled', text: 'settled in 8.0 s' };
    const w = writeJson(tr, s, { ...META, metricInputs, monitor, outcome, verdict });
    if (!w.ok) throw new Error('write');
    const d = JSON.parse(w.value);
    expect(d.metricInputs).toEqual({ settleAngleRad: 0.001, plannedSwitchTimesS: [0, 12.5], liftDependent: true });
    expect([d.monitor, d.outcome, d.verdict]).toEqual([monitor, outcome, verdict]);
    for (const k of ['metricInputs', 'monitor', 'outcome', 'verdict']) expect(k in doc).toBe(false);
  });

  it('NaN, functions, bigints, class instances and cycles in opaque inputs are errors with paths', () => {
    const cyc: any = { a: 1 };
    cyc.self = cyc;
    const bad = writeJson(tr, s, { ...META, metrics: { a: [1, Number.NaN], f: () => 1, b: 10n, d: new Date(0) }, plan: cyc });
    expect(bad.ok ? [] : bad.errors.map((e) => `${e.path} ${e.rule}`)).toEqual([
      'export.plan.self cycle',
      'export.metrics.a[1] finite',
      'export.metrics.f json-type',
      'export.metrics.b json-type',
      'export.metrics.d json-type',
    ]);
  });

  it('decimated and indented variants', () => {
    const d = writeJson(tr, s, META, { sampleRateHz: 1, indent: 2 });
    if (!d.ok) throw new Error('write');
    const j = JSON.parse(d.value);
    expect(j.channels.t_s).toEqual([0, 1, 2, 3, 4, 5, 6, 7, 8, 9, 10].map((k) => tr.t[k * 10 + (k * 10 > 40 ? 1 : 0)]));
    expect(j.samples).toEqual({ count: 11, ofTrace: 102, sampleRateHz: 1 });
    expect(d.value).toContain('\n  "format"');
  });
});

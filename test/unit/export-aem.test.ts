/**
 * AEM writer rules from CCSDS 504.0-B-2 (Attitude Data Messages, Issue 2, 2024): header and
 * metadata keyword order (Tables 4-2, 4-3; §6.7.8), COMMENT placement, one META/DATA pair per
 * maneuver segment with consistent USEABLE times (§4.2.4.8), epochs YYYY-MM-DDThh:mm:ss.sss
 * (§6.8.9) strictly increasing in a block, KVN value rules (§6: ≤ 254 printable ASCII characters,
 * ≤ 16 significant digits, no NaN/Inf/−0), plus the practice of one quaternion hemisphere along
 * the file (references.md §1.9). Round trip write → parseAem → the same states to the printed
 * precision.
 */
import { describe, expect, it } from 'vitest';
import { writeAem } from '../../app/engine/export/aem-write';
import type { AemOptions } from '../../app/engine/export/aem-write';
import { parseAem } from '../../app/engine/export/aem-read';
import { AEM_META_KEYS } from '../../app/engine/export/aem-keywords';
import { significantDigits } from '../../app/engine/export/kvn';
import { CAUTION_TEXT } from '../../app/engine/caution';
import type { ScenarioSummary } from '../../app/engine/pipeline/types';
import { exampleSummary } from './scenario-fixtures';
import { META, makeTrace } from './export-fixtures';

const OPTS: AemOptions = { creationDateUtc: '2030-03-13T08:00:00Z' };

function scenario(name: 'lumen6-imaging' | 'kestrel60-momentum' = 'lumen6-imaging'): ScenarioSummary {
  const r = { ok: true as const, value: exampleSummary(name) };
  if (!r.ok) throw new Error('fixture');
  return r.value;
}
const q0 = [0.1, -0.2, 0.3, Math.sqrt(0.86)];
const lumenTrace = () =>
  makeTrace({ n: 301, dt: 0.1, nWheels: 4, q0, omega: [0.004, -0.011, 0.019], segmentStarts: [8, 17.5, 25], jumpsAfter: [50, 120] });

function write(tr = lumenTrace(), s = scenario(), o: AemOptions = OPTS): string {
  const r = writeAem(tr, s, META, o);
  if (!r.ok) throw new Error(JSON.stringify(r.errors, null, 1));
  return r.value;
}

describe('AEM writer: layout and keywords', () => {
  const text = write();
  const lines = text.split('\n');

  it('header: version, the caution as a COMMENT right after it, then CREATION_DATE, ORIGINATOR, MESSAGE_ID', () => {
    expect(lines[0]).toBe('CCSDS_AEM_VERS = 2.0');
    expect(lines[1]).toBe(`COMMENT ${CAUTION_TEXT}`);
    const keys = lines
      .slice(0, lines.indexOf('META_START'))
      .filter((l) => l && !l.startsWith('COMMENT'))
      .map((l) => l.split(' = ')[0]);
    expect(keys).toEqual(['CCSDS_AEM_VERS', 'CREATION_DATE', 'ORIGINATOR', 'MESSAGE_ID']);
    expect(text).toContain('CREATION_DATE = 2030-03-13T08:00:00.000\n');
    expect(text).toContain('MESSAGE_ID = LUMEN-6-20300313T080000\n');
  });

  it('one META block per maneuver segment, keywords in the table order, frames and type', () => {
    const doc = parseAem(text);
    if (!doc.ok) throw new Error(JSON.stringify(doc.errors));
    expect(doc.value.segments).toHaveLength(4);
    const order: string[] = AEM_META_KEYS.map((k) => k.key);
    for (const seg of doc.value.segments) {
      const keys = Object.keys(seg.metadata);
      expect(keys).toEqual([...keys].sort((a, b) => order.indexOf(a) - order.indexOf(b)));
      expect(seg.metadata).toMatchObject({
        OBJECT_NAME: 'LUMEN-6',
        OBJECT_ID: 'UNKNOWN',
        REF_FRAME_A: 'EME2000',
        REF_FRAME_B: 'SC_BODY_1',
        TIME_SYSTEM: 'UTC',
        ATTITUDE_TYPE: 'QUATERNION/ANGVEL',
        ANGVEL_FRAME: 'SC_BODY_1',
      });
      expect(seg.metadata.START_TIME).toBe(seg.lines[0]!.epoch);
      expect(seg.metadata.STOP_TIME).toBe(seg.lines.at(-1)!.epoch);
      expect(seg.metadata.USEABLE_START_TIME).toBe(seg.metadata.START_TIME);
      expect(seg.metadata.USEABLE_STOP_TIME).toBe(seg.metadata.STOP_TIME);
    }
    expect(doc.value.segments.map((g) => g.comments[0])).toEqual([
      'Segment 1 of 4: Image 1',
      'Segment 2 of 4: Image 2 (cross-track step)',
      'Segment 3 of 4: Image 3',
      'Segment 4 of 4: Antenna to ground station',
    ]);
    // Consecutive segments meet at the boundary instant: USEABLE_START(k+1) = USEABLE_STOP(k).
    const segs = doc.value.segments;
    for (let k = 1; k < segs.length; k++) expect(segs[k]!.metadata.USEABLE_START_TIME).toBe(segs[k - 1]!.metadata.USEABLE_STOP_TIME);
    expect(segs[1]!.metadata.START_TIME).toBe('2030-03-14T10:00:08.000');
    expect(segs[2]!.metadata.START_TIME).toBe('2030-03-14T10:00:17.500');
  });

  it('KVN rules: line length, printable ASCII, no NaN/Inf/−0, ≤ 16 significant digits', () => {
    for (const l of lines) {
      expect(l.length).toBeLessThanOrEqual(254);
      expect(l).toMatch(/^[\x20-\x7e]*$/);
    }
    const data = lines.filter((l) => /^\d{4}-/.test(l));
    for (const l of data) {
      const [epoch, ...nums] = l.split(' ');
      expect(epoch).toMatch(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}$/);
      expect(nums).toHaveLength(7);
      for (const n of nums) {
        expect(n).not.toMatch(/NaN|Inf/);
        expect(n).not.toMatch(/^-0(\.0*)?$/);
        expect(significantDigits(n)).toBeLessThanOrEqual(16);
      }
    }
  });

  it('repeated instants at logic jumps are written once; data lines strictly increase', () => {
    const doc = parseAem(text);
    if (!doc.ok) throw new Error('parse');
    const all = doc.value.segments.flatMap((g) => g.lines);
    // 301 instants, 4 segments: the 3 boundary instants appear in two blocks; jumps add none.
    expect(all).toHaveLength(301 + 3);
    for (const g of doc.value.segments)
      for (let i = 1; i < g.lines.length; i++) expect(g.lines[i]!.time.unixS).toBeGreaterThan(g.lines[i - 1]!.time.unixS);
  });
});

describe('AEM writer: values', () => {
  it('round trip: write → read gives the trace states to the printed precision', () => {
    const tr = lumenTrace();
    const doc = parseAem(write(tr));
    if (!doc.ok) throw new Error('parse');
    const epoch0 = Date.UTC(2030, 2, 14, 10, 0, 0) / 1000;
    let k = 0;
    for (const g of doc.value.segments) {
      for (const line of g.lines) {
        // Find the trace sample of this epoch (first of a repeated instant).
        const t = line.time.unixS - epoch0;
        while (Math.abs(tr.t[k]! - t) > 5e-4) k++;
        for (let i = 0; i < 4; i++) expect(Math.abs(line.values[i]! - tr.q[4 * k + i]!)).toBeLessThanOrEqual(0.5e-10 + 1e-16);
        for (let i = 0; i < 3; i++) {
          const deg = (tr.omega[3 * k + i]! * 180) / Math.PI;
          expect(Math.abs(line.values[4 + i]! - deg)).toBeLessThanOrEqual(5e-12 * Math.abs(deg) + 1e-18); // half a unit in the 12th digit
        }
        expect(Math.abs(t - tr.t[k]!)).toBeLessThanOrEqual(0.5e-3 + 1e-9);
      }
      k = 0;
    }
  });

  it('keeps one hemisphere (positive dot products), even through QC = 0 on a long slew', () => {
    // 200° about Z at 10°/s: the scalar part crosses zero half-way; a QC ≥ 0 rule would flip it.
    const tr = makeTrace({ n: 201, dt: 0.1, nWheels: 4, q0: [0, 0, 0, 1], omega: [0, 0, (10 * Math.PI) / 180], segmentStarts: [10] });
    // Feed alternate samples with the opposite (equivalent) sign.
    for (let k = 1; k < tr.n; k += 2) for (let i = 0; i < 4; i++) tr.q[4 * k + i] = -tr.q[4 * k + i]!;
    const doc = parseAem(write(tr));
    if (!doc.ok) throw new Error('parse');
    const lines = doc.value.segments.flatMap((g) => g.lines);
    expect(lines[0]!.values[3]).toBeGreaterThan(0);
    for (let i = 1; i < lines.length; i++) {
      const a = lines[i - 1]!.values,
        b = lines[i]!.values;
      expect(a[0]! * b[0]! + a[1]! * b[1]! + a[2]! * b[2]! + a[3]! * b[3]!).toBeGreaterThan(0);
    }
    expect(lines.at(-1)!.values[3]).toBeLessThan(0); // cos(100°) < 0: not forced positive
  });

  it('−0 prints as plain zero, small rates in d.ddd…E±n form; options set digits and frames', () => {
    const tr = makeTrace({ n: 5, dt: 1, nWheels: 4, q0: [0, 0, 0, 1], omega: [-0, 1e-30, 0] });
    const text = write(tr, scenario(), {
      ...OPTS,
      quaternionDecimals: 6,
      rateSignificantDigits: 5,
      epochFractionDigits: 0,
      refFrameA: 'ICRF',
      refFrameB: 'SC_BODY_2',
      centerName: null,
      objectId: '2030-999A',
      originator: 'EXAMPLE',
      messageId: 'RUN-0001',
    });
    expect(text).toContain('\n2030-03-14T10:00:00 0.000000 0.000000 0.000000 1.000000 0.0 5.7296E-29 0.0\n');
    expect(text).toContain('REF_FRAME_A = ICRF\n');
    expect(text).toContain('ANGVEL_FRAME = SC_BODY_2\n');
    expect(text).not.toContain('CENTER_NAME');
    expect(text).toContain('OBJECT_ID = 2030-999A\n');
    expect(text).toContain('ORIGINATOR = EXAMPLE\n');
    expect(text).toContain('MESSAGE_ID = RUN-0001\n');
  });

  it('sample-rate decimation and CRLF', () => {
    const text = write(lumenTrace(), scenario(), { ...OPTS, sampleRateHz: 1, lineEnding: '\r\n' });
    expect(text).not.toMatch(/[^\r]\n/);
    const doc = parseAem(text);
    if (!doc.ok) throw new Error('parse');
    expect(doc.value.segments[0]!.lines.map((l) => l.epoch.slice(17))).toEqual([
      '00.000',
      '01.000',
      '02.000',
      '03.000',
      '04.000',
      '05.000',
      '06.000',
      '07.000',
      '08.000',
    ]);
  });

  it('bad options are reported together, and nothing is written', () => {
    const r = writeAem(lumenTrace(), scenario(), META, {
      creationDateUtc: 'yesterday',
      refFrameA: 'Mixed_Case',
      quaternionDecimals: 17,
      epochFractionDigits: 9,
      interpolation: { method: 'SPLINE' as 'LINEAR', degree: 0 },
    });
    expect(r.ok ? [] : r.errors.map((e) => `${e.path} ${e.rule}`)).toEqual([
      'options.creationDateUtc format',
      'options.epochFractionDigits range',
      'options.quaternionDecimals range',
      'options.refFrameA kvn-text',
      'options.interpolation.method one-of',
      'options.interpolation.degree range',
    ]);
  });

  it('given segments must hold samples', () => {
    const r = writeAem(
      lumenTrace(),
      scenario(),
      {
        ...META,
        segments: [
          { index: 0, label: 'early', startS: 0, stopS: 5 },
          { index: 1, label: 'none', startS: 100, stopS: 200 },
        ],
      },
      OPTS,
    );
    expect(r.ok ? [] : r.errors.map((e) => `${e.path} ${e.rule}`)).toEqual(['segments[1] empty-segment']);
  });

  it('a vehicle name with spaces and lower case becomes a KVN text value', () => {
    const s = scenario('kestrel60-momentum');
    s.vehicleName = 'Kestrel 60 (flight spare)';
    const tr = makeTrace({ n: 3, dt: 1, nWheels: 4, q0, omega: [0, 0, 0] });
    expect(write(tr, s)).toContain('OBJECT_NAME = KESTREL_60_FLIGHT_SPARE\n');
  });
});

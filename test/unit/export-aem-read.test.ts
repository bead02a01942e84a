/**
 * parseAem against the hand-composed v2 example of references.md §1.9 (a 90° rest-to-rest slew
 * about Z, bang-coast-bang, 1 deg/s², 3 deg/s cap, built for this project from CCSDS 504.0-B-2
 * Tables 4-2/4-3/4-4) and against malformed variants, each rejected with its line number and rule.
 * Expected angles 0, 1.125, 4.5, 49.5, 85.5, 88.875, 90° follow from the profile: θ = ½αt² for
 * t ≤ 3 s, then 4.5° + 3(t − 3)°, symmetric braking.
 */
import { describe, expect, it } from 'vitest';
import { parseAem } from '../../app/engine/export/aem-read';

const EXAMPLE = `CCSDS_AEM_VERS = 2.0
COMMENT Fictitious slew used as a writer/reader test fixture
CREATION_DATE = 2030-03-13T08:00:00
ORIGINATOR = EXAMPLE
MESSAGE_ID = SLEW-TEST-0001

META_START
COMMENT Bang-coast-bang, 90 deg about Z
OBJECT_NAME = DEMO_SAT
OBJECT_ID = 2030-999A
CENTER_NAME = EARTH
REF_FRAME_A = EME2000
REF_FRAME_B = SC_BODY_1
TIME_SYSTEM = UTC
START_TIME = 2030-03-14T10:00:00.000
STOP_TIME = 2030-03-14T10:00:33.000
ATTITUDE_TYPE = QUATERNION/ANGVEL
ANGVEL_FRAME = SC_BODY_1
INTERPOLATION_METHOD = HERMITE
INTERPOLATION_DEGREE = 3
META_STOP

DATA_START
2030-03-14T10:00:00.000 0.0 0.0 0.0000000 1.0000000 0.0 0.0 0.0
2030-03-14T10:00:01.500 0.0 0.0 0.0098173 0.9999518 0.0 0.0 1.5
2030-03-14T10:00:03.000 0.0 0.0 0.0392598 0.9992290 0.0 0.0 3.0
2030-03-14T10:00:18.000 0.0 0.0 0.4186597 0.9081432 0.0 0.0 3.0
2030-03-14T10:00:30.000 0.0 0.0 0.6788007 0.7343225 0.0 0.0 3.0
2030-03-14T10:00:31.500 0.0 0.0 0.7001308 0.7140146 0.0 0.0 1.5
2030-03-14T10:00:33.000 0.0 0.0 0.7071068 0.7071068 0.0 0.0 0.0
DATA_STOP
`;

const lines = () => EXAMPLE.split('\n');
const join = (l: string[]) => l.join('\n');
function issues(text: string): string[] {
  const r = parseAem(text);
  return r.ok ? [] : r.errors.map((e) => `${e.path} ${e.rule}`);
}
/** Line index (0-based) of the first line starting with s. */
const at = (l: string[], s: string) => l.findIndex((x) => x.startsWith(s));

describe('parseAem: the §1.9 example', () => {
  const r = parseAem(EXAMPLE);
  if (!r.ok) throw new Error(JSON.stringify(r.errors));
  const doc = r.value;

  it('header and metadata', () => {
    expect(doc.version).toBe('2.0');
    expect(doc.comments).toEqual(['Fictitious slew used as a writer/reader test fixture']);
    expect(doc.header).toMatchObject({ CREATION_DATE: '2030-03-13T08:00:00', ORIGINATOR: 'EXAMPLE', MESSAGE_ID: 'SLEW-TEST-0001' });
    expect(doc.segments).toHaveLength(1);
    const s = doc.segments[0]!;
    expect(s.comments).toEqual(['Bang-coast-bang, 90 deg about Z']);
    expect(s.metadata.ATTITUDE_TYPE).toBe('QUATERNION/ANGVEL');
    expect(s.metadata.INTERPOLATION_DEGREE).toBe('3');
    expect(s.lines.map((l) => l.line)).toEqual([24, 25, 26, 27, 28, 29, 30]);
  });

  it('rotation angles 0, 1.125, 4.5, 49.5, 85.5, 88.875, 90° and the rate profile', () => {
    const s = doc.segments[0]!;
    const angles = s.lines.map((l) => (2 * Math.atan2(l.values[2]!, l.values[3]!) * 180) / Math.PI);
    const expected = [0, 1.125, 4.5, 49.5, 85.5, 88.875, 90];
    // Seven decimals in the quaternion: |Δθ| ≤ 2·(0.5e-7)·√2 rad ≈ 8e-6°.
    angles.forEach((a, i) => expect(Math.abs(a - expected[i]!)).toBeLessThan(1e-5));
    expect(s.lines.map((l) => l.values[6])).toEqual([0, 1.5, 3, 3, 3, 1.5, 0]);
    expect(s.lines.map((l) => l.time.unixS - s.lines[0]!.time.unixS)).toEqual([0, 1.5, 3, 18, 30, 31.5, 33]);
    expect(s.lines[0]!.time.unixS).toBe(Date.UTC(2030, 2, 14, 10, 0, 0) / 1000);
  });

  it('CRLF, LFCR and CR line ends read the same', () => {
    for (const eol of ['\r\n', '\n\r', '\r']) {
      const r2 = parseAem(EXAMPLE.split('\n').join(eol));
      expect(r2.ok).toBe(true);
      if (r2.ok) expect(r2.value.segments[0]!.lines.map((l) => l.values)).toEqual(doc.segments[0]!.lines.map((l) => l.values));
    }
  });

  it('day-of-year epochs, a trailing Z and a UTC leap second are accepted', () => {
    const l = lines();
    l[at(l, 'START_TIME')] = 'START_TIME = 2030-073T10:00:00Z';
    l[at(l, '2030-03-14T10:00:01.500')] = l[at(l, '2030-03-14T10:00:01.500')]!.replace('2030-03-14T10:00:01.500', '2030-073T10:00:01.500Z');
    expect(issues(join(l))).toEqual([]);
    const leap = lines();
    leap[at(leap, 'START_TIME')] = 'START_TIME = 2030-03-14T23:59:59.000';
    leap[at(leap, 'STOP_TIME')] = 'STOP_TIME = 2030-03-15T00:00:31.000';
    const d = at(leap, '2030-03-14T10:00:00.000');
    const times = [
      '2030-03-14T23:59:59.000',
      '2030-03-14T23:59:60.500',
      '2030-03-15T00:00:00.000',
      '2030-03-15T00:00:10',
      '2030-03-15T00:00:20',
      '2030-03-15T00:00:25',
      '2030-03-15T00:00:30',
    ];
    for (let i = 0; i < 7; i++) leap[d + i] = leap[d + i]!.replace(/^\S+/, times[i]!);
    expect(issues(join(leap))).toEqual([]);
  });
});

describe('parseAem: malformed files, with line numbers', () => {
  it('first line must be the version', () => {
    expect(issues('\n\nOBJECT_NAME = X\n')).toEqual(['line 3 first-line']);
    expect(issues('')).toEqual(['line 1 first-line']);
    const l = lines();
    l[0] = 'CCSDS_AEM_VERS = 1.0';
    expect(issues(join(l))).toEqual(['line 1 version']);
  });

  it('metadata keywords out of the standard order', () => {
    const l = lines();
    const a = at(l, 'REF_FRAME_A'),
      b = at(l, 'REF_FRAME_B');
    [l[a], l[b]] = [l[b]!, l[a]!];
    expect(issues(join(l))).toEqual([`line ${b + 1} keyword-order`]);
  });

  it('header keywords out of order, unknown and lower-case keywords, duplicates', () => {
    const l = lines();
    [l[2], l[3]] = [l[3]!, l[2]!];
    l.splice(5, 0, 'SPACECRAFT = X');
    l.splice(10, 0, 'object_id = 2030-999A', 'OBJECT_NAME = AGAIN');
    expect(issues(join(l))).toEqual(['line 4 keyword-order', 'line 6 unknown-keyword', 'line 11 key-case', 'line 12 duplicate']);
  });

  it('missing mandatory keywords', () => {
    const l = lines().filter((x) => !x.startsWith('OBJECT_ID') && !x.startsWith('ORIGINATOR'));
    expect(issues(join(l))).toEqual(['line 6 missing-keyword', 'line 19 missing-keyword']);
  });

  it('comment placement: between data lines, after DATA_STOP, inside the header after keywords', () => {
    const l = lines();
    const d = at(l, '2030-03-14T10:00:18.000');
    l.splice(d, 0, 'COMMENT coast');
    l.push('COMMENT trailing');
    l.splice(4, 0, 'COMMENT late header comment');
    expect(issues(join(l))).toEqual(['line 5 comment-placement', `line ${d + 2} comment-placement`, `line ${l.length} comment-placement`]);
  });

  it('data lines: order, width, numbers, epochs, range', () => {
    const l = lines();
    const d = at(l, '2030-03-14T10:00:00.000');
    l[d + 2] = '2030-03-14T10:00:01.000 0.0 0.0 0.0392598 0.9992290 0.0 0.0 3.0'; // goes back in time
    l[d + 3] = '2030-03-14T10:00:18.000 0.0 0.0 0.4186597 0.9081432 0.0 0.0'; // 6 values
    l[d + 4] = '2030-03-14T10:00:30.000 0.0 0.0 0.67.88007 0.7343225 -0.0 0.0 3.0'; // bad number, −0
    l[d + 5] = '2030-03-14T10:00:31.5 0.0 0.0 0.70013080000000001 0.7140146 0.0 0.0 1.5'; // 17 digits
    l[d + 6] = '2030-03-14T10:00:34.000 0.0 0.0 0.7071068 0.7071068 0.0 0.0 0.0'; // after STOP_TIME
    l.splice(d + 6, 0, '2030-02-30T10:00:32.000 0.0 0.0 0.7071068 0.7071068 0.0 0.0 0.0'); // no such day
    const n = d + 1;
    expect(issues(join(l))).toEqual([
      `line ${n + 2} time-order`,
      `line ${n + 3} columns`,
      `line ${n + 4} number`,
      `line ${n + 4} number`,
      `line ${n + 5} number`,
      `line ${n + 6} epoch`,
      `line ${n + 7} time-range`,
    ]);
  });

  it('characters and lengths', () => {
    const l = lines();
    l[at(l, 'OBJECT_NAME')] = 'OBJECT_NAME =\tDEMO_SAT';
    l[at(l, 'COMMENT Bang')] = `COMMENT ${'x'.repeat(260)}`;
    l[at(l, 'CENTER_NAME')] = 'CENTER_NAME = EARTH°';
    const r = issues(join(l));
    expect(r).toEqual(['line 8 line-length', 'line 9 ascii', 'line 11 ascii']);
  });

  it('structure: unterminated blocks and missing DATA_START', () => {
    const l = lines().filter((x) => x !== 'DATA_STOP');
    expect(issues(join(l))).toEqual([`line ${l.length} eof`]);
    const m = lines().filter((x) => x !== 'DATA_START');
    expect(issues(join(m))[0]).toBe('line 23 structure');
    const h = lines().slice(0, 6);
    expect(issues(join(h))).toEqual(['line 6 eof']);
  });

  it('interpolation degree, attitude type, mixed-case values, USEABLE overlap between segments', () => {
    const l = lines().filter((x) => !x.startsWith('INTERPOLATION_DEGREE'));
    l[at(l, 'ATTITUDE_TYPE')] = 'ATTITUDE_TYPE = QUATERNION/RATE';
    l[at(l, 'OBJECT_NAME')] = 'OBJECT_NAME = Demo_Sat';
    const stop = at(l, 'META_STOP') + 1;
    expect(issues(join(l))).toEqual(['line 9 text-case', `line ${stop} attitude-type`, `line ${stop} missing-keyword`]);

    // Two segments: the second starts before the first one's stop.
    const base = lines();
    const seg2 = base
      .slice(at(base, 'META_START'))
      .map((x) =>
        x.replace(
          'START_TIME = 2030-03-14T10:00:00.000',
          'START_TIME = 2030-03-14T10:00:20.000\nUSEABLE_START_TIME = 2030-03-14T10:00:20.000',
        ),
      );
    const seg2Lines = join(seg2)
      .split('\n')
      .filter((x) => !/^2030-03-14T10:00:(00|01|03|18)/.test(x));
    const two = [...base, ...seg2Lines];
    const stop2 = two.lastIndexOf('META_STOP') + 1;
    expect(issues(join(two))).toEqual([`line ${stop2} useable`]);
  });

  it('several problems come back together', () => {
    const l = lines();
    l[at(l, 'TIME_SYSTEM')] = 'time_system = UTC';
    const d = at(l, '2030-03-14T10:00:00.000');
    l[d + 1] = '2030-03-14T10:00:01.500 0.0 0.0 x 0.9999518 0.0 0.0 1.5';
    l[d + 3] = '2030-03-14T10:00:18.000 0.0 0.0 0.4186597';
    expect(issues(join(l)).length).toBe(4);
  });
});

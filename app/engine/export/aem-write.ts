/**
 * CCSDS Attitude Ephemeris Message, version 2 (CCSDS 504.0-B-2, 2024), KVN form, with
 * ATTITUDE_TYPE = QUATERNION/ANGVEL: one segment (META/DATA block pair) per maneuver segment.
 *
 * Quaternion mapping (Annex F2). The standard's quaternion "from A to B" (A = REF_FRAME_A, the
 * inertial frame; B = REF_FRAME_B, the body) is scalar-last (Q1, Q2, Q3, QC) and transforms
 * coordinates as X_B = M_BA X_A with
 *   M_BA = [[Q1²−Q2²−Q3²+QC², 2(Q1Q2+Q3QC), 2(Q1Q3−Q2QC)], [2(Q1Q2−Q3QC), …], …].
 * Ours, qInertialFromBody, gives v_I = R(q) v_B, so v_B = R(q)ᵀ v_I: M_BA = R(q)ᵀ. The Hamilton
 * matrix R(q) = (w² − |e|²) I + 2 e eᵀ + 2 w [e]× has R(2,1) = 2(xy + wz), R(3,1) = 2(xz − wy),
 * R(1,1) = x² − y² − z² + w², …; so R(q)ᵀ equals M_BA entry by entry with (Q1, Q2, Q3, QC) =
 * (x, y, z, w). The AEM quaternion IS our quaternion, no conjugate (proved numerically in
 * test/reference/export-aem-convention.test.ts with the Annex F example and the propagation
 * vector). ANGVEL "from A to B" is the rate of B relative to A with components in ANGVEL_FRAME:
 * our body rate ω in body axes, written in deg/s (§4.2.4.6).
 *
 * Writer rules (§6): consecutive quaternions kept in one hemisphere (first one with QC ≥ 0);
 * data lines strictly increasing in time (a repeated printed epoch, e.g. at a logic jump, is
 * dropped); no NaN/Inf/−0; ≤ 16 significant digits; lines ≤ 254 printable ASCII characters;
 * comments only after CCSDS_AEM_VERS and after META_START. The output is parsed back with parseAem
 * before it is returned.
 */
import type { Issue, Result } from '../errors';
import { fail, ok } from '../errors';
import type { ScenarioSummary } from '../pipeline/types';
import { epochUnits, formatEpochUnits, parseIsoUtcMs } from '../scenario/utc';
import { parseUtcIso, utcLabelFromTai } from '../time/iso';
import { orbitHeaderLines, windowText } from './orbitText';
import type { RunTrace } from '../sim/types';
import { AEM_VERSION, KVN_MAX_LINE } from './aem-keywords';
import { AemLineChecker } from './aem-read';
import { collectChunks, LineChunker, type ChunkedExport, type ChunkSource } from './chunks';
import { CAUTION_TEXT } from '../caution';
import { selectSamples } from './columns';
import { kvnFixed, kvnSignificant } from './kvn';
import { aemSettings, type AemOptions, type AemSettings } from './aem-options';

export type { AemOptions } from './aem-options';
import { checkExportInputs } from './prepare';
import { exportSegments } from './segments';
import { pointingNote } from './pointingNote';
import type { ExportMeta, ExportSegment } from './types';
import { DEG_PER_RAD } from '../units';
import { constraintComments } from './constraintColumns';

/** AEM quaternion (Q1, Q2, Q3, QC) from A = inertial to B = body, from qInertialFromBody: the same numbers (see header). */
export function aemQuaternionFromAttitude(out: Float64Array, qInertialFromBody: ArrayLike<number>): Float64Array {
  out[0] = qInertialFromBody[0]!;
  out[1] = qInertialFromBody[1]!;
  out[2] = qInertialFromBody[2]!;
  out[3] = qInertialFromBody[3]!;
  return out;
}

/** Free text for a COMMENT line: printable ASCII, clipped to fit the line limit. */
function commentText(s: string): string {
  const ascii = s.replace(/[\u2013\u2014]/g, '-').replace(/[^\x20-\x7e]/g, '?');
  return ascii.slice(0, KVN_MAX_LINE - 'COMMENT '.length);
}

/** Free text as COMMENT values of whole words, each within the line limit (nothing clipped). */
function commentPieces(s: string): string[] {
  const room = KVN_MAX_LINE - 'COMMENT '.length;
  const words = commentText(s.replace(/\s+/g, ' ').trim())
    .split(' ')
    .flatMap((w) => (w.length > room ? (w.match(new RegExp(`.{1,${room}}`, 'g')) ?? []) : [w]));
  const pieces: string[] = [];
  let cur = '';
  for (const w of words) {
    if (cur && cur.length + 1 + w.length > room) {
      pieces.push(cur);
      cur = w;
    } else cur = cur ? `${cur} ${w}` : w;
  }
  if (cur) pieces.push(cur);
  return pieces;
}

/** One META/DATA block pair: its label, how many data lines it has, and its first and last epochs (epoch units). */
interface AemBlock {
  seg: ExportSegment;
  count: number;
  first: number;
  last: number;
}

/** The whole AEM as one string (tests, the app's download); the CLI streams aemChunks instead. */
export function writeAem(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: AemOptions): Result<string> {
  return collectChunks(aemChunks(trace, scenario, meta, options));
}

/**
 * Checks every input and the segments' data (a segment without a line is refused before any
 * text), then the AEM text chunk by chunk (chunks.ts), each line also read back as it is written.
 */
export function aemChunks(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: AemOptions): ChunkedExport {
  const errors: Issue[] = checkExportInputs(trace, scenario, meta);
  const o = options ?? ({} as AemOptions);
  const settings = aemSettings(o, scenario, errors);
  if (errors.length) return fail(errors);

  const sel = selectSamples(trace, o.sampleRateHz);
  if (!sel.ok) return sel;
  const segs = exportSegments(trace, scenario, meta.segments);
  if (!segs.ok) return segs;
  const idx = sel.value;
  const blocks = dataBlocks(trace, segs.value, idx, settings);
  if (!blocks.ok) return blocks;
  const head: string[] = [];
  headerLines(head, o, settings, scenario, meta);
  const label = epochLabeller(scenario.epochUtc, settings.fracDigits);
  const data: AemData = { trace, idx, sign: hemisphereSigns(trace, idx), label, st: settings, scenario };
  return ok(aemText(head, blocks.value, data, o));
}

/** One hemisphere throughout: the sign of each selected sample's quaternion, in time order (first with QC ≥ 0). */
function hemisphereSigns(trace: RunTrace, idx: ArrayLike<number>): Float64Array {
  const sign = new Float64Array(trace.n);
  let px = 0,
    py = 0,
    pz = 0,
    pw = 0;
  for (let m = 0; m < idx.length; m++) {
    const k = idx[m]!;
    const x = trace.q[4 * k]!,
      y = trace.q[4 * k + 1]!,
      z = trace.q[4 * k + 2]!,
      w = trace.q[4 * k + 3]!;
    const s = m === 0 ? (w < 0 ? -1 : 1) : px * x + py * y + pz * z + pw * w < 0 ? -1 : 1;
    sign[k] = s;
    px = s * x;
    py = s * y;
    pz = s * z;
    pw = s * w;
  }
  return sign;
}

/**
 * What the data lines are made from: the trace, the selected samples, their hemisphere signs, the
 * epoch labeller (plan-time units → UTC text), the settings and the scenario (orbit windows).
 */
interface AemData {
  trace: RunTrace;
  idx: ArrayLike<number>;
  sign: Float64Array;
  label: (units: number) => string;
  st: AemSettings;
  scenario: ScenarioSummary;
}

/**
 * The samples of one segment that become data lines, strictly increasing in printed epoch: each
 * next() moves to the next one (its sample index in `k`, its epoch in epoch units in `units`).
 * One definition for both passes (counting the lines for the metadata, then writing them), so the
 * two cannot disagree.
 */
class SegmentSamples {
  k = -1;
  units = 0;
  private m = 0;
  private lastUnits = -Infinity;
  private readonly slack: number;

  constructor(
    private readonly d: Pick<AemData, 'trace' | 'idx' | 'st'>,
    private readonly seg: ExportSegment,
  ) {
    this.slack = 1e-9 * Math.max(1, Math.abs(seg.stopS));
  }

  next(): boolean {
    const { trace, idx, st } = this.d;
    while (this.m < idx.length) {
      const k = idx[this.m++]!;
      const t = trace.t[k]!;
      if (t < this.seg.startS - this.slack || t > this.seg.stopS + this.slack) continue;
      // Plan time in units of 10^-digits s from the scenario epoch; the labeller turns it into UTC.
      const u = Math.round(t * 10 ** st.fracDigits);
      if (u <= this.lastUnits) continue; // repeated printed epoch (logic jump, or finer than the epoch resolution)
      this.lastUnits = u;
      this.k = k;
      this.units = u;
      return true;
    }
    return false;
  }
}

/** Each segment's line count and first and last epochs; a segment with no line is an error. */
function dataBlocks(trace: RunTrace, segments: readonly ExportSegment[], idx: ArrayLike<number>, st: AemSettings): Result<AemBlock[]> {
  const blocks: AemBlock[] = [];
  const segErrors: Issue[] = [];
  for (let b = 0; b < segments.length; b++) {
    const seg = segments[b]!;
    const blk: AemBlock = { seg, count: 0, first: NaN, last: NaN };
    const it = new SegmentSamples({ trace, idx, st }, seg);
    while (it.next()) {
      if (blk.count++ === 0) blk.first = it.units;
      blk.last = it.units;
    }
    if (blk.count === 0) {
      segErrors.push({
        path: `segments[${b}]`,
        rule: 'empty-segment',
        message: `segment ${b} ("${seg.label}", ${seg.startS}–${seg.stopS} s) holds no samples to write`,
      });
      continue;
    }
    blocks.push(blk);
  }
  return segErrors.length ? fail(segErrors) : ok(blocks);
}

/** One data line: epoch, quaternion (one hemisphere) and angular velocity in deg/s. */
function dataLine(d: AemData, k: number, u: number, aq: Float64Array): string {
  const { trace, st } = d;
  aemQuaternionFromAttitude(aq, trace.q.subarray(4 * k, 4 * k + 4));
  const s = d.sign[k]!;
  const parts = [d.label(u)];
  for (let i = 0; i < 4; i++) parts.push(kvnFixed(s * aq[i]!, st.qDec));
  for (let i = 0; i < 3; i++) parts.push(kvnSignificant(trace.omega[3 * k + i]! * DEG_PER_RAD, st.rateSig));
  return parts.join(' ');
}

/**
 * The text: header, then each segment's metadata and data lines, in chunks; every line is also
 * fed to the reader's checks (AemLineChecker), and a problem it finds — the writer's, reported as
 * internal — is the source's return value, so the caller discards what was written.
 */
function* aemText(head: readonly string[], blocks: readonly AemBlock[], d: AemData, o: AemOptions): ChunkSource {
  const out = new LineChunker(o.lineEnding ?? '\n');
  const check = new AemLineChecker();
  const put = (line: string): string | null => {
    check.line(line);
    return out.add(line);
  };
  let chunk: string | null;
  for (const h of head) if ((chunk = put(h)) !== null) yield chunk;
  const aq = new Float64Array(4);
  for (let b = 0; b < blocks.length; b++) {
    const meta: string[] = [];
    segmentMeta(meta, blocks[b]!, b, blocks.length, o, d);
    for (const l of meta) if ((chunk = put(l)) !== null) yield chunk;
    const it = new SegmentSamples(d, blocks[b]!.seg);
    while (it.next()) if ((chunk = put(dataLine(d, it.k, it.units, aq))) !== null) yield chunk;
    if ((chunk = put('DATA_STOP')) !== null) yield chunk;
  }
  const rest = out.flush();
  if (rest !== null) yield rest;
  return readBackIssues(check.end());
}

/** Header lines: version, the caution and what wrote the file, creation date, originator, message id. */
function headerLines(out: string[], o: AemOptions, st: AemSettings, scenario: ScenarioSummary, meta: ExportMeta): void {
  const text = st.text;
  const creation = formatEpochUnits(epochUnits(st.creationMs, 0, 3), 3);
  const messageId = o.messageId ?? `${st.objectName}-${creation.slice(0, 19).replace(/[-:]/g, '')}`;
  const kv = (k: string, v: string) => out.push(`${k} = ${v}`);
  kv('CCSDS_AEM_VERS', AEM_VERSION);
  out.push(`COMMENT ${commentText(CAUTION_TEXT)}`);
  if (meta.incomplete) for (const piece of commentPieces(meta.incomplete)) out.push(`COMMENT ${piece}`);
  out.push(
    `COMMENT ${commentText(`Written by ${meta.toolName} ${meta.toolVersion}: scenario "${scenario.name}", controller "${meta.controllerLabel}"`)}`,
  );
  out.push(
    `COMMENT ${commentText(`Quaternion from ${text.refFrameA} to ${text.refFrameB} (Q1 Q2 Q3 QC, scalar last); ANGVEL of ${text.refFrameB} relative to ${text.refFrameA} in ${text.refFrameB} axes, deg/s`)}`,
  );
  if (scenario.orbit) for (const line of orbitHeaderLines(scenario.orbit)) out.push(`COMMENT ${commentText(line)}`);
  for (const c of constraintComments(meta.constraints)) out.push(`COMMENT ${commentText(c)}`);
  kv('CREATION_DATE', creation);
  kv('ORIGINATOR', text.originator as string);
  kv('MESSAGE_ID', messageId);
}

/** Segment b of count: its metadata block and the start of its data block (the data lines and DATA_STOP follow). */
function segmentMeta(out: string[], blk: AemBlock, b: number, count: number, o: AemOptions, d: AemData): void {
  const st = d.st;
  const text = st.text;
  const kv = (k: string, v: string) => out.push(`${k} = ${v}`);
  out.push('');
  out.push('META_START');
  out.push(`COMMENT ${commentText(`Segment ${b + 1} of ${count}: ${blk.seg.label}`)}`);
  const orbit = d.scenario.orbit;
  const w = orbit?.windows.find((x) => x.target === blk.seg.index);
  if (orbit && w) out.push(`COMMENT ${commentText(windowText(orbit, w))}`);
  const note = pointingNote(d.scenario, blk.seg.index);
  if (note) out.push(`COMMENT ${commentText(note)}`);
  kv('OBJECT_NAME', st.objectName);
  kv('OBJECT_ID', text.objectId as string);
  if (text.centerName !== null) kv('CENTER_NAME', text.centerName);
  kv('REF_FRAME_A', text.refFrameA as string);
  kv('REF_FRAME_B', text.refFrameB as string);
  kv('TIME_SYSTEM', 'UTC');
  const start = d.label(blk.first);
  const stop = d.label(blk.last);
  kv('START_TIME', start);
  kv('USEABLE_START_TIME', start);
  kv('USEABLE_STOP_TIME', stop);
  kv('STOP_TIME', stop);
  kv('ATTITUDE_TYPE', 'QUATERNION/ANGVEL');
  kv('ANGVEL_FRAME', text.refFrameB as string);
  if (o.interpolation) {
    kv('INTERPOLATION_METHOD', o.interpolation.method);
    kv('INTERPOLATION_DEGREE', String(o.interpolation.degree));
  }
  out.push('META_STOP');
  out.push('');
  out.push('DATA_START');
}

/** The read-back check's problems as the writer's own (rule "internal"). */
function readBackIssues(errors: readonly Issue[]): Issue[] {
  return errors.map((e) => ({
    path: `aem.${e.path}`,
    rule: 'internal',
    message: `the written AEM failed its own read-back check: ${e.message}`,
  }));
}

/**
 * Epoch labels of plan times counted in units of 10^-digits s from the scenario epoch: UTC with
 * leap seconds counted (time/iso.ts), so an inserted second reads 23:59:60.xxx (CCSDS 504.0-B-2
 * §6.8.9 allows seconds = 60 in UTC). The epoch was validated upstream; a bad one falls back to
 * the POSIX labels.
 */
function epochLabeller(epochUtc: string, digits: number): (units: number) => string {
  const e = parseUtcIso(epochUtc);
  const per = 10 ** digits;
  if (!e.ok) {
    const ms = parseIsoUtcMs(epochUtc) ?? 0;
    return (u) => formatEpochUnits(epochUnits(ms, u / per, digits), digits);
  }
  const whole = Math.floor(e.value.taiS);
  const fracUnits = Math.round((e.value.taiS - whole) * per);
  return (u) => {
    const total = fracUnits + u;
    const s = Math.floor(total / per);
    return utcLabelFromTai(whole + s + (total - s * per) / per, digits);
  };
}

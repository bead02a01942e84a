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
import type { RunTrace } from '../sim/types';
import { AEM_VERSION, KVN_MAX_LINE } from './aem-keywords';
import { parseAem } from './aem-read';
import { CAUTION_TEXT } from '../caution';
import { selectSamples } from './columns';
import { isKvnText, kvnFixed, kvnSignificant, toKvnText } from './kvn';
import { checkExportInputs } from './prepare';
import { exportSegments } from './segments';
import { pointingNote } from './pointingNote';
import type { ExportMeta, ExportSegment } from './types';
import { DEG_PER_RAD } from '../units';

export interface AemOptions {
  /** When the message is created, ISO 8601 UTC `YYYY-MM-DDThh:mm:ss[.sss]Z` (passed in so output is reproducible). */
  creationDateUtc: string;
  /** ORIGINATOR (v2 asks for a SANA-registered organisation; default "SLEWSMITH"). */
  originator?: string;
  /** MESSAGE_ID; default `<OBJECT_NAME>-<creation date as YYYYMMDDThhmmss>`. */
  messageId?: string;
  /** OBJECT_NAME; default the vehicle name in upper case. */
  objectName?: string;
  /** OBJECT_ID; default "UNKNOWN" (the standard's value when there is no international designator). */
  objectId?: string;
  /** CENTER_NAME; default "EARTH"; null leaves the optional keyword out. */
  centerName?: string | null;
  /** Inertial frame, REF_FRAME_A (default "EME2000"). */
  refFrameA?: string;
  /** Body frame, REF_FRAME_B and ANGVEL_FRAME (default "SC_BODY_1"). */
  refFrameB?: string;
  /** Optional INTERPOLATION_METHOD / INTERPOLATION_DEGREE. */
  interpolation?: { method: 'LINEAR' | 'HERMITE' | 'LAGRANGE'; degree: number } | null;
  /** Decimal places of the epoch seconds, 0–6 (default 3, i.e. hh:mm:ss.sss). */
  epochFractionDigits?: number;
  /** Decimal places of quaternion components, 1–15 (default 10). */
  quaternionDecimals?: number;
  /** Significant digits of angular velocity (deg/s), 1–16 (default 12). */
  rateSignificantDigits?: number;
  /** Keep about this many data lines per second (and always a segment's last). */
  sampleRateHz?: number;
  lineEnding?: '\n' | '\r\n';
}

/** AEM quaternion (Q1, Q2, Q3, QC) from A = inertial to B = body, from qInertialFromBody: the same numbers (see header). */
export function aemQuaternionFromAttitude(out: Float64Array, qInertialFromBody: ArrayLike<number>): Float64Array {
  out[0] = qInertialFromBody[0]!;
  out[1] = qInertialFromBody[1]!;
  out[2] = qInertialFromBody[2]!;
  out[3] = qInertialFromBody[3]!;
  return out;
}

function intIn(v: unknown, lo: number, hi: number): boolean {
  return typeof v === 'number' && Number.isInteger(v) && v >= lo && v <= hi;
}

/** Free text for a COMMENT line: printable ASCII, clipped to fit the line limit. */
function commentText(s: string): string {
  const ascii = s.replace(/[\u2013\u2014]/g, '-').replace(/[^\x20-\x7e]/g, '?');
  return ascii.slice(0, KVN_MAX_LINE - 'COMMENT '.length);
}

/** Options resolved to what the writer prints (after their checks). */
interface AemSettings {
  /** CREATION_DATE, ms since 1970 (NaN when it did not parse: the options are then refused). */
  creationMs: number;
  fracDigits: number;
  qDec: number;
  rateSig: number;
  objectName: string;
  text: Record<'originator' | 'objectName' | 'objectId' | 'centerName' | 'refFrameA' | 'refFrameB', string | null>;
}

/** One META/DATA block pair: its label, its data lines and its first and last epochs (epoch units). */
interface AemBlock {
  label: string;
  lines: string[];
  first: number;
  last: number;
}

export function writeAem(trace: RunTrace, scenario: ScenarioSummary, meta: ExportMeta, options: AemOptions): Result<string> {
  const errors: Issue[] = checkExportInputs(trace, scenario, meta);
  const o = options ?? ({} as AemOptions);
  const settings = aemSettings(o, scenario, errors);
  if (errors.length) return fail(errors);

  const sel = selectSamples(trace, o.sampleRateHz);
  if (!sel.ok) return sel;
  const segs = exportSegments(trace, scenario, meta.segments);
  if (!segs.ok) return segs;
  const idx = sel.value;
  const blocks = dataBlocks(trace, segs.value, idx, hemisphereSigns(trace, idx), scenario.epochUnixMs, settings);
  if (!blocks.ok) return blocks;

  const out: string[] = [];
  headerLines(out, o, settings, scenario, meta);
  blocks.value.forEach((blk, b) =>
    segmentLines(out, blk, b, blocks.value.length, o, settings, pointingNote(scenario, segs.value[b]!.index)),
  );
  const eol = o.lineEnding ?? '\n';
  return readBack(out.join(eol) + eol);
}

/** Every problem with the options, appended to `errors`; the values the writer uses. */
function aemSettings(o: AemOptions, scenario: ScenarioSummary, errors: Issue[]): AemSettings {
  const creationMs = parseIsoUtcMs(o.creationDateUtc);
  if (creationMs === null) {
    errors.push({
      path: 'options.creationDateUtc',
      rule: 'format',
      message: `options.creationDateUtc must be an ISO 8601 UTC time like 2030-03-13T08:00:00Z (got ${JSON.stringify(o.creationDateUtc)})`,
    });
  }
  const fracDigits = o.epochFractionDigits ?? 3;
  const qDec = o.quaternionDecimals ?? 10;
  const rateSig = o.rateSignificantDigits ?? 12;
  if (!intIn(fracDigits, 0, 6))
    errors.push({
      path: 'options.epochFractionDigits',
      rule: 'range',
      message: 'options.epochFractionDigits must be a whole number from 0 to 6',
    });
  if (!intIn(qDec, 1, 15))
    errors.push({
      path: 'options.quaternionDecimals',
      rule: 'range',
      message: 'options.quaternionDecimals must be a whole number from 1 to 15 (16 significant digits at most)',
    });
  if (!intIn(rateSig, 1, 16))
    errors.push({
      path: 'options.rateSignificantDigits',
      rule: 'range',
      message: 'options.rateSignificantDigits must be a whole number from 1 to 16',
    });
  if (o.lineEnding !== undefined && o.lineEnding !== '\n' && o.lineEnding !== '\r\n') {
    errors.push({ path: 'options.lineEnding', rule: 'one-of', message: 'options.lineEnding must be "\\n" or "\\r\\n"' });
  }
  const objectName = o.objectName ?? toKvnText(scenario?.vehicleName ?? '');
  const text: AemSettings['text'] = {
    originator: o.originator ?? 'SLEWSMITH',
    objectName,
    objectId: o.objectId ?? 'UNKNOWN',
    centerName: o.centerName === undefined ? 'EARTH' : o.centerName,
    refFrameA: o.refFrameA ?? 'EME2000',
    refFrameB: o.refFrameB ?? 'SC_BODY_1',
  };
  textIssues(o, text, errors);
  return { creationMs: creationMs ?? NaN, fracDigits, qDec, rateSig, objectName, text };
}

/** The text-valued options: KVN text (printable ASCII, one case) and a known interpolation. */
function textIssues(o: AemOptions, text: AemSettings['text'], errors: Issue[]): void {
  for (const [k, v] of Object.entries(text)) {
    if (v === null && k === 'centerName') continue;
    if (typeof v !== 'string' || !isKvnText(v)) {
      errors.push({
        path: `options.${k}`,
        rule: 'kvn-text',
        message: `options.${k} must be printable ASCII letters, digits, "_", "-", ".", all upper or all lower case (got ${JSON.stringify(v)})`,
      });
    }
  }
  if (o.messageId !== undefined && !isKvnText(o.messageId)) {
    errors.push({ path: 'options.messageId', rule: 'kvn-text', message: 'options.messageId must be printable ASCII in one case' });
  }
  if (o.interpolation) {
    if (!['LINEAR', 'HERMITE', 'LAGRANGE'].includes(o.interpolation.method)) {
      errors.push({
        path: 'options.interpolation.method',
        rule: 'one-of',
        message: 'options.interpolation.method must be LINEAR, HERMITE or LAGRANGE',
      });
    }
    if (!intIn(o.interpolation.degree, 1, 32)) {
      errors.push({
        path: 'options.interpolation.degree',
        rule: 'range',
        message: 'options.interpolation.degree must be a whole number from 1 to 32',
      });
    }
  }
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

/** The data lines of each segment, strictly increasing in printed epoch; a segment with none is an error. */
function dataBlocks(
  trace: RunTrace,
  segments: readonly ExportSegment[],
  idx: ArrayLike<number>,
  sign: Float64Array,
  epochMs: number,
  st: AemSettings,
): Result<AemBlock[]> {
  const aq = new Float64Array(4);
  const blocks: AemBlock[] = [];
  const segErrors: Issue[] = [];
  for (let b = 0; b < segments.length; b++) {
    const seg = segments[b]!;
    const slack = 1e-9 * Math.max(1, Math.abs(seg.stopS));
    const lines: string[] = [];
    let lastUnits = -Infinity,
      firstUnits = NaN;
    for (let m = 0; m < idx.length; m++) {
      const k = idx[m]!;
      const t = trace.t[k]!;
      if (t < seg.startS - slack || t > seg.stopS + slack) continue;
      const u = epochUnits(epochMs, t, st.fracDigits);
      if (u <= lastUnits) continue; // repeated printed epoch (logic jump, or finer than the epoch resolution)
      if (Number.isNaN(firstUnits)) firstUnits = u;
      lastUnits = u;
      aemQuaternionFromAttitude(aq, trace.q.subarray(4 * k, 4 * k + 4));
      const s = sign[k]!;
      const parts = [formatEpochUnits(u, st.fracDigits)];
      for (let i = 0; i < 4; i++) parts.push(kvnFixed(s * aq[i]!, st.qDec));
      for (let i = 0; i < 3; i++) parts.push(kvnSignificant(trace.omega[3 * k + i]! * DEG_PER_RAD, st.rateSig));
      lines.push(parts.join(' '));
    }
    if (lines.length === 0) {
      segErrors.push({
        path: `segments[${b}]`,
        rule: 'empty-segment',
        message: `segment ${b} ("${seg.label}", ${seg.startS}–${seg.stopS} s) holds no samples to write`,
      });
      continue;
    }
    blocks.push({ label: seg.label, lines, first: firstUnits, last: lastUnits });
  }
  return segErrors.length ? fail(segErrors) : ok(blocks);
}

/** Header lines: version, the caution and what wrote the file, creation date, originator, message id. */
function headerLines(out: string[], o: AemOptions, st: AemSettings, scenario: ScenarioSummary, meta: ExportMeta): void {
  const text = st.text;
  const creation = formatEpochUnits(epochUnits(st.creationMs, 0, 3), 3);
  const messageId = o.messageId ?? `${st.objectName}-${creation.slice(0, 19).replace(/[-:]/g, '')}`;
  const kv = (k: string, v: string) => out.push(`${k} = ${v}`);
  kv('CCSDS_AEM_VERS', AEM_VERSION);
  out.push(`COMMENT ${commentText(CAUTION_TEXT)}`);
  out.push(
    `COMMENT ${commentText(`Written by ${meta.toolName} ${meta.toolVersion}: scenario "${scenario.name}", controller "${meta.controllerLabel}"`)}`,
  );
  out.push(
    `COMMENT ${commentText(`Quaternion from ${text.refFrameA} to ${text.refFrameB} (Q1 Q2 Q3 QC, scalar last); ANGVEL of ${text.refFrameB} relative to ${text.refFrameA} in ${text.refFrameB} axes, deg/s`)}`,
  );
  kv('CREATION_DATE', creation);
  kv('ORIGINATOR', text.originator as string);
  kv('MESSAGE_ID', messageId);
}

/** Segment b of count: its metadata block and its data block. */
function segmentLines(
  out: string[],
  blk: AemBlock,
  b: number,
  count: number,
  o: AemOptions,
  st: AemSettings,
  note: string | null = null,
): void {
  const text = st.text;
  const kv = (k: string, v: string) => out.push(`${k} = ${v}`);
  out.push('');
  out.push('META_START');
  out.push(`COMMENT ${commentText(`Segment ${b + 1} of ${count}: ${blk.label}`)}`);
  if (note) out.push(`COMMENT ${commentText(note)}`);
  kv('OBJECT_NAME', st.objectName);
  kv('OBJECT_ID', text.objectId as string);
  if (text.centerName !== null) kv('CENTER_NAME', text.centerName);
  kv('REF_FRAME_A', text.refFrameA as string);
  kv('REF_FRAME_B', text.refFrameB as string);
  kv('TIME_SYSTEM', 'UTC');
  const start = formatEpochUnits(blk.first, st.fracDigits);
  const stop = formatEpochUnits(blk.last, st.fracDigits);
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
  out.push(...blk.lines);
  out.push('DATA_STOP');
}

/** The written text, parsed back with parseAem: any problem is the writer's, reported as internal. */
function readBack(textOut: string): Result<string> {
  const check = parseAem(textOut);
  if (!check.ok) {
    return fail(
      check.errors.map((e) => ({
        path: `aem.${e.path}`,
        rule: 'internal',
        message: `the written AEM failed its own read-back check: ${e.message}`,
      })),
    );
  }
  return ok(textOut);
}

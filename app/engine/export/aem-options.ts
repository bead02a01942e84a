/**
 * The AEM writer's options (aem-write.ts): what a caller may set, and their checks, resolved to the
 * values the writer prints. Every problem names its option and rule (CCSDS 504.0-B-2 KVN text rules
 * for the text-valued keywords).
 */
import type { Issue } from '../errors';
import type { ScenarioSummary } from '../pipeline/types';
import { parseIsoUtcMs } from '../scenario/utc';
import { isKvnText, toKvnText } from './kvn';

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

function intIn(v: unknown, lo: number, hi: number): boolean {
  return typeof v === 'number' && Number.isInteger(v) && v >= lo && v <= hi;
}

/** Options resolved to what the writer prints (after their checks). */
export interface AemSettings {
  /** CREATION_DATE, ms since 1970 (NaN when it did not parse: the options are then refused). */
  creationMs: number;
  fracDigits: number;
  qDec: number;
  rateSig: number;
  objectName: string;
  text: Record<'originator' | 'objectName' | 'objectId' | 'centerName' | 'refFrameA' | 'refFrameB', string | null>;
}

/** Every problem with the options, appended to `errors`; the values the writer uses. */
export function aemSettings(o: AemOptions, scenario: ScenarioSummary, errors: Issue[]): AemSettings {
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
